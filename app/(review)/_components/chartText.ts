// Chart captions, in a module of their own so that a chart's placeholder can show its caption without loading the
// chart library.
export const DELTA_CHART_CAPTION = "Change of coverage, overlap and interference ratios, percentage points (after − before)";

export function cdfChartCaption(title: string, unit: string): string {
  return `${title}: share of grids at or below a value (${unit})`;
}
