import { mkdtemp, readFile, rm, unlink, writeFile } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { generateDemoTown } from "../../../lib/io/demoTown";
import {
  formatAsciiGrid,
  formatCsv,
  formatFloat32,
  formatScenarioFiles,
  normaliseHeader,
  parseAsciiGrid,
  parseCsv,
  parseScenarioFiles,
  parseSitesCsv,
  readScenarioFolder,
  SCENARIO_FILES,
  ScenarioFormatError,
  writeScenarioFolder,
  type FormatProblem,
  type ScenarioFiles,
} from "../../../lib/io/scenarioFolder";
import { createRandom } from "../../../lib/io/random";
import type { Raster } from "../../../lib/radio/scenario";

const demo = generateDemoTown(7);
const goodFiles = formatScenarioFiles(demo);

/** The demo's files with one file rewritten. */
function withFile(name: keyof ScenarioFiles, edit: (text: string) => string | undefined): ScenarioFiles {
  const files = { ...goodFiles };
  const next = edit(files[name]!);
  if (next === undefined) delete files[name];
  else files[name] = next;
  return files;
}

/** Replaces the field `column` on CSV line `row` (1-based; header = 1). */
function setCsvField(text: string, row: number, column: string, value: string): string {
  const lines = text.split("\n");
  const header = lines[0].split(",");
  const k = header.indexOf(column);
  if (k < 0) throw new Error(`no column ${column}`);
  const fields = lines[row - 1].split(",");
  fields[k] = value;
  lines[row - 1] = fields.join(",");
  return lines.join("\n");
}

function errorsOf(files: ScenarioFiles): FormatProblem[] {
  const report = parseScenarioFiles(files);
  expect(report.scenario).toBeUndefined();
  return report.errors;
}

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "beamgate-io-"));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe("writeScenarioFolder / readScenarioFolder", () => {
  it("readScenarioFolder(writeScenarioFolder(demo)) deep-equals the demo, Float32 rasters included, with no warnings", async () => {
    const folder = path.join(dir, "roundtrip");
    await writeScenarioFolder(folder, demo);
    const warnings: FormatProblem[] = [];
    const back = await readScenarioFolder(folder, { onWarnings: (w) => warnings.push(...w) });
    expect(back).toEqual(demo);
    expect(back.terrain.values).toBeInstanceOf(Float32Array);
    expect(back.traffic!.values).toBeInstanceOf(Float32Array);
    expect(Array.from(back.terrain.values)).toEqual(Array.from(demo.terrain.values));
    expect(warnings).toEqual([]);
  });

  it("writeScenarioFolder writes the documented files with the documented headers", async () => {
    const folder = path.join(dir, "files");
    await writeScenarioFolder(folder, demo);
    const sites = await readFile(path.join(folder, SCENARIO_FILES.sites), "utf8");
    const cells = await readFile(path.join(folder, SCENARIO_FILES.cells), "utf8");
    expect(sites.split("\n")[0]).toBe("site_id,name,x_m,y_m,ground_m");
    expect(cells.split("\n")[0]).toBe(
      "cell_id,site_id,antenna_model,antenna_height_m,azimuth_deg,mechanical_tilt_deg,electrical_tilt_deg,beam_set,rs_power_dbm,frequency_mhz,bandwidth_mhz,scs_khz",
    );
    const buildings = JSON.parse(await readFile(path.join(folder, SCENARIO_FILES.buildings), "utf8"));
    expect(buildings.type).toBe("FeatureCollection");
    expect(buildings.crs.properties.name).toBe("beamgate:local-metres");
    const ring = buildings.features[0].geometry.coordinates[0];
    expect(ring[0]).toEqual(ring[ring.length - 1]);
    const terrain = await readFile(path.join(folder, SCENARIO_FILES.terrain), "utf8");
    expect(terrain.split("\n").slice(0, 5)).toEqual(["ncols 160", "nrows 120", "xllcorner 0", "yllcorner 0", "cellsize 10"]);
  });

  it("writeScenarioFolder of a scenario without traffic removes a stale traffic.asc, and the read gives no traffic", async () => {
    const folder = path.join(dir, "no-traffic");
    await writeScenarioFolder(folder, demo);
    const { traffic: _unused, ...rest } = demo;
    await writeScenarioFolder(folder, rest);
    const back = await readScenarioFolder(folder);
    expect(back.traffic).toBeUndefined();
    expect(back).toEqual(rest);
  });

  it("readScenarioFolder throws ScenarioFormatError listing every problem of the folder", async () => {
    const folder = path.join(dir, "broken");
    await writeScenarioFolder(folder, demo);
    await unlink(path.join(folder, SCENARIO_FILES.cells));
    await writeFile(path.join(folder, SCENARIO_FILES.antennas), "[{", "utf8");
    const sites = await readFile(path.join(folder, SCENARIO_FILES.sites), "utf8");
    await writeFile(path.join(folder, SCENARIO_FILES.sites), setCsvField(sites, 3, "x_m", "abc"), "utf8");
    const error = await readScenarioFolder(folder).then(
      () => undefined,
      (e: unknown) => e,
    );
    expect(error).toBeInstanceOf(ScenarioFormatError);
    const problems = (error as ScenarioFormatError).problems;
    expect(problems).toContainEqual(expect.objectContaining({ file: "cells.csv", reason: "missing file" }));
    expect(problems).toContainEqual(expect.objectContaining({ file: "antennas.json", reason: expect.stringMatching(/malformed JSON/) }));
    expect(problems).toContainEqual(expect.objectContaining({ file: "sites.csv", row: 3, column: "x_m", value: "abc" }));
    const message = (error as Error).message;
    expect(message).toMatch(/cells\.csv: missing file/);
    expect(message).toMatch(/sites\.csv row 3, column x_m, value "abc": not a finite number/);
  });
});

