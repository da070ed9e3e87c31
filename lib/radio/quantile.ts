// Quantiles by selection (no full sort): O(n) per quantile on a scratch array that may be reordered.

/** Rearranges a[lo..hi] so that a[k] holds the value it would have if sorted, smaller to its left, larger to its right (Hoare quickselect, median of three). */
export function selectInPlace(a: Float32Array | Float64Array, k: number, lo = 0, hi = a.length - 1): void {
  while (hi > lo) {
    const mid = (lo + hi) >>> 1;
    // median of three as pivot, guarding against sorted input
    let x = a[lo], y = a[mid], z = a[hi];
    if (x > y) { const t = x; x = y; y = t; }
    if (y > z) { y = z; if (x > y) y = x; }
    const pivot = y;
    let i = lo, j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i]; a[i] = a[j]; a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return;
  }
}

/**
 * p-quantile (0 ≤ p ≤ 1) of a[0..n) with linear interpolation between order statistics
 * (the "R-7" definition, as numpy's default and d3.quantile), or null when n = 0. Reorders a.
 */
export function quantileInPlace(a: Float32Array | Float64Array, p: number, n = a.length): number | null {
  if (n === 0) return null;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  selectInPlace(a, lo, 0, n - 1);
  const low = a[lo];
  if (lo + 1 >= n || h === lo) return low;
  let high = Infinity;
  for (let i = lo + 1; i < n; i++) if (a[i] < high) high = a[i];
  return low + (high - low) * (h - lo);
}

/**
 * R-7 quantiles of several groups at once, exact, in O(n) passes: a histogram locates the bin of each wanted
 * order statistic, then only the values of those bins are gathered and sorted.
 * `group[i]` in 0..groupCount − 1 (or −1: network only); result[0] is the network (all values), result[k + 1]
 * group k; each row holds one entry per probability (null when the group is empty). Non-finite values are skipped.
 */
export function groupQuantiles(values: Float32Array, group: Int32Array, groupCount: number, probabilities: readonly number[]): (number | null)[][] {
  const n = values.length;
  const BINS = 4096;
  const G = groupCount + 1; // row 0 = network, row k + 1 = group k
  // ---- range
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (v > -Infinity && v < Infinity) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  const result: (number | null)[][] = [];
  for (let r = 0; r < G; r++) result.push(probabilities.map(() => null));
  if (lo > hi) return result;
  const scale = hi > lo ? BINS / (hi - lo) : 0;
  // ---- histograms
  const hist = new Int32Array(G * BINS);
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (!(v > -Infinity && v < Infinity)) continue;
    let b = ((v - lo) * scale) | 0;
    if (b >= BINS) b = BINS - 1;
    hist[b]++;
    const k = group[i];
    if (k >= 0) hist[(k + 1) * BINS + b]++;
  }
  // ---- wanted order statistics → (row, bin, rank inside the bin)
  interface Wanted { row: number; p: number; rank: number; bin: number; within: number }
  const wanted: Wanted[] = [];
  const slotOf = new Int32Array(G * BINS).fill(-1);
  const slotSizes: number[] = [];
  for (let row = 0; row < G; row++) {
    let total = 0;
    for (let b = 0; b < BINS; b++) total += hist[row * BINS + b];
    if (total === 0) continue;
    probabilities.forEach((p, pi) => {
      const h = (total - 1) * p;
      const first = Math.floor(h);
      for (const rank of first + 1 < total && h !== first ? [first, first + 1] : [first]) {
        let cum = 0, b = 0;
        while (cum + hist[row * BINS + b] <= rank) cum += hist[row * BINS + b++];
        const key = row * BINS + b;
        if (slotOf[key] < 0) {
          slotOf[key] = slotSizes.length;
          slotSizes.push(hist[key]);
        }
        wanted.push({ row, p: pi, rank, bin: b, within: rank - cum });
      }
    });
  }
  // ---- gather the wanted bins and sort them
  const buffers = slotSizes.map((s) => new Float32Array(s));
  const fill = new Int32Array(slotSizes.length);
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (!(v > -Infinity && v < Infinity)) continue;
    let b = ((v - lo) * scale) | 0;
    if (b >= BINS) b = BINS - 1;
    let s = slotOf[b];
    if (s >= 0) buffers[s][fill[s]++] = v;
    const k = group[i];
    if (k >= 0) {
      s = slotOf[(k + 1) * BINS + b];
      if (s >= 0) buffers[s][fill[s]++] = v;
    }
  }
  for (const buf of buffers) buf.sort();
  // ---- interpolate
  const byRank = new Map<number, Wanted>();
  for (const w of wanted) byRank.set(w.row * (n + 1) + w.rank, w);
  const order = (row: number, rank: number) => {
    const w = byRank.get(row * (n + 1) + rank)!;
    return buffers[slotOf[row * BINS + w.bin]][w.within];
  };
  for (let row = 0; row < G; row++) {
    let total = 0;
    for (let b = 0; b < BINS; b++) total += hist[row * BINS + b];
    if (total === 0) continue;
    probabilities.forEach((p, pi) => {
      const h = (total - 1) * p;
      const first = Math.floor(h);
      const low = order(row, first);
      result[row][pi] = first + 1 < total && h !== first ? low + (order(row, first + 1) - low) * (h - first) : low;
    });
  }
  return result;
}
