import { mapSitesOf } from "../../_components/mapSites";
import { simulationRasterUrl } from "../../_components/mapUrls";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requireActor } from "@/lib/auth/session";
import { can } from "@/lib/changes/roles";
import { isEditableState } from "@/lib/changes/rules";
import { PARAMETER_LABELS, SAFETY_NOTICE } from "@/lib/changes/workOrder";
import { runtime } from "@/app/_lib/runtime";
import { getRequest, type SimulationDto } from "@/lib/db/requests/data";
import { listCells, listNetworks } from "@/lib/db/networks/data";
import { mapGeometry, simulationCdfs } from "@/lib/jobs/mapLayers";
import { StateBadge } from "../../_components/RequestsTable";
import { KpiTable } from "../../_components/KpiTable";
import { DeferredCdfChart, DeferredDeltaChart } from "../../_components/DeferredCharts";
import { ImpactMapSection } from "../../_components/ImpactMapSection";
import type { ImpactSummaryDto, WorstGridDto } from "../../_components/types";
import { utcDateTime } from "../../_components/format";
import { RequestActions } from "./_components/RequestActions";
import { SimulationWatcher } from "./_components/SimulationWatcher";
import { CommentForm } from "./_components/CommentForm";

export const dynamic = "force-dynamic";

const RUNNING = new Set(["queued", "running", "retrying"]);

function formatValue(value: number | string): string {
  return typeof value === "number" ? String(value) : value;
}

