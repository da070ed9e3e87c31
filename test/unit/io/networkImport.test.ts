import ExcelJS from "exceljs";
import { writeArrayBuffer } from "geotiff";
import { describe, expect, it } from "vitest";
import { toLocal, utmConverter } from "../../../lib/io/geo";
import { encodeGeoTiff } from "../../../lib/io/geoTiff";
import { parseNetworkUpload, type UploadedFile } from "../../../lib/io/networkImport";
import type { FormatProblem } from "../../../lib/io/scenarioFolder";
import { buildZip } from "../../support/zipBuilder";

// Invented data only: local-metre sets have no place at all; lon/lat sets sit in the open
// South Pacific around 135° W, 35° S (no land, no real network).

const enc = (s: string): Uint8Array => new TextEncoder().encode(s);
const file = (name: string, text: string): UploadedFile => ({ name, bytes: enc(text) });

const CELL_HEADER =
  "cell_id,site_id,antenna_model,antenna_height_m,azimuth_deg,mechanical_tilt_deg,electrical_tilt_deg,beam_set,rs_power_dbm,frequency_mhz,bandwidth_mhz,scs_khz";
const CELL_ROWS = [
  "S1-A,S1,panel-8x4,25,0,2,4,broad-single,18,1800,20,15",
  "S1-B,S1,panel-8x4,25,120,2,4,horizontal-sweep-8,18,1800,20,15",
  "S2-A,S2,panel-4x2,12,240,3,2,hot-spot-4,10,3500,20,30",
];
const CELLS = [CELL_HEADER, ...CELL_ROWS].join("\n") + "\n";
const SITES_LOCAL = "site_id,name,x_m,y_m,ground_m\nS1,North mast,100,300,5\nS2,South mast,300,100,6\n";

function square(x: number, y: number, size: number): number[][] {
  return [
    [x, y],
    [x + size, y],
    [x + size, y + size],
    [x, y + size],
    [x, y],
  ];
}

function collection(features: object[], crs?: string): string {
  return JSON.stringify({
    type: "FeatureCollection",
    ...(crs ? { crs: { type: "name", properties: { name: crs } } } : {}),
    features,
  });
}

function feature(properties: object, ring: number[][]): object {
  return { type: "Feature", properties, geometry: { type: "Polygon", coordinates: [ring] } };
}

const BUILDINGS_LOCAL = collection(
  [feature({ id: "B1", height_m: 9, floors: 3 }, square(150, 150, 20)), feature({ id: "B2", height_m: 12, floors: 4 }, square(220, 220, 15))],
  "beamgate:local-metres",
);
const CLUSTERS_LOCAL = collection([feature({ id: "C1", name: "Centre" }, square(50, 50, 350))], "beamgate:local-metres");

function asciiGrid(ncols: number, nrows: number, cellsize: number, value: (c: number, r: number) => number): string {
  const lines = [`ncols ${ncols}`, `nrows ${nrows}`, "xllcorner 0", "yllcorner 0", `cellsize ${cellsize}`];
  for (let r = 0; r < nrows; r++) lines.push(Array.from({ length: ncols }, (_, c) => String(value(c, r))).join(" "));
  return lines.join("\n") + "\n";
}
const TERRAIN_ASC = asciiGrid(50, 50, 10, (c, r) => 10 + c * 0.1 + r * 0.05);

function localSet(overrides: Record<string, string | null> = {}): UploadedFile[] {
  const base: Record<string, string> = {
    "sites.csv": SITES_LOCAL,
    "cells.csv": CELLS,
    "buildings.geojson": BUILDINGS_LOCAL,
    "clusters.geojson": CLUSTERS_LOCAL,
    "terrain.asc": TERRAIN_ASC,
  };
  for (const [name, text] of Object.entries(overrides)) {
    if (text === null) delete base[name];
    else base[name] = text;
  }
  return Object.entries(base).map(([name, text]) => file(name, text));
}

function errorsOf(problems: readonly FormatProblem[]): FormatProblem[] {
  return problems.filter((p) => p.severity === "error");
}

/** Runs the import, expects no scenario, and returns the one error matching `reason`. */
async function refused(files: UploadedFile[], reason: RegExp, options = {}): Promise<FormatProblem> {
  const result = await parseNetworkUpload(files, options);
  expect(result.scenario).toBeUndefined();
  const hits = result.report.errors.filter((p) => reason.test(p.reason));
  expect(hits, JSON.stringify(result.report.errors, null, 1)).toHaveLength(1);
  return hits[0];
}

