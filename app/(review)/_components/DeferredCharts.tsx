"use client";
// The impact page's charts, started after its map has drawn. The chart library is the page's largest script
// (parsing it and drawing four charts took about as long as everything else on the page together); loaded
// with the page, it held the map back. Until a chart is ready its box keeps the chart's caption and height, so
// nothing moves when it appears.
import { lazy, Suspense, useEffect, useState } from "react";
import type { CdfChartProps } from "./CdfChart";
import type { DeltaChartProps } from "./DeltaChart";
import { DELTA_CHART_CAPTION, cdfChartCaption } from "./chartText";
import { afterMapDrawn } from "./mapDrawn";

const DeltaChart = lazy(() => import("./DeltaChart").then((m) => ({ default: m.DeltaChart })));
const CdfChart = lazy(() => import("./CdfChart").then((m) => ({ default: m.CdfChart })));

/** Start anyway after this long, e.g. when the map could not load its layer. */
const LONGEST_WAIT_MS = 3000;

function useAfterMap(): boolean {
  const [ready, setReady] = useState(false);
  useEffect(() => {
    const start = () => setReady(true);
    const cancel = afterMapDrawn(start);
    const timer = setTimeout(start, LONGEST_WAIT_MS);
    return () => {
      cancel();
      clearTimeout(timer);
    };
  }, []);
  return ready;
}

function ChartPlaceholder({ caption, height, note, testId }: { caption: string; height: number; note?: string; testId: string }) {
  return (
    <figure className="chart" data-testid={testId} aria-busy="true">
      <figcaption className="chart-title">{caption}</figcaption>
      <div className="chart-placeholder" style={{ height }}>
        <span className="muted">Drawing the chart…</span>
      </div>
      {note && <p className="muted chart-note">{note}</p>}
    </figure>
  );
}

export function DeferredDeltaChart(props: DeltaChartProps) {
  const ready = useAfterMap();
  const placeholder = <ChartPlaceholder caption={DELTA_CHART_CAPTION} height={props.height ?? 280} testId="delta-chart" />;
  return ready ? (
    <Suspense fallback={placeholder}>
      <DeltaChart {...props} />
    </Suspense>
  ) : (
    placeholder
  );
}

export function DeferredCdfChart(props: CdfChartProps) {
  const ready = useAfterMap();
  const placeholder = <ChartPlaceholder caption={cdfChartCaption(props.title, props.unit)} height={props.height ?? 260} note={props.note} testId="cdf-chart" />;
  return ready ? (
    <Suspense fallback={placeholder}>
      <CdfChart {...props} />
    </Suspense>
  ) : (
    placeholder
  );
}