describe("bad input: each problem names its file, row and column", () => {
  const cases: [string, () => ScenarioFiles, Partial<FormatProblem> & { reason?: unknown }][] = [
    ["missing file", () => withFile("terrain.asc", () => undefined), { file: "terrain.asc", reason: "missing file" }],
    [
      "missing column",
      () => withFile("sites.csv", (t) => t.split("\n").map((l) => l.split(",").slice(0, 4).join(",")).join("\n")),
      { file: "sites.csv", row: 1, column: "ground_m", reason: "missing column" },
    ],
    [
      "bad number",
      () => withFile("cells.csv", (t) => setCsvField(t, 4, "azimuth_deg", "12,5".replace(",", ";"))),
      { file: "cells.csv", row: 4, column: "azimuth_deg", value: "12;5", reason: "not a finite number" },
    ],
    [
      "NaN",
      () => withFile("cells.csv", (t) => setCsvField(t, 2, "rs_power_dbm", "NaN")),
      { file: "cells.csv", row: 2, column: "rs_power_dbm", value: "NaN", reason: "not a finite number" },
    ],
    [
      "Infinity",
      () => withFile("sites.csv", (t) => setCsvField(t, 5, "ground_m", "Infinity")),
      { file: "sites.csv", row: 5, column: "ground_m", value: "Infinity" },
    ],
    [
      "empty number",
      () => withFile("cells.csv", (t) => setCsvField(t, 3, "antenna_height_m", "")),
      { file: "cells.csv", row: 3, column: "antenna_height_m", reason: "empty; a number is required" },
    ],
    [
      "azimuth out of range",
      () => withFile("cells.csv", (t) => setCsvField(t, 3, "azimuth_deg", "360")),
      { file: "cells.csv", row: 3, column: "azimuth_deg", value: "360", reason: "must be less than 360" },
    ],
    [
      "duplicate id",
      () => withFile("sites.csv", (t) => setCsvField(t, 3, "site_id", demo.sites[0].id)),
      { file: "sites.csv", row: 3, column: "site_id", value: demo.sites[0].id, reason: "duplicate id" },
    ],
    [
      "unknown site reference",
      () => withFile("cells.csv", (t) => setCsvField(t, 6, "site_id", "NOPE99")),
      { file: "cells.csv", row: 6, column: "site_id", value: "NOPE99", reason: "unknown site (not in sites.csv)" },
    ],
    [
      "unknown beam set",
      () => withFile("cells.csv", (t) => setCsvField(t, 2, "beam_set", "pencil-999")),
      { file: "cells.csv", row: 2, column: "beam_set", value: "pencil-999", reason: "unknown beam set (not in beamsets.json)" },
    ],
    [
      "unknown antenna model",
      () => withFile("cells.csv", (t) => setCsvField(t, 2, "antenna_model", "panel-x")),
      { file: "cells.csv", row: 2, column: "antenna_model", value: "panel-x", reason: "unknown antenna model (not in antennas.json)" },
    ],
    [
      "beam set the antenna does not support",
      () => {
        // A passive single-column panel lists only "broad-single".
        const row = demo.cells.findIndex((c) => c.antennaModelId === "passive-8x1-1800") + 2;
        return withFile("cells.csv", (t) => setCsvField(t, row, "beam_set", "high-rise-stack"));
      },
      { file: "cells.csv", column: "beam_set", value: "high-rise-stack", reason: "beam set not supported by antenna model passive-8x1-1800" },
    ],
    [
      "tilt outside the antenna range",
      () => withFile("cells.csv", (t) => setCsvField(t, 2, "electrical_tilt_deg", "40")),
      { file: "cells.csv", row: 2, column: "electrical_tilt_deg", value: "40" },
    ],
    [
      "wrong number of fields",
      () => withFile("cells.csv", (t) => t.replace(/\n([^\n]*)\n/, (_m, line: string) => `\n${line},extra\n`)),
      { file: "cells.csv", row: 2, reason: "expected 12 fields, found 13" },
    ],
    [
      "polygon with fewer than 3 points",
      () =>
        withFile("buildings.geojson", (t) => {
          const g = JSON.parse(t);
          g.features[4].geometry.coordinates = [[[0, 0], [10, 0], [0, 0]]];
          return JSON.stringify(g);
        }),
      { file: "buildings.geojson", row: 5, column: "geometry.coordinates[0]" },
    ],
    [
      "polygon not closed",
      () =>
        withFile("clusters.geojson", (t) => {
          const g = JSON.parse(t);
          g.features[1].geometry.coordinates[0].pop();
          return JSON.stringify(g);
        }),
      {
        file: "clusters.geojson",
        row: 2,
        column: "geometry.coordinates[0]",
        reason: "polygon ring is not closed (the last position must repeat the first)",
      },
    ],
    [
      "building with no height",
      () =>
        withFile("buildings.geojson", (t) => {
          const g = JSON.parse(t);
          delete g.features[9].properties.height_m;
          return JSON.stringify(g);
        }),
      { file: "buildings.geojson", row: 10, column: "properties.height_m", reason: "building has no height" },
    ],
    [
      "duplicate building id",
      () =>
        withFile("buildings.geojson", (t) => {
          const g = JSON.parse(t);
          g.features[3].properties.id = g.features[0].properties.id;
          return JSON.stringify(g);
        }),
      { file: "buildings.geojson", row: 4, column: "properties.id", reason: "duplicate id" },
    ],
    [
      "coordinates in degrees",
      () => withFile("buildings.geojson", (t) => t.replace("beamgate:local-metres", "urn:ogc:def:crs:OGC:1.3:CRS84")),
      { file: "buildings.geojson", column: "crs" },
    ],
    ["malformed JSON", () => withFile("beamsets.json", (t) => t.slice(0, -5)), { file: "beamsets.json", reason: expect.stringMatching(/^malformed JSON/) }],
    [
      "antenna field of the wrong type",
      () =>
        withFile("antennas.json", (t) => {
          const a = JSON.parse(t);
          a[2].rows = "four";
          return JSON.stringify(a);
        }),
      { file: "antennas.json", row: 3, column: "rows", value: "four", reason: "not a finite number" },
    ],
    [
      "antenna lists an unknown beam set",
      () =>
        withFile("antennas.json", (t) => {
          const a = JSON.parse(t);
          a[0].beamSetIds.push("ghost");
          return JSON.stringify(a);
        }),
      { file: "antennas.json", row: 1, column: "beamSetIds[1]", value: "ghost" },
    ],
    [
      "beam with zero width",
      () =>
        withFile("beamsets.json", (t) => {
          const b = JSON.parse(t);
          b[2].beams[3].widthDeg = 0;
          return JSON.stringify(b);
        }),
      { file: "beamsets.json", row: 3, column: "beams[3].widthDeg", reason: "must be greater than 0" },
    ],
    [
      "raster header key missing",
      () => withFile("terrain.asc", (t) => t.replace(/^ncols.*\n/, "")),
      { file: "terrain.asc", column: "ncols", reason: "missing header key" },
    ],
    [
      "raster header value bad",
      () => withFile("terrain.asc", (t) => t.replace("cellsize 10", "cellsize -10")),
      { file: "terrain.asc", row: 5, column: "cellsize", reason: "must be greater than 0" },
    ],
    [
      "raster with too few values",
      () => withFile("terrain.asc", (t) => { const l = t.split("\n"); l[6] = l[6].replace(/ [^ ]+$/, ""); return l.join("\n"); }),
      { file: "terrain.asc", reason: "expected 19200 values (ncols 160 × nrows 120), found 19199" },
    ],
    [
      "raster line with too few values",
      () => withFile("terrain.asc", (t) => { const l = t.split("\n"); l[6] = l[6].replace(/ [^ ]+$/, ""); return l.join("\n"); }),
      { file: "terrain.asc", row: 7, reason: "expected 160 values on this line, found 159" },
    ],
    [
      "raster value not a number",
      () => withFile("terrain.asc", (t) => { const l = t.split("\n"); const v = l[8].split(" "); v[4] = "x1"; l[8] = v.join(" "); return l.join("\n"); }),
      { file: "terrain.asc", row: 9, column: "5", value: "x1", reason: "not a finite number" },
    ],
    [
      "terrain NODATA cell",
      () => withFile("terrain.asc", (t) => { const l = t.split("\n"); const v = l[10].split(" "); v[0] = "-9999"; l[10] = v.join(" "); return l.join("\n"); }),
      { file: "terrain.asc", row: 11, column: "1", value: "-9999", reason: "NODATA cell; every cell needs a value" },
    ],
    [
      "negative traffic",
      () => withFile("traffic.asc", (t) => { const l = t.split("\n"); const v = l[6].split(" "); v[2] = "-1"; l[6] = v.join(" "); return l.join("\n"); }),
      { file: "traffic.asc", row: 7, column: "3", value: "-1", reason: "must not be negative" },
    ],
    [
      "settings value of the wrong kind",
      () => withFile("settings.json", (t) => t.replace('"environment": "UMa"', '"environment": "suburban"')),
      { file: "settings.json", column: "settings.environment", value: "suburban", reason: "must be one of UMa, UMi" },
    ],
    [
      "settings bounds reversed",
      () => withFile("settings.json", (t) => t.replace('"maxX": 1600', '"maxX": -5')),
      { file: "settings.json", column: "bounds.maxX", reason: "maxX must be greater than minX" },
    ],
  ];

  it.each(cases)("%s is reported as an error at its place", (_name, files, expected) => {
    const errors = errorsOf(files());
    expect(errors).toContainEqual(expect.objectContaining({ severity: "error", ...expected }));
  });

  it("parseScenarioFiles collects the problems of several files at once", () => {
    let files = withFile("cells.csv", (t) => setCsvField(setCsvField(t, 2, "azimuth_deg", "abc"), 3, "site_id", "ZZZ"));
    files = { ...files, [SCENARIO_FILES.sites]: setCsvField(files["sites.csv"]!, 2, "y_m", "-") };
    delete files["clusters.geojson"];
    const report = parseScenarioFiles(files);
    expect(report.scenario).toBeUndefined();
    expect(report.errors.map((p) => `${p.file}:${p.row ?? ""}:${p.column ?? ""}`).sort()).toEqual([
      "cells.csv:2:azimuth_deg",
      "cells.csv:3:site_id",
      "clusters.geojson::",
      "sites.csv:2:y_m",
    ]);
  });

  it("ScenarioFormatError lists the first problems in its message and keeps all of them", () => {
    const problems: FormatProblem[] = Array.from({ length: 30 }, (_, i) => ({
      severity: "error",
      file: "cells.csv",
      row: i + 2,
      column: "azimuth_deg",
      value: "x",
      reason: "not a finite number",
    }));
    const e = new ScenarioFormatError(problems);
    expect(e.problems).toHaveLength(30);
    expect(e.message).toMatch(/^Scenario has 30 problems:/);
    expect(e.message).toMatch(/cells\.csv row 2, column azimuth_deg, value "x": not a finite number/);
    expect(e.message).toMatch(/… and 18 more/);
    expect(e.message).not.toMatch(/row 31/);
    expect([e.file, e.row, e.column, e.value]).toEqual(["cells.csv", 2, "azimuth_deg", "x"]);
  });
});