// --- lon/lat fixtures around 135° W, 35° S (UTM zone 8 south) -------------------------------
const SITES_LONLAT = "site_id,name,lon,lat\nS1,North mast,-135.0,-34.998\nS2,South mast,-134.997,-35.0\n";
const lonLatSquare = (lon: number, lat: number, d: number): number[][] => [
  [lon, lat],
  [lon + d, lat],
  [lon + d, lat + d],
  [lon, lat + d],
  [lon, lat],
];
const BUILDINGS_CRS84 = collection([feature({ id: "B1", height: 9, levels: 3 }, lonLatSquare(-134.999, -34.9995, 0.0002))]);
const CLUSTERS_CRS84 = collection([feature({ id: "C1" }, lonLatSquare(-135.001, -35.001, 0.005))], "urn:ogc:def:crs:OGC:1.3:CRS84");

/** A 10 m UTM zone 8 south terrain (EPSG:32708) written with the geotiff package's writer. */
function utmTerrain(): { bytes: Uint8Array; west: number; north: number; value: (e: number, n: number) => number } {
  const utm = utmConverter(8, "south");
  const [e0, n0] = utm.forward([-135.003, -35.004]);
  const west = Math.floor(e0 / 10) * 10;
  const north = Math.floor(n0 / 10) * 10 + 800;
  const width = 80;
  const height = 80;
  const value = (e: number, n: number): number => 20 + (e - west) * 0.01 + (north - n) * 0.02;
  const values = new Float32Array(width * height);
  for (let r = 0; r < height; r++) for (let c = 0; c < width; c++) values[r * width + c] = value(west + (c + 0.5) * 10, north - (r + 0.5) * 10);
  const buffer = writeArrayBuffer(values, {
    width,
    height,
    ModelPixelScale: [10, 10, 0],
    ModelTiepoint: [0, 0, 0, west, north, 0],
    GTModelTypeGeoKey: 1,
    GTRasterTypeGeoKey: 1,
    ProjectedCSTypeGeoKey: 32708,
  });
  return { bytes: new Uint8Array(buffer), west, north, value };
}

function lonLatSet(overrides: Record<string, string | Uint8Array | null> = {}): UploadedFile[] {
  const base: Record<string, string | Uint8Array> = {
    "sites.csv": SITES_LONLAT,
    "cells.csv": CELLS,
    "buildings.geojson": BUILDINGS_CRS84,
    "clusters.geojson": CLUSTERS_CRS84,
    "terrain.tif": utmTerrain().bytes,
  };
  for (const [name, v] of Object.entries(overrides)) {
    if (v === null) delete base[name];
    else base[name] = v;
  }
  return Object.entries(base).map(([name, v]) => (typeof v === "string" ? file(name, v) : { name, bytes: v }));
}

