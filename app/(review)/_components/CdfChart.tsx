"use client";
// Before and after distributions of one per-grid quantity as cumulative curves: a curve further right is better.
import { CartesianGrid, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis, type TooltipContentProps } from "recharts";
import type { CdfPoint } from "@/lib/io/cdf";
import { cdfChartCaption } from "./chartText";
import { fixed } from "./format";

export interface CdfChartProps {
  /** e.g. "Best RSRP". */
  title: string;
  unit: "dBm" | "dB";
  before: CdfPoint[];
  /** null or omitted: a single curve (no change to compare). */
  after?: CdfPoint[] | null;
  /** Shown under the chart, e.g. "SINR per resource element: noise of one subcarrier". */
  note?: string;
  beforeLabel?: string;
  afterLabel?: string;
  /** CSS pixels (default 260). */
  height?: number;
}

function CdfTooltip({ active, payload, unit }: TooltipContentProps<number, string> & { unit: string }) {
  if (!active || !payload?.length) return null;
  return (
    <div className="chart-tooltip">
      {payload.map((item) => {
        const point = item.payload as CdfPoint;
        return (
          <div key={String(item.name)}>
            <span className="gridmap-swatch" style={{ background: item.color }} aria-hidden /> {item.name}: {fixed(point.fraction * 100, 0)}% of grids ≤{" "}
            {fixed(point.value, 1, unit)}
          </div>
        );
      })}
    </div>
  );
}

export function CdfChart({ title, unit, before, after = null, note, beforeLabel = "Before", afterLabel = "After", height = 260 }: CdfChartProps) {
  const empty = before.length === 0 && (after?.length ?? 0) === 0;
  return (
    <figure className="chart" data-testid="cdf-chart">
      <figcaption className="chart-title">{cdfChartCaption(title, unit)}</figcaption>
      {empty ? (
        <p className="muted">No grid has a value.</p>
      ) : (
        <ResponsiveContainer width="100%" height={height}>
          <LineChart margin={{ top: 8, right: 16, bottom: 20, left: 8 }}>
            <CartesianGrid strokeDasharray="3 3" stroke="#d9ddd6" />
            <XAxis
              type="number"
              dataKey="value"
              domain={["dataMin", "dataMax"]}
              tick={{ fontSize: 12 }}
              tickFormatter={(v: number) => fixed(v, 0)}
              label={{ value: `${title}, ${unit}`, position: "insideBottom", offset: -12, fontSize: 12 }}
            />
            <YAxis
              type="number"
              dataKey="fraction"
              domain={[0, 1]}
              ticks={[0, 0.25, 0.5, 0.75, 1]}
              tick={{ fontSize: 12 }}
              tickFormatter={(v: number) => `${Math.round(v * 100)}%`}
              label={{ value: "grids ≤ value", angle: -90, position: "insideLeft", fontSize: 12 }}
            />
            <Tooltip content={(props) => <CdfTooltip {...(props as TooltipContentProps<number, string>)} unit={unit} />} />
            <Legend verticalAlign="top" wrapperStyle={{ fontSize: 12 }} />
            <Line data={before} dataKey="fraction" name={beforeLabel} stroke="#5d6b74" strokeDasharray="5 3" strokeWidth={2} dot={false} isAnimationActive={false} />
            {after && <Line data={after} dataKey="fraction" name={afterLabel} stroke="#0e6b6b" strokeWidth={2} dot={false} isAnimationActive={false} />}
          </LineChart>
        </ResponsiveContainer>
      )}
      {note && <p className="muted chart-note">{note}</p>}
    </figure>
  );
}
