// dB → linear power, 10^(x/10), the one conversion every power sum of the model uses.
//
// Computed without Math.pow (≈ 10× slower in the hot loops): 10^(x/10) = 2^y with y = x · log2(10) / 10;
// n = y rounded to the nearest whole number, 2^n from a table, 2^(y − n) (y − n in [−½, ½]) from a linearly
// interpolated table of 4096 intervals (relative error < 4e-9, below Float32 resolution). Deterministic: the same
// input gives the same bits on every thread and machine (only exact table reads and IEEE + − ×).

// Hot loops bind these to local constants and inline the few lines of dbToLinear: a bundler turns module
// constants into mutable `var`s, which V8 then reloads and re-checks on every use (measured 2–3× slower).
export const DB_TO_LOG2 = Math.log2(10) / 10;
export const EXP2_STEPS = 4096;
/** 2^(k / EXP2_STEPS − ½), k = 0 … EXP2_STEPS. */
export const EXP2_FRACTION = new Float64Array(EXP2_STEPS + 1).map((_, i) => Math.pow(2, i / EXP2_STEPS - 0.5));
export const EXP2_MIN = -160, EXP2_MAX = 160; // 2^−160 is far below any power the model meets
/** 2^(n + EXP2_MIN), n = 0 … EXP2_MAX − EXP2_MIN. */
export const EXP2_INTEGER = new Float64Array(EXP2_MAX - EXP2_MIN + 1).map((_, i) => Math.pow(2, i + EXP2_MIN));

/**
 * x rounded to the nearest whole number (ties to even), for |x| < 2^51: adding 1.5 · 2^52 leaves no fraction bits,
 * subtracting it again is exact. Twice as fast as Math.floor in V8's hot loops here, and as deterministic.
 */
export const ROUNDING_SHIFT = 1.5 * 2 ** 52;

/** 10^(db / 10); 0 below −481 dB; −Infinity gives 0. */
export function dbToLinear(db: number): number {
  const y = db * DB_TO_LOG2;
  let n = y + ROUNDING_SHIFT - ROUNDING_SHIFT;
  if (!(n >= EXP2_MIN)) return 0;
  if (n > EXP2_MAX) n = EXP2_MAX;
  const t = (y - n + 0.5) * EXP2_STEPS;
  const i = t | 0;
  const a = EXP2_FRACTION[i];
  return (a + (EXP2_FRACTION[i + 1] - a) * (t - i)) * EXP2_INTEGER[n - EXP2_MIN];
}