describe("parseNetworkUpload(files) — good uploads", () => {
  it("reads a local-metre set as it stands: no origin, positions unchanged, every row counted", async () => {
    const { scenario, report } = await parseNetworkUpload(localSet(), { name: "Test net" });
    expect(report.errors).toEqual([]);
    expect(scenario).toBeDefined();
    expect(scenario!.origin).toBeUndefined();
    expect(scenario!.sites.map((s) => [s.id, s.x, s.y, s.groundHeightM])).toEqual([
      ["S1", 100, 300, 5],
      ["S2", 300, 100, 6],
    ]);
    expect(scenario!.cells.map((c) => c.id)).toEqual(["S1-A", "S1-B", "S2-A"]);
    expect(scenario!.buildings[0].footprint[0]).toEqual({ x: 150, y: 150 });
    expect(report.counts).toMatchObject({ sites: 2, cells: 3, buildings: 2, clusters: 1, rows: 8, terrainCells: 2500 });
    // Bounds: data box 50…400 plus the 100 m margin, cut to the 0…500 m terrain.
    expect(scenario!.bounds).toEqual({ minX: 0, minY: 0, maxX: 500, maxY: 500 });
  });

  it("projects lon/lat sites and CRS84 GeoJSON into local metres and records the origin", async () => {
    const { scenario, projection, report } = await parseNetworkUpload(lonLatSet());
    expect(report.errors).toEqual([]);
    expect(projection).toMatchObject({ zone: 8, hemisphere: "south" });
    expect(scenario!.origin).toEqual(projection!.origin);
    const s1 = toLocal({ lon: -135.0, lat: -34.998 }, projection!);
    expect(scenario!.sites[0].x).toBeCloseTo(s1.x, 3);
    expect(scenario!.sites[0].y).toBeCloseTo(s1.y, 3);
    // Local (0, 0) is the rounded south-west corner of the data: every position is ≥ 0 and small.
    const xs = [...scenario!.sites.map((s) => s.x), ...scenario!.clusters[0].polygon.map((p) => p.x)];
    const ys = [...scenario!.sites.map((s) => s.y), ...scenario!.clusters[0].polygon.map((p) => p.y)];
    expect(Math.min(...xs)).toBeGreaterThanOrEqual(0);
    expect(Math.min(...xs)).toBeLessThan(10);
    expect(Math.min(...ys)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...xs, ...ys)).toBeLessThan(1000);
    // Property aliases: height → height_m, levels → floors.
    expect(scenario!.buildings[0]).toMatchObject({ id: "B1", heightM: 9, floors: 3 });
  });

  it("places a UTM GeoTIFF of the chosen zone cell for cell and reads the sites' ground from it", async () => {
    const terrain = utmTerrain();
    const { scenario, projection } = await parseNetworkUpload(lonLatSet({ "terrain.tif": terrain.bytes }));
    const t = scenario!.terrain;
    expect(t.cellSize).toBe(10);
    expect([t.width, t.height]).toEqual([80, 80]);
    expect(t.originX).toBe(terrain.west - projection!.originEasting);
    expect(t.originY).toBe(terrain.north - 800 - projection!.originNorthing);
    // Raster row 0 is the south: its first cell centre is 5 m in from the south-west corner.
    const e = terrain.west + 5;
    const n = terrain.north - 800 + 5;
    expect(t.values[0]).toBeCloseTo(terrain.value(e, n), 4);
    // No ground column: each site takes the height of the terrain cell it stands in.
    const site = scenario!.sites[0];
    const col = Math.floor((site.x - t.originX) / 10);
    const row = Math.floor((site.y - t.originY) / 10);
    expect(site.groundHeightM).toBe(t.values[row * t.width + col]);
  });

  it("resamples an EPSG:4326 terrain bilinearly onto the local grid", async () => {
    // Height linear in lon and lat: bilinear resampling reproduces it up to Float32 rounding.
    const pixel = 1 / 3600;
    const west = -135.01;
    const north = -34.99;
    const width = 72;
    const height = 72;
    const h = (lon: number, lat: number): number => 100 + (lon - west) * 5000 + (north - lat) * 3000;
    const values = new Float32Array(width * height);
    for (let r = 0; r < height; r++) for (let c = 0; c < width; c++) values[r * width + c] = h(west + (c + 0.5) * pixel, north - (r + 0.5) * pixel);
    const tif = encodeGeoTiff(values, width, height, { west, north, pixelWidth: pixel, pixelHeight: pixel, epsg: 4326 });
    const { scenario, projection, report } = await parseNetworkUpload(lonLatSet({ "terrain.tif": tif }), { terrainCellSizeM: 5 });
    expect(report.errors).toEqual([]);
    expect(report.warnings.some((w) => /resampled/.test(w.reason))).toBe(true);
    const t = scenario!.terrain;
    expect(t.cellSize).toBe(5);
    const conv = utmConverter(projection!.zone, projection!.hemisphere);
    for (const [c, r] of [
      [3, 4],
      [Math.floor(t.width / 2), Math.floor(t.height / 3)],
      [t.width - 2, t.height - 2],
    ]) {
      const [lon, lat] = conv.inverse([t.originX + (c + 0.5) * 5 + projection!.originEasting, t.originY + (r + 0.5) * 5 + projection!.originNorthing]);
      expect(t.values[r * t.width + c]).toBeCloseTo(h(lon, lat), 2);
    }
  });

  it("matches headers case-insensitively through the documented aliases", async () => {
    const sites = "Site,Site Name,Longitude,LAT\nS1,North mast,-135.0,-34.998\nS2,South mast,-134.997,-35.0\n";
    const cells =
      [
        "Cell,siteId,Antenna,Antenna Height (m),Bearing,mechTilt,E-Tilt,beamSetId,RS Power (dBm),Freq,BW,SCS",
        ...CELL_ROWS,
      ].join("\n") + "\n";
    const plain = await parseNetworkUpload(lonLatSet());
    const aliased = await parseNetworkUpload(lonLatSet({ "sites.csv": sites, "cells.csv": cells }));
    expect(aliased.report.errors).toEqual([]);
    expect(aliased.scenario!.cells).toEqual(plain.scenario!.cells);
    expect(aliased.scenario!.sites).toEqual(plain.scenario!.sites);
  });

  it("accepts a UTF-8 byte-order mark", async () => {
    const withBom = new Uint8Array([0xef, 0xbb, 0xbf, ...enc(SITES_LOCAL)]);
    const files = localSet().map((f) => (f.name === "sites.csv" ? { name: f.name, bytes: withBom } : f));
    const { scenario, report } = await parseNetworkUpload(files);
    expect(report.errors).toEqual([]);
    expect(scenario!.sites[0].id).toBe("S1");
  });

  it("reads one .xlsx workbook with sheets sites and cells like the CSV files", async () => {
    const wb = new ExcelJS.Workbook();
    const sitesSheet = wb.addWorksheet("Sites");
    sitesSheet.addRow(["site_id", "name", "x_m", "y_m", "ground_m"]);
    sitesSheet.addRow(["S1", "North mast", 100, 300, 5]);
    sitesSheet.addRow(["S2", "South mast", 300, 100, 6]);
    const cellsSheet = wb.addWorksheet("cells");
    cellsSheet.addRow(CELL_HEADER.split(","));
    for (const row of CELL_ROWS) cellsSheet.addRow(row.split(",").map((v) => (/^-?\d+(\.\d+)?$/.test(v) ? Number(v) : v)));
    const xlsx = new Uint8Array(await wb.xlsx.writeBuffer());
    const files = localSet({ "sites.csv": null, "cells.csv": null });
    files.push({ name: "network.xlsx", bytes: xlsx });
    const fromBook = await parseNetworkUpload(files);
    const fromCsv = await parseNetworkUpload(localSet());
    expect(fromBook.report.errors).toEqual([]);
    expect(fromBook.scenario!.cells).toEqual(fromCsv.scenario!.cells);
    expect(fromBook.scenario!.sites).toEqual(fromCsv.scenario!.sites);
  });

  it("names the sheet and the sheet's row in an .xlsx problem", async () => {
    const wb = new ExcelJS.Workbook();
    const sitesSheet = wb.addWorksheet("sites");
    sitesSheet.addRow(["site_id", "x_m", "y_m", "ground_m"]);
    sitesSheet.addRow(["S1", 100, 300, 5]);
    sitesSheet.addRow(["S2", 300, 100, 6]);
    const cellsSheet = wb.addWorksheet("cells");
    cellsSheet.addRow(CELL_HEADER.split(","));
    cellsSheet.addRow(CELL_ROWS[0].split(","));
    cellsSheet.addRow(CELL_ROWS[1].replace(",120,", ",north,").split(","));
    const files = localSet({ "sites.csv": null, "cells.csv": null });
    files.push({ name: "net.xlsx", bytes: new Uint8Array(await wb.xlsx.writeBuffer()) });
    const p = await refused(files, /not a finite number/);
    expect(p).toMatchObject({ file: "net.xlsx (sheet cells)", row: 3, column: "azimuth_deg", value: "north" });
  });

  it("reads a .zip of the files", async () => {
    const zip = buildZip(localSet().map((f) => ({ name: `net/${f.name}`, bytes: f.bytes })));
    const { scenario, report } = await parseNetworkUpload([{ name: "upload.zip", bytes: zip }]);
    expect(report.errors).toEqual([]);
    expect(scenario!.cells).toHaveLength(3);
  });

  it("reads the default catalogues unless antennas.json / beamsets.json are given", async () => {
    const beamsets = JSON.stringify([{ id: "only-one", name: "Only one", description: "", beams: [{ azimuthOffsetDeg: 0, elevationOffsetDeg: 0, widthDeg: 60 }] }]);
    const p = await refused(localSet({ "beamsets.json": beamsets }), /used by the default antenna model panel-8x4/);
    expect(p.file).toBe("beamsets.json");
  });
});