describe("warnings", () => {
  it("a building with 0 floors but a height is a warning and the scenario still reads", () => {
    const files = withFile("buildings.geojson", (t) => {
      const g = JSON.parse(t);
      g.features[0].properties.floors = 0;
      return JSON.stringify(g);
    });
    const report = parseScenarioFiles(files);
    expect(report.errors).toEqual([]);
    expect(report.warnings).toContainEqual(expect.objectContaining({ file: "buildings.geojson", row: 1, column: "properties.floors" }));
    expect(report.scenario!.buildings[0].floors).toBe(0);
  });

  it("a building with no floor count gets floors from its height, with a warning", () => {
    const files = withFile("buildings.geojson", (t) => {
      const g = JSON.parse(t);
      g.features[0].properties = { id: "B-x", height_m: 13.4 };
      return JSON.stringify(g);
    });
    const report = parseScenarioFiles(files);
    expect(report.errors).toEqual([]);
    expect(report.scenario!.buildings[0].floors).toBe(4);
    expect(report.warnings).toContainEqual(expect.objectContaining({ row: 1, column: "properties.floors" }));
  });

  it("an unknown CSV column and missing settings fall back with warnings", () => {
    let files = withFile("sites.csv", (t) => t.split("\n").map((l, i) => (l === "" ? l : `${l},${i === 0 ? "Owner Note" : "x"}`)).join("\n"));
    const settings = JSON.parse(files["settings.json"]!);
    delete settings.settings.worstGridDropDb;
    files = { ...files, [SCENARIO_FILES.settings]: JSON.stringify(settings) };
    const report = parseScenarioFiles(files);
    expect(report.errors).toEqual([]);
    expect(report.warnings).toContainEqual(expect.objectContaining({ file: "sites.csv", row: 1, column: "Owner Note" }));
    expect(report.warnings).toContainEqual(expect.objectContaining({ file: "settings.json", column: "settings.worstGridDropDb" }));
    expect(report.scenario!.settings.worstGridDropDb).toBe(6);
    expect(report.scenario!.sites).toEqual(demo.sites);
  });

  it("NODATA in traffic.asc reads as 0 with one warning", () => {
    const files = withFile("traffic.asc", (t) => {
      const l = t.split("\n");
      const v = l[6].split(" ");
      v[0] = "-9999";
      v[1] = "-9999";
      l[6] = v.join(" ");
      return l.join("\n");
    });
    const report = parseScenarioFiles(files);
    expect(report.errors).toEqual([]);
    expect(report.warnings).toEqual([expect.objectContaining({ file: "traffic.asc", reason: "2 NODATA cells read as 0" })]);
    // Line 7 is the first data line: the northernmost raster row.
    const t = report.scenario!.traffic!;
    expect(t.values[(t.height - 1) * t.width]).toBe(0);
  });
});

