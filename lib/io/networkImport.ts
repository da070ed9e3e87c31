// Import of a real network from uploaded files: sites and cells (CSV, or one .xlsx workbook),
// building footprints and cluster outlines (GeoJSON), terrain (GeoTIFF or ESRI ASCII grid),
// optionally antenna models and beam sets (JSON), loose or in one .zip. Positions may be WGS84
// longitude/latitude (projected to local metres with lib/io/geo.ts) or local metres already.
// Accepted names, headers and units: ./import-format.md.
//
// Every check of the scenario folder format is reused by handing its parsers canonical texts
// (same rows, the user's headers put back into the problems), so an imported network obeys
// exactly the rules of an exported one. What the folder format has no need for — encodings,
// delimiters, header aliases, size limits, degrees, self-intersecting rings, GeoTIFF — is
// checked here. Every problem of every file is collected; any error means no scenario.

import {
  DEFAULT_SETTINGS,
  type AntennaModel,
  type BeamSet,
  type Building,
  type Cell,
  type Cluster,
  type ModelSettings,
  type Raster,
  type Scenario,
  type Site,
} from "../radio/scenario";
import { ANTENNA_MODEL_CATALOGUE, BEAM_SET_CATALOGUE } from "../radio/beamSets";
import {
  LOCAL_METRES_CRS,
  formatNumber,
  parseAntennasJson,
  parseAsciiGrid,
  parseBeamSetsJson,
  parseBuildingsGeoJson,
  parseCellsCsv,
  parseClustersGeoJson,
  parseNumberText,
  parseSitesCsv,
  type FormatProblem,
} from "./scenarioFolder";
import { chooseProjection, utmConverter, type LocalProjection, type LonLat } from "./geo";
import { describeRasterCrs, readGeoTiff, type GeoRaster } from "./geoTiff";
import {
  CELL_HEADER_ALIASES,
  SITE_HEADER_ALIASES,
  canonicalCsv,
  checkWidths,
  csvTable,
  decodeUtf8,
  mapHeader,
  normaliseImportHeader,
  renameColumns,
  xlsxTables,
  type SourceTable,
  type TableMapping,
} from "./importTable";
import { findSelfIntersection } from "./polygon";
import { ZipError, declaredUncompressedSize, looksLikeZip, readZipDirectory, unzipEntries } from "./zip";

// ---------------------------------------------------------------------------
// Types

export interface UploadedFile {
  name: string;
  bytes: Uint8Array;
}

export interface NetworkImportOptions {
  /** Scenario name (default "Imported network"). */
  name?: string;
  /** Limit of every file and of the whole upload, inflated archives included (default 50 MB). */
  maxBytes?: number;
  /** Model settings over DEFAULT_SETTINGS. */
  settings?: Partial<ModelSettings>;
  /** Margin around the data added to the scenario bounds, metres (default 100). */
  boundsMarginM?: number;
  /** Cell size of terrain resampled from another coordinate system, metres (default: the source's pixel size). */
  terrainCellSizeM?: number;
}

export interface ImportCounts {
  files: number;
  sites: number;
  cells: number;
  buildings: number;
  clusters: number;
  terrainCells: number;
  /** Data rows and features read (sites + cells + buildings + clusters). */
  rows: number;
}

export interface ImportReport {
  errors: FormatProblem[];
  warnings: FormatProblem[];
  counts: ImportCounts;
}

export interface NetworkUploadResult {
  /** Present only when there is no error. */
  scenario?: Scenario;
  /**
   * The UTM zone and shift used when positions were lon/lat. Scenario.origin only records the
   * lon/lat of local (0, 0); keep this too to convert later positions the same way.
   */
  projection?: LocalProjection;
  report: ImportReport;
}

export const DEFAULT_MAX_UPLOAD_BYTES = 50 * 1024 * 1024;
const DEFAULT_BOUNDS_MARGIN_M = 100;
/** Resampled terrain larger than this is refused (80 MB of Float32). */
const MAX_TERRAIN_CELLS = 20_000_000;
/** Imported positions are kept to the millimetre (1000 steps per metre). */
const POSITION_STEPS_PER_M = 1000;

type Role = "sites" | "cells" | "workbook" | "buildings" | "clusters" | "terrain" | "antennas" | "beamSets";

const ROLE_OF_NAME: Record<string, Role> = {
  "sites.csv": "sites",
  "cells.csv": "cells",
  "buildings.geojson": "buildings",
  "buildings.json": "buildings",
  "clusters.geojson": "clusters",
  "clusters.json": "clusters",
  "terrain.tif": "terrain",
  "terrain.tiff": "terrain",
  "terrain.asc": "terrain",
  "antennas.json": "antennas",
  "beamsets.json": "beamSets",
};

/** GeoJSON crs names meaning longitude/latitude degrees. */
const DEGREE_CRS = /(crs84|epsg:*4326|wgs ?84)/i;

const BUILDING_PROPERTY_ALIASES: Readonly<Record<string, readonly string[]>> = {
  id: ["id", "building_id", "bldg_id"],
  height_m: ["height_m", "height", "building_height", "building_height_m", "roof_height_m"],
  floors: ["floors", "levels", "building_levels", "floor_count", "storeys", "stories"],
  name: ["name"],
};
const CLUSTER_PROPERTY_ALIASES: Readonly<Record<string, readonly string[]>> = {
  id: ["id", "cluster_id", "cluster"],
  name: ["name", "cluster_name"],
};

function megabytes(n: number): string {
  return `${(n / 1024 / 1024).toFixed(1)} MB`;
}

