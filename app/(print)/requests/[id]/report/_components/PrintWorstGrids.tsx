"use client";
// The worst grids as a still table for print: the first rows of the engine's ranking, no sorting or paging.
import { REASON_LABELS } from "@/app/(review)/_components/WorstGridsTable";
import type { WorstGridDto } from "@/app/(review)/_components/types";
import { fixed, floorLabel } from "@/app/(review)/_components/format";

const db = (v: number | null, unit: string) => (v === null ? "no signal" : fixed(v, 1, unit));

export function PrintWorstGrids({ grids, clusterNames }: { grids: WorstGridDto[]; clusterNames: Record<string, string> }) {
  return (
    <table className="data print-worst" data-testid="print-worst-grids">
      <thead>
        <tr>
          <th className="num">#</th>
          <th className="num">x, y (m)</th>
          <th>Floor</th>
          <th>Cluster</th>
          <th>Server</th>
          <th className="num">Best RSRP</th>
          <th className="num">SINR</th>
          <th>Why</th>
        </tr>
      </thead>
      <tbody>
        {grids.map((g, i) => (
          <tr key={g.gridIndex}>
            <td className="num">{i + 1}</td>
            <td className="num">
              {g.x.toFixed(0)}, {g.y.toFixed(0)}
            </td>
            <td>{floorLabel(g.floor)}</td>
            <td>{g.clusterId ? (clusterNames[g.clusterId] ?? g.clusterId) : "—"}</td>
            <td>
              {g.servingCellBefore ?? "none"} → {g.servingCellAfter ?? "none"}
            </td>
            <td className="num">
              {db(g.bestRsrpBeforeDbm, "")} → {db(g.bestRsrpAfterDbm, "dBm")}
            </td>
            <td className="num">
              {db(g.sinrBeforeDb, "")} → {db(g.sinrAfterDb, "dB")}
            </td>
            <td className="wrap">{g.reasons.map((r) => REASON_LABELS[r].label).join(", ")}</td>
          </tr>
        ))}
        {grids.length === 0 && (
          <tr>
            <td colSpan={8} className="muted">
              No grid gets worse.
            </td>
          </tr>
        )}
      </tbody>
    </table>
  );
}
