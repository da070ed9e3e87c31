import { describe, expect, it } from "vitest";
import { breakpointDistanceM } from "../../lib/radio/breakpoint";
import { umaLosDb, umaNlosDb } from "../../lib/radio/uma";
import { umiLosDb, umiNlosDb } from "../../lib/radio/umi";

// Source: 3GPP TR 38.901 V17 Table 7.4.1-1 (UMa and UMi-Street Canyon), note 1 for d'BP with h_E = 1 m.
// Values hand-computed from the table's formulas (fc in GHz, metres), 20 log10(3.5) = 10.8814.
describe("TR 38.901 Table 7.4.1-1 UMa, fc = 3.5 GHz, hBS = 25 m, hUT = 1.5 m", () => {
  const d3 = (d2: number) => Math.hypot(d2, 25 - 1.5);
  it("breakpointDistanceM: d'BP = 4 · 24 · 0.5 · 3.5e9 / 3e8 = 560 m", () => {
    expect(breakpointDistanceM(3.5, 25, 1.5)).toBeCloseTo(560, 9);
  });
  it("umaLosDb at d2D = 200 m (< d'BP) is PL1 = 28 + 22 log10(201.376) + 10.881 = 89.570 dB", () => {
    expect(umaLosDb(200, d3(200), 3.5, 25, 1.5)).toBeCloseTo(89.5695, 3);
  });
  it("umaLosDb at d2D = 1000 m (> d'BP) is PL2 = 28 + 40 log10(1000.276) + 10.881 − 9 log10(560² + 23.5²) = 109.412 dB", () => {
    expect(umaLosDb(1000, d3(1000), 3.5, 25, 1.5)).toBeCloseTo(109.4119, 3);
  });
  it("umaNlosDb at 1000 m = max(109.412, 13.54 + 39.08 log10(1000.276) + 10.881) = 141.666 dB", () => {
    expect(umaNlosDb(1000, d3(1000), 3.5, 25, 1.5)).toBeCloseTo(141.6660, 3);
  });
  it("umaNlosDb at 200 m = max(89.570, 114.462) = 114.462 dB", () => {
    expect(umaNlosDb(200, d3(200), 3.5, 25, 1.5)).toBeCloseTo(114.4620, 3);
  });
});

describe("TR 38.901 Table 7.4.1-1 UMi-Street Canyon, fc = 3.5 GHz, hBS = 10 m, hUT = 1.5 m", () => {
  const d3 = (d2: number) => Math.hypot(d2, 10 - 1.5);
  it("breakpointDistanceM: d'BP = 4 · 9 · 0.5 · 3.5e9 / 3e8 = 210 m", () => {
    expect(breakpointDistanceM(3.5, 10, 1.5)).toBeCloseTo(210, 9);
  });
  it("umiLosDb at 100 m (< d'BP) is PL1 = 32.4 + 21 log10(100.361) + 10.881 = 85.314 dB", () => {
    expect(umiLosDb(100, d3(100), 3.5, 10, 1.5)).toBeCloseTo(85.3142, 3);
  });
  it("umiLosDb at 500 m (> d'BP) is PL2 = 32.4 + 40 log10(500.072) + 10.881 − 9.5 log10(210² + 8.5²) = 107.114 dB", () => {
    expect(umiLosDb(500, d3(500), 3.5, 10, 1.5)).toBeCloseTo(107.1138, 3);
  });
  it("umiNlosDb at 500 m = max(107.114, 35.3 log10(500.072) + 22.4 + 21.3 log10(3.5)) = 129.265 dB", () => {
    expect(umiNlosDb(500, d3(500), 3.5, 10, 1.5)).toBeCloseTo(129.2645, 3);
  });
  it("umiNlosDb at 100 m = max(85.314, 104.644) = 104.644 dB", () => {
    expect(umiNlosDb(100, d3(100), 3.5, 10, 1.5)).toBeCloseTo(104.6438, 3);
  });
});
