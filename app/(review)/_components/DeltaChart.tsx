"use client";
// The three ratio KPIs' changes per cluster, in percentage points: bars above zero are gains (all three are
// "higher is better"), below zero losses.
import { Bar, BarChart, CartesianGrid, Legend, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis, type TooltipContentProps } from "recharts";
import { DELTA_CHART_CAPTION } from "./chartText";
import { signed } from "./format";
import type { ImpactSummaryDto } from "./types";

// Three distinguishable hues of Tableau 10 (blue, orange, purple), none of them the better/worse colours,
// because here a bar's sign, not its colour, says better or worse.
const SERIES = [
  { key: "coverage", label: "Coverage", colour: "#4e79a7" },
  { key: "overlap", label: "Overlap", colour: "#f28e2c" },
  { key: "interference", label: "Interference", colour: "#b07aa1" },
] as const;

type Datum = { name: string; coverage: number | null; overlap: number | null; interference: number | null };

const pp = (ratioDelta: number | null) => (ratioDelta === null ? null : ratioDelta * 100);

function DeltaTooltip({ active, payload, label }: TooltipContentProps<number, string>) {
  if (!active || !payload?.length) return null;
  return (
    <div className="chart-tooltip">
      <strong>{label}</strong>
      {payload.map((item) => (
        <div key={String(item.dataKey)}>
          <span className="gridmap-swatch" style={{ background: item.color }} aria-hidden /> {item.name}:{" "}
          {typeof item.value === "number" ? `${item.value > 0 ? "▲" : item.value < 0 ? "▼" : "="} ${signed(item.value, 2, "pp")}` : "–"}
        </div>
      ))}
    </div>
  );
}

export interface DeltaChartProps {
  report: Pick<ImpactSummaryDto, "network" | "clusters">;
  /** Add a bar group for the whole network first (default true). */
  includeNetwork?: boolean;
  networkLabel?: string;
  /** CSS pixels (default 280). */
  height?: number;
}

export function DeltaChart({ report, includeNetwork = true, networkLabel = "Whole network", height = 280 }: DeltaChartProps) {
  const data: Datum[] = [
    ...(includeNetwork ? [{ name: networkLabel, comparison: report.network }] : []),
    ...report.clusters.map((c) => ({ name: c.clusterName, comparison: c })),
  ].map(({ name, comparison }) => ({
    name,
    coverage: pp(comparison.delta.coverageRatio),
    overlap: pp(comparison.delta.overlapRatio),
    interference: pp(comparison.delta.interferenceRatio),
  }));
  return (
    <figure className="chart" data-testid="delta-chart">
      <figcaption className="chart-title">{DELTA_CHART_CAPTION}</figcaption>
      <ResponsiveContainer width="100%" height={height}>
        <BarChart data={data} margin={{ top: 8, right: 16, bottom: 8, left: 8 }}>
          <CartesianGrid strokeDasharray="3 3" stroke="#d9ddd6" vertical={false} />
          <XAxis dataKey="name" tick={{ fontSize: 12 }} interval={0} />
          <YAxis tick={{ fontSize: 12 }} tickFormatter={(v: number) => signed(v, 1)} label={{ value: "Δ pp", angle: -90, position: "insideLeft", fontSize: 12 }} />
          <ReferenceLine y={0} stroke="#1c2830" />
          <Tooltip content={(props) => <DeltaTooltip {...(props as TooltipContentProps<number, string>)} />} />
          <Legend wrapperStyle={{ fontSize: 12 }} />
          {SERIES.map((s) => (
            <Bar key={s.key} dataKey={s.key} name={s.label} fill={s.colour} isAnimationActive={false} />
          ))}
        </BarChart>
      </ResponsiveContainer>
    </figure>
  );
}
