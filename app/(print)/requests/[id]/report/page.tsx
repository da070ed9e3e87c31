import { mapSitesOf } from "@/app/(review)/_components/mapSites";
import { simulationRasterUrl } from "@/app/(review)/_components/mapUrls";
import { notFound } from "next/navigation";
import { PARAMETER_LABELS, SAFETY_NOTICE } from "@/lib/changes/workOrder";
import { runtime } from "@/app/_lib/runtime";
import { getRequest, type SimulationDto } from "@/lib/db/requests/data";
import { listCells, listNetworks } from "@/lib/db/networks/data";
import { mapGeometry, simulationCdfs } from "@/lib/jobs/mapLayers";
import { pageActor } from "@/app/(review)/_components/guard";
import { Forbidden } from "@/app/(review)/_components/Forbidden";
import { KpiTable } from "@/app/(review)/_components/KpiTable";
import { DeltaChart } from "@/app/(review)/_components/DeltaChart";
import { CdfChart } from "@/app/(review)/_components/CdfChart";
import { GridMap } from "@/app/(review)/_components/GridMap";
import type { ImpactSummaryDto, WorstGridDto } from "@/app/(review)/_components/types";
import { utcDateTime } from "@/app/(review)/_components/format";
import { PrintWorstGrids } from "./_components/PrintWorstGrids";

export const dynamic = "force-dynamic";

/** Worst grids printed (the rest are on the request page and in its CSV). */
const PRINTED_WORST_GRIDS = 30;

const PRINT_CAUTION = `${SAFETY_NOTICE} Where this report and local rules differ, defer to local regulations and licensed practice.`;

const STATE_LABELS: Record<string, string> = {
  draft: "Draft",
  submitted: "Submitted",
  simulated: "Simulated",
  approved: "Approved",
  rejected: "Rejected",
  returned: "Returned",
  implemented: "Implemented",
  rolled_back: "Rolled back",
};

