import { describe, expect, it } from "vitest";
import { fresnelParameter, knifeEdgeLossDb } from "../../../lib/radio/knifeEdge";

describe("knifeEdgeLossDb / fresnelParameter", () => {
  it("knifeEdgeLossDb(ν) rises monotonically for ν > −0.78", () => {
    let previous = -Infinity;
    for (let nu = -0.77; nu < 10; nu += 0.05) {
      const j = knifeEdgeLossDb(nu);
      expect(j).toBeGreaterThan(previous);
      previous = j;
    }
  });
  it("fresnelParameter is negative below the line and symmetric in d1, d2", () => {
    expect(fresnelParameter(-5, 100, 300, 0.1)).toBeLessThan(0);
    expect(fresnelParameter(5, 100, 300, 0.1)).toBeCloseTo(fresnelParameter(5, 300, 100, 0.1), 12);
  });
});
