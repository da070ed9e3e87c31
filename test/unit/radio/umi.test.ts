import { describe, expect, it } from "vitest";
import { breakpointDistanceM } from "../../../lib/radio/breakpoint";
import { umiLosDb, umiNlosDb } from "../../../lib/radio/umi";

describe("umiLosDb / umiNlosDb", () => {
  it("umiLosDb(d, fc) stays continuous at the breakpoint", () => {
    const dbp = breakpointDistanceM(3.5, 10, 1.5);
    const below = umiLosDb(dbp - 1e-6, Math.hypot(dbp - 1e-6, 8.5), 3.5, 10, 1.5);
    const above = umiLosDb(dbp + 1e-6, Math.hypot(dbp + 1e-6, 8.5), 3.5, 10, 1.5);
    expect(Math.abs(above - below)).toBeLessThan(1e-4);
  });
  it("umiNlosDb is never below umiLosDb", () => {
    for (let d = 10; d <= 5000; d *= 1.7) {
      const d3 = Math.hypot(d, 8.5);
      expect(umiNlosDb(d, d3, 3.5, 10, 1.5)).toBeGreaterThanOrEqual(umiLosDb(d, d3, 3.5, 10, 1.5));
    }
  });
});
