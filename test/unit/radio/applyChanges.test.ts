import { describe, expect, it } from "vitest";
import { applyChanges } from "../../../lib/radio/applyChanges";
import { tinyScenario } from "./scenarioFixtures";

describe("applyChanges", () => {
  it("applyChanges copies only the changed cells, the later change winning, and leaves the input untouched", () => {
    const s = tinyScenario();
    s.cells.push({ ...s.cells[0], id: "C2" });
    const out = applyChanges(s, [
      { cellId: "C1", parameter: "azimuthDeg", value: 100 },
      { cellId: "C1", parameter: "azimuthDeg", value: 120 },
      { cellId: "C1", parameter: "beamSetId", value: "dual-layer" },
    ]);
    expect(out.cells[0].azimuthDeg).toBe(120);
    expect(out.cells[0].beamSetId).toBe("dual-layer");
    expect(s.cells[0].azimuthDeg).toBe(90);
    expect(out.cells[1]).toBe(s.cells[1]);
    expect(applyChanges(s, [])).toBe(s);
  });
});
