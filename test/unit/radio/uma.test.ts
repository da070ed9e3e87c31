import { describe, expect, it } from "vitest";
import { breakpointDistanceM } from "../../../lib/radio/breakpoint";
import { umaLosDb, umaNlosDb } from "../../../lib/radio/uma";

describe("umaLosDb / umaNlosDb", () => {
  it("umaLosDb(d, fc) stays continuous at the breakpoint", () => {
    const dbp = breakpointDistanceM(3.5, 25, 1.5);
    const below = umaLosDb(dbp - 1e-6, Math.hypot(dbp - 1e-6, 23.5), 3.5, 25, 1.5);
    const above = umaLosDb(dbp + 1e-6, Math.hypot(dbp + 1e-6, 23.5), 3.5, 25, 1.5);
    expect(Math.abs(above - below)).toBeLessThan(1e-4);
  });
  it("umaNlosDb is never below umaLosDb and grows with distance", () => {
    let previous = -Infinity;
    for (let d = 10; d <= 5000; d *= 1.5) {
      const d3 = Math.hypot(d, 23.5);
      const nlos = umaNlosDb(d, d3, 2.1, 25, 1.5);
      expect(nlos).toBeGreaterThanOrEqual(umaLosDb(d, d3, 2.1, 25, 1.5));
      expect(nlos).toBeGreaterThan(previous);
      previous = nlos;
    }
  });
  it("umaNlosDb drops 0.6 dB per metre of UT height (the hUT term)", () => {
    const a = umaNlosDb(800, 800, 3.5, 25, 1.5), b = umaNlosDb(800, 800, 3.5, 25, 11.5);
    expect(a - b).toBeCloseTo(6, 9);
  });
});
