import { describe, expect, it } from "vitest";
import { elementGainDbi } from "../../../lib/radio/elementPattern";

const element = { elementHBeamwidthDeg: 65, elementVBeamwidthDeg: 40, elementGainDbi: 8, frontToBackDb: 25, sideLobeLevelDb: 20 };

describe("elementGainDbi", () => {
  it("elementGainDbi is symmetric left/right and up/down about boresight", () => {
    for (const a of [5, 20, 47, 90, 140]) {
      expect(elementGainDbi(element, 90, a)).toBe(elementGainDbi(element, 90, -a));
    }
    for (const a of [3, 15, 33, 80]) expect(elementGainDbi(element, 90 + a, 10)).toBeCloseTo(elementGainDbi(element, 90 - a, 10), 12);
  });
  it("elementGainDbi uses SLA_V for the vertical floor and A_max for the total floor", () => {
    expect(elementGainDbi(element, 0, 0)).toBe(8 - 20);
    expect(elementGainDbi(element, 0, 180)).toBe(8 - 25);
  });
});