describe("parseCsv / formatCsv", () => {
  it("parseCsv(text) handles quotes, doubled quotes, CRLF, a byte-order mark and counts blank lines", () => {
    const text = '\ufeffa,b\r\n"x, y","say ""hi"""\r\n\r\n"multi\nline",2\r\nlast,"q"';
    const { value, problems } = parseCsv(text);
    expect(problems).toEqual([]);
    expect(value).toEqual([
      { row: 1, fields: ["a", "b"] },
      { row: 2, fields: ["x, y", 'say "hi"'] },
      { row: 4, fields: ["multi\nline", "2"] },
      { row: 6, fields: ["last", "q"] },
    ]);
  });

  it("parseCsv(text) reports an unclosed quote at the row where it opened", () => {
    const { problems } = parseCsv('a,b\n1,"open\n2,3\n', "x.csv");
    expect(problems).toEqual([expect.objectContaining({ file: "x.csv", row: 2, reason: "quoted field is never closed" })]);
  });

  it("formatCsv then parseCsv returns the same fields, commas, quotes and edge spaces included", () => {
    const rows = [["plain", "with,comma", 'with "quote"', " padded ", "line\nbreak", ""]];
    const parsed = parseCsv(formatCsv(["a", "b", "c", "d", "e", "f"], rows)).value;
    expect(parsed[1].fields).toEqual(rows[0]);
  });

  it("normaliseHeader matches case-insensitively with trimmed spaces and hyphens as underscores", () => {
    expect(normaliseHeader("  Site ID ")).toBe("site_id");
    expect(normaliseHeader("X-M")).toBe("x_m");
    const { value, problems } = parseSitesCsv(" Site_ID , NAME ,X_m,y_M,Ground-M\nS1,Quay,1.5,2,3\n");
    expect(problems).toEqual([]);
    expect(value).toEqual([{ id: "S1", name: "Quay", x: 1.5, y: 2, groundHeightM: 3 }]);
  });
});

