import { describe, expect, it } from "vitest";
import { validateItems, rangeOf, sameValue, type ItemLike } from "../../../lib/changes/validate";
import { DomainError, type IssueDetail } from "../../../lib/changes/errors";
import type { AntennaModel, BeamSet, Cell } from "../../../lib/radio/scenario";

// Invented hardware and cells for the tests.
const model: AntennaModel = {
  id: "AM-A",
  name: "Test panel",
  elementHBeamwidthDeg: 65,
  elementVBeamwidthDeg: 65,
  elementGainDbi: 8,
  frontToBackDb: 30,
  sideLobeLevelDb: 30,
  rows: 8,
  columns: 4,
  verticalSpacingWl: 0.5,
  horizontalSpacingWl: 0.5,
  electricalTiltMinDeg: 2,
  electricalTiltMaxDeg: 12,
  mechanicalTiltMinDeg: -5,
  mechanicalTiltMaxDeg: 10,
  rsPowerMinDbm: 0,
  rsPowerMaxDbm: 24,
  beamSetIds: ["wide", "sweep"],
};
const unranged: AntennaModel = { ...model, id: "AM-B", electricalTiltMinDeg: NaN, electricalTiltMaxDeg: NaN };
const beamSets: BeamSet[] = ["wide", "sweep", "tower"].map((id) => ({ id, name: id, description: "", beams: [] }));

function cell(id: string, antennaModelId = "AM-A"): Cell {
  return {
    id,
    siteId: "S1",
    antennaModelId,
    antennaHeightM: 25,
    azimuthDeg: 120,
    mechanicalTiltDeg: 2,
    electricalTiltDeg: 4,
    beamSetId: "wide",
    rsPowerDbm: 15,
    frequencyMHz: 3500,
    bandwidthMHz: 100,
    subcarrierSpacingKHz: 30,
  };
}
const cells = new Map([cell("C1"), cell("C2"), cell("C3", "AM-B"), cell("C4", "AM-missing")].map((c) => [c.id, c]));
const models = [model, unranged];

function problems(items: ItemLike[]): IssueDetail[] {
  try {
    validateItems(items, cells, models, beamSets);
  } catch (error) {
    if (error instanceof DomainError && error.code === "invalid") return [...error.details];
    throw error;
  }
  throw new Error("expected the items to be refused");
}

function only(item: ItemLike): IssueDetail {
  const found = problems([item]);
  expect(found).toHaveLength(1);
  return found[0];
}