/** The impact report of one change request, laid out for A4 (printed to PDF by /api/requests/:id/report). */
export default async function ImpactReportPage({ params }: { params: Promise<{ id: string }> }) {
  const gate = await pageActor("request.read");
  if (!gate.ok) return <Forbidden permission={gate.permission} />;
  const { id } = await params;
  const { db } = await runtime();
  const detail = await getRequest(db.prisma, id, gate.actor);
  if (!detail) notFound();

  // The same simulation the request page shows: the newest finished one of the current revision, else the newest finished.
  const finished = detail.simulations.filter((s) => s.status === "done");
  const shown: SimulationDto | undefined = finished.find((s) => s.revision === detail.revision) ?? finished[0];
  const networks = await listNetworks(db.prisma);
  const network = networks.find((n) => n.id === detail.networkId);
  const clusterNames = Object.fromEntries((network?.clusters ?? []).map((c) => [c.code, c.name]));

  let impact: React.ReactNode = (
    <p className="panel muted" data-testid="no-simulation">
      No simulation has finished for this request: there is no predicted impact to report.
    </p>
  );
  if (shown) {
    const summary = shown.summary as ImpactSummaryDto;
    const worst = shown.worstGrids as { grids: WorstGridDto[]; total: number };
    const [geometry, cdfs, cells] = await Promise.all([
      mapGeometry(db.prisma, shown.id),
      simulationCdfs(db.prisma, shown.id),
      listCells(db.prisma, detail.networkId, { version: detail.baseVersion }),
    ]);
    const sites = mapSitesOf(cells, detail.items);
    const outdoor = geometry.floors.includes(0) ? 0 : (geometry.floors[0] ?? 0);
    impact = (
      <>
        <section className="print-block" aria-label="KPIs per cluster">
          <h2>Predicted KPIs per cluster</h2>
          <p className="muted" style={{ margin: "0 0 6px" }}>
            {shown.purpose === "preview" ? "Preview" : "Submission"} simulation of revision {shown.revision}
            {shown.finishedAt ? `, finished ${utcDateTime(shown.finishedAt)}` : ""}
            {shown.revision !== detail.revision ? " — the request has changed since; this is not its current impact" : ""}.
          </p>
          <h3>Coverage, overlap and interference ratios</h3>
          <KpiTable report={summary} initialGroup="ratios" />
        </section>
        <section className="print-block print-wide">
          <h3>Best-server RSRP</h3>
          <KpiTable report={summary} initialGroup="rsrp" />
        </section>
        <section className="print-block print-wide">
          <h3>SINR</h3>
          <KpiTable report={summary} initialGroup="sinr" />
        </section>
        <section className="print-block print-break" aria-label="KPI change per cluster">
          <h2>KPI change per cluster</h2>
          <DeltaChart report={summary} height={260} />
        </section>
        <section className="print-block" aria-label="Distributions">
          <h2>Distributions before and after</h2>
          <CdfChart title="Best-server RSRP" unit="dBm" before={cdfs.bestRsrp.before} after={cdfs.bestRsrp.after} height={220} />
          <CdfChart
            title="SINR"
            unit="dB"
            before={cdfs.sinr.before}
            after={cdfs.sinr.after}
            height={220}
            note="SINR per resource element: the noise is that of one subcarrier, like the RSRP it is computed from."
          />
        </section>
        <section className="print-block print-break" aria-label="Map">
          <h2>Best-server RSRP after the change, outdoor</h2>
          <GridMap
            rasterUrl={simulationRasterUrl(shown.id)}
            floors={[outdoor]}
            sites={sites}
            initialLayer="rsrp"
            initialStage="after"
            height={560}
            rsrpDomainDbm="data"
            printMode
          />
          <p className="muted" style={{ margin: "4px 0 0" }}>
            Changed cells are drawn larger, in the accent colour. Local metres, north up.
          </p>
        </section>
        <section aria-label="Worst grids">
          <h2>
            Grids that get worse{" "}
            <span className="muted" style={{ fontWeight: 400, fontSize: 12 }}>
              {worst.grids.length > PRINTED_WORST_GRIDS || worst.total > PRINTED_WORST_GRIDS
                ? `the first ${Math.min(PRINTED_WORST_GRIDS, worst.grids.length)} of ${worst.total}, most severe first`
                : `${worst.total}, most severe first`}
            </span>
          </h2>
          <PrintWorstGrids grids={worst.grids.slice(0, PRINTED_WORST_GRIDS)} clusterNames={clusterNames} />
        </section>
      </>
    );
  }

  return (
    <main className="print-report" data-testid="impact-report">
      <header className="print-block">
        <p className="muted" style={{ margin: 0 }}>
          Beamgate impact report · printed {utcDateTime(new Date().toISOString())}
        </p>
        <h1>
          CR-{detail.number} · {detail.title}
        </h1>
        <dl className="print-meta">
          <dt>State</dt>
          <dd data-testid="report-state">{STATE_LABELS[detail.state] ?? detail.state}</dd>
          <dt>Network</dt>
          <dd>
            {network?.name ?? detail.networkId}, built on version {detail.baseVersion}, revision {detail.revision}
          </dd>
          <dt>Author</dt>
          <dd>{detail.authorName}</dd>
          <dt>Approver</dt>
          <dd>{detail.approverName ? `${detail.approverName}${detail.decidedAt ? `, ${utcDateTime(detail.decidedAt)}` : ""}` : "not decided yet"}</dd>
          {detail.windowStart && (
            <>
              <dt>Change window</dt>
              <dd>
                {utcDateTime(detail.windowStart)} – {detail.windowEnd ? utcDateTime(detail.windowEnd) : "open"}
              </dd>
            </>
          )}
        </dl>
        <h3>Reason</h3>
        <p style={{ whiteSpace: "pre-wrap", margin: 0 }}>{detail.reason}</p>
        <div className="caution" role="note" data-testid="report-caution">
          <strong>Caution.</strong> {PRINT_CAUTION}
        </div>
      </header>
      <section className="print-block" aria-label="Parameter changes">
        <h2>Parameter changes</h2>
        <table className="data" data-testid="report-items">
          <thead>
            <tr>
              <th>Cell</th>
              <th>Parameter</th>
              <th className="num">Old</th>
              <th className="num">New</th>
            </tr>
          </thead>
          <tbody>
            {detail.items.map((item) => (
              <tr key={`${item.cellId}-${item.parameter}`}>
                <td>{item.cellId}</td>
                <td>{PARAMETER_LABELS[item.parameter]}</td>
                <td className="num">{String(item.oldValue)}</td>
                <td className="num">
                  <strong>{String(item.newValue)}</strong>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      {impact}
    </main>
  );
}