function baseName(name: string): string {
  const parts = name.split(/[\\/]/);
  return parts[parts.length - 1];
}

function roundPosition(v: number): number {
  // Divide (not multiply by 0.001) so the result is the double nearest the millimetre value.
  return Math.round(v * POSITION_STEPS_PER_M) / POSITION_STEPS_PER_M;
}

type Mode = "lonlat" | "local";

// ---------------------------------------------------------------------------
// Entry point

/** Reads an uploaded network; see ./import-format.md. Any error in the report means no scenario. */
export async function parseNetworkUpload(files: readonly UploadedFile[], options: NetworkImportOptions = {}): Promise<NetworkUploadResult> {
  const problems: FormatProblem[] = [];
  const counts: ImportCounts = { files: 0, sites: 0, cells: 0, buildings: 0, clusters: 0, terrainCells: 0, rows: 0 };
  const maxBytes = options.maxBytes ?? DEFAULT_MAX_UPLOAD_BYTES;
  const error = (file: string, reason: string, extra: Partial<FormatProblem> = {}): void => {
    problems.push({ severity: "error", file, reason, ...extra });
  };
  const warn = (file: string, reason: string, extra: Partial<FormatProblem> = {}): void => {
    problems.push({ severity: "warning", file, reason, ...extra });
  };
  const finish = (scenario?: Scenario, projection?: LocalProjection): NetworkUploadResult => {
    const errors = problems.filter((p) => p.severity === "error");
    const warnings = problems.filter((p) => p.severity === "warning");
    return {
      ...(scenario && errors.length === 0 ? { scenario } : {}),
      ...(projection ? { projection } : {}),
      report: { errors, warnings, counts },
    };
  };
  const failed = (): boolean => problems.some((p) => p.severity === "error");

  // --- Size limits, before anything is decoded or inflated -----------------------------
  if (files.length === 0) {
    error("upload", "no files: expected sites and cells (CSV or one .xlsx) and terrain");
    return finish();
  }
  let total = 0;
  for (const f of files) {
    total += f.bytes.length;
    if (f.bytes.length > maxBytes) {
      error(f.name, `file too large: ${megabytes(f.bytes.length)}, the limit is ${megabytes(maxBytes)} per file`);
    }
  }
  if (total > maxBytes) error("upload", `upload too large: ${megabytes(total)} in all, the limit is ${megabytes(maxBytes)}`);
  if (failed()) return finish();

  // --- Archives: the central directory's sizes are checked before inflating -------------
  const inputs: UploadedFile[] = [];
  let inflatedTotal = 0;
  for (const f of files) {
    const lower = baseName(f.name).toLowerCase();
    const isZip = lower.endsWith(".zip");
    const isXlsx = lower.endsWith(".xlsx");
    if (isZip || isXlsx) {
      if (f.bytes.length === 0) {
        error(f.name, "empty file");
        continue;
      }
      if (!looksLikeZip(f.bytes)) {
        error(f.name, isXlsx ? "not an .xlsx workbook (an .xlsx file is a ZIP archive; this one is not)" : "not a ZIP archive");
        continue;
      }
      let declared: number;
      try {
        declared = declaredUncompressedSize(readZipDirectory(f.bytes));
      } catch (e) {
        error(f.name, e instanceof ZipError ? e.message : `unreadable archive: ${(e as Error).message}`);
        continue;
      }
      inflatedTotal += declared;
      if (declared > maxBytes || inflatedTotal > maxBytes) {
        error(f.name, `${isXlsx ? "workbook" : "archive"} too large: it inflates to ${megabytes(declared)}, the limit is ${megabytes(maxBytes)}; refused before inflating`);
        continue;
      }
      if (isXlsx) {
        inputs.push(f);
        continue;
      }
      try {
        for (const entry of unzipEntries(f.bytes, maxBytes)) {
          const name = baseName(entry.name);
          if (name.startsWith(".") || entry.name.startsWith("__MACOSX/")) continue;
          inputs.push({ name, bytes: entry.bytes });
        }
      } catch (e) {
        error(f.name, e instanceof ZipError ? e.message : `unreadable archive: ${(e as Error).message}`);
      }
    } else {
      inputs.push(f);
    }
  }
  if (failed()) return finish();
  counts.files = inputs.length;

  // --- Who is who ----------------------------------------------------------------------
  const byRole = new Map<Role, UploadedFile>();
  for (const f of inputs) {
    const lower = baseName(f.name).toLowerCase();
    const role: Role | undefined = lower.endsWith(".xlsx") ? "workbook" : ROLE_OF_NAME[lower];
    if (!role) {
      warn(f.name, `not a file this import reads; ignored (expected: ${Object.keys(ROLE_OF_NAME).join(", ")}, one .xlsx, or a .zip of them)`);
      continue;
    }
    const already = byRole.get(role);
    if (already) {
      error(f.name, `given twice (also ${already.name})`);
      continue;
    }
    byRole.set(role, f);
  }
  const workbook = byRole.get("workbook");
  for (const role of ["sites", "cells"] as const) {
    const csv = byRole.get(role);
    if (csv && workbook) error(csv.name, `${role} given twice: as ${csv.name} and as the sheet "${role}" of ${workbook.name}`);
    if (!csv && !workbook) error(`${role}.csv`, `missing file: give ${role}.csv or an .xlsx workbook with a sheet "${role}"`);
  }
  if (!byRole.get("terrain")) error("terrain.tif", "missing file: give terrain.tif (GeoTIFF) or terrain.asc (ESRI ASCII grid)");

  /** Decoded text of a text file, or undefined after reporting why not. */
  const textOf = (f: UploadedFile | undefined): string | undefined => {
    if (!f) return undefined;
    if (f.bytes.length === 0) {
      error(f.name, "empty file");
      return undefined;
    }
    const decoded = decodeUtf8(f.bytes, f.name);
    if (decoded.problem) {
      problems.push(decoded.problem);
      return undefined;
    }
    if (decoded.text!.trim() === "" || decoded.text!.trim() === "\ufeff") {
      error(f.name, "empty file");
      return undefined;
    }
    return decoded.text;
  };

  // --- Catalogues ----------------------------------------------------------------------
  let beamSets: BeamSet[] = BEAM_SET_CATALOGUE.map((b) => ({ ...b, beams: b.beams.map((x) => ({ ...x })) }));
  const beamSetsFile = byRole.get("beamSets");
  const beamSetsText = textOf(beamSetsFile);
  if (beamSetsFile && beamSetsText !== undefined) {
    const r = parseBeamSetsJson(beamSetsText, beamSetsFile.name);
    problems.push(...r.problems);
    beamSets = r.value;
  }
  let antennaModels: AntennaModel[] = ANTENNA_MODEL_CATALOGUE.map((m) => ({ ...m, beamSetIds: [...m.beamSetIds] }));
  const antennasFile = byRole.get("antennas");
  const antennasText = textOf(antennasFile);
  if (antennasFile && antennasText !== undefined) {
    const r = parseAntennasJson(antennasText, antennasFile.name, { beamSetIds: beamSets.map((b) => b.id) });
    problems.push(...r.problems);
    antennaModels = r.value;
  } else if (beamSetsFile && !antennasFile) {
    // The default antenna models name default beam sets; they must still exist.
    const ids = new Set(beamSets.map((b) => b.id));
    for (const m of antennaModels) {
      const lost = m.beamSetIds.filter((b) => !ids.has(b));
      if (lost.length > 0) {
        error(beamSetsFile.name, `beam sets ${lost.join(", ")} are used by the default antenna model ${m.id}; keep them or upload antennas.json too`, {
          value: lost.join(", "),
        });
      }
    }
  }

  // --- Tables --------------------------------------------------------------------------
  let sitesTable: SourceTable | undefined;
  let cellsTable: SourceTable | undefined;
  if (workbook) {
    const sheets = await xlsxTables(workbook.bytes, workbook.name, ["sites", "cells"], problems);
    sitesTable = sheets.get("sites");
    cellsTable = sheets.get("cells");
  }
  const sitesFile = byRole.get("sites");
  const sitesText = textOf(sitesFile);
  if (sitesFile && sitesText !== undefined) sitesTable = csvTable(sitesText, sitesFile.name, problems);
  const cellsFile = byRole.get("cells");
  const cellsText = textOf(cellsFile);
  if (cellsFile && cellsText !== undefined) cellsTable = csvTable(cellsText, cellsFile.name, problems);

  let sitesMap: TableMapping | undefined;
  let mode: Mode | undefined;
  if (sitesTable) {
    checkWidths(sitesTable, problems);
    sitesMap = mapHeader(sitesTable, SITE_HEADER_ALIASES, ["site_id"], problems);
    if (sitesMap) {
      const has = (c: string): boolean => sitesMap!.index.has(c);
      const hasLonLat = has("lon") || has("lat");
      const hasLocal = has("x_m") || has("y_m");
      const row = sitesTable.header.row;
      if (hasLonLat && hasLocal) {
        error(sitesTable.file, "give positions as lon/lat or as x_m/y_m, not both", { row });
        sitesMap = undefined;
      } else if (!hasLonLat && !hasLocal) {
        error(sitesTable.file, `missing position columns: lon and lat (WGS84 degrees) or x_m and y_m (local metres)`, { row, column: "lon" });
        sitesMap = undefined;
      } else {
        mode = hasLonLat ? "lonlat" : "local";
        for (const c of mode === "lonlat" ? ["lon", "lat"] : ["x_m", "y_m"]) {
          if (!has(c)) {
            error(sitesTable.file, `missing column (accepted headers: ${SITE_HEADER_ALIASES[c].join(", ")})`, { row, column: c });
            sitesMap = undefined;
          }
        }
      }
    }
  }
  const field = (_table: SourceTable, map: TableMapping, r: { fields: string[] }, column: string): string => {
    const k = map.index.get(column);
    return k === undefined ? "" : (r.fields[k] ?? "");
  };

  // Site positions in degrees, checked here (the folder parser knows only metres).
  const siteLonLat: (LonLat | undefined)[] = [];
  if (sitesTable && sitesMap && mode === "lonlat") {
    for (const r of sitesTable.records) {
      const lonText = field(sitesTable, sitesMap, r, "lon");
      const latText = field(sitesTable, sitesMap, r, "lat");
      const lon = parseNumberText(lonText);
      const lat = parseNumberText(latText);
      let ok = true;
      const bad = (column: string, text: string, value: number | undefined, limit: number): void => {
        const written = sitesMap!.written.get(column)!;
        if (value === undefined) {
          error(sitesTable!.file, text.trim() === "" ? "empty; a number is required" : "not a finite number", { row: r.row, column: written, value: text });
          ok = false;
        } else if (value < -limit || value > limit) {
          error(sitesTable!.file, `${column === "lon" ? "longitude" : "latitude"} must be within −${limit}…${limit} degrees`, { row: r.row, column: written, value: text });
          ok = false;
        }
      };
      bad("lon", lonText, lon, 180);
      bad("lat", latText, lat, 90);
      siteLonLat.push(ok ? { lon: lon!, lat: lat! } : undefined);
    }
  }

  // --- GeoJSON: coordinate system, property aliases, projection -------------------------
  interface Features {
    file: UploadedFile;
    data?: { features: unknown[]; crs?: unknown } & Record<string, unknown>;
    /** The decoded text, handed to the folder parser as is when it is not a usable collection. */
    text: string;
    degrees: boolean;
  }
  const readFeatures = (role: "buildings" | "clusters"): Features | undefined => {
    const f = byRole.get(role);
    const text = textOf(f);
    if (!f || text === undefined) return undefined;
    let data: unknown;
    try {
      data = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
    } catch {
      return { file: f, text, degrees: false }; // the folder parser reports the JSON error with its line
    }
    if (typeof data !== "object" || data === null || !Array.isArray((data as { features?: unknown }).features)) {
      return { file: f, text, degrees: false };
    }
    const collection = data as NonNullable<Features["data"]>;
    const crs = collection.crs as { properties?: { name?: unknown } } | undefined;
    const crsName = typeof crs?.properties?.name === "string" ? crs.properties.name : undefined;
    let degrees: boolean;
    if (crs === undefined) {
      // RFC 7946 GeoJSON is lon/lat by definition; a collection without crs follows the sites.
      degrees = mode !== "local";
    } else if (crsName !== undefined && DEGREE_CRS.test(crsName)) {
      degrees = true;
    } else if (crsName !== undefined && crsName.toLowerCase() === LOCAL_METRES_CRS) {
      degrees = false;
    } else {
      degrees = false;
      if (mode === "lonlat") {
        error(f.name, `unsupported crs; give coordinates as lon/lat (CRS84) or as local metres ("${LOCAL_METRES_CRS}")`, { column: "crs", value: crsName ?? JSON.stringify(crs) });
      }
    }
    if (degrees && mode === "local") {
      error(f.name, "coordinates are lon/lat degrees but the sites are in local metres (x_m, y_m); give every position the same way", { column: "crs" });
    } else if (!degrees && mode === "lonlat" && crsName !== undefined && crsName.toLowerCase() === LOCAL_METRES_CRS) {
      error(f.name, "coordinates are local metres but the sites are lon/lat; give every position the same way", { column: "crs" });
    }
    return { file: f, data: collection, text, degrees };
  };
  const buildingsIn = readFeatures("buildings");
  const clustersIn = readFeatures("clusters");
  if (!byRole.get("buildings")) warn("buildings.geojson", "no buildings: every grid is open ground");
  if (!byRole.get("clusters")) warn("clusters.geojson", "no clusters: KPIs are reported for the whole network only");

  /** Visits every position [x, y, ...] of Polygon / MultiPolygon geometries. */
  const eachPosition = (fs: Features, visit: (pos: number[], row: number, path: string) => void): void => {
    fs.data!.features.forEach((feature, k) => {
      const g = (feature as { geometry?: { type?: unknown; coordinates?: unknown } } | null)?.geometry;
      if (!g || !Array.isArray(g.coordinates)) return;
      const rings: unknown[][] = g.type === "Polygon" ? [g.coordinates] : g.type === "MultiPolygon" ? (g.coordinates as unknown[][]) : [];
      rings.forEach((polygon, pi) => {
        if (!Array.isArray(polygon)) return;
        polygon.forEach((ring, ri) => {
          if (!Array.isArray(ring)) return;
          ring.forEach((pos, j) => {
            if (Array.isArray(pos) && pos.length >= 2 && typeof pos[0] === "number" && typeof pos[1] === "number") {
              const prefix = g.type === "MultiPolygon" ? `geometry.coordinates[${pi}][${ri}][${j}]` : `geometry.coordinates[${ri}][${j}]`;
              visit(pos as number[], k + 1, prefix);
            }
          });
        });
      });
    });
  };

  // Degrees are checked before they choose the projection.
  const geoPoints: LonLat[] = [];
  for (const s of siteLonLat) if (s) geoPoints.push(s);
  for (const fs of [buildingsIn, clustersIn]) {
    if (!fs?.data || !fs.degrees) continue;
    eachPosition(fs, (pos, row, path) => {
      const [lon, lat] = pos;
      if (!Number.isFinite(lon) || !Number.isFinite(lat) || lon < -180 || lon > 180 || lat < -90 || lat > 90) {
        error(fs.file.name, "not a WGS84 position [lon, lat] (lon −180…180, lat −90…90)", { row, column: path, value: JSON.stringify(pos) });
        pos[0] = NaN; // marks it so it is not projected; the folder parser then refuses it
      } else {
        geoPoints.push({ lon, lat });
      }
    });
  }
  let projection: LocalProjection | undefined;
  if (mode === "lonlat" || (mode === undefined && (buildingsIn?.degrees || clustersIn?.degrees))) {
    if (geoPoints.length > 0) projection = chooseProjection(geoPoints);
    if (projection && Math.abs(projection.origin.lat) > 84) {
      warn(sitesTable?.file ?? "upload", `data lies at latitude ${projection.origin.lat.toFixed(2)}°, outside the UTM range (80°S–84°N); distances may be distorted`);
    }
  }
  const converter = projection ? utmConverter(projection.zone, projection.hemisphere) : undefined;
  const project = (lon: number, lat: number): [number, number] => {
    const [e, n] = converter!.forward([lon, lat]);
    return [roundPosition(e - projection!.originEasting), roundPosition(n - projection!.originNorthing)];
  };

  /** Canonical GeoJSON text for the folder parser, plus the self-intersection check. */
  const prepareFeatures = (fs: Features | undefined, aliases: Readonly<Record<string, readonly string[]>>): string | undefined => {
    if (!fs) return undefined;
    if (!fs.data) return fs.text;
    const unknown = new Map<string, number>();
    fs.data.features.forEach((feature) => {
      if (typeof feature !== "object" || feature === null) return;
      const f = feature as { id?: unknown; properties?: unknown; geometry?: { type?: unknown; coordinates?: unknown } };
      if (typeof f.properties === "object" && f.properties !== null && !Array.isArray(f.properties)) {
        const props: Record<string, unknown> = {};
        for (const [key, v] of Object.entries(f.properties as Record<string, unknown>)) {
          const name = normaliseImportHeader(key);
          const canonical = Object.keys(aliases).find((c) => aliases[c].includes(name));
          if (canonical === undefined || props[canonical] !== undefined) {
            if (canonical === undefined) unknown.set(key, (unknown.get(key) ?? 0) + 1);
            continue;
          }
          // Numbers written as text ("12.5") are common in exports from spreadsheets.
          const n = typeof v === "string" && canonical !== "id" && canonical !== "name" ? parseNumberText(v) : undefined;
          props[canonical] = n ?? v;
        }
        if (props.id === undefined && (typeof f.id === "string" || typeof f.id === "number")) props.id = f.id;
        f.properties = props;
      }
      // A MultiPolygon of one part is just a polygon.
      if (f.geometry?.type === "MultiPolygon" && Array.isArray(f.geometry.coordinates) && f.geometry.coordinates.length === 1) {
        f.geometry = { type: "Polygon", coordinates: f.geometry.coordinates[0] };
      }
    });
    for (const [key, n] of unknown) warn(fs.file.name, `unknown property on ${n} feature${n === 1 ? "" : "s"}; ignored`, { column: `properties.${key}` });
    if (fs.degrees) {
      if (projection) {
        eachPosition(fs, (pos) => {
          if (Number.isNaN(pos[0])) return;
          const [x, y] = project(pos[0], pos[1]);
          pos[0] = x;
          pos[1] = y;
        });
      }
      fs.data.crs = { type: "name", properties: { name: LOCAL_METRES_CRS } };
    }
    fs.data.features.forEach((feature, k) => {
      const g = (feature as { geometry?: { type?: unknown; coordinates?: unknown } } | null)?.geometry;
      if (g?.type !== "Polygon" || !Array.isArray(g.coordinates) || !Array.isArray(g.coordinates[0])) return;
      const ring = (g.coordinates[0] as unknown[]).filter(
        (p): p is number[] => Array.isArray(p) && Number.isFinite(p[0]) && Number.isFinite(p[1]),
      );
      if (ring.length < 4) return; // too short: the folder parser says so
      const pts = ring.slice(0, -1).map((p) => ({ x: p[0], y: p[1] }));
      const hit = findSelfIntersection(pts);
      if (hit) {
        error(fs.file.name, `polygon ring intersects itself (edges ${hit[0] + 1} and ${hit[1] + 1} cross or touch); a footprint or outline must be a simple polygon`, {
          row: k + 1,
          column: "geometry.coordinates[0]",
        });
      }
    });
    return JSON.stringify(fs.data);
  };

  // --- Sites and cells through the folder parsers --------------------------------------
  const settings: ModelSettings = { ...DEFAULT_SETTINGS, ...options.settings };
  let sites: Site[] | undefined;
  const groundFromTerrain = !!sitesMap && !sitesMap.index.has("ground_m");
  /** Sites whose lon/lat was refused: their stand-in position must not raise more problems. */
  const unplaced = new Set<string>();
  if (sitesTable && sitesMap) {
    const map = sitesMap;
    const table = sitesTable;
    const text = canonicalCsv(table, ["site_id", "name", "x_m", "y_m", "ground_m"], (r, k) => {
      let x = field(table, map, r, "x_m");
      let y = field(table, map, r, "y_m");
      if (mode === "lonlat") {
        const p = siteLonLat[k];
        if (p && projection) [x, y] = project(p.lon, p.lat).map(formatNumber);
        else {
          [x, y] = ["0", "0"]; // already reported on lon/lat
          unplaced.add(field(table, map, r, "site_id").trim());
        }
      }
      return [field(table, map, r, "site_id"), field(table, map, r, "name"), x, y, groundFromTerrain ? "0" : field(table, map, r, "ground_m")];
    });
    const r = parseSitesCsv(text, table.file);
    problems.push(...renameColumns(r.problems, map));
    sites = r.value;
    if (groundFromTerrain) warn(table.file, "no ground height column; each site's ground height is read from the terrain", { column: "ground_m" });
  }

  let cells: Cell[] | undefined;
  let cellsMap: TableMapping | undefined;
  if (cellsTable) {
    checkWidths(cellsTable, problems);
    const columns = Object.keys(CELL_HEADER_ALIASES);
    cellsMap = mapHeader(cellsTable, CELL_HEADER_ALIASES, columns, problems);
    if (cellsMap) {
      const map = cellsMap;
      const table = cellsTable;
      const text = canonicalCsv(table, columns, (r) => columns.map((c) => field(table, map, r, c)));
      const r = parseCellsCsv(text, table.file, {
        siteIds: sites?.map((s) => s.id),
        antennaModels,
        beamSetIds: beamSets.map((b) => b.id),
      });
      problems.push(...renameColumns(r.problems, map));
      cells = r.value;
    }
  }

  // --- Buildings and clusters ----------------------------------------------------------
  let buildings: Building[] = [];
  const buildingsText = prepareFeatures(buildingsIn, BUILDING_PROPERTY_ALIASES);
  if (buildingsIn && buildingsText !== undefined) {
    const r = parseBuildingsGeoJson(buildingsText, buildingsIn.file.name, { floorHeightM: settings.floorHeightM });
    problems.push(...r.problems);
    buildings = r.value;
  }
  let clusters: Cluster[] = [];
  const clustersText = prepareFeatures(clustersIn, CLUSTER_PROPERTY_ALIASES);
  if (clustersIn && clustersText !== undefined) {
    const r = parseClustersGeoJson(clustersText, clustersIn.file.name);
    problems.push(...r.problems);
    clusters = r.value;
  }

  // --- Extent of the data --------------------------------------------------------------
  const box = { minX: Infinity, minY: Infinity, maxX: -Infinity, maxY: -Infinity };
  const extend = (x: number, y: number): void => {
    if (!Number.isFinite(x) || !Number.isFinite(y)) return;
    if (x < box.minX) box.minX = x;
    if (x > box.maxX) box.maxX = x;
    if (y < box.minY) box.minY = y;
    if (y > box.maxY) box.maxY = y;
  };
  for (const s of sites ?? []) extend(s.x, s.y);
  for (const b of buildings) for (const p of b.footprint) extend(p.x, p.y);
  for (const c of clusters) for (const p of c.polygon) extend(p.x, p.y);
  const haveBox = box.minX <= box.maxX;

  // --- Terrain -------------------------------------------------------------------------
  let terrain: Raster | undefined;
  const terrainFile = byRole.get("terrain");
  const margin = options.boundsMarginM ?? DEFAULT_BOUNDS_MARGIN_M;
  if (terrainFile) {
    if (terrainFile.bytes.length === 0) error(terrainFile.name, "empty file");
    else if (baseName(terrainFile.name).toLowerCase().endsWith(".asc")) {
      const text = textOf(terrainFile);
      if (text !== undefined) {
        if (mode === "lonlat") {
          error(terrainFile.name, "an ESRI ASCII grid has no coordinate system, and the positions are lon/lat; give the terrain as a GeoTIFF (EPSG:4326 or WGS84 UTM) or the positions as x_m/y_m");
        } else {
          const r = parseAsciiGrid(text, terrainFile.name, { nodata: { replaceWith: 0 } });
          problems.push(...r.problems);
          if (r.value.width > 0) terrain = r.value;
        }
      }
    } else {
      const r = await readGeoTiff(terrainFile.bytes, terrainFile.name);
      problems.push(...r.problems);
      if (r.value) {
        const area = haveBox
          ? { minX: box.minX - margin, minY: box.minY - margin, maxX: box.maxX + margin, maxY: box.maxY + margin }
          : undefined;
        terrain = placeTerrain(r.value, terrainFile.name, mode ?? "local", projection, area, options.terrainCellSizeM, problems);
      }
    }
  }
  if (terrain) {
    // Missing ground is read as sea level (0 m): coastal terrain models often leave the sea empty.
    let missing = 0;
    const v = terrain.values;
    for (let i = 0; i < v.length; i++) {
      if (Number.isNaN(v[i])) {
        v[i] = 0;
        missing++;
      }
    }
    if (missing > 0) warn(terrainFile!.name, `${missing} terrain cells without data read as 0 m (sea level)`);
    counts.terrainCells = terrain.width * terrain.height;
  }

  // --- Cross-checks: sites on the terrain ----------------------------------------------
  if (terrain && sites) {
    const t = terrain;
    const maxX = t.originX + t.width * t.cellSize;
    const maxY = t.originY + t.height * t.cellSize;
    const inside = (s: Site): boolean => s.x >= t.originX && s.x <= maxX && s.y >= t.originY && s.y <= maxY;
    const extent = `${formatNumber(t.originX)}…${formatNumber(maxX)} × ${formatNumber(t.originY)}…${formatNumber(maxY)} m`;
    const siteById = new Map(sites.map((s) => [s.id, s]));
    const outside = new Set<string>();
    for (const s of sites) {
      if (!Number.isFinite(s.x) || !Number.isFinite(s.y) || unplaced.has(s.id)) continue;
      if (!inside(s)) outside.add(s.id);
      else if (groundFromTerrain) s.groundHeightM = sampleNearest(t, s.x, s.y);
    }
    const used = new Set<string>();
    if (cells && cellsTable && cellsMap) {
      const siteColumn = cellsMap.written.get("site_id");
      cells.forEach((c, k) => {
        used.add(c.siteId);
        const s = siteById.get(c.siteId);
        if (s && outside.has(s.id)) {
          error(cellsTable!.file, `the cell's site ${s.id} at (${formatNumber(s.x)}, ${formatNumber(s.y)}) m lies outside the terrain raster (${extent})`, {
            row: cellsTable!.records[k].row,
            column: siteColumn,
            value: s.id,
          });
        }
      });
    }
    if (sitesTable && sitesMap) {
      sites.forEach((s, k) => {
        if (outside.has(s.id) && !used.has(s.id)) {
          warn(sitesTable!.file, `site lies outside the terrain raster (${extent})`, { row: sitesTable!.records[k].row, column: sitesMap!.written.get("site_id"), value: s.id });
        }
      });
    }
  }

  counts.sites = sites?.length ?? 0;
  counts.cells = cells?.length ?? 0;
  counts.buildings = buildings.length;
  counts.clusters = clusters.length;
  counts.rows = counts.sites + counts.cells + counts.buildings + counts.clusters;
  if (failed() || !sites || !cells || !terrain) return finish(undefined, projection);

  // --- Bounds: the data plus a margin, on the grid, within the terrain --------------------
  const grid = settings.gridSizeM;
  const t = terrain;
  const tMaxX = t.originX + t.width * t.cellSize;
  const tMaxY = t.originY + t.height * t.cellSize;
  const want = haveBox
    ? {
        minX: Math.floor((box.minX - margin) / grid) * grid,
        minY: Math.floor((box.minY - margin) / grid) * grid,
        maxX: Math.ceil((box.maxX + margin) / grid) * grid,
        maxY: Math.ceil((box.maxY + margin) / grid) * grid,
      }
    : { minX: t.originX, minY: t.originY, maxX: tMaxX, maxY: tMaxY };
  const bounds = {
    minX: Math.max(want.minX, Math.ceil(t.originX / grid) * grid),
    minY: Math.max(want.minY, Math.ceil(t.originY / grid) * grid),
    maxX: Math.min(want.maxX, Math.floor(tMaxX / grid) * grid),
    maxY: Math.min(want.maxY, Math.floor(tMaxY / grid) * grid),
  };
  if (bounds.maxX <= bounds.minX || bounds.maxY <= bounds.minY) {
    error(terrainFile!.name, `the terrain raster (${formatNumber(t.originX)}…${formatNumber(tMaxX)} × ${formatNumber(t.originY)}…${formatNumber(tMaxY)} m) does not overlap the data`);
    return finish(undefined, projection);
  }
  if (bounds.minX > want.minX || bounds.minY > want.minY || bounds.maxX < want.maxX || bounds.maxY < want.maxY) {
    warn(terrainFile!.name, "the terrain does not cover the data plus its margin; the scenario bounds are cut to the terrain");
  }

  const scenario: Scenario = {
    name: options.name?.trim() || "Imported network",
    bounds,
    ...(projection ? { origin: projection.origin } : {}),
    terrain,
    antennaModels,
    beamSets,
    sites,
    cells,
    buildings,
    clusters,
    settings,
  };
  return finish(scenario, projection);
}

