// Points of an empirical cumulative distribution for the CDF charts, from a centi-dB layer (lib/io/mapRaster).
//
// Point k of n has fraction F_k = k / (n − 1) and value = the F_k-quantile of the values present, by linear
// interpolation between order statistics (R-7, the same definition as the KPI percentiles in lib/radio/kpi),
// so the first point is the minimum and the last the maximum. Values in dB (or dBm), fraction in 0..1.
import { MAP_RASTER_NO_DATA } from "./mapRaster";

export interface CdfPoint {
  /** dB or dBm. */
  value: number;
  /** Share of the values ≤ value, 0..1. */
  fraction: number;
}

export function cdfPoints(values: Int16Array, points = 101, noData = MAP_RASTER_NO_DATA): CdfPoint[] {
  if (!Number.isInteger(points) || points < 2) throw new RangeError(`cdfPoints: points must be an integer ≥ 2, got ${points}`);
  // ---- keep the values present, sorted (typed-array sort is numeric)
  let n = 0;
  for (let i = 0; i < values.length; i++) if (values[i] !== noData) n++;
  if (n === 0) return [];
  const sorted = new Int16Array(n);
  for (let i = 0, j = 0; i < values.length; i++) if (values[i] !== noData) sorted[j++] = values[i];
  sorted.sort();
  // ---- R-7 quantile at each fraction: h = (n − 1)·F, value = x[⌊h⌋] + (h − ⌊h⌋)·(x[⌊h⌋ + 1] − x[⌊h⌋])
  const out: CdfPoint[] = new Array(points);
  for (let k = 0; k < points; k++) {
    const fraction = k / (points - 1);
    const h = (n - 1) * fraction;
    const lo = Math.floor(h);
    const hi = Math.min(n - 1, lo + 1);
    const centi = sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
    out[k] = { value: centi / 100, fraction };
  }
  return out;
}