describe("parseNetworkUpload(files) — every bad input names file, row and column, and returns no scenario", () => {
  const cellsWith = (row: number, from: string, to: string): string => {
    const lines = CELLS.split("\n");
    expect(lines[row - 1]).toContain(from);
    lines[row - 1] = lines[row - 1].replace(from, to);
    return lines.join("\n");
  };

  it("a missing field", async () => {
    const p = await refused(localSet({ "cells.csv": cellsWith(3, ",120,", ",,") }), /empty; a number is required/);
    expect(p).toMatchObject({ file: "cells.csv", row: 3, column: "azimuth_deg" });
  });

  it("a bad number, NaN and Infinity", async () => {
    for (const bad of ["12a", "NaN", "Infinity", "1,5"]) {
      const text = bad === "1,5" ? cellsWith(2, ",25,", `,"1,5",`) : cellsWith(2, ",25,", `,${bad},`);
      const p = await refused(localSet({ "cells.csv": text }), /not a finite number/);
      expect(p).toMatchObject({ file: "cells.csv", row: 2, column: "antenna_height_m", value: bad });
    }
  });

  it("a tilt outside the antenna model's range", async () => {
    const p = await refused(localSet({ "cells.csv": cellsWith(4, ",3,2,hot-spot-4", ",3,12,hot-spot-4") }), /electrical tilt outside the range of antenna model panel-4x2/);
    expect(p).toMatchObject({ file: "cells.csv", row: 4, column: "electrical_tilt_deg", value: "12" });
  });

  it("a duplicate cell id, reported under the user's own header", async () => {
    const text = cellsWith(3, "S1-B,", "S1-A,").replace("cell_id,", "Cell ID,");
    const p = await refused(localSet({ "cells.csv": text }), /duplicate id/);
    expect(p).toMatchObject({ file: "cells.csv", row: 3, column: "Cell ID", value: "S1-A" });
  });

  it("an unknown beam set", async () => {
    const p = await refused(localSet({ "cells.csv": cellsWith(2, "broad-single", "very-wide") }), /unknown beam set/);
    expect(p).toMatchObject({ file: "cells.csv", row: 2, column: "beam_set", value: "very-wide" });
  });

  it("a polygon that is not closed", async () => {
    const open = square(150, 150, 20).slice(0, 4).concat([[151, 150]]);
    const text = collection([feature({ id: "B1", height_m: 9 }, square(10, 10, 5)), feature({ id: "B2", height_m: 9 }, open)]);
    const p = await refused(localSet({ "buildings.geojson": text }), /not closed/);
    expect(p).toMatchObject({ file: "buildings.geojson", row: 2, column: "geometry.coordinates[0]" });
  });

  it("a self-intersecting polygon", async () => {
    const bowTie = [
      [0, 0],
      [100, 100],
      [100, 0],
      [0, 100],
      [0, 0],
    ];
    const text = collection([feature({ id: "C1" }, square(50, 50, 300)), feature({ id: "C2" }, bowTie)], "beamgate:local-metres");
    const p = await refused(localSet({ "clusters.geojson": text }), /intersects itself/);
    expect(p).toMatchObject({ file: "clusters.geojson", row: 2, column: "geometry.coordinates[0]" });
  });

  it("a building with no height", async () => {
    const text = collection([feature({ id: "B1", floors: 2 }, square(150, 150, 20))]);
    const p = await refused(localSet({ "buildings.geojson": text }), /building has no height/);
    expect(p).toMatchObject({ file: "buildings.geojson", row: 1, column: "properties.height_m" });
  });

  it("a cell whose site lies outside the terrain raster", async () => {
    const sites = SITES_LOCAL.replace("S2,South mast,300,100,6", "S2,South mast,900,100,6");
    const result = await parseNetworkUpload(localSet({ "sites.csv": sites }));
    expect(result.scenario).toBeUndefined();
    const p = result.report.errors.find((e) => /outside the terrain raster/.test(e.reason));
    expect(p).toMatchObject({ file: "cells.csv", row: 4, column: "site_id", value: "S2" });
  });

  it("invalid UTF-8 (a Latin-1 file)", async () => {
    const latin1 = new Uint8Array([...enc("site_id,name,x_m,y_m,ground_m\nS1,Caf"), 0xe9, ...enc(",100,300,5\n")]);
    const files = localSet().map((f) => (f.name === "sites.csv" ? { name: f.name, bytes: latin1 } : f));
    const p = await refused(files, /not valid UTF-8/);
    expect(p).toMatchObject({ file: "sites.csv", row: 2 });
  });

  it("a UTF-16 file", async () => {
    const utf16 = new Uint8Array([0xff, 0xfe, ...Array.from(Buffer.from(SITES_LOCAL, "utf16le"))]);
    const files = localSet().map((f) => (f.name === "sites.csv" ? { name: f.name, bytes: utf16 } : f));
    const p = await refused(files, /UTF-16/);
    expect(p.file).toBe("sites.csv");
  });

  it("a semicolon or tab delimiter, naming the delimiter found", async () => {
    const semi = await refused(localSet({ "cells.csv": CELLS.replace(/,/g, ";") }), /wrong delimiter/);
    expect(semi).toMatchObject({ file: "cells.csv", row: 1 });
    expect(semi.reason).toMatch(/';' \(semicolon\)/);
    const tab = await refused(localSet({ "sites.csv": SITES_LOCAL.replace(/,/g, "\t") }), /wrong delimiter/);
    expect(tab).toMatchObject({ file: "sites.csv", row: 1 });
    expect(tab.reason).toMatch(/tab/);
  });

  it("an empty file and a header-only file", async () => {
    expect((await refused(localSet({ "sites.csv": "" }), /empty file/)).file).toBe("sites.csv");
    expect((await refused(localSet({ "sites.csv": "  \n\n" }), /empty file/)).file).toBe("sites.csv");
    const headerOnly = await refused(localSet({ "cells.csv": CELL_HEADER + "\n" }), /header only/);
    expect(headerOnly).toMatchObject({ file: "cells.csv", row: 1 });
  });

  it("a missing column, listing the accepted headers", async () => {
    const text = CELLS.replace(",scs_khz", "").replace(/,(15|30)\n/g, "\n");
    const p = await refused(localSet({ "cells.csv": text }), /missing column/);
    expect(p).toMatchObject({ file: "cells.csv", row: 1, column: "scs_khz" });
    expect(p.reason).toContain("subcarrier_spacing_khz");
  });

  it("two headers for one column, a radians header and a row of the wrong width", async () => {
    const twoNames = CELLS.replace("cell_id,", "cell_id,azimuth,").replace(/\n(S\d-\w),/g, "\n$1,0,");
    const both = await refused(localSet({ "cells.csv": twoNames }), /duplicate column/);
    expect(both).toMatchObject({ row: 1, column: "azimuth_deg" });
    const rad = await refused(localSet({ "cells.csv": CELLS.replace("azimuth_deg", "azimuth_rad") }), /degrees/);
    expect(rad).toMatchObject({ file: "cells.csv", row: 1, column: "azimuth_rad" });
    const short = await refused(localSet({ "cells.csv": cellsWith(3, ",1800,20,15", ",1800,20") }), /expected 12 fields, found 11/);
    expect(short).toMatchObject({ file: "cells.csv", row: 3 });
  });

  it("a longitude or latitude out of range", async () => {
    const p = await refused(lonLatSet({ "sites.csv": SITES_LONLAT.replace("-34.998", "-134.998") }), /latitude must be within/);
    expect(p).toMatchObject({ file: "sites.csv", row: 2, column: "lat", value: "-134.998" });
  });

  it("lon/lat GeoJSON under local-metre sites", async () => {
    const p = await refused(localSet({ "clusters.geojson": CLUSTERS_CRS84 }), /lon\/lat degrees but the sites are in local metres/);
    expect(p.file).toBe("clusters.geojson");
  });

  it("a GeoTIFF without georeference, naming the file", async () => {
    const plain = encodeGeoTiff(new Float32Array(16).fill(5), 4, 4);
    const p = await refused(lonLatSet({ "terrain.tif": plain }), /no georeference/);
    expect(p.file).toBe("terrain.tif");
  });

  it("an ASCII grid under lon/lat positions", async () => {
    const files = lonLatSet({ "terrain.tif": null });
    files.push(file("terrain.asc", TERRAIN_ASC));
    const p = await refused(files, /no coordinate system/);
    expect(p.file).toBe("terrain.asc");
  });

  it("collects every problem of every file in one report, warnings apart", async () => {
    const result = await parseNetworkUpload(
      localSet({
        "sites.csv": SITES_LOCAL.replace(",5\n", ",five\n").replace("site_id,", "site_id,colour,").replace(/\n(S\d),/g, "\n$1,red,"),
        "cells.csv": cellsWith(2, "broad-single", "nope"),
        "buildings.geojson": collection([feature({ id: "B1" }, square(150, 150, 20))]),
      }),
    );
    expect(result.scenario).toBeUndefined();
    const where = errorsOf(result.report.errors).map((p) => `${p.file}:${p.row}:${p.column}`);
    expect(where).toEqual(expect.arrayContaining(["sites.csv:2:ground_m", "cells.csv:2:beam_set", "buildings.geojson:1:properties.height_m"]));
    expect(result.report.warnings).toEqual(expect.arrayContaining([expect.objectContaining({ file: "sites.csv", column: "colour", reason: "unknown column; ignored" })]));
    expect(result.report.warnings.every((w) => w.severity === "warning")).toBe(true);
  });

  it("missing required files", async () => {
    const result = await parseNetworkUpload(localSet({ "terrain.asc": null, "cells.csv": null }));
    expect(result.scenario).toBeUndefined();
    expect(result.report.errors.map((p) => p.file).sort()).toEqual(["cells.csv", "terrain.tif"]);
  });
});

