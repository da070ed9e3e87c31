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
/** Lower edge of the first bin, dB. */
export const QUANTILE_LOWEST_DB = -256;
/** Bins per histogram row. */
export const QUANTILE_BINS = 512 * QUANTILE_BINS_PER_DB;

// The bin of a finite value v (monotonic in v): t = (v − QUANTILE_LOWEST_DB) · QUANTILE_BINS_PER_DB, clamped to the bins
// before the truncation to a whole number (which would wrap far-off values around). Written out where used.

/** A histogram of `groupCount + 1` rows: row k counts the values of group k, the last row those of no group (−1). */
export function createQuantileHistogram(groupCount: number): Int32Array {
  return new Int32Array((groupCount + 1) * QUANTILE_BINS);
}

/** Counts values[from … to − 1] (finite ones only) into `histogram`, by group[i] (−1: none). */
export function countInto(histogram: Int32Array, values: Float32Array, group: Int32Array, groupCount: number, from = 0, to = values.length): void {
  const bins = QUANTILE_BINS, low = QUANTILE_LOWEST_DB, perDb = QUANTILE_BINS_PER_DB;
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
 * Where the wanted order statistics of a histogram lie: for each result row (0 = all values, k + 1 = group k) and
 * probability, the ranks R-7 interpolates between, and the bins holding them. Each bin holding a wanted rank is a
 * slot: its values are gathered (gatherQuantileValues), sorted, and read (quantilesOfPlan).
 */
export interface QuantilePlan {
  groupCount: number;
  probabilities: readonly number[];
  /** Finite values per result row. */
  totals: number[];
  /** Slot of (result row, bin) at row · QUANTILE_BINS + bin, −1 where no wanted rank lies. */
  slotOf: Int32Array;
  /** Values of each slot (the bin's count in its row). */
  slotSizes: number[];
  /** Per result row and probability: [slot, rank inside the slot] of the one or two order statistics. */
  picks: { slot: number; within: number }[][][];
}

/** The plan of the quantiles at `probabilities` of the values counted in `histogram` (countInto). */
export function planQuantiles(histogram: Int32Array, groupCount: number, probabilities: readonly number[]): QuantilePlan {
  const B = QUANTILE_BINS, G = groupCount + 1; // result rows: 0 = network, k + 1 = group k
  if (histogram.length !== G * B) throw new RangeError(`planQuantiles: a histogram of ${histogram.length} bins for ${groupCount} groups`);
  // ---- per result row: counts per bin (the network row adds up every histogram row)
  const rowCounts = (row: number): Int32Array => {
    if (row > 0) return histogram.subarray((row - 1) * B, row * B);
    const all = new Int32Array(B);
    for (let r = 0; r <= groupCount; r++) for (let b = 0; b < B; b++) all[b] += histogram[r * B + b];
    return all;
  };
  const totals: number[] = [];
  const slotOf = new Int32Array(G * B).fill(-1);
  const slotSizes: number[] = [];
  const picks: { slot: number; within: number }[][][] = [];
  for (let row = 0; row < G; row++) {
    const counts = rowCounts(row);
    let total = 0;
    for (let b = 0; b < B; b++) total += counts[b];
    totals.push(total);
    picks.push(
      probabilities.map((p) => {
        if (total === 0) return [];
        const h = (total - 1) * p;
        const first = Math.floor(h);
        return (first + 1 < total && h !== first ? [first, first + 1] : [first]).map((rank) => {
          let cum = 0, b = 0;
          while (cum + counts[b] <= rank) cum += counts[b++];
          const key = row * B + b;
          if (slotOf[key] < 0) {
            slotOf[key] = slotSizes.length;
            slotSizes.push(counts[b]);
          }
          return { slot: slotOf[key], within: rank - cum };
        });
      }),
    );
  }
  return { groupCount, probabilities, totals, slotOf, slotSizes, picks };
}

/** Empty buffers for the slots of a plan (give `allocate` for memory other threads can fill). */
export function allocateQuantileSlots(plan: QuantilePlan, allocate: (bytes: number) => ArrayBufferLike = (b) => new ArrayBuffer(b)): Float32Array[] {
  // one buffer cut into the slots, so that a gathering posts one shared buffer, not one per slot
  const all = new Float32Array(allocate(4 * plan.slotSizes.reduce((n, size) => n + size, 0)));
  let at = 0;
  return plan.slotSizes.map((size) => all.subarray(at, (at += size)));
}

/**
 * Writes the finite values[i], i in [from, to), that fall in a slot of the plan into that slot's buffer, at
 * fill[slot] (which is moved on): once for the network row, once for the value's group row. Callers that split
 * the values among themselves start each at its own offsets (the counts of the parts before it), so that they
 * write disjoint places of the same buffers.
 */
export function gatherQuantileValues(plan: QuantilePlan, values: Float32Array, group: Int32Array, buffers: Float32Array[], fill: Int32Array, from = 0, to = values.length): void {
  const B = QUANTILE_BINS, slotOf = plan.slotOf;
  const low = QUANTILE_LOWEST_DB, perDb = QUANTILE_BINS_PER_DB;
  for (let i = from; i < to; i++) {
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
}

/**
 * Where a part of the values starts writing in each slot (gatherQuantileValues' fill): the counts, in the slot's
 * row and bin, of the parts before it. `histograms` are the parts' own histograms, in the order they write.
 */
export function quantileSlotOffsets(plan: QuantilePlan, histograms: readonly Int32Array[]): Int32Array[] {
  const B = QUANTILE_BINS, rows = plan.groupCount + 1;
  const slots: { row: number; bin: number }[] = new Array(plan.slotSizes.length);
  for (let key = 0; key < plan.slotOf.length; key++) if (plan.slotOf[key] >= 0) slots[plan.slotOf[key]] = { row: Math.floor(key / B), bin: key % B };
  const running = new Int32Array(slots.length);
  return histograms.map((histogram) => {
    const start = running.slice();
    slots.forEach(({ row, bin }, slot) => {
      let count = 0;
      if (row > 0) count = histogram[(row - 1) * B + bin];
      else for (let r = 0; r < rows; r++) count += histogram[r * B + bin];
      running[slot] += count;
    });
    return start;
  });
}

/** The quantiles of a plan from its filled slot buffers (sorted here, in place). */
export function quantilesOfPlan(plan: QuantilePlan, buffers: Float32Array[]): (number | null)[][] {
  for (const buffer of buffers) buffer.sort();
  return plan.picks.map((row, r) =>
    row.map((pick, j) => {
      if (pick.length === 0) return null;
      const low = buffers[pick[0].slot][pick[0].within];
      if (pick.length === 1) return low;
      const h = (plan.totals[r] - 1) * plan.probabilities[j];
      return low + (buffers[pick[1].slot][pick[1].within] - low) * (h - Math.floor(h));
    }),
  );
}

/**
 * R-7 quantiles (linear interpolation between order statistics, as numpy's default and d3.quantile) of the finite
 * values, from their histogram (countInto over all of them). result[0] is the network (all values), result[k + 1]
 * group k; one entry per probability, null for an empty group. Exact: the values themselves are read back.
 */
export function quantilesFromHistogram(values: Float32Array, group: Int32Array, groupCount: number, histogram: Int32Array, probabilities: readonly number[]): (number | null)[][] {
  const plan = planQuantiles(histogram, groupCount, probabilities);
  const buffers = allocateQuantileSlots(plan);
  gatherQuantileValues(plan, values, group, buffers, new Int32Array(buffers.length));
  return quantilesOfPlan(plan, buffers);
}

/** The same in one call: histogram and quantiles of all values. */
export function groupQuantiles(values: Float32Array, group: Int32Array, groupCount: number, probabilities: readonly number[]): (number | null)[][] {
  const histogram = createQuantileHistogram(groupCount);
  countInto(histogram, values, group, groupCount);
  return quantilesFromHistogram(values, group, groupCount, histogram, probabilities);
}
