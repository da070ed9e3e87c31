import { describe, expect, it } from "vitest";
import { validateChanges, validateScenario } from "../../../lib/radio/validation";
import { prepareEngine } from "../../../lib/radio/engine";
import type { Cell } from "../../../lib/radio/scenario";
import { tinyScenario } from "./scenarioFixtures";

function withCell(patch: Partial<Cell>) {
  const s = tinyScenario();
  s.cells = [{ ...s.cells[0], ...patch }];
  return s;
}

describe("validateScenario", () => {
  const cases: [string, Partial<Cell>, RegExp][] = [
    ["an unknown beam set", { beamSetId: "nope" }, /cell "C1": beamSetId = "nope"/],
    ["a beam set the model does not support", { beamSetId: "hot-spot-4" }, /cell "C1": beamSetId = "hot-spot-4" is not supported/],
    ["an unknown antenna model", { antennaModelId: "ghost" }, /cell "C1": antennaModelId = "ghost"/],
    ["an electrical tilt above the model's range", { electricalTiltDeg: 16 }, /cell "C1": electricalTiltDeg = 16 .*\[0, 15\]/],
    ["a mechanical tilt below the model's range", { mechanicalTiltDeg: -5 }, /cell "C1": mechanicalTiltDeg = -5/],
    ["a power outside the model's range", { rsPowerDbm: 40 }, /cell "C1": rsPowerDbm = 40/],
    ["an azimuth of 360", { azimuthDeg: 360 }, /cell "C1": azimuthDeg = 360 is outside \[0, 360\)/],
    ["a negative azimuth", { azimuthDeg: -1 }, /cell "C1": azimuthDeg = -1/],
    ["an unknown site", { siteId: "S9" }, /cell "C1": siteId = "S9"/],
  ];
  for (const [what, patch, message] of cases) {
    it(`validateScenario throws a RangeError for ${what}, naming cell, field and value`, () => {
      expect(() => validateScenario(withCell(patch))).toThrow(RangeError);
      expect(() => validateScenario(withCell(patch))).toThrow(message);
    });
  }
  it("validateScenario throws for a site outside the bounds, before prepareEngine computes anything", () => {
    const s = tinyScenario();
    s.sites = [{ ...s.sites[0], x: 500 }];
    expect(() => validateScenario(s)).toThrow(/cell "C1": siteId = "S1" site at \(500, 30\) lies outside the bounds/);
    // an invalid terrain would fail later in the grid stage: the cell error comes first
    s.terrain = { ...s.terrain, width: 99 };
    expect(() => prepareEngine(s)).toThrow(/cell "C1"/);
  });
  it("engine.evaluate refuses an out-of-range change before computing", () => {
    const engine = prepareEngine(tinyScenario());
    expect(() => engine.evaluate([{ cellId: "C1", parameter: "electricalTiltDeg", value: 30 }])).toThrow(/cell "C1": electricalTiltDeg = 30/);
    expect(() => engine.evaluate([{ cellId: "C1", parameter: "beamSetId", value: "unknown" }])).toThrow(RangeError);
  });
});

describe("validateChanges", () => {
  it("validateChanges refuses an unknown cell, an unknown parameter and a value of the wrong type", () => {
    const s = tinyScenario();
    expect(() => validateChanges(s, [{ cellId: "X", parameter: "azimuthDeg", value: 1 }])).toThrow(/cellId "X"/);
    expect(() => validateChanges(s, [{ cellId: "C1", parameter: "height" as never, value: 1 }])).toThrow(/parameter "height"/);
    expect(() => validateChanges(s, [{ cellId: "C1", parameter: "azimuthDeg", value: "10" }])).toThrow(/azimuthDeg = "10"/);
    expect(() => validateChanges(s, [{ cellId: "C1", parameter: "beamSetId", value: 3 }])).toThrow(RangeError);
  });
});
