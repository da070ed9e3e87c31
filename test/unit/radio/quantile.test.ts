import { describe, expect, it } from "vitest";
import { groupQuantiles, quantileInPlace } from "../../../lib/radio/quantile";
import { seededRandom } from "../../bench/benchScenario";

function r7(sorted: number[], p: number): number | null {
  if (sorted.length === 0) return null;
  const h = (sorted.length - 1) * p, lo = Math.floor(h);
  return lo + 1 < sorted.length ? sorted[lo] + (sorted[lo + 1] - sorted[lo]) * (h - lo) : sorted[lo];
}

describe("quantile", () => {
  it("quantileInPlace gives the R-7 quantile of a shuffled array", () => {
    const rnd = seededRandom(2);
    const values = Array.from({ length: 1001 }, () => Math.round(rnd() * 200) / 4);
    const sorted = Float32Array.from(values).sort();
    for (const p of [0, 0.05, 0.5, 0.95, 1]) expect(quantileInPlace(Float32Array.from(values), p)).toBe(r7(Array.from(sorted), p));
    expect(quantileInPlace(new Float32Array(0), 0.5)).toBeNull();
  });
  it("groupQuantiles equals sorting each group, skipping non-finite values, with duplicates", () => {
    const rnd = seededRandom(5);
    const n = 20000;
    const values = new Float32Array(n).map(() => (rnd() < 0.02 ? -Infinity : Math.round(rnd() * 800) / 8 - 120));
    const group = new Int32Array(n).map(() => Math.floor(rnd() * 4) - 1);
    const probs = [0.05, 0.5, 0.95];
    const result = groupQuantiles(values, group, 3, probs);
    const rows = [Array.from(values)].concat([0, 1, 2].map((k) => Array.from(values).filter((_, i) => group[i] === k)));
    rows.forEach((row, i) => {
      const sorted = Array.from(Float32Array.from(row.filter(Number.isFinite)).sort());
      probs.forEach((p, j) => expect(result[i][j]).toBeCloseTo(r7(sorted, p)!, 4));
    });
  });
  it("groupQuantiles gives null for empty groups and handles a single repeated value", () => {
    const result = groupQuantiles(new Float32Array([3, 3, 3]), new Int32Array([0, 0, 0]), 2, [0.5]);
    expect(result).toEqual([[3], [3], [null]]);
  });
});
