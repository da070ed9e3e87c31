"use client";
// KPIs before and after a change, per cluster and for the whole network. Every KPI here is "higher is better"
// (DESIGN.md §2), so a positive delta is better; the direction is shown by a symbol as well as by colour.
import { Fragment, useState } from "react";
import { DASH, TREND_SYMBOL, fixed, percent, signed, trendOf } from "./format";
import type { ImpactSummaryDto, KpiDeltaDto, KpiSummaryDto } from "./types";

type Unit = "ratio" | "dBm" | "dB";

interface Metric {
  label: string;
  unit: Unit;
  value: (s: KpiSummaryDto) => number | null;
  delta: (d: KpiDeltaDto) => number | null;
}

export type KpiGroup = "ratios" | "rsrp" | "sinr" | "weighted";

const GROUPS: Record<KpiGroup, { label: string; metrics: Metric[] }> = {
  ratios: {
    label: "Ratios",
    metrics: [
      { label: "Coverage", unit: "ratio", value: (s) => s.coverageRatio, delta: (d) => d.coverageRatio },
      { label: "Overlap", unit: "ratio", value: (s) => s.overlapRatio, delta: (d) => d.overlapRatio },
      { label: "Interference", unit: "ratio", value: (s) => s.interferenceRatio, delta: (d) => d.interferenceRatio },
    ],
  },
  rsrp: {
    label: "Best RSRP",
    metrics: [
      { label: "Mean dBm", unit: "dBm", value: (s) => s.meanBestRsrpDbm, delta: (d) => d.meanBestRsrpDbm },
      { label: "5th pct dBm", unit: "dBm", value: (s) => s.p5BestRsrpDbm, delta: (d) => d.p5BestRsrpDbm },
      { label: "Median dBm", unit: "dBm", value: (s) => s.p50BestRsrpDbm, delta: (d) => d.p50BestRsrpDbm },
      { label: "95th pct dBm", unit: "dBm", value: (s) => s.p95BestRsrpDbm, delta: (d) => d.p95BestRsrpDbm },
    ],
  },
  sinr: {
    label: "SINR",
    metrics: [
      { label: "Mean dB", unit: "dB", value: (s) => s.meanSinrDb, delta: (d) => d.meanSinrDb },
      { label: "5th pct dB", unit: "dB", value: (s) => s.p5SinrDb, delta: (d) => d.p5SinrDb },
      { label: "Median dB", unit: "dB", value: (s) => s.p50SinrDb, delta: (d) => d.p50SinrDb },
      { label: "95th pct dB", unit: "dB", value: (s) => s.p95SinrDb, delta: (d) => d.p95SinrDb },
    ],
  },
  weighted: {
    label: "Traffic-weighted",
    metrics: [
      { label: "Coverage", unit: "ratio", value: (s) => s.weighted?.coverageRatio ?? null, delta: (d) => d.weighted?.coverageRatio ?? null },
      { label: "Overlap", unit: "ratio", value: (s) => s.weighted?.overlapRatio ?? null, delta: (d) => d.weighted?.overlapRatio ?? null },
      { label: "Interference", unit: "ratio", value: (s) => s.weighted?.interferenceRatio ?? null, delta: (d) => d.weighted?.interferenceRatio ?? null },
      { label: "Mean RSRP dBm", unit: "dBm", value: (s) => s.weighted?.meanBestRsrpDbm ?? null, delta: (d) => d.weighted?.meanBestRsrpDbm ?? null },
      { label: "Mean SINR dB", unit: "dB", value: (s) => s.weighted?.meanSinrDb ?? null, delta: (d) => d.weighted?.meanSinrDb ?? null },
    ],
  },
};

const VALUE_DIGITS = 1;
const DELTA_DIGITS = 2;

function formatValue(unit: Unit, v: number | null): string {
  return unit === "ratio" ? percent(v, VALUE_DIGITS) : fixed(v, VALUE_DIGITS);
}

/** The delta cell: ratios in percentage points, dBm and dB differences in dB. */
function DeltaCell({ unit, delta }: { unit: Unit; delta: number | null }) {
  const shown = unit === "ratio" && delta !== null ? delta * 100 : delta;
  const trend = trendOf(shown, DELTA_DIGITS);
  if (trend === null) return <td className="num muted">{DASH}</td>;
  const words = { better: "better", worse: "worse", same: "unchanged" }[trend];
  return (
    <td className={`num kpi-delta ${trend === "same" ? "muted" : trend}`} title={words}>
      <span aria-hidden>{TREND_SYMBOL[trend]} </span>
      {signed(shown, DELTA_DIGITS, unit === "ratio" ? "pp" : "dB")}
      <span className="visually-hidden"> ({words})</span>
    </td>
  );
}

export interface KpiTableProps {
  report: Pick<ImpactSummaryDto, "network" | "clusters">;
  /** Which KPI group to show first (default "ratios"). */
  initialGroup?: KpiGroup;
  /** Label of the network row (default "Whole network"). */
  networkLabel?: string;
}

export function KpiTable({ report, initialGroup = "ratios", networkLabel = "Whole network" }: KpiTableProps) {
  const hasWeighted = report.network.before.weighted !== null && report.network.after.weighted !== null;
  const available = (Object.keys(GROUPS) as KpiGroup[]).filter((g) => g !== "weighted" || hasWeighted);
  const [group, setGroup] = useState<KpiGroup>(available.includes(initialGroup) ? initialGroup : "ratios");
  const { metrics } = GROUPS[group];
  const rows = [
    { id: "network", name: networkLabel, comparison: report.network, isNetwork: true },
    ...report.clusters.map((c) => ({ id: c.clusterId, name: c.clusterName, comparison: c, isNetwork: false })),
  ];
  return (
    <div className="kpi-table">
      <div className="tools">
        <div className="segmented" role="group" aria-label="KPI group">
          {available.map((g) => (
            <button key={g} type="button" aria-pressed={group === g} onClick={() => setGroup(g)}>
              {GROUPS[g].label}
            </button>
          ))}
        </div>
        <span className="muted">
          Higher is better for every KPI; ▲ better, ▼ worse.{group === "ratios" || group === "weighted" ? " Changes in percentage points (pp)." : ""}
        </span>
      </div>
      <div style={{ overflowX: "auto" }}>
        <table className="data" data-testid="kpi-table">
          <thead>
            <tr>
              <th rowSpan={2}>Area</th>
              <th rowSpan={2} className="num">Grids</th>
              {metrics.map((m) => (
                <th key={m.label} colSpan={3} className="group">{m.label}</th>
              ))}
            </tr>
            <tr>
              {metrics.map((m) => (
                <Fragment key={m.label}>
                  <th className="num">Before</th>
                  <th className="num">After</th>
                  <th className="num">Change</th>
                </Fragment>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((row) => (
              <tr key={row.id} className={row.isNetwork ? "kpi-network-row" : undefined}>
                <td>{row.name}</td>
                <td className="num">{row.comparison.before.gridCount.toLocaleString("en-US")}</td>
                {metrics.map((m) => (
                  <Fragment key={m.label}>
                    <td className="num">{formatValue(m.unit, m.value(row.comparison.before))}</td>
                    <td className="num">{formatValue(m.unit, m.value(row.comparison.after))}</td>
                    <DeltaCell unit={m.unit} delta={m.delta(row.comparison.delta)} />
                  </Fragment>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {group === "sinr" && <p className="muted chart-note">SINR per resource element: noise of one subcarrier.</p>}
    </div>
  );
}
