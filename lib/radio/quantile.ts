// Exact R-7 quantiles of several groups at once, without sorting whole arrays: a histogram of fixed bins locates
// the bin of each wanted order statistic, then only the values of those bins are gathered and sorted.
//
// The bins are fixed (QUANTILE_BINS_PER_DB per dB over [−256, +256) dB, values outside in the end bins), not
// fitted to the data, so histograms of parts of the grid (one per thread) add up to the histogram of the whole:
// the per-grid pass counts its own grids (kpi.ts), the last step reads the values once.

/**
 * Bins per dB. 1/8 dB bins keep the gathered bins small for any realistic spread of values (a few hundred values
 * for 300 000 grids over 60 dB) and a row small enough (16 KB) for the counting to stay in the cache.
 */
export const QUANTILE_BINS_PER_DB = 8;
const LOWEST_DB = -256;
/** Bins per histogram row. */
export const QUANTILE_BINS = 512 * QUANTILE_BINS_PER_DB;

// The bin of a finite value v (monotonic in v): t = (v − LOWEST_DB) · QUANTILE_BINS_PER_DB, clamped to the bins
// before the truncation to a whole number (which would wrap far-off values around). Written out where used.

/** A histogram of `groupCount + 1` rows: row k counts the values of group k, the last row those of no group (−1). */
export function createQuantileHistogram(groupCount: number): Int32Array {
  return new Int32Array((groupCount + 1) * QUANTILE_BINS);
}

/** Counts values[from … to − 1] (finite ones only) into `histogram`, by group[i] (−1: none). */
export function countInto(histogram: Int32Array, values: Float32Array, group: Int32Array, groupCount: number, from = 0, to = values.length): void {
  const bins = QUANTILE_BINS, low = LOWEST_DB, perDb = QUANTILE_BINS_PER_DB;
  for (let i = from; i < to; i++) {
    const v = values[i];
    if (!(v > -Infinity && v < Infinity)) continue;
    const t = (v - low) * perDb;
    const b = t < 0 ? 0 : t >= bins ? bins - 1 : t | 0; // the bin of v
    const k = group[i];
    histogram[(k >= 0 ? k : groupCount) * bins + b]++;
  }
}

/**
 * R-7 quantiles (linear interpolation between order statistics, as numpy's default and d3.quantile) of the finite
 * values, from their histogram (countInto over all of them). result[0] is the network (all values), result[k + 1]
 * group k; one entry per probability, null for an empty group. Exact: the values themselves are read back.
 */
export function quantilesFromHistogram(values: Float32Array, group: Int32Array, groupCount: number, histogram: Int32Array, probabilities: readonly number[]): (number | null)[][] {
  const B = QUANTILE_BINS, G = groupCount + 1; // result rows: 0 = network, k + 1 = group k
  // ---- per result row: counts per bin (the network row adds up every histogram row)
  const rowCounts = (row: number): Int32Array => {
    if (row > 0) return histogram.subarray((row - 1) * B, row * B);
    const all = new Int32Array(B);
    for (let r = 0; r <= groupCount; r++) for (let b = 0; b < B; b++) all[b] += histogram[r * B + b];
    return all;
  };
  // ---- wanted order statistics → (row, bin, rank inside the bin)
  interface Wanted { row: number; rank: number; bin: number; within: number }
  const wanted: Wanted[] = [];
  const totals: number[] = [];
  const slotOf = new Int32Array(G * B).fill(-1);
  const slotSizes: number[] = [];
  for (let row = 0; row < G; row++) {
    const counts = rowCounts(row);
    let total = 0;
    for (let b = 0; b < B; b++) total += counts[b];
    totals.push(total);
    if (total === 0) continue;
    for (const p of probabilities) {
      const h = (total - 1) * p;
      const first = Math.floor(h);
      for (const rank of first + 1 < total && h !== first ? [first, first + 1] : [first]) {
        let cum = 0, b = 0;
        while (cum + counts[b] <= rank) cum += counts[b++];
        const key = row * B + b;
        if (slotOf[key] < 0) {
          slotOf[key] = slotSizes.length;
          slotSizes.push(counts[b]);
        }
        wanted.push({ row, rank, bin: b, within: rank - cum });
      }
    }
  }
  // ---- gather the wanted bins (one pass over the values) and sort them
  const buffers = slotSizes.map((size) => new Float32Array(size));
  const fill = new Int32Array(slotSizes.length);
  const low = LOWEST_DB, perDb = QUANTILE_BINS_PER_DB;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (!(v > -Infinity && v < Infinity)) continue;
    const t = (v - low) * perDb;
    const b = t < 0 ? 0 : t >= B ? B - 1 : t | 0; // the bin of v
    let slot = slotOf[b];
    if (slot >= 0) buffers[slot][fill[slot]++] = v;
    const k = group[i];
    if (k >= 0) {
      slot = slotOf[(k + 1) * B + b];
      if (slot >= 0) buffers[slot][fill[slot]++] = v;
    }
  }
  for (const buf of buffers) buf.sort();
  // ---- interpolate
  const byRank = new Map<number, Wanted>();
  for (const w of wanted) byRank.set(w.row * (values.length + 1) + w.rank, w);
  const order = (row: number, rank: number) => {
    const w = byRank.get(row * (values.length + 1) + rank)!;
    return buffers[slotOf[row * B + w.bin]][w.within];
  };
  const result: (number | null)[][] = [];
  for (let row = 0; row < G; row++) {
    const total = totals[row];
    result.push(
      probabilities.map((p) => {
        if (total === 0) return null;
        const h = (total - 1) * p;
        const first = Math.floor(h);
        const low = order(row, first);
        return first + 1 < total && h !== first ? low + (order(row, first + 1) - low) * (h - first) : low;
      }),
    );
  }
  return result;
}

/** The same in one call: histogram and quantiles of all values. */
export function groupQuantiles(values: Float32Array, group: Int32Array, groupCount: number, probabilities: readonly number[]): (number | null)[][] {
  const histogram = createQuantileHistogram(groupCount);
  countInto(histogram, values, group, groupCount);
  return quantilesFromHistogram(values, group, groupCount, histogram, probabilities);
}