describe("parseNetworkUpload(files, {maxBytes}) — size limits", () => {
  it("refuses a file, or an upload, above the limit", async () => {
    const big = await refused(localSet(), /file too large/, { maxBytes: 2000 });
    expect(big.file).toBe("terrain.asc");
    const total = await parseNetworkUpload(localSet({ "terrain.asc": asciiGrid(5, 5, 100, () => 1) }), { maxBytes: 900 });
    expect(total.report.errors.map((p) => p.reason).join("\n")).toMatch(/upload too large/);
    expect(total.scenario).toBeUndefined();
  });

  it("refuses an .xlsx whose sheets inflate beyond the limit before inflating it", async () => {
    const wb = new ExcelJS.Workbook();
    const sheet = wb.addWorksheet("sites");
    for (let r = 0; r < 20000; r++) sheet.addRow(["S", 1, 2, 3, "the same words again and again"]);
    wb.addWorksheet("cells").addRow(["cell_id"]);
    const bytes = new Uint8Array(await wb.xlsx.writeBuffer());
    const limit = 1024 * 1024;
    expect(bytes.length).toBeLessThan(limit);
    const files = localSet({ "sites.csv": null, "cells.csv": null, "terrain.asc": null });
    const p = await refused([...files, { name: "network.xlsx", bytes }], /refused before inflating/, { maxBytes: limit });
    expect(p.file).toBe("network.xlsx");
  });

  it("refuses a .zip whose central directory declares too much, and one that lies about it", async () => {
    const declared = buildZip([{ name: "sites.csv", bytes: enc(SITES_LOCAL), declaredSize: 3_000_000_000 }]);
    expect((await refused([{ name: "u.zip", bytes: declared }], /refused before inflating/)).file).toBe("u.zip");
    // Claims 10 bytes, inflates to 200 kB: the inflation cap stops it.
    const lying = buildZip([{ name: "sites.csv", bytes: new Uint8Array(200_000).fill(65), declaredSize: 10 }]);
    expect((await refused([{ name: "u.zip", bytes: lying }], /inflates to more than/, { maxBytes: 100_000 })).file).toBe("u.zip");
  });
});

