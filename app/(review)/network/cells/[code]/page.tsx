import Link from "next/link";
import { notFound } from "next/navigation";
import { runtime } from "@/app/_lib/runtime";
import { listCells, listHardware, listNetworks } from "@/lib/db/networks/data";
import { cellHistory, type CellHistory } from "@/lib/db/history";
import { isDomainError } from "@/lib/changes/errors";
import { CELL_PARAMETERS } from "@/lib/radio/scenario";
import { pageActor } from "../../../_components/guard";
import { Forbidden } from "../../../_components/Forbidden";
import { ParameterStepChart } from "../../../_components/ParameterStepChart";
import { fixed, utcDateTime } from "../../../_components/format";
import type { ParameterPointDto } from "../../../_components/types";
import { PARAMETER_DISPLAY, parameterText } from "../../_components/parameters";

export const dynamic = "force-dynamic";

/** "2026-03-14 09:05": the table's heading says UTC. */
const shortTime = (iso: string) => utcDateTime(iso).replace(" UTC", "");

/** toVersion is the first version without the value, so the span ends one before it. */
function versionSpan(from: number, to: number | null): string {
  if (to === null) return `${from}–now`;
  return to - 1 > from ? `${from}–${to - 1}` : String(from);
}

export default async function CellHistoryPage({ params }: { params: Promise<{ code: string }> }) {
  const gate = await pageActor("network.read");
  if (!gate.ok) return <Forbidden permission={gate.permission} />;
  const code = decodeURIComponent((await params).code);
  const { db } = await runtime();
  const [network] = await listNetworks(db.prisma);
  if (!network) notFound();
  const cell = (await listCells(db.prisma, network.id)).find((c) => c.code === code);
  if (!cell) notFound();
  let history: CellHistory;
  try {
    history = await cellHistory(db.prisma, network.id, code);
  } catch (error) {
    if (isDomainError(error) && error.code === "not_found") notFound();
    throw error;
  }
  const { beamSets } = await listHardware(db.prisma, network.id);
  const beamSetNames = Object.fromEntries(beamSets.map((b) => [b.code, b.name]));
  const changes = CELL_PARAMETERS.reduce((n, p) => n + Math.max(0, history[p].length - 1), 0);

  return (
    <main>
      <p className="crumbs">
        <Link href="/network">{network.name}</Link> › cell
      </p>
      <h1>Cell {cell.code}</h1>
      <p className="subtitle">
        {cell.siteName} ({cell.siteCode}) · {changes === 0 ? "no change recorded since the network was loaded" : `${changes} recorded change${changes === 1 ? "" : "s"}`}
      </p>

      <section className="panel" aria-labelledby="fixed-heading">
        <h2 id="fixed-heading" className="panel-title">
          Fixed attributes
        </h2>
        <p className="muted panel-note">Not changed by requests; they come with the network import.</p>
        <dl className="kv kv-columns" data-testid="cell-attributes">
          <dt>Site</dt>
          <dd>
            {cell.siteName} ({cell.siteCode})
          </dd>
          <dt>Site position</dt>
          <dd>
            x {fixed(cell.x, 1)} m, y {fixed(cell.y, 1)} m (local)
          </dd>
          <dt>Antenna model</dt>
          <dd>{cell.antennaModel}</dd>
          <dt>Antenna height</dt>
          <dd>{fixed(cell.antennaHeightM, 1, "m")} above ground</dd>
          <dt>Carrier</dt>
          <dd>
            {cell.frequencyMHz} MHz, {cell.bandwidthMHz} MHz wide
          </dd>
          <dt>Subcarrier spacing</dt>
          <dd>{cell.subcarrierSpacingKHz} kHz</dd>
        </dl>
      </section>

      <h2>Parameters through time</h2>
      <p className="muted">Each value holds from its start until the next one; times are UTC. Point at a step for the request behind it.</p>
      {CELL_PARAMETERS.map((parameter) => {
        const { label, unit } = PARAMETER_DISPLAY[parameter];
        const entries = history[parameter];
        const points: ParameterPointDto[] = entries.map((e) => ({
          validFrom: e.validFrom,
          validTo: e.validTo,
          value: parameter === "beamSetId" ? (beamSetNames[String(e.value)] ?? e.value) : e.value,
          requestNumber: e.requestNumber,
          requestTitle: e.requestTitle,
        }));
        const current = entries.find((e) => e.validTo === null);
        return (
          <section key={parameter} className="panel parameter-panel" data-testid={`parameter-${parameter}`} aria-label={label}>
            <div className="parameter-head">
              <h3>{label}</h3>
              <span className="muted">now {current ? parameterText(parameter, current.value, beamSetNames) : "–"}</span>
            </div>
            <div className="parameter-body">
              <ParameterStepChart points={points} label={label} unit={unit} height={180} />
              <div className="parameter-table">
                <table className="data">
                  <thead>
                    <tr>
                      <th className="num">Value</th>
                      <th>From (UTC)</th>
                      <th>Until</th>
                      <th>Set by</th>
                    </tr>
                  </thead>
                  <tbody>
                    {[...entries].reverse().map((e) => (
                      <tr key={`${e.validFrom}-${e.fromVersion}`}>
                        <td className="num">{parameterText(parameter, e.value, beamSetNames)}</td>
                        <td>
                          {shortTime(e.validFrom)}
                          <div className="muted cell-sub">version {versionSpan(e.fromVersion, e.toVersion)}</div>
                        </td>
                        <td>{e.validTo ? shortTime(e.validTo) : <span className="badge info">current</span>}</td>
                        <td className="wrap">
                          {e.changeRequestId && e.requestNumber !== null ? (
                            <Link href={`/requests/${e.changeRequestId}`}>
                              #{e.requestNumber}
                              {e.requestTitle ? ` ${e.requestTitle}` : ""}
                            </Link>
                          ) : (
                            <span className="muted">initial value, no request</span>
                          )}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            </div>
          </section>
        );
      })}
    </main>
  );
}
