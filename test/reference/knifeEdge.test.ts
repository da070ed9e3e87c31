import { describe, expect, it } from "vitest";
import { fresnelParameter, knifeEdgeLossDb } from "../../lib/radio/knifeEdge";

// Source: ITU-R P.526-15 eq. (31), J(ν) = 6.9 + 20 log10(sqrt((ν − 0.1)² + 1) + ν − 0.1) for ν > −0.78.
// Expected values computed from eq. (31) itself (not read off the recommendation's Figure).
describe("knifeEdgeLossDb (ITU-R P.526 eq. 31)", () => {
  it("knifeEdgeLossDb(0) = 6.9 + 20 log10(sqrt(1.01) − 0.1) = 6.03 dB (grazing edge)", () => {
    expect(knifeEdgeLossDb(0)).toBeCloseTo(6.0329, 3);
  });
  it("knifeEdgeLossDb(−0.78) ≈ 0 dB at the validity limit, and exactly 0 below it", () => {
    expect(knifeEdgeLossDb(-0.7799)).toBeCloseTo(0.004, 2);
    expect(knifeEdgeLossDb(-0.78)).toBe(0);
    expect(knifeEdgeLossDb(-3)).toBe(0);
  });
  it("knifeEdgeLossDb(1) = 13.93 dB", () => {
    expect(knifeEdgeLossDb(1)).toBeCloseTo(13.9257, 3);
  });
  it("knifeEdgeLossDb(2.4) = 20.54 dB (eq. 31; a reading of '≈ 20 dB' off the figure is 0.5 dB low)", () => {
    expect(knifeEdgeLossDb(2.4)).toBeCloseTo(20.5393, 3);
  });
});

// Source: ITU-R P.526-15 eq. (26), ν = h sqrt((2/λ)(1/d1 + 1/d2)).
describe("fresnelParameter (ITU-R P.526 eq. 26)", () => {
  it("fresnelParameter(10 m, 500 m, 500 m, 0.1 m) = 10 · sqrt(20 · 0.004) = 2.828", () => {
    expect(fresnelParameter(10, 500, 500, 0.1)).toBeCloseTo(Math.sqrt(8), 9);
  });
});