describe("ASCII grid", () => {
  const raster: Raster = {
    originX: 100,
    originY: 200,
    cellSize: 5,
    width: 3,
    height: 2,
    // Row 0 is the southern row.
    values: Float32Array.from([1, 2, 3, 4, 5, 6]),
  };

  it("formatAsciiGrid(raster) writes the northern row first", () => {
    const text = formatAsciiGrid(raster);
    expect(text).toBe("ncols 3\nnrows 2\nxllcorner 100\nyllcorner 200\ncellsize 5\nNODATA_value -9999\n4 5 6\n1 2 3\n");
  });

  it("parseAsciiGrid(text) reads case-insensitive header keys, xllcenter and rows north to south", () => {
    const text = "NCOLS 3\nNRows 2\nXLLCENTER 102.5\nyllcorner 200\nCellSize 5\n4 5 6\n1 2 3\n";
    const { value, problems } = parseAsciiGrid(text, "t.asc");
    expect(problems).toEqual([]);
    expect(value).toEqual(raster);
  });

  it("formatFloat32(v) is the shortest text that reads back as the same Float32", () => {
    const r = createRandom(5);
    const sample = new Float32Array(5000);
    for (let i = 0; i < sample.length; i++) sample[i] = r.normal(0, 1) * 10 ** r.int(-30, 30);
    sample[0] = 0.1;
    sample[1] = -0;
    sample[2] = 3.4028234663852886e38;
    sample[3] = 1.401298464324817e-45; // smallest subnormal
    for (const v of sample) {
      const text = formatFloat32(v);
      expect(Object.is(Math.fround(Number(text)), v)).toBe(true);
    }
    expect(formatFloat32(Math.fround(0.1))).toBe("0.1");
    expect(formatFloat32(Math.fround(16.34))).toBe("16.34");
    expect(formatFloat32(-0)).toBe("-0");
  });

  it("parseAsciiGrid(formatAsciiGrid(raster)) round-trips awkward Float32 values exactly", () => {
    const r = createRandom(8);
    const values = new Float32Array(40 * 30);
    for (let i = 0; i < values.length; i++) values[i] = r.uniform(-500, 9000) * (i % 7 === 0 ? 1e-7 : 1);
    const awkward: Raster = { originX: -12.345, originY: 0.1 + 0.2, cellSize: 2.5, width: 40, height: 30, values };
    const back = parseAsciiGrid(formatAsciiGrid(awkward), "a.asc");
    expect(back.problems).toEqual([]);
    expect(back.value).toEqual(awkward);
  });

  it("formatAsciiGrid refuses a raster whose values do not match its shape (RangeError)", () => {
    expect(() => formatAsciiGrid({ ...raster, width: 4 })).toThrow(RangeError);
  });
});
