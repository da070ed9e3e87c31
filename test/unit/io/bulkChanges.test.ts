import { describe, expect, it } from "vitest";
import { parameterOfName, parseBulkChangesCsv, parseBulkChangesUpload } from "../../../lib/io/bulkChanges";
import { validateItems } from "../../../lib/changes/validate";
import { ANTENNA_MODEL_CATALOGUE, BEAM_SET_CATALOGUE } from "../../../lib/radio/beamSets";
import type { Cell } from "../../../lib/radio/scenario";

describe("parameterOfName(name)", () => {
  it("accepts the cells.csv names, short names and the model's names", () => {
    expect(parameterOfName("azimuth")).toBe("azimuthDeg");
    expect(parameterOfName("Azimuth (deg)")).toBe("azimuthDeg");
    expect(parameterOfName("azimuthDeg")).toBe("azimuthDeg");
    expect(parameterOfName("mechanical_tilt")).toBe("mechanicalTiltDeg");
    expect(parameterOfName("electrical tilt")).toBe("electricalTiltDeg");
    expect(parameterOfName("beam_set")).toBe("beamSetId");
    expect(parameterOfName("beamSetId")).toBe("beamSetId");
    expect(parameterOfName("rs_power")).toBe("rsPowerDbm");
    expect(parameterOfName("rsPowerDbm")).toBe("rsPowerDbm");
    // Columns of cells.csv that no change request alters are not parameters.
    expect(parameterOfName("antenna_height_m")).toBeUndefined();
    expect(parameterOfName("tilt")).toBeUndefined();
  });
});

