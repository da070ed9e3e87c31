import { describe, expect, it } from "vitest";
import { wallPenetrationLossDb } from "../../../lib/radio/buildingEntry";

describe("wallPenetrationLossDb", () => {
  it("wallPenetrationLossDb: the high-loss model always loses more than the low-loss one, and both grow with f", () => {
    let low = 0, high = 0;
    for (const f of [0.7, 1.8, 2.6, 3.5, 6, 28]) {
      const l = wallPenetrationLossDb("low", f), h = wallPenetrationLossDb("high", f);
      expect(h).toBeGreaterThan(l);
      expect(l).toBeGreaterThan(low);
      expect(h).toBeGreaterThan(high);
      low = l;
      high = h;
    }
  });
});
