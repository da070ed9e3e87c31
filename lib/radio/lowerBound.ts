// Binary search in an ascending Int32Array (footprints of grid indices).

/** First index j with sorted[j] ≥ value (sorted.length when none). */
export function lowerBound(sorted: Int32Array, value: number): number {
  let lo = 0, hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