describe("validateItems(items, cells, antennaModels, beamSets)", () => {
  it("fills old values from the baseline and keeps positions", () => {
    const result = validateItems(
      [
        { cellId: "C1", parameter: "electricalTiltDeg", newValue: 8 },
        { cellId: "C2", parameter: "beamSetId", newValue: "sweep" },
        { cellId: "C1", parameter: "azimuthDeg", newValue: 0 },
      ],
      cells,
      new Map(models.map((m) => [m.id, m])),
      beamSets,
    );
    expect(result.items).toEqual([
      { position: 0, cellId: "C1", parameter: "electricalTiltDeg", oldValue: 4, newValue: 8, unchanged: false },
      { position: 1, cellId: "C2", parameter: "beamSetId", oldValue: "wide", newValue: "sweep", unchanged: false },
      { position: 2, cellId: "C1", parameter: "azimuthDeg", oldValue: 120, newValue: 0, unchanged: false },
    ]);
    expect(result.warnings).toEqual([]);
  });

  it("refuses an unknown cell, naming it", () => {
    expect(only({ cellId: "C9", parameter: "azimuthDeg", newValue: 10 })).toEqual({
      path: "items[0].cellId",
      message: 'unknown cell "C9"',
    });
  });

  it("refuses an unknown parameter, listing the known ones", () => {
    const issue = only({ cellId: "C1", parameter: "heightM", newValue: 10 });
    expect(issue.path).toBe("items[0].parameter");
    expect(issue.message).toContain('"heightM"');
    expect(issue.message).toContain("rsPowerDbm");
  });

  it("refuses a cell whose antenna model is not in the catalogue", () => {
    expect(only({ cellId: "C4", parameter: "azimuthDeg", newValue: 10 }).message).toContain('"AM-missing"');
  });

  it("refuses a string for a number and a number for a beam set", () => {
    expect(only({ cellId: "C1", parameter: "azimuthDeg", newValue: "90" })).toEqual({
      path: "items[0].newValue",
      message: 'azimuth must be a finite number, got "90"',
    });
    expect(only({ cellId: "C1", parameter: "beamSetId", newValue: 2 }).message).toBe("beam set must be a beam-set id, got 2");
    expect(only({ cellId: "C1", parameter: "rsPowerDbm", newValue: NaN }).message).toContain("got NaN");
  });

  it("accepts azimuth 0 and 359.9, refuses 360 and -0.1", () => {
    expect(validateItems([{ cellId: "C1", parameter: "azimuthDeg", newValue: 359.9 }], cells, models, beamSets).items).toHaveLength(1);
    expect(validateItems([{ cellId: "C1", parameter: "azimuthDeg", newValue: 0 }], cells, models, beamSets).items).toHaveLength(1);
    expect(only({ cellId: "C1", parameter: "azimuthDeg", newValue: 360 }).message).toBe(
      'azimuth 360° is outside [0, 360)° for cell "C1" (north is 0, not 360)',
    );
    expect(only({ cellId: "C1", parameter: "azimuthDeg", newValue: -0.1 }).message).toContain("-0.1°");
  });

  it("checks electrical tilt against the model's range, inclusive at both ends", () => {
    for (const ok of [2, 12]) {
      expect(validateItems([{ cellId: "C1", parameter: "electricalTiltDeg", newValue: ok }], cells, models, beamSets).items).toHaveLength(1);
    }
    expect(only({ cellId: "C1", parameter: "electricalTiltDeg", newValue: 13 }).message).toBe(
      'electrical tilt 13° is outside 2–12° for antenna model "AM-A" of cell "C1"',
    );
    expect(only({ cellId: "C1", parameter: "electricalTiltDeg", newValue: 1.5 }).message).toContain("1.5°");
  });

  it("falls back to 0–15° electrical tilt when the model gives no range", () => {
    expect(rangeOf(unranged, "electricalTiltDeg")).toEqual({ min: 0, max: 15 });
    expect(validateItems([{ cellId: "C3", parameter: "electricalTiltDeg", newValue: 15 }], cells, models, beamSets).items).toHaveLength(1);
    expect(only({ cellId: "C3", parameter: "electricalTiltDeg", newValue: 15.5 }).message).toContain("0–15°");
  });

  it("checks mechanical tilt and RS power against the model's ranges", () => {
    expect(only({ cellId: "C1", parameter: "mechanicalTiltDeg", newValue: -6 }).message).toBe(
      'mechanical tilt -6° is outside -5–10° for antenna model "AM-A" of cell "C1"',
    );
    expect(only({ cellId: "C1", parameter: "rsPowerDbm", newValue: 24.5 }).message).toBe(
      'RS power 24.5 dBm is outside 0–24 dBm for antenna model "AM-A" of cell "C1"',
    );
    expect(validateItems([{ cellId: "C1", parameter: "rsPowerDbm", newValue: 0 }], cells, models, beamSets).items).toHaveLength(1);
  });

  it("refuses an unknown beam set and one the hardware does not list", () => {
    expect(only({ cellId: "C1", parameter: "beamSetId", newValue: "pencil" }).message).toBe('unknown beam set "pencil"');
    expect(only({ cellId: "C1", parameter: "beamSetId", newValue: "tower" }).message).toBe(
      'beam set "tower" is not supported by antenna model "AM-A" of cell "C1" (supported: "wide", "sweep")',
    );
  });

  it("refuses the same (cell, parameter) twice, pointing at the first", () => {
    const found = problems([
      { cellId: "C1", parameter: "azimuthDeg", newValue: 10 },
      { cellId: "C2", parameter: "azimuthDeg", newValue: 10 },
      { cellId: "C1", parameter: "azimuthDeg", newValue: 20 },
    ]);
    expect(found).toEqual([
      { path: "items[2].parameter", message: 'duplicate of items[0]: cell "C1" azimuthDeg may appear only once per request' },
    ]);
  });

  it("collects every problem with its item index into one error", () => {
    try {
      validateItems(
        [
          { cellId: "C1", parameter: "azimuthDeg", newValue: 10 },
          { cellId: "C9", parameter: "azimuthDeg", newValue: 10 },
          { cellId: "C1", parameter: "electricalTiltDeg", newValue: 40 },
          { cellId: "C2", parameter: "beamSetId", newValue: "tower" },
        ],
        cells,
        models,
        beamSets,
      );
      expect.unreachable();
    } catch (error) {
      const e = error as DomainError;
      expect(e.code).toBe("invalid");
      expect(e.details.map((d) => d.path)).toEqual(["items[1].cellId", "items[2].newValue", "items[3].newValue"]);
      expect(e.message).toMatch(/^3 problems in the items: items\[1\]\.cellId: unknown cell "C9"; items\[2\]/);
    }
  });

  it("refuses an empty list", () => {
    expect(problems([])).toEqual([{ path: "items", message: "a request needs at least one item" }]);
  });

  it("warns, without refusing, when the new value equals the old one", () => {
    const result = validateItems(
      [
        { cellId: "C1", parameter: "electricalTiltDeg", newValue: 4 },
        { cellId: "C1", parameter: "beamSetId", newValue: "wide" },
      ],
      cells,
      models,
      beamSets,
    );
    expect(result.items.map((i) => i.unchanged)).toEqual([true, true]);
    expect(result.warnings).toEqual([
      { path: "items[0].newValue", message: 'electrical tilt of cell "C1" is already 4°; this item changes nothing' },
      { path: "items[1].newValue", message: 'beam set of cell "C1" is already "wide"; this item changes nothing' },
    ]);
  });

  it("sameValue(a, b) ignores float noise but not real differences", () => {
    expect(sameValue(0.1 + 0.2, 0.3)).toBe(true);
    expect(sameValue(4, 4.01)).toBe(false);
    expect(sameValue("wide", "Wide")).toBe(false);
    expect(sameValue(4, "4")).toBe(false);
  });
});