describe("parseNetworkUpload(files) — 100 000 rows", () => {
  it("reads 100 000 cells on 1 000 sites within seconds", async () => {
    const sites = ["site_id,x_m,y_m,ground_m"];
    for (let s = 0; s < 1000; s++) sites.push(`S${s},${(s % 40) * 12 + 10},${Math.floor(s / 40) * 19 + 10},3`);
    const cells = [CELL_HEADER];
    for (let k = 0; k < 100_000; k++) {
      const s = k % 1000;
      cells.push(`C${k},S${s},panel-12x8,30,${(k * 7) % 360},${k % 10},${k % 15},dual-layer,${6 + (k % 18)},3500,100,30`);
    }
    const files = [file("sites.csv", sites.join("\n")), file("cells.csv", cells.join("\n")), file("terrain.asc", TERRAIN_ASC)];
    const start = performance.now();
    const { scenario, report } = await parseNetworkUpload(files);
    const ms = performance.now() - start;
    expect(report.errors).toEqual([]);
    expect(scenario!.cells).toHaveLength(100_000);
    expect(scenario!.cells[99_999]).toMatchObject({ id: "C99999", siteId: "S999", azimuthDeg: (99_999 * 7) % 360 });
    expect(report.counts.rows).toBe(101_000);
    expect(ms).toBeLessThan(15_000);
  });
});