// ---------------------------------------------------------------------------
// Terrain placement

function sampleNearest(t: Raster, x: number, y: number): number {
  const col = Math.min(t.width - 1, Math.max(0, Math.floor((x - t.originX) / t.cellSize)));
  const row = Math.min(t.height - 1, Math.max(0, Math.floor((y - t.originY) / t.cellSize)));
  return t.values[row * t.width + col];
}

/** Missing (NODATA or NaN) source values become NaN. */
function sourceValue(src: GeoRaster, i: number): number {
  const v = src.values[i];
  return src.nodata !== undefined && v === src.nodata ? NaN : v;
}

/**
 * Brings a GeoTIFF into local metres. Rasters already in the local frame (the chosen UTM zone,
 * or no CRS when positions are local metres) are copied cell for cell; lon/lat or another UTM
 * zone are resampled bilinearly onto a local grid covering `area`.
 */
function placeTerrain(
  src: GeoRaster,
  file: string,
  mode: Mode,
  projection: LocalProjection | undefined,
  area: { minX: number; minY: number; maxX: number; maxY: number } | undefined,
  cellSizeOption: number | undefined,
  problems: FormatProblem[],
): Raster | undefined {
  const error = (reason: string, column?: string): undefined => {
    problems.push({ severity: "error", file, reason, ...(column ? { column } : {}) });
    return undefined;
  };
  const crs = src.crs;
  if (crs.kind === "unsupported") {
    return error(`unsupported coordinate system ${describeRasterCrs(crs)}; give the terrain in EPSG:4326 (lon/lat) or a WGS84 UTM zone (EPSG:326zz / 327zz)`, "ProjectedCSTypeGeoKey");
  }
  const sameFrame =
    (mode === "local" && crs.kind === "unspecified") ||
    (mode === "lonlat" && projection !== undefined && crs.kind === "utm" && crs.zone === projection.zone && crs.hemisphere === projection.hemisphere);
  if (mode === "local" && crs.kind !== "unspecified") {
    return error(`the terrain is in ${describeRasterCrs(crs)} but the positions are local metres (x_m, y_m); give the positions as lon/lat, or the terrain without a coordinate system in the same local metres`, "GeoKeyDirectory");
  }
  if (mode === "lonlat" && crs.kind === "unspecified") {
    return error("the GeoTIFF names no coordinate system (no GeographicTypeGeoKey / ProjectedCSTypeGeoKey), so it cannot be placed under lon/lat positions", "GeoKeyDirectory");
  }
  if (sameFrame) {
    if (Math.abs(src.pixelWidth - src.pixelHeight) > 1e-9 * src.pixelWidth) {
      return error(`pixels are not square (${src.pixelWidth} × ${src.pixelHeight}); resample the terrain to square pixels`, "ModelPixelScale");
    }
    const shiftX = projection && crs.kind === "utm" ? projection.originEasting : 0;
    const shiftY = projection && crs.kind === "utm" ? projection.originNorthing : 0;
    const { width, height } = src;
    const values = new Float32Array(width * height);
    // File row 0 is the north edge; our row 0 is the south edge.
    for (let r = 0; r < height; r++) {
      const from = (height - 1 - r) * width;
      for (let c = 0; c < width; c++) values[r * width + c] = sourceValue(src, from + c);
    }
    return {
      originX: src.west - shiftX,
      originY: src.north - height * src.pixelHeight - shiftY,
      cellSize: src.pixelWidth,
      width,
      height,
      values,
    };
  }
  if (!projection) return error("no positions to place the terrain against");
  if (!area) return error("no sites, buildings or clusters with valid positions to place the terrain around");

  // --- Resampling: local grid cell centre → lon/lat → source pixel → bilinear value ---
  const local = utmConverter(projection.zone, projection.hemisphere);
  const sourceUtm = crs.kind === "utm" ? utmConverter(crs.zone, crs.hemisphere) : undefined;
  const toSource = (x: number, y: number): number[] => {
    const lonLat = local.inverse([x + projection.originEasting, y + projection.originNorthing]);
    return sourceUtm ? sourceUtm.forward(lonLat) : lonLat;
  };
  const toLocalXY = (sx: number, sy: number): number[] => {
    const lonLat = sourceUtm ? sourceUtm.inverse([sx, sy]) : [sx, sy];
    const [e, n] = local.forward(lonLat);
    return [e - projection.originEasting, n - projection.originNorthing];
  };
  // Metres per source pixel: 1° of latitude ≈ 111 320 m (mean; common practice).
  const nativeM = crs.kind === "geographic" ? src.pixelHeight * 111_320 : src.pixelHeight;
  const cellSize = cellSizeOption ?? Math.max(1, Math.round(nativeM));
  if (!(cellSize > 0) || !Number.isFinite(cellSize)) return error(`terrain cell size ${String(cellSize)} is not a positive number`);

  // The largest axis-aligned local box inside the source: sample its edges.
  const east = src.west + src.width * src.pixelWidth;
  const south = src.north - src.height * src.pixelHeight;
  const steps = 32;
  let innerMinX = -Infinity;
  let innerMaxX = Infinity;
  let innerMinY = -Infinity;
  let innerMaxY = Infinity;
  for (let k = 0; k <= steps; k++) {
    const fx = src.west + ((east - src.west) * k) / steps;
    const fy = south + ((src.north - south) * k) / steps;
    innerMinX = Math.max(innerMinX, toLocalXY(src.west, fy)[0]);
    innerMaxX = Math.min(innerMaxX, toLocalXY(east, fy)[0]);
    innerMinY = Math.max(innerMinY, toLocalXY(fx, south)[1]);
    innerMaxY = Math.min(innerMaxY, toLocalXY(fx, src.north)[1]);
  }
  const lo = { x: Math.max(area.minX, innerMinX), y: Math.max(area.minY, innerMinY) };
  const hi = { x: Math.min(area.maxX, innerMaxX), y: Math.min(area.maxY, innerMaxY) };
  const originX = Math.floor(lo.x / cellSize) * cellSize;
  const originY = Math.floor(lo.y / cellSize) * cellSize;
  const width = Math.ceil((hi.x - originX) / cellSize);
  const height = Math.ceil((hi.y - originY) / cellSize);
  if (!(width >= 1 && height >= 1)) {
    return error(`the terrain (${describeRasterCrs(crs)}, ${src.west}…${east} × ${south}…${src.north}) does not cover the sites, buildings and clusters`);
  }
  if (width * height > MAX_TERRAIN_CELLS) {
    return error(`resampled terrain would have ${width} × ${height} cells (more than ${MAX_TERRAIN_CELLS}); set a larger terrain cell size`);
  }
  const values = new Float32Array(width * height);
  const w = src.width;
  const h = src.height;
  for (let r = 0; r < height; r++) {
    const y = originY + (r + 0.5) * cellSize;
    for (let c = 0; c < width; c++) {
      const x = originX + (c + 0.5) * cellSize;
      const [sx, sy] = toSource(x, y);
      // Fractional pixel index, pixel centres at integers.
      const fc = Math.min(w - 1, Math.max(0, (sx - src.west) / src.pixelWidth - 0.5));
      const fr = Math.min(h - 1, Math.max(0, (src.north - sy) / src.pixelHeight - 0.5));
      const c0 = Math.floor(fc);
      const r0 = Math.floor(fr);
      const c1 = Math.min(w - 1, c0 + 1);
      const r1 = Math.min(h - 1, r0 + 1);
      const tc = fc - c0;
      const tr = fr - r0;
      const v00 = sourceValue(src, r0 * w + c0);
      const v01 = sourceValue(src, r0 * w + c1);
      const v10 = sourceValue(src, r1 * w + c0);
      const v11 = sourceValue(src, r1 * w + c1);
      let v = (v00 * (1 - tc) + v01 * tc) * (1 - tr) + (v10 * (1 - tc) + v11 * tc) * tr;
      if (Number.isNaN(v)) {
        // A missing neighbour: take the nearest pixel instead (NaN when that one is missing too).
        v = sourceValue(src, Math.round(fr) * w + Math.round(fc));
      }
      values[r * width + c] = v;
    }
  }
  problems.push({
    severity: "warning",
    file,
    reason: `terrain resampled (bilinear) from ${describeRasterCrs(crs)} to a ${cellSize} m local grid of ${width} × ${height} cells`,
  });
  return { originX, originY, cellSize, width, height, values };
}
