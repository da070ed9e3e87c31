import { describe, expect, it } from "vitest";
import { countInto, createQuantileHistogram, groupQuantiles, quantilesFromHistogram } from "../../../lib/radio/quantile";
import { seededRandom } from "../../bench/benchScenario";

function r7(sorted: number[], p: number): number | null {
  if (sorted.length === 0) return null;
  const h = (sorted.length - 1) * p, lo = Math.floor(h);
  return lo + 1 < sorted.length ? sorted[lo] + (sorted[lo + 1] - sorted[lo]) * (h - lo) : sorted[lo];
}

describe("quantile", () => {
  it("groupQuantiles gives the R-7 quantile of one group exactly, values far outside the bins included", () => {
    const rnd = seededRandom(2);
    const values = Array.from({ length: 1001 }, () => Math.round(rnd() * 200) / 4);
    values.push(-900, 700, 1e30, -300, 270);
    const sorted = Array.from(Float32Array.from(values).sort());
    const probs = [0, 0.05, 0.5, 0.95, 1];
    const result = groupQuantiles(Float32Array.from(values), new Int32Array(values.length).fill(-1), 0, probs);
    probs.forEach((p, j) => expect(result[0][j]).toBe(r7(sorted, p)));
    expect(groupQuantiles(new Float32Array(0), new Int32Array(0), 0, [0.5])).toEqual([[null]]);
  });
  it("histograms of parts of the values add up: quantilesFromHistogram on the sum equals groupQuantiles", () => {
    const rnd = seededRandom(3);
    const n = 5000;
    const values = new Float32Array(n).map(() => Math.round(rnd() * 1600) / 8 - 150);
    const group = new Int32Array(n).map(() => Math.floor(rnd() * 3) - 1);
    const [a, b] = [createQuantileHistogram(2), createQuantileHistogram(2)];
    countInto(a, values, group, 2, 0, 1234);
    countInto(b, values, group, 2, 1234, n);
    const sum = a.map((x, i) => x + b[i]);
    expect(quantilesFromHistogram(values, group, 2, sum, [0.05, 0.5, 0.95])).toEqual(groupQuantiles(values, group, 2, [0.05, 0.5, 0.95]));
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
