// A small seeded pseudo-random generator, so that demo data and benchmarks are
// reproducible from one integer. Not for anything security-related.
//
// Core generator: mulberry32 by Tommy Ettinger (2017), a 32-bit state generator
// published as public domain (CC0); re-implemented here from its description.
// Seed scrambling: the 32-bit finaliser of MurmurHash3 by Austin Appleby
// (public domain), so that neighbouring seeds (1, 2, 3 …) start far apart.

export interface Random {
  /** Uniform float in [0, 1). */
  next(): number;
  /** Uniform float in [min, max). */
  uniform(min: number, max: number): number;
  /** Uniform integer in [min, max], both inclusive. */
  int(min: number, max: number): number;
  /** Normal (Gaussian) variate with the given mean and standard deviation. */
  normal(mean?: number, standardDeviation?: number): number;
  /** One element of a non-empty array, each equally likely. */
  pick<T>(items: readonly T[]): T;
  /** True with probability p. */
  chance(p: number): boolean;
  /** A new array with the items in random order (Fisher–Yates). */
  shuffle<T>(items: readonly T[]): T[];
}

/** MurmurHash3 fmix32: a bijective 32-bit mix (Appleby, public domain). */
function mix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/**
 * Creates a seeded generator. The same seed always gives the same sequence.
 * @throws RangeError when the seed is not a finite number.
 */
export function createRandom(seed: number): Random {
  if (!Number.isFinite(seed)) {
    throw new RangeError(`createRandom: seed must be a finite number, got ${String(seed)}`);
  }
  // Fold the integer part (and any fraction) into 32 bits before mixing.
  let state = mix32((Math.trunc(seed) ^ Math.trunc((seed % 1) * 0x100000000)) >>> 0);
  // A cached second Box–Muller variate would make results depend on call
  // history in a surprising way; we draw two uniforms per normal instead.

  const next = (): number => {
    // mulberry32 step (Ettinger, CC0): Weyl increment then two xorshift-multiply rounds.
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };

  const uniform = (min: number, max: number): number => {
    if (!(Number.isFinite(min) && Number.isFinite(max)) || max < min) {
      throw new RangeError(`uniform: need finite min <= max, got [${min}, ${max}]`);
    }
    return min + (max - min) * next();
  };

  const int = (min: number, max: number): number => {
    if (!Number.isInteger(min) || !Number.isInteger(max) || max < min) {
      throw new RangeError(`int: need integers min <= max, got [${min}, ${max}]`);
    }
    return min + Math.floor(next() * (max - min + 1));
  };

  const normal = (mean = 0, standardDeviation = 1): number => {
    // Box–Muller transform (Box & Muller 1958): z = sqrt(−2 ln u1) · cos(2π u2).
    // 1 − next() lies in (0, 1], so the logarithm is finite.
    const u1 = 1 - next();
    const u2 = next();
    return mean + standardDeviation * Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
  };

  const pick = <T>(items: readonly T[]): T => {
    if (items.length === 0) throw new RangeError("pick: the array is empty");
    return items[Math.floor(next() * items.length)];
  };

  const chance = (p: number): boolean => next() < p;

  const shuffle = <T>(items: readonly T[]): T[] => {
    const out = items.slice();
    for (let i = out.length - 1; i > 0; i--) {
      const j = Math.floor(next() * (i + 1));
      const tmp = out[i];
      out[i] = out[j];
      out[j] = tmp;
    }
    return out;
  };

  return { next, uniform, int, normal, pick, chance, shuffle };
}