export default async function RequestPage({ params }: { params: Promise<{ id: string }> }) {
  const actor = await requireActor("request.read");
  const { id } = await params;
  const { db } = await runtime();
  const detail = await getRequest(db.prisma, id, actor);
  if (!detail) notFound();

  // The simulation the page shows: the newest finished one of the current revision, else the newest finished.
  const finished = detail.simulations.filter((s) => s.status === "done");
  const shown: SimulationDto | undefined = finished.find((s) => s.revision === detail.revision) ?? finished[0];
  const active = detail.simulations.find((s) => RUNNING.has(s.status));
  const newest = detail.simulations[0];
  const failed = newest && newest.status === "failed" ? newest : undefined;

  const networks = await listNetworks(db.prisma);
  const latestVersion = networks.find((n) => n.id === detail.networkId)?.latestVersion ?? detail.baseVersion;
  // Rebasing is legal on any open request, but only useful when the network has moved on.
  const actions = detail.availableActions.filter((a) => a !== "rebase" || detail.stale || detail.baseVersion < latestVersion);
  const isAuthor = detail.authorId === actor.id;
  const editable = isEditableState(detail.state);
  const canEdit = editable && isAuthor && can(actor.role, "request.edit");
  const canPreview = editable && isAuthor && can(actor.role, "request.preview") && detail.items.length > 0;

  let impact: React.ReactNode = null;
  if (shown) {
    const summary = shown.summary as ImpactSummaryDto;
    const worst = shown.worstGrids as { grids: WorstGridDto[]; total: number };
    const [geometry, cdfs, cells] = await Promise.all([
      mapGeometry(db.prisma, shown.id),
      simulationCdfs(db.prisma, shown.id),
      listCells(db.prisma, detail.networkId, { version: detail.baseVersion }),
    ]);
    const clusterNames = Object.fromEntries((networks.find((n) => n.id === detail.networkId)?.clusters ?? []).map((c) => [c.code, c.name]));
    const sites = mapSitesOf(cells, detail.items);
    impact = (
      <section aria-label="Predicted impact">
        <h2>
          Predicted impact{" "}
          <span className="muted" style={{ fontWeight: 400, fontSize: 13 }}>
            {shown.purpose === "preview" ? "preview" : "submission"} simulation of revision {shown.revision}
            {shown.finishedAt ? `, finished ${utcDateTime(shown.finishedAt)}` : ""}
            {shown.revision !== detail.revision ? " — the request has changed since; this is not its current impact" : ""}
          </span>
        </h2>
        <div className="panel">
          <KpiTable report={summary} />
        </div>
        <div className="grid2">
          <div className="panel">
            <h3>KPI change per cluster</h3>
            <DeferredDeltaChart report={summary} />
          </div>
          <div className="panel">
            <DeferredCdfChart title="Best-server RSRP" unit="dBm" before={cdfs.bestRsrp.before} after={cdfs.bestRsrp.after} />
            <DeferredCdfChart
              title="SINR"
              unit="dB"
              before={cdfs.sinr.before}
              after={cdfs.sinr.after}
              note="SINR per resource element: the noise is that of one subcarrier, like the RSRP it is computed from."
            />
          </div>
        </div>
        <ImpactMapSection
          map={{ rasterUrl: simulationRasterUrl(shown.id), floors: geometry.floors, sites, rsrpDomainDbm: "data" }}
          worstGrids={worst.grids}
          worstGridTotal={worst.total}
          clusterNames={clusterNames}
        />
      </section>
    );
  }

  return (
    <main>
      <p className="muted" style={{ margin: 0 }}>
        <Link href="/requests">Change requests</Link> ›
      </p>
      <h1>
        CR-{detail.number} · {detail.title} <StateBadge state={detail.state} />
      </h1>
      <p className="subtitle">
        by {detail.authorName} · built on network version {detail.baseVersion} · revision {detail.revision}
        {detail.approverName ? ` · decided by ${detail.approverName}` : ""}
        {detail.windowStart ? ` · change window ${utcDateTime(detail.windowStart)} – ${detail.windowEnd ? utcDateTime(detail.windowEnd) : "open"}` : ""}
      </p>

      {detail.stale && (
        <div className="banner warn" role="status" data-testid="stale-banner">
          <strong>Out of date.</strong> {detail.staleReason ?? "Another request on the same cells went ahead."} Rebase it on the
          latest network and simulate again before it can be approved.
        </div>
      )}
      {detail.conflicts.length > 0 && (
        <div className="banner info" role="status" data-testid="conflict-banner">
          <strong>Shares cells with other open requests:</strong>{" "}
          {detail.conflicts.map((c, i) => (
            <span key={c.otherId}>
              {i > 0 ? "; " : ""}
              <Link href={`/requests/${c.otherId}`}>
                CR-{c.otherNumber} {c.otherTitle}
              </Link>{" "}
              ({c.cellIds.join(", ")})
            </span>
          ))}
        </div>
      )}
      {failed && (
        <div className="banner bad" role="alert">
          <strong>The last simulation failed:</strong> {failed.error}. The request was left as it was.
        </div>
      )}

      <div className="grid2">
        <div className="panel">
          <h3 style={{ marginTop: 0 }}>Parameter changes</h3>
          <table className="data" data-testid="items-table">
            <thead>
              <tr>
                <th>Cell</th>
                <th>Parameter</th>
                <th className="num">Now</th>
                <th className="num">Proposed</th>
              </tr>
            </thead>
            <tbody>
              {detail.items.map((item) => (
                <tr key={`${item.cellId}-${item.parameter}`}>
                  <td>
                    <Link href={`/network/cells/${encodeURIComponent(item.cellId)}`}>{item.cellId}</Link>
                  </td>
                  <td>{PARAMETER_LABELS[item.parameter]}</td>
                  <td className="num">{formatValue(item.oldValue)}</td>
                  <td className="num">
                    <strong>{formatValue(item.newValue)}</strong>
                  </td>
                </tr>
              ))}
              {detail.items.length === 0 && (
                <tr>
                  <td colSpan={4} className="muted">
                    No items yet.
                  </td>
                </tr>
              )}
            </tbody>
          </table>
          <h3>Reason</h3>
          <p style={{ whiteSpace: "pre-wrap" }}>{detail.reason}</p>
          {shown && (
            <p>
              <a href={`/api/requests/${detail.id}/report`} data-testid="report-pdf">
                Impact report (PDF)
              </a>
            </p>
          )}
          {(detail.state === "approved" || detail.state === "implemented") && can(actor.role, "workorder.read") && (
            <p>
              Work order: <a href={`/api/requests/${detail.id}/work-order?format=csv`}>CSV</a> ·{" "}
              <a href={`/api/requests/${detail.id}/work-order?format=json`}>JSON</a> · rollback sheet{" "}
              <a href={`/api/requests/${detail.id}/work-order?format=csv&sheet=rollback`}>CSV</a>
            </p>
          )}
        </div>
        <div className="panel">
          <h3 style={{ marginTop: 0 }}>What happens next</h3>
          {active && (
            <SimulationWatcher
              simulationId={active.id}
              initial={{ status: active.status as "queued", progress: active.progress }}
              label={active.purpose === "preview" ? "Impact preview" : "Simulation"}
            />
          )}
          <RequestActions
            requestId={detail.id}
            version={detail.version}
            actions={actions}
            canPreview={canPreview && !active}
            canEdit={canEdit}
            safetyNotice={SAFETY_NOTICE}
          />
        </div>
      </div>

      {impact ?? (
        <div className="panel muted">
          No simulation has finished for this request yet{canPreview ? ": press “Preview impact” to see its predicted effect before submitting." : "."}
        </div>
      )}

      <div className="grid2">
        <div className="panel">
          <h3 style={{ marginTop: 0 }}>Timeline</h3>
          <ol className="timeline" data-testid="timeline">
            {detail.events.map((event) => (
              <li key={event.seq}>
                <span className="muted">{utcDateTime(event.at)}</span> · <strong>{event.action.replace(/^request\./, "").replace(/_/g, " ")}</strong>
                {event.actorEmail ? ` by ${event.actorEmail}` : ""}
              </li>
            ))}
          </ol>
        </div>
        <div className="panel">
          <h3 style={{ marginTop: 0 }}>Comments</h3>
          {detail.comments.map((comment) => (
            <div key={comment.id} style={{ borderBottom: "1px solid var(--line)", padding: "6px 0" }}>
              <div className="muted">
                {comment.authorName} · {utcDateTime(comment.createdAt)}
              </div>
              <div style={{ whiteSpace: "pre-wrap" }}>{comment.text}</div>
            </div>
          ))}
          {detail.comments.length === 0 && <p className="muted">No comments yet.</p>}
          {can(actor.role, "request.comment") && <CommentForm requestId={detail.id} />}
        </div>
      </div>
    </main>
  );
}
