"use client";
// One cell parameter through time from the temporal record: a step line for numbers (each value holds until
// the next one starts), a timeline list for text values such as beam sets.
import { useEffect, useState } from "react";
import { CartesianGrid, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis, type TooltipContentProps } from "recharts";
import { utcDate, utcDateTime } from "./format";
import type { ParameterPointDto } from "./types";

export interface ParameterStepChartProps {
  points: ParameterPointDto[];
  /** e.g. "Electrical tilt". */
  label: string;
  /** e.g. "°", "dBm"; shown after numbers. */
  unit?: string;
  /** CSS pixels (default 220). */
  height?: number;
}

const DAY_MS = 86_400_000;

interface Step {
  t: number;
  value: number;
  point: ParameterPointDto;
}

function requestText(point: ParameterPointDto): string {
  if (point.requestNumber === null) return "initial value, no request";
  return `request #${point.requestNumber}${point.requestTitle ? ` — ${point.requestTitle}` : ""}`;
}

function period(point: ParameterPointDto): string {
  return `${utcDateTime(point.validFrom)} → ${point.validTo ? utcDateTime(point.validTo) : "now"}`;
}

function StepTooltip({ active, payload, unit }: TooltipContentProps<number, string> & { unit: string }) {
  if (!active || !payload?.length) return null;
  const { point, value } = payload[0].payload as Step;
  return (
    <div className="chart-tooltip">
      <strong>
        {value}
        {unit && ` ${unit}`}
      </strong>
      <div>{period(point)}</div>
      <div>{requestText(point)}</div>
    </div>
  );
}

export function ParameterStepChart({ points, label, unit = "", height = 220 }: ParameterStepChartProps) {
  // "now" only after mounting, so server and client render the same markup
  const [now, setNow] = useState<number | null>(null);
  useEffect(() => setNow(Date.now()), []);

  const sorted = [...points].sort((a, b) => Date.parse(a.validFrom) - Date.parse(b.validFrom));
  if (sorted.length === 0) return <p className="muted">No recorded values of {label.toLowerCase()}.</p>;

  if (!sorted.every((p) => typeof p.value === "number")) {
    return (
      <div className="chart">
        <div className="chart-title">{label} through time</div>
        <ol className="timeline" data-testid="parameter-timeline">
          {sorted.map((p) => (
            <li key={p.validFrom}>
              <span className="timeline-when">{period(p)}</span>
              <code>{String(p.value)}</code>
              <span className="muted">{requestText(p)}</span>
            </li>
          ))}
        </ol>
      </div>
    );
  }

  const steps: Step[] = sorted.map((point) => ({ t: Date.parse(point.validFrom), value: point.value as number, point }));
  // the last value holds until its validTo, or until now: repeat it there so the final step has a length
  const last = sorted[sorted.length - 1];
  const end = last.validTo ? Date.parse(last.validTo) : (now ?? steps[steps.length - 1].t);
  if (end > steps[steps.length - 1].t) steps.push({ t: end, value: last.value as number, point: last });

  // a history shorter than two days would print the same date under every tick: show the time too
  const spanMs = steps[steps.length - 1].t - steps[0].t;
  return (
    <figure className="chart" data-testid="parameter-step-chart">
      <figcaption className="chart-title">
        {label} through time{unit && `, ${unit}`}
      </figcaption>
      <ResponsiveContainer width="100%" height={height}>
        <LineChart data={steps} margin={{ top: 8, right: 16, bottom: 8, left: 8 }}>
          <CartesianGrid strokeDasharray="3 3" stroke="#d9ddd6" />
          <XAxis type="number" dataKey="t" scale="time" domain={["dataMin", "dataMax"]} tick={{ fontSize: 12 }} tickFormatter={(t: number) => (spanMs < 2 * DAY_MS ? utcDateTime(new Date(t).toISOString()).slice(5, 16) : utcDate(t))} />
          <YAxis dataKey="value" domain={["auto", "auto"]} tick={{ fontSize: 12 }} width={48} />
          <Tooltip content={(props) => <StepTooltip {...(props as TooltipContentProps<number, string>)} unit={unit} />} />
          <Line type="stepAfter" dataKey="value" name={label} stroke="#0e6b6b" strokeWidth={2} dot={{ r: 3 }} isAnimationActive={false} />
        </LineChart>
      </ResponsiveContainer>
    </figure>
  );
}
