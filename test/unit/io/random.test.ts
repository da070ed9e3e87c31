import { describe, expect, it } from "vitest";
import { createRandom } from "../../../lib/io/random";

describe("createRandom(seed)", () => {
  it("createRandom(seed) repeats the same sequence for the same seed", () => {
    const a = createRandom(42);
    const b = createRandom(42);
    const xs = Array.from({ length: 1000 }, () => a.next());
    const ys = Array.from({ length: 1000 }, () => b.next());
    expect(xs).toEqual(ys);
  });

  it("createRandom(seed) gives different sequences for neighbouring seeds", () => {
    const a = Array.from({ length: 8 }, ((r) => () => r.next())(createRandom(1)));
    const b = Array.from({ length: 8 }, ((r) => () => r.next())(createRandom(2)));
    expect(a).not.toEqual(b);
    // Seeds 1 and 2 must not be shifted copies of each other either.
    expect(a.slice(1)).not.toEqual(b.slice(0, 7));
  });

  it("createRandom(NaN) throws a RangeError naming the seed", () => {
    expect(() => createRandom(NaN)).toThrow(RangeError);
    expect(() => createRandom(Infinity)).toThrow(/seed/);
  });
});

describe("Random.next()", () => {
  it("next() stays in [0, 1) with mean ½ and variance 1/12", () => {
    const r = createRandom(7);
    const n = 100_000;
    let sum = 0;
    let sumSq = 0;
    let outside = 0;
    for (let i = 0; i < n; i++) {
      const v = r.next();
      if (!(v >= 0 && v < 1)) outside++;
      sum += v;
      sumSq += v * v;
    }
    expect(outside).toBe(0);
    const mean = sum / n;
    // Standard error of the mean is sqrt(1/12 / n) ≈ 0.0009; 5 standard errors of slack.
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.0046);
    expect(Math.abs(sumSq / n - mean * mean - 1 / 12)).toBeLessThan(0.002);
  });

  it("next() has no strong lag-1 correlation", () => {
    const r = createRandom(11);
    const n = 50_000;
    let prev = r.next();
    let sxy = 0;
    let sx = 0;
    let sxx = 0;
    for (let i = 0; i < n; i++) {
      const v = r.next();
      sxy += prev * v;
      sx += v;
      sxx += v * v;
      prev = v;
    }
    const mean = sx / n;
    const correlation = (sxy / n - mean * mean) / (sxx / n - mean * mean);
    expect(Math.abs(correlation)).toBeLessThan(0.03);
  });
});

describe("Random helpers", () => {
  it("int(1, 6) returns every face, inclusive, in near-equal shares", () => {
    const r = createRandom(3);
    const counts = new Map<number, number>();
    const n = 60_000;
    for (let i = 0; i < n; i++) {
      const v = r.int(1, 6);
      counts.set(v, (counts.get(v) ?? 0) + 1);
    }
    expect([...counts.keys()].sort()).toEqual([1, 2, 3, 4, 5, 6]);
    for (const c of counts.values()) expect(Math.abs(c - n / 6)).toBeLessThan(0.05 * (n / 6));
  });

  it("int(min, max) refuses reversed or fractional bounds", () => {
    const r = createRandom(3);
    expect(() => r.int(5, 1)).toThrow(RangeError);
    expect(() => r.int(0.5, 2)).toThrow(RangeError);
    expect(r.int(4, 4)).toBe(4);
  });

  it("uniform(min, max) stays within [min, max) and refuses max < min", () => {
    const r = createRandom(5);
    for (let i = 0; i < 1000; i++) {
      const v = r.uniform(-3, 2);
      expect(v).toBeGreaterThanOrEqual(-3);
      expect(v).toBeLessThan(2);
    }
    expect(() => r.uniform(2, -3)).toThrow(RangeError);
  });

  it("normal(mean, sd) has the requested mean and standard deviation", () => {
    const r = createRandom(9);
    const n = 50_000;
    let sum = 0;
    let sumSq = 0;
    let nonFinite = 0;
    for (let i = 0; i < n; i++) {
      const v = r.normal(10, 2);
      if (!Number.isFinite(v)) nonFinite++;
      sum += v;
      sumSq += v * v;
    }
    const mean = sum / n;
    expect(nonFinite).toBe(0);
    const sd = Math.sqrt(sumSq / n - mean * mean);
    expect(Math.abs(mean - 10)).toBeLessThan(0.05);
    expect(Math.abs(sd - 2)).toBeLessThan(0.05);
  });

  it("pick(items) returns only members, reaches all of them, and refuses an empty array", () => {
    const r = createRandom(13);
    const items = ["a", "b", "c"] as const;
    const seen = new Set<string>();
    for (let i = 0; i < 300; i++) {
      const v = r.pick(items);
      expect(items).toContain(v);
      seen.add(v);
    }
    expect(seen.size).toBe(3);
    expect(() => r.pick([])).toThrow(RangeError);
  });

  it("shuffle(items) returns a permutation and leaves the input untouched", () => {
    const r = createRandom(17);
    const input = Array.from({ length: 50 }, (_, i) => i);
    const copy = input.slice();
    const out = r.shuffle(input);
    expect(input).toEqual(copy);
    expect(out.slice().sort((a, b) => a - b)).toEqual(input);
    expect(out).not.toEqual(input);
  });

  it("chance(p) is true about p of the time", () => {
    const r = createRandom(19);
    let hits = 0;
    for (let i = 0; i < 20_000; i++) if (r.chance(0.3)) hits++;
    expect(Math.abs(hits / 20_000 - 0.3)).toBeLessThan(0.015);
  });
});