describe("parseBulkChangesCsv(text, fileName)", () => {
  it("reads the long layout (cell, parameter, new value) into items", () => {
    const text = "cell_id,parameter,new_value\nS1-A,azimuth,35\nS1-A,electrical_tilt,6\nS2-A,beam_set,dual-layer\nS2-A,rsPowerDbm,12.5\n";
    const { items, problems } = parseBulkChangesCsv(text, "changes.csv");
    expect(problems).toEqual([]);
    expect(items).toEqual([
      { cellId: "S1-A", parameter: "azimuthDeg", newValue: 35 },
      { cellId: "S1-A", parameter: "electricalTiltDeg", newValue: 6 },
      { cellId: "S2-A", parameter: "beamSetId", newValue: "dual-layer" },
      { cellId: "S2-A", parameter: "rsPowerDbm", newValue: 12.5 },
    ]);
  });

  it("reads the wide layout, one column per parameter, empty meaning unchanged", () => {
    const text = "Cell,Azimuth,Mechanical tilt,Beam set,comment\nS1-A,35,,,turn east\nS1-B,,4,broad-single,\n";
    const { items, problems } = parseBulkChangesCsv(text, "changes.csv");
    expect(problems.filter((p) => p.severity === "error")).toEqual([]);
    expect(items).toEqual([
      { cellId: "S1-A", parameter: "azimuthDeg", newValue: 35 },
      { cellId: "S1-B", parameter: "mechanicalTiltDeg", newValue: 4 },
      { cellId: "S1-B", parameter: "beamSetId", newValue: "broad-single" },
    ]);
  });

  it("reports every bad row with file, row and column, and then returns no items", () => {
    const text = [
      "cell,parameter,value",
      "S1-A,azimuth,north",
      "S1-A,tilt,3",
      "S1-B,mechanical_tilt,NaN",
      "S1-B,beam_set,",
      ",azimuth,10",
      "S2-A,azimuth,10",
      "S2-A,azimuth_deg,20",
      "S2-B,rs_power",
    ].join("\n");
    const { items, problems } = parseBulkChangesCsv(text, "changes.csv");
    expect(items).toEqual([]);
    const where = problems.map((p) => [p.row, p.column, p.reason.split(/[;(:]/)[0].trim()]);
    expect(where).toEqual([
      [2, "value", "not a finite number"],
      [3, "parameter", 'unknown parameter "tilt"'],
      [4, "value", "not a finite number"],
      [5, "value", "empty"],
      [6, "cell", "empty cell id"],
      [8, "value", "duplicate change"],
      [9, undefined, "expected 3 fields, found 2"],
    ]);
    expect(problems.every((p) => p.file === "changes.csv" && p.severity === "error")).toBe(true);
  });

  it("refuses a misspelt parameter column in the wide layout and a file with no change columns", () => {
    const misspelt = parseBulkChangesCsv("cell_id,rs_power,azimuht\nS1-A,10,20\n", "c.csv");
    expect(misspelt.items).toEqual([]);
    expect(misspelt.problems).toEqual([expect.objectContaining({ severity: "error", row: 1, column: "azimuht" })]);
    const none = parseBulkChangesCsv("cell_id,site_id\nS1-A,S1\n", "c.csv");
    expect(none.problems.some((p) => /no change columns/.test(p.reason))).toBe(true);
  });

  it("refuses a semicolon file, a header-only file and an empty upload clearly", () => {
    expect(parseBulkChangesCsv("cell;parameter;value\nS1-A;azimuth;3\n", "c.csv").problems[0].reason).toMatch(/wrong delimiter.*semicolon/);
    expect(parseBulkChangesCsv("cell,parameter,value\n", "c.csv").problems[0].reason).toMatch(/header only/);
    expect(parseBulkChangesUpload(new Uint8Array(0), "c.csv").problems[0].reason).toMatch(/empty file/);
    expect(parseBulkChangesUpload(new Uint8Array([0xff, 0xfe, 0x63, 0]), "c.csv").problems[0].reason).toMatch(/UTF-16/);
  });

  it("gives items that lib/changes validateItems accepts as they are", () => {
    const cell: Cell = {
      id: "S1-A",
      siteId: "S1",
      antennaModelId: "panel-8x4",
      antennaHeightM: 25,
      azimuthDeg: 0,
      mechanicalTiltDeg: 2,
      electricalTiltDeg: 4,
      beamSetId: "broad-single",
      rsPowerDbm: 18,
      frequencyMHz: 1800,
      bandwidthMHz: 20,
      subcarrierSpacingKHz: 15,
    };
    const { items } = parseBulkChangesCsv("cell_id,parameter,new_value\nS1-A,azimuth,35\nS1-A,beam_set,dual-layer\n", "c.csv");
    const result = validateItems(items, new Map([[cell.id, cell]]), ANTENNA_MODEL_CATALOGUE, BEAM_SET_CATALOGUE);
    expect(result.items.map((i) => [i.parameter, i.oldValue, i.newValue])).toEqual([
      ["azimuthDeg", 0, 35],
      ["beamSetId", "broad-single", "dual-layer"],
    ]);
  });
});

describe("parseBulkChangesCsv(text) sources", () => {
  it("names the CSV row and column of every item, in the long layout and the wide one", () => {
    const long = parseBulkChangesCsv("cell_id,parameter,new_value\nC1,azimuth,40\n\nC2,e_tilt,3\n", "long.csv");
    expect(long.problems.filter((p) => p.severity === "error")).toEqual([]);
    expect(long.items.map((i) => i.cellId)).toEqual(["C1", "C2"]);
    // the file's own line numbers: a blank line makes item 1 row 4, not i + 2 = 3
    expect(long.sources).toEqual([
      { row: 2, column: "new_value" },
      { row: 4, column: "new_value" },
    ]);
    const wide = parseBulkChangesCsv("cell_id,azimuth_deg,electrical_tilt_deg\nC1,10,\nC2,20,4\n", "wide.csv");
    expect(wide.sources).toEqual([
      { row: 2, column: "azimuth_deg" },
      { row: 3, column: "azimuth_deg" },
      { row: 3, column: "electrical_tilt_deg" },
    ]);
  });

  it("gives no sources when any problem is an error", () => {
    const bad = parseBulkChangesCsv("cell_id,parameter,new_value\nC1,azimuth,north\n", "bad.csv");
    expect(bad.items).toEqual([]);
    expect(bad.sources).toEqual([]);
  });
});
