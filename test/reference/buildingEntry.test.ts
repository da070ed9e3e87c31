import { describe, expect, it } from "vitest";
import { concreteLossDb, glassLossDb, irrGlassLossDb, wallPenetrationLossDb, indoorLossDb } from "../../lib/radio/buildingEntry";

// Source: 3GPP TR 38.901 §7.4.3.1, Table 7.4.3-1 (materials) and Table 7.4.3-2 (O2I models), f in GHz.
describe("TR 38.901 O2I building penetration at 3.5 GHz", () => {
  it("material losses: L_glass = 2.7, L_IRRglass = 24.05, L_concrete = 19 dB", () => {
    expect(glassLossDb(3.5)).toBeCloseTo(2.7, 12);
    expect(irrGlassLossDb(3.5)).toBeCloseTo(24.05, 12);
    expect(concreteLossDb(3.5)).toBeCloseTo(19, 12);
  });
  it("low-loss PL_tw = 5 − 10 log10(0.3·10^−0.27 + 0.7·10^−1.9) = 12.70 dB", () => {
    expect(wallPenetrationLossDb("low", 3.5)).toBeCloseTo(12.6975, 3);
  });
  it("high-loss PL_tw = 5 − 10 log10(0.7·10^−2.405 + 0.3·10^−1.9) = 26.85 dB", () => {
    expect(wallPenetrationLossDb("high", 3.5)).toBeCloseTo(26.8498, 3);
  });
  it("indoorLossDb(d2D-in) = 0.5 dB per metre", () => {
    expect(indoorLossDb(10)).toBe(5);
  });
});
