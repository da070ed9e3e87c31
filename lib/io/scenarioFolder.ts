// The open scenario folder: one network as plain CSV, JSON, GeoJSON and ESRI ASCII
// grid files that any spreadsheet, GIS or script can read and write. The file
// layout, columns and units are documented in ./scenario-format.md.
//
// Everything below is pure (text in, text out) so the web import can reuse it on
// uploaded files; only writeScenarioFolder / readScenarioFolder touch the disk.
//
// Reading collects every problem of every file before giving up, so a user fixes a
// folder in one pass: errors stop the import, warnings are reported and the data is
// used as described in the warning.

import { mkdir, readFile, rm, writeFile } from "node:fs/promises";
import path from "node:path";
import type {
  AntennaModel,
  Beam,
  BeamSet,
  Building,
  Cell,
  Cluster,
  ModelSettings,
  Point,
  Raster,
  Scenario,
  Site,
} from "../radio/scenario";
import { DEFAULT_SETTINGS } from "../radio/scenario";

// ---------------------------------------------------------------------------
// File names

export const SCENARIO_FILES = {
  settings: "settings.json",
  sites: "sites.csv",
  cells: "cells.csv",
  antennas: "antennas.json",
  beamSets: "beamsets.json",
  buildings: "buildings.geojson",
  clusters: "clusters.geojson",
  terrain: "terrain.asc",
  traffic: "traffic.asc",
} as const;

export type ScenarioFileName = (typeof SCENARIO_FILES)[keyof typeof SCENARIO_FILES];

/** Every file except traffic.asc must be present (an empty collection is fine). */
export const OPTIONAL_FILES: readonly ScenarioFileName[] = [SCENARIO_FILES.traffic];

/** Names the GeoJSON "crs" member we write: coordinates are local metres, x east, y north. */
export const LOCAL_METRES_CRS = "beamgate:local-metres";

export const FORMAT_NAME = "beamgate-scenario";
export const FORMAT_VERSION = 1;

// ---------------------------------------------------------------------------
// Problems and the error class

export type ProblemSeverity = "error" | "warning";

/** One thing wrong (or doubtful) in one file. */
export interface FormatProblem {
  severity: ProblemSeverity;
  file: string;
  /**
   * CSV: 1-based line of the record, the header being row 1. ASCII grid: 1-based line.
   * JSON/GeoJSON: 1-based index of the entry (feature) in its array. Absent for
   * whole-file problems.
   */
  row?: number;
  /** CSV: the column name. JSON: the field path. ASCII grid: header key or 1-based value position in the line. */
  column?: string;
  /** The offending value as text, when there is one. */
  value?: string;
  reason: string;
}

export function describeProblem(p: FormatProblem): string {
  let where = p.file;
  if (p.row !== undefined) where += ` row ${p.row}`;
  if (p.column !== undefined) where += `, column ${p.column}`;
  const value = p.value !== undefined ? `, value ${JSON.stringify(p.value)}` : "";
  return `${where}${value}: ${p.reason}`;
}

const MESSAGE_LINES = 12;

/** Thrown when a scenario cannot be read; `problems` holds every error, `warnings` the rest. */
export class ScenarioFormatError extends Error {
  readonly problems: FormatProblem[];
  readonly warnings: FormatProblem[];
  /** The first problem's location, for callers that show one line. */
  readonly file: string;
  readonly row?: number;
  readonly column?: string;
  readonly value?: string;
  readonly reason: string;

  constructor(problems: FormatProblem[], warnings: FormatProblem[] = []) {
    const shown = problems.slice(0, MESSAGE_LINES).map((p) => `  - ${describeProblem(p)}`);
    const more = problems.length > MESSAGE_LINES ? [`  … and ${problems.length - MESSAGE_LINES} more`] : [];
    super(
      `Scenario has ${problems.length} problem${problems.length === 1 ? "" : "s"}:\n${[...shown, ...more].join("\n")}`,
    );
    this.name = "ScenarioFormatError";
    this.problems = problems;
    this.warnings = warnings;
    const first = problems[0] ?? { file: "", reason: "" };
    this.file = first.file;
    this.row = first.row;
    this.column = first.column;
    this.value = first.value;
    this.reason = first.reason;
  }
}

/** The outcome of parsing one file: the value is only trustworthy when no problem is an error. */
export interface ParseResult<T> {
  value: T;
  problems: FormatProblem[];
}

export function hasErrors(problems: readonly FormatProblem[]): boolean {
  return problems.some((p) => p.severity === "error");
}

/** Collects problems for one file. */
class Reporter {
  readonly problems: FormatProblem[] = [];
  constructor(readonly file: string) {}

  add(severity: ProblemSeverity, reason: string, row?: number, column?: string, value?: unknown): void {
    const p: FormatProblem = { severity, file: this.file, reason };
    if (row !== undefined) p.row = row;
    if (column !== undefined) p.column = column;
    if (value !== undefined) p.value = showValue(value);
    this.problems.push(p);
  }
  error(reason: string, row?: number, column?: string, value?: unknown): void {
    this.add("error", reason, row, column, value);
  }
  warn(reason: string, row?: number, column?: string, value?: unknown): void {
    this.add("warning", reason, row, column, value);
  }
}

function showValue(value: unknown): string {
  const text = typeof value === "string" ? value : JSON.stringify(value) ?? String(value);
  return text.length > 80 ? `${text.slice(0, 77)}...` : text;
}

// ---------------------------------------------------------------------------
// Numbers

/** Plain decimal or scientific notation; no NaN, Infinity, hex, or thousands separators. */
const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** Parses a decimal number strictly; undefined when the text is not a finite number. */
export function parseNumberText(text: string): number | undefined {
  const t = text.trim();
  if (!NUMBER_PATTERN.test(t)) return undefined;
  const n = Number(t);
  return Number.isFinite(n) ? n : undefined;
}

/** Shortest text that reads back as the same double (keeps −0). */
export function formatNumber(n: number): string {
  if (!Number.isFinite(n)) throw new RangeError(`formatNumber: not a finite number: ${String(n)}`);
  return Object.is(n, -0) ? "-0" : String(n);
}

/**
 * Shortest decimal text that reads back, through Math.fround, as the same Float32
 * value. String(v) would print the float's exact double expansion (0.1f →
 * "0.10000000149011612"); 9 significant digits always suffice for Float32.
 */
export function formatFloat32(v: number): string {
  if (!Number.isFinite(v)) throw new RangeError(`formatFloat32: not a finite number: ${String(v)}`);
  if (v === 0) return Object.is(v, -0) ? "-0" : "0";
  const f = Math.fround(v);
  for (let digits = 1; digits <= 9; digits++) {
    const candidate = Number(f.toPrecision(digits));
    if (Math.fround(candidate) === f) return String(candidate);
  }
  return String(f);
}

interface NumberRule {
  min?: number;
  max?: number;
  /** Strict bounds. */
  above?: number;
  below?: number;
  integer?: boolean;
  oneOf?: readonly number[];
}

/** Why the number breaks the rule, or undefined when it does not. */
function ruleBreak(n: number, rule: NumberRule): string | undefined {
  if (rule.integer && !Number.isInteger(n)) return "must be a whole number";
  if (rule.min !== undefined && n < rule.min) return `must be at least ${rule.min}`;
  if (rule.max !== undefined && n > rule.max) return `must be at most ${rule.max}`;
  if (rule.above !== undefined && n <= rule.above) return `must be greater than ${rule.above}`;
  if (rule.below !== undefined && n >= rule.below) return `must be less than ${rule.below}`;
  if (rule.oneOf && !rule.oneOf.includes(n)) return `must be one of ${rule.oneOf.join(", ")}`;
  return undefined;
}

// ---------------------------------------------------------------------------
// CSV (RFC 4180: comma separated, double-quoted fields with "" escapes, CRLF or LF)

export interface CsvRecord {
  /** 1-based line on which the record starts (the header is normally row 1). */
  row: number;
  fields: string[];
}

/** Splits CSV text into records; blank lines are skipped but still counted. */
export function parseCsv(text: string, fileName = "file.csv"): ParseResult<CsvRecord[]> {
  const rep = new Reporter(fileName);
  const records: CsvRecord[] = [];
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text; // byte-order mark
  let line = 1;
  let recordRow = 1;
  let fields: string[] = [];
  let field = "";
  let i = 0;
  let quoted = false;
  let quoteRow = 0;
  let afterQuote = false;

  const endRecord = (): void => {
    fields.push(field);
    const blank = fields.length === 1 && fields[0].trim() === "";
    if (!blank) records.push({ row: recordRow, fields });
    fields = [];
    field = "";
    afterQuote = false;
  };

  while (i < src.length) {
    const ch = src[i];
    if (quoted) {
      if (ch === '"') {
        if (src[i + 1] === '"') {
          field += '"';
          i += 2;
          continue;
        }
        quoted = false;
        afterQuote = true;
        i++;
        continue;
      }
      if (ch === "\n") line++;
      field += ch;
      i++;
      continue;
    }
    if (ch === ",") {
      fields.push(field);
      field = "";
      afterQuote = false;
      i++;
    } else if (ch === "\r" || ch === "\n") {
      endRecord();
      i += ch === "\r" && src[i + 1] === "\n" ? 2 : 1;
      line++;
      recordRow = line;
    } else if (ch === '"' && field.trim() === "" && !afterQuote) {
      quoted = true;
      quoteRow = line;
      field = "";
      i++;
    } else {
      if (afterQuote && ch.trim() !== "") {
        rep.error("text after a closing quote; quote the whole field", line, undefined, ch);
        afterQuote = false;
      }
      if (!afterQuote) field += ch;
      i++;
    }
  }
  if (quoted) rep.error("quoted field is never closed", quoteRow);
  if (field !== "" || fields.length > 0) endRecord();
  return { value: records, problems: rep.problems };
}

function csvField(value: string): string {
  return /[",\r\n]/.test(value) || value.trim() !== value ? `"${value.replace(/"/g, '""')}"` : value;
}

/** Formats a header and rows as CSV with LF line ends and a final newline. */
export function formatCsv(header: readonly string[], rows: readonly (readonly string[])[]): string {
  return [header, ...rows].map((r) => r.map(csvField).join(",")).join("\n") + "\n";
}

/** Header matching: trimmed, case-insensitive, spaces and hyphens read as underscores. */
export function normaliseHeader(name: string): string {
  return name.trim().toLowerCase().replace(/[\s-]+/g, "_");
}

interface TableRow {
  row: number;
  /** The field's raw text, or undefined when the row is too short (already reported). */
  get(column: string): string | undefined;
}

/** Maps CSV records to named columns; reports missing, duplicate and unknown columns. */
function readTable(
  text: string,
  rep: Reporter,
  required: readonly string[],
  optional: readonly string[] = [],
): TableRow[] | undefined {
  const csv = parseCsv(text, rep.file);
  rep.problems.push(...csv.problems);
  const [headerRecord, ...dataRecords] = csv.value;
  if (!headerRecord) {
    rep.error("empty file: expected a header row", 1);
    return undefined;
  }
  const index = new Map<string, number>();
  headerRecord.fields.forEach((raw, k) => {
    const name = normaliseHeader(raw);
    if (index.has(name)) rep.error("duplicate column", headerRecord.row, name, raw);
    else if (required.includes(name) || optional.includes(name)) index.set(name, k);
    else rep.warn("unknown column; ignored", headerRecord.row, raw.trim(), raw);
  });
  let missing = false;
  for (const name of required) {
    if (!index.has(name)) {
      rep.error("missing column", headerRecord.row, name);
      missing = true;
    }
  }
  if (missing) return undefined;
  const width = headerRecord.fields.length;
  return dataRecords.map((record) => {
    if (record.fields.length !== width) {
      rep.error(`expected ${width} fields, found ${record.fields.length}`, record.row);
    }
    return {
      row: record.row,
      get: (column: string) => {
        const k = index.get(column);
        return k === undefined ? undefined : record.fields[k];
      },
    };
  });
}

/** Reads a numeric field; reports and returns NaN when it is not a finite number or breaks the rule. */
function csvNumber(rep: Reporter, r: TableRow, column: string, rule: NumberRule = {}): number {
  const raw = r.get(column);
  if (raw === undefined) return NaN; // short row, already reported
  const n = parseNumberText(raw);
  if (n === undefined) {
    rep.error(raw.trim() === "" ? "empty; a number is required" : "not a finite number", r.row, column, raw);
    return NaN;
  }
  const broken = ruleBreak(n, rule);
  if (broken) rep.error(broken, r.row, column, raw);
  return n;
}

function csvId(rep: Reporter, r: TableRow, column: string, seen: Set<string>): string {
  const raw = r.get(column);
  if (raw === undefined) return "";
  const id = raw.trim();
  if (id === "") rep.error("empty id", r.row, column);
  else if (seen.has(id)) rep.error("duplicate id", r.row, column, id);
  seen.add(id);
  return id;
}

// ---------------------------------------------------------------------------
// sites.csv

export const SITE_COLUMNS = ["site_id", "name", "x_m", "y_m", "ground_m"] as const;

export interface BoundsOption {
  /** When given, positions outside it are warned about. */
  bounds?: Scenario["bounds"];
}

function outside(bounds: Scenario["bounds"] | undefined, x: number, y: number): boolean {
  return !!bounds && (x < bounds.minX || x > bounds.maxX || y < bounds.minY || y > bounds.maxY);
}

export function parseSitesCsv(text: string, fileName: string = SCENARIO_FILES.sites, options: BoundsOption = {}): ParseResult<Site[]> {
  const rep = new Reporter(fileName);
  const rows = readTable(text, rep, ["site_id", "x_m", "y_m", "ground_m"], ["name"]);
  const sites: Site[] = [];
  const seen = new Set<string>();
  for (const r of rows ?? []) {
    const id = csvId(rep, r, "site_id", seen);
    const site: Site = {
      id,
      // Names are kept verbatim (ids are trimmed); an empty name falls back to the id.
      name: r.get("name")?.trim() ? r.get("name")! : id,
      x: csvNumber(rep, r, "x_m"),
      y: csvNumber(rep, r, "y_m"),
      groundHeightM: csvNumber(rep, r, "ground_m", { min: -500, max: 9000 }),
    };
    if (outside(options.bounds, site.x, site.y)) rep.warn("site lies outside the scenario bounds", r.row, "x_m", `${site.x} ${site.y}`);
    sites.push(site);
  }
  return { value: sites, problems: rep.problems };
}

export function formatSitesCsv(sites: readonly Site[]): string {
  return formatCsv(
    SITE_COLUMNS,
    sites.map((s) => [s.id, s.name, formatNumber(s.x), formatNumber(s.y), formatNumber(s.groundHeightM)]),
  );
}

// ---------------------------------------------------------------------------
// cells.csv

export const CELL_COLUMNS = [
  "cell_id",
  "site_id",
  "antenna_model",
  "antenna_height_m",
  "azimuth_deg",
  "mechanical_tilt_deg",
  "electrical_tilt_deg",
  "beam_set",
  "rs_power_dbm",
  "frequency_mhz",
  "bandwidth_mhz",
  "scs_khz",
] as const;

export const SUBCARRIER_SPACINGS_KHZ: readonly number[] = [15, 30, 60, 120];

/** What cells.csv may refer to; checks are skipped for references not given. */
export interface CellReferences {
  siteIds?: Iterable<string>;
  antennaModels?: readonly AntennaModel[];
  beamSetIds?: Iterable<string>;
}

export function parseCellsCsv(text: string, fileName: string = SCENARIO_FILES.cells, refs: CellReferences = {}): ParseResult<Cell[]> {
  const rep = new Reporter(fileName);
  const rows = readTable(text, rep, CELL_COLUMNS);
  const siteIds = refs.siteIds ? new Set(refs.siteIds) : undefined;
  const beamSetIds = refs.beamSetIds ? new Set(refs.beamSetIds) : undefined;
  const models = refs.antennaModels ? new Map(refs.antennaModels.map((m) => [m.id, m])) : undefined;
  const cells: Cell[] = [];
  const seen = new Set<string>();

  for (const r of rows ?? []) {
    const id = csvId(rep, r, "cell_id", seen);
    const siteId = r.get("site_id")?.trim() ?? "";
    if (siteIds && r.get("site_id") !== undefined && !siteIds.has(siteId)) {
      rep.error(`unknown site (not in ${SCENARIO_FILES.sites})`, r.row, "site_id", siteId);
    }
    const modelId = r.get("antenna_model")?.trim() ?? "";
    const model = models?.get(modelId);
    if (models && r.get("antenna_model") !== undefined && !model) {
      rep.error(`unknown antenna model (not in ${SCENARIO_FILES.antennas})`, r.row, "antenna_model", modelId);
    }
    const beamSetId = r.get("beam_set")?.trim() ?? "";
    if (beamSetIds && r.get("beam_set") !== undefined && !beamSetIds.has(beamSetId)) {
      rep.error(`unknown beam set (not in ${SCENARIO_FILES.beamSets})`, r.row, "beam_set", beamSetId);
    } else if (model && r.get("beam_set") !== undefined && !model.beamSetIds.includes(beamSetId)) {
      rep.error(`beam set not supported by antenna model ${modelId}`, r.row, "beam_set", beamSetId);
    }
    const cell: Cell = {
      id,
      siteId,
      antennaModelId: modelId,
      antennaHeightM: csvNumber(rep, r, "antenna_height_m", { above: 0, max: 1000 }),
      azimuthDeg: csvNumber(rep, r, "azimuth_deg", { min: 0, below: 360 }),
      mechanicalTiltDeg: csvNumber(rep, r, "mechanical_tilt_deg", { min: -90, max: 90 }),
      electricalTiltDeg: csvNumber(rep, r, "electrical_tilt_deg", { min: -90, max: 90 }),
      beamSetId,
      rsPowerDbm: csvNumber(rep, r, "rs_power_dbm", { min: -50, max: 60 }),
      frequencyMHz: csvNumber(rep, r, "frequency_mhz", { above: 0 }),
      bandwidthMHz: csvNumber(rep, r, "bandwidth_mhz", { above: 0, max: 1000 }),
      subcarrierSpacingKHz: csvNumber(rep, r, "scs_khz", { oneOf: SUBCARRIER_SPACINGS_KHZ }),
    };
    // Hardware ranges of the antenna model: values outside are refused, as in a change request.
    if (model) {
      const range = (column: string, v: number, min: number, max: number, what: string): void => {
        if (Number.isFinite(v) && (v < min || v > max)) {
          rep.error(`${what} outside the range of antenna model ${model.id} (${min} to ${max})`, r.row, column, r.get(column));
        }
      };
      range("mechanical_tilt_deg", cell.mechanicalTiltDeg, model.mechanicalTiltMinDeg, model.mechanicalTiltMaxDeg, "mechanical tilt");
      range("electrical_tilt_deg", cell.electricalTiltDeg, model.electricalTiltMinDeg, model.electricalTiltMaxDeg, "electrical tilt");
      range("rs_power_dbm", cell.rsPowerDbm, model.rsPowerMinDbm, model.rsPowerMaxDbm, "reference-signal power");
    }
    // TR 38.901 path-loss models are stated for 0.5–100 GHz (§7.4.1).
    if (Number.isFinite(cell.frequencyMHz) && (cell.frequencyMHz < 500 || cell.frequencyMHz > 100_000)) {
      rep.warn("frequency outside 500–100000 MHz, the validity range of TR 38.901 path loss", r.row, "frequency_mhz", r.get("frequency_mhz"));
    }
    cells.push(cell);
  }
  return { value: cells, problems: rep.problems };
}

export function formatCellsCsv(cells: readonly Cell[]): string {
  return formatCsv(
    CELL_COLUMNS,
    cells.map((c) => [
      c.id,
      c.siteId,
      c.antennaModelId,
      formatNumber(c.antennaHeightM),
      formatNumber(c.azimuthDeg),
      formatNumber(c.mechanicalTiltDeg),
      formatNumber(c.electricalTiltDeg),
      c.beamSetId,
      formatNumber(c.rsPowerDbm),
      formatNumber(c.frequencyMHz),
      formatNumber(c.bandwidthMHz),
      formatNumber(c.subcarrierSpacingKHz),
    ]),
  );
}

// ---------------------------------------------------------------------------
// JSON helpers

type JsonObject = Record<string, unknown>;

function isObject(v: unknown): v is JsonObject {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

/** JSON.parse with the error turned into a problem (with its line when the engine tells the position). */
function parseJson(text: string, rep: Reporter): unknown {
  try {
    return JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    const position = /position (\d+)/.exec(message);
    const lineMatch = /line (\d+)/.exec(message);
    const line = lineMatch
      ? Number(lineMatch[1])
      : position
        ? text.slice(0, Number(position[1])).split("\n").length
        : undefined;
    rep.error(`malformed JSON: ${message}`, line);
    return undefined;
  }
}

function jsonNumber(rep: Reporter, obj: JsonObject, key: string, row: number | undefined, path: string, rule: NumberRule = {}): number {
  const v = obj[key];
  if (v === undefined) {
    rep.error("missing field", row, path);
    return NaN;
  }
  if (typeof v !== "number" || !Number.isFinite(v)) {
    rep.error("not a finite number", row, path, v);
    return NaN;
  }
  const broken = ruleBreak(v, rule);
  if (broken) rep.error(broken, row, path, v);
  return v;
}

function jsonString(rep: Reporter, obj: JsonObject, key: string, row: number | undefined, path: string, fallback?: string): string {
  const v = obj[key];
  if (v === undefined && fallback !== undefined) return fallback;
  if (typeof v !== "string") {
    rep.error(v === undefined ? "missing field" : "must be a string", row, path, v);
    return "";
  }
  return v;
}

function warnUnknownKeys(rep: Reporter, obj: JsonObject, known: readonly string[], row: number | undefined, prefix: string): void {
  for (const key of Object.keys(obj)) {
    if (!known.includes(key)) rep.warn("unknown field; ignored", row, `${prefix}${key}`);
  }
}

/** Parses a top-level JSON array; reports when it is something else. */
function jsonArray(text: string, rep: Reporter, what: string): unknown[] {
  const data = parseJson(text, rep);
  if (data === undefined) return [];
  if (!Array.isArray(data)) {
    rep.error(`expected a JSON array of ${what}`);
    return [];
  }
  return data;
}

// ---------------------------------------------------------------------------
// beamsets.json

const BEAM_SET_KEYS = ["id", "name", "description", "beams"] as const;
const BEAM_KEYS = ["azimuthOffsetDeg", "elevationOffsetDeg", "widthDeg"] as const;

export function parseBeamSetsJson(text: string, fileName: string = SCENARIO_FILES.beamSets): ParseResult<BeamSet[]> {
  const rep = new Reporter(fileName);
  const seen = new Set<string>();
  const out: BeamSet[] = [];
  jsonArray(text, rep, "beam sets").forEach((entry, k) => {
    const row = k + 1;
    if (!isObject(entry)) {
      rep.error("expected an object", row, `[${k}]`);
      return;
    }
    warnUnknownKeys(rep, entry, BEAM_SET_KEYS, row, "");
    const id = jsonString(rep, entry, "id", row, "id");
    if (id.trim() === "" && typeof entry.id === "string") rep.error("empty id", row, "id");
    else if (seen.has(id)) rep.error("duplicate id", row, "id", id);
    seen.add(id);
    const beams: Beam[] = [];
    if (!Array.isArray(entry.beams) || entry.beams.length === 0) {
      rep.error("a beam set needs a non-empty array of beams", row, "beams", entry.beams);
    } else {
      entry.beams.forEach((b, j) => {
        const p = `beams[${j}].`;
        if (!isObject(b)) {
          rep.error("expected an object", row, `beams[${j}]`);
          return;
        }
        warnUnknownKeys(rep, b, BEAM_KEYS, row, p);
        beams.push({
          azimuthOffsetDeg: jsonNumber(rep, b, "azimuthOffsetDeg", row, `${p}azimuthOffsetDeg`, { min: -180, max: 180 }),
          elevationOffsetDeg: jsonNumber(rep, b, "elevationOffsetDeg", row, `${p}elevationOffsetDeg`, { min: -90, max: 90 }),
          widthDeg: jsonNumber(rep, b, "widthDeg", row, `${p}widthDeg`, { above: 0, max: 360 }),
        });
      });
    }
    out.push({
      id,
      name: jsonString(rep, entry, "name", row, "name", id),
      description: jsonString(rep, entry, "description", row, "description", ""),
      beams,
    });
  });
  return { value: out, problems: rep.problems };
}

export function formatBeamSetsJson(beamSets: readonly BeamSet[]): string {
  const plain = beamSets.map((s) => ({
    id: s.id,
    name: s.name,
    description: s.description,
    beams: s.beams.map((b) => ({ azimuthOffsetDeg: b.azimuthOffsetDeg, elevationOffsetDeg: b.elevationOffsetDeg, widthDeg: b.widthDeg })),
  }));
  return JSON.stringify(plain, null, 2) + "\n";
}

// ---------------------------------------------------------------------------
// antennas.json

const ANTENNA_NUMBER_FIELDS: readonly [keyof AntennaModel & string, NumberRule][] = [
  ["elementHBeamwidthDeg", { above: 0, max: 360 }],
  ["elementVBeamwidthDeg", { above: 0, max: 180 }],
  ["elementGainDbi", { min: -10, max: 30 }],
  ["frontToBackDb", { min: 0, max: 100 }],
  ["sideLobeLevelDb", { min: 0, max: 100 }],
  ["rows", { integer: true, min: 1, max: 64 }],
  ["columns", { integer: true, min: 1, max: 64 }],
  ["verticalSpacingWl", { above: 0, max: 10 }],
  ["horizontalSpacingWl", { above: 0, max: 10 }],
  ["electricalTiltMinDeg", { min: -90, max: 90 }],
  ["electricalTiltMaxDeg", { min: -90, max: 90 }],
  ["mechanicalTiltMinDeg", { min: -90, max: 90 }],
  ["mechanicalTiltMaxDeg", { min: -90, max: 90 }],
  ["rsPowerMinDbm", { min: -50, max: 60 }],
  ["rsPowerMaxDbm", { min: -50, max: 60 }],
];
const ANTENNA_KEYS = ["id", "name", "beamSetIds", ...ANTENNA_NUMBER_FIELDS.map(([k]) => k)];

export interface AntennaReferences {
  beamSetIds?: Iterable<string>;
}

export function parseAntennasJson(
  text: string,
  fileName: string = SCENARIO_FILES.antennas,
  refs: AntennaReferences = {},
): ParseResult<AntennaModel[]> {
  const rep = new Reporter(fileName);
  const known = refs.beamSetIds ? new Set(refs.beamSetIds) : undefined;
  const seen = new Set<string>();
  const out: AntennaModel[] = [];
  jsonArray(text, rep, "antenna models").forEach((entry, k) => {
    const row = k + 1;
    if (!isObject(entry)) {
      rep.error("expected an object", row, `[${k}]`);
      return;
    }
    warnUnknownKeys(rep, entry, ANTENNA_KEYS, row, "");
    const id = jsonString(rep, entry, "id", row, "id");
    if (id.trim() === "" && typeof entry.id === "string") rep.error("empty id", row, "id");
    else if (seen.has(id)) rep.error("duplicate id", row, "id", id);
    seen.add(id);
    const numbers = {} as Record<string, number>;
    for (const [key, rule] of ANTENNA_NUMBER_FIELDS) numbers[key] = jsonNumber(rep, entry, key, row, key, rule);
    for (const [lo, hi] of [
      ["electricalTiltMinDeg", "electricalTiltMaxDeg"],
      ["mechanicalTiltMinDeg", "mechanicalTiltMaxDeg"],
      ["rsPowerMinDbm", "rsPowerMaxDbm"],
    ]) {
      if (numbers[lo] > numbers[hi]) rep.error(`${lo} is greater than ${hi}`, row, lo, numbers[lo]);
    }
    const beamSetIds: string[] = [];
    if (!Array.isArray(entry.beamSetIds)) {
      rep.error("must be an array of beam-set ids", row, "beamSetIds", entry.beamSetIds);
    } else {
      entry.beamSetIds.forEach((b, j) => {
        if (typeof b !== "string") rep.error("must be a string", row, `beamSetIds[${j}]`, b);
        else {
          if (known && !known.has(b)) rep.error(`unknown beam set (not in ${SCENARIO_FILES.beamSets})`, row, `beamSetIds[${j}]`, b);
          beamSetIds.push(b);
        }
      });
    }
    out.push({
      id,
      name: jsonString(rep, entry, "name", row, "name", id),
      ...(numbers as Omit<AntennaModel, "id" | "name" | "beamSetIds">),
      beamSetIds,
    });
  });
  return { value: out, problems: rep.problems };
}

export function formatAntennasJson(models: readonly AntennaModel[]): string {
  const plain = models.map((m) => {
    const o: Record<string, unknown> = { id: m.id, name: m.name };
    for (const [key] of ANTENNA_NUMBER_FIELDS) o[key] = m[key];
    o.beamSetIds = [...m.beamSetIds];
    return o;
  });
  return JSON.stringify(plain, null, 2) + "\n";
}

// ---------------------------------------------------------------------------
// GeoJSON polygons (buildings.geojson, clusters.geojson)

/** Coordinates given in degrees would silently be read as metres: refuse them. */
const DEGREE_CRS = /(crs84|epsg:?:?4326|wgs ?84)/i;

interface PolygonFeature {
  row: number;
  properties: JsonObject;
  ring: Point[] | undefined;
}

function parseFeatureCollection(text: string, rep: Reporter): PolygonFeature[] {
  const data = parseJson(text, rep);
  if (data === undefined) return [];
  if (!isObject(data) || data.type !== "FeatureCollection" || !Array.isArray(data.features)) {
    rep.error('expected a GeoJSON FeatureCollection ({"type": "FeatureCollection", "features": [...]})');
    return [];
  }
  if (data.crs !== undefined) {
    const name = isObject(data.crs) && isObject(data.crs.properties) ? data.crs.properties.name : undefined;
    if (typeof name === "string" && name.toLowerCase() === LOCAL_METRES_CRS) {
      // ours
    } else if (typeof name === "string" && DEGREE_CRS.test(name)) {
      rep.error("coordinates in degrees; convert to local metres (x east, y north) first", undefined, "crs", name);
    } else {
      rep.warn(`crs is not ${LOCAL_METRES_CRS}; coordinates are read as local metres anyway`, undefined, "crs", name ?? data.crs);
    }
  }
  const out: PolygonFeature[] = [];
  data.features.forEach((f, k) => {
    const row = k + 1;
    if (!isObject(f) || f.type !== "Feature") {
      rep.error('expected a GeoJSON Feature ({"type": "Feature", ...})', row, `features[${k}]`);
      return;
    }
    const properties = isObject(f.properties) ? f.properties : {};
    if (!isObject(f.properties)) rep.error("missing properties", row, "properties");
    out.push({ row, properties, ring: parseRing(f.geometry, rep, row) });
  });
  return out;
}

/** The outer ring of a Polygon geometry, without the repeated closing point. */
function parseRing(geometry: unknown, rep: Reporter, row: number): Point[] | undefined {
  if (!isObject(geometry)) {
    rep.error("missing geometry", row, "geometry");
    return undefined;
  }
  if (geometry.type !== "Polygon") {
    rep.error("geometry must be a Polygon (one feature per polygon)", row, "geometry.type", geometry.type);
    return undefined;
  }
  const rings = geometry.coordinates;
  if (!Array.isArray(rings) || rings.length === 0 || !Array.isArray(rings[0])) {
    rep.error("Polygon coordinates must be an array of rings", row, "geometry.coordinates");
    return undefined;
  }
  if (rings.length > 1) rep.warn("inner rings (holes) are ignored", row, "geometry.coordinates");
  const outer = rings[0] as unknown[];
  const points: Point[] = [];
  for (let j = 0; j < outer.length; j++) {
    const pos = outer[j];
    // A third (height) coordinate is allowed by GeoJSON and ignored here.
    if (!Array.isArray(pos) || pos.length < 2 || !pos.slice(0, 2).every((c) => typeof c === "number" && Number.isFinite(c))) {
      rep.error("position must be [x, y] with finite numbers", row, `geometry.coordinates[0][${j}]`, pos);
      return undefined;
    }
    points.push({ x: pos[0] as number, y: pos[1] as number });
  }
  if (points.length < 4) {
    rep.error(`a polygon ring needs at least 3 points plus the closing point, found ${points.length} positions`, row, "geometry.coordinates[0]");
    return undefined;
  }
  const first = points[0];
  const last = points[points.length - 1];
  if (first.x !== last.x || first.y !== last.y) {
    rep.error("polygon ring is not closed (the last position must repeat the first)", row, "geometry.coordinates[0]", [last.x, last.y]);
    return undefined;
  }
  const ring = points.slice(0, -1);
  // Shoelace formula: twice the signed area; zero means a degenerate ring.
  let area2 = 0;
  for (let j = 0; j < ring.length; j++) {
    const a = ring[j];
    const b = ring[(j + 1) % ring.length];
    area2 += a.x * b.y - b.x * a.y;
  }
  if (area2 === 0) rep.error("polygon has zero area", row, "geometry.coordinates[0]");
  return ring;
}

function featureId(rep: Reporter, f: PolygonFeature, seen: Set<string>): string {
  const raw = f.properties.id;
  if (typeof raw !== "string" && !(typeof raw === "number" && Number.isFinite(raw))) {
    rep.error(raw === undefined ? "missing id" : "id must be a string or number", f.row, "properties.id", raw);
    return "";
  }
  const id = String(raw).trim();
  if (id === "") rep.error("empty id", f.row, "properties.id");
  else if (seen.has(id)) rep.error("duplicate id", f.row, "properties.id", id);
  seen.add(id);
  return id;
}

function ringCoordinates(ring: readonly Point[]): number[][] {
  const coords = ring.map((p) => [p.x, p.y]);
  if (ring.length > 0) coords.push([ring[0].x, ring[0].y]);
  return coords;
}

/** One feature per line: diff-friendly and still plain GeoJSON. */
function formatFeatureCollection(features: readonly object[]): string {
  const head = `{"type":"FeatureCollection","crs":{"type":"name","properties":{"name":"${LOCAL_METRES_CRS}"}},"features":[`;
  if (features.length === 0) return `${head}]}\n`;
  return `${head}\n${features.map((f) => JSON.stringify(f)).join(",\n")}\n]}\n`;
}

export interface BuildingOptions extends BoundsOption {
  /** Used to derive missing floor counts (default 3 m). */
  floorHeightM?: number;
}

export function parseBuildingsGeoJson(
  text: string,
  fileName: string = SCENARIO_FILES.buildings,
  options: BuildingOptions = {},
): ParseResult<Building[]> {
  const rep = new Reporter(fileName);
  const floorHeightM = options.floorHeightM ?? DEFAULT_SETTINGS.floorHeightM;
  const seen = new Set<string>();
  const out: Building[] = [];
  for (const f of parseFeatureCollection(text, rep)) {
    const id = featureId(rep, f, seen);
    warnUnknownKeys(rep, f.properties, ["id", "height_m", "floors", "name"], f.row, "properties.");
    const h = f.properties.height_m;
    let heightM = NaN;
    if (h === undefined || h === null) rep.error("building has no height", f.row, "properties.height_m");
    else if (typeof h !== "number" || !Number.isFinite(h)) rep.error("not a finite number", f.row, "properties.height_m", h);
    else if (h <= 0) rep.error("height must be greater than 0", f.row, "properties.height_m", h);
    else heightM = h;

    let floors = NaN;
    const fl = f.properties.floors;
    if (fl === undefined || fl === null) {
      if (Number.isFinite(heightM)) {
        floors = Math.max(1, Math.round(heightM / floorHeightM));
        rep.warn(`no floor count; derived ${floors} from the height`, f.row, "properties.floors");
      }
    } else if (typeof fl !== "number" || !Number.isInteger(fl) || fl < 0) {
      rep.error("floors must be a whole number ≥ 0", f.row, "properties.floors", fl);
    } else {
      floors = fl;
      if (fl === 0) rep.warn("0 floors: the building has no indoor grids", f.row, "properties.floors", fl);
      else if (Number.isFinite(heightM) && (fl - 1) * floorHeightM > heightM) {
        rep.warn(`${fl} floors of ${floorHeightM} m do not fit under the roof height`, f.row, "properties.floors", fl);
      }
    }
    const ring = f.ring ?? [];
    if (ring.some((p) => outside(options.bounds, p.x, p.y))) rep.warn("building reaches outside the scenario bounds", f.row, "geometry");
    out.push({ id, footprint: ring, heightM, floors });
  }
  return { value: out, problems: rep.problems };
}

export function formatBuildingsGeoJson(buildings: readonly Building[]): string {
  return formatFeatureCollection(
    buildings.map((b) => ({
      type: "Feature",
      properties: { id: b.id, height_m: b.heightM, floors: b.floors },
      geometry: { type: "Polygon", coordinates: [ringCoordinates(b.footprint)] },
    })),
  );
}

export function parseClustersGeoJson(text: string, fileName: string = SCENARIO_FILES.clusters): ParseResult<Cluster[]> {
  const rep = new Reporter(fileName);
  const seen = new Set<string>();
  const out: Cluster[] = [];
  for (const f of parseFeatureCollection(text, rep)) {
    const id = featureId(rep, f, seen);
    warnUnknownKeys(rep, f.properties, ["id", "name"], f.row, "properties.");
    const name = f.properties.name;
    if (name !== undefined && typeof name !== "string") rep.error("name must be a string", f.row, "properties.name", name);
    out.push({ id, name: typeof name === "string" && name.trim() !== "" ? name : id, polygon: f.ring ?? [] });
  }
  return { value: out, problems: rep.problems };
}

export function formatClustersGeoJson(clusters: readonly Cluster[]): string {
  return formatFeatureCollection(
    clusters.map((c) => ({
      type: "Feature",
      properties: { id: c.id, name: c.name },
      geometry: { type: "Polygon", coordinates: [ringCoordinates(c.polygon)] },
    })),
  );
}

// ---------------------------------------------------------------------------
// ESRI ASCII grid (terrain.asc, traffic.asc)

export interface AsciiGridOptions {
  /** What a NODATA cell becomes: an error (terrain) or a value with one warning (traffic). */
  nodata?: "error" | { replaceWith: number };
  /** Refuse negative values (traffic weights). */
  nonNegative?: boolean;
}

const GRID_KEYS = ["ncols", "nrows", "xllcorner", "xllcenter", "yllcorner", "yllcenter", "cellsize", "nodata_value"];
/** Per-value problems beyond this count are summarised in one line. */
const MAX_VALUE_PROBLEMS = 20;
/** Guards memory: 100 million Float32 values are 400 MB. */
const MAX_GRID_VALUES = 100_000_000;

/**
 * Reads an ESRI ASCII grid. Header keys are case-insensitive, in any order; the
 * file's first data row is the northernmost, so it becomes the raster's last row
 * (our rows run south to north). Values are stored as Float32.
 */
export function parseAsciiGrid(text: string, fileName: string, options: AsciiGridOptions = {}): ParseResult<Raster> {
  const rep = new Reporter(fileName);
  const empty: Raster = { originX: 0, originY: 0, cellSize: 1, width: 0, height: 0, values: new Float32Array(0) };
  const lines = (text.charCodeAt(0) === 0xfeff ? text.slice(1) : text).split(/\r?\n/);
  const header = new Map<string, { value: number; row: number }>();
  /** Keys present, even with a bad value (so they are not also reported as missing). */
  const present = new Set<string>();
  let lineIndex = 0;
  // Header: "key value" lines until the first line that starts with a number.
  for (; lineIndex < lines.length; lineIndex++) {
    const tokens = lines[lineIndex].trim().split(/\s+/).filter((t) => t !== "");
    if (tokens.length === 0) continue;
    if (parseNumberText(tokens[0]) !== undefined) break;
    const row = lineIndex + 1;
    const key = tokens[0].toLowerCase();
    if (!GRID_KEYS.includes(key)) {
      rep.error("unknown header key", row, tokens[0]);
      continue;
    }
    if (present.has(key)) rep.error("duplicate header key", row, tokens[0]);
    present.add(key);
    const n = tokens.length === 2 ? parseNumberText(tokens[1]) : undefined;
    if (n === undefined) {
      rep.error("header value must be one finite number", row, tokens[0], tokens.slice(1).join(" "));
      continue;
    }
    header.set(key, { value: n, row });
  }
  const need = (key: string, rule: NumberRule): number | undefined => {
    const h = header.get(key);
    if (!h) return undefined;
    const broken = ruleBreak(h.value, rule);
    if (broken) {
      rep.error(broken, h.row, key, String(h.value));
      return undefined;
    }
    return h.value;
  };
  const width = need("ncols", { integer: true, min: 1 });
  const height = need("nrows", { integer: true, min: 1 });
  const cellSize = need("cellsize", { above: 0 });
  for (const key of ["ncols", "nrows", "cellsize"]) if (!present.has(key)) rep.error("missing header key", undefined, key);
  const corner = (axis: "x" | "y"): number | undefined => {
    const c = header.get(`${axis}llcorner`);
    const m = header.get(`${axis}llcenter`);
    if (c && m) rep.error(`give ${axis}llcorner or ${axis}llcenter, not both`, m.row, `${axis}llcenter`);
    if (!present.has(`${axis}llcorner`) && !present.has(`${axis}llcenter`)) {
      rep.error("missing header key", undefined, `${axis}llcorner`);
    }
    if (c) return c.value;
    // A centre reference names the middle of the south-west cell.
    if (m && cellSize !== undefined) return m.value - cellSize / 2;
    return undefined;
  };
  const originX = corner("x");
  const originY = corner("y");
  const nodata = header.get("nodata_value")?.value;
  if (width !== undefined && height !== undefined && width * height > MAX_GRID_VALUES) {
    rep.error(`grid of ${width} × ${height} values is larger than the ${MAX_GRID_VALUES} this reader accepts`, header.get("ncols")?.row, "ncols");
    return { value: empty, problems: rep.problems };
  }
  if (width === undefined || height === undefined || cellSize === undefined || originX === undefined || originY === undefined) {
    return { value: empty, problems: rep.problems };
  }

  const values = new Float32Array(width * height);
  const expected = width * height;
  let count = 0;
  let valueProblems = 0;
  let nodataCount = 0;
  const dataLines: number[] = [];
  const valueError = (reason: string, row: number, position: number, token: string): void => {
    valueProblems++;
    if (valueProblems <= MAX_VALUE_PROBLEMS) rep.error(reason, row, String(position), token);
  };
  for (let li = lineIndex; li < lines.length; li++) {
    const tokens = lines[li].trim().split(/\s+/).filter((t) => t !== "");
    if (tokens.length === 0) continue;
    dataLines.push(li);
    for (let t = 0; t < tokens.length; t++, count++) {
      if (count >= expected) continue; // counted, reported below
      let v = parseNumberText(tokens[t]);
      if (v === undefined) {
        valueError("not a finite number", li + 1, t + 1, tokens[t]);
        v = NaN;
      } else if (nodata !== undefined && v === nodata) {
        nodataCount++;
        if (options.nodata === undefined || options.nodata === "error") {
          valueError("NODATA cell; every cell needs a value", li + 1, t + 1, tokens[t]);
        } else {
          v = options.nodata.replaceWith;
        }
      } else if (Math.abs(v) > 3.4028234663852886e38) {
        valueError("outside the Float32 range", li + 1, t + 1, tokens[t]);
      } else if (options.nonNegative && v < 0) {
        valueError("must not be negative", li + 1, t + 1, tokens[t]);
      }
      // File row r (0 = north) is raster row height − 1 − r.
      const fileRow = Math.floor(count / width);
      const col = count % width;
      values[(height - 1 - fileRow) * width + col] = v;
    }
  }
  if (valueProblems > MAX_VALUE_PROBLEMS) {
    rep.error(`… and ${valueProblems - MAX_VALUE_PROBLEMS} more bad values`);
  }
  if (count !== expected) {
    rep.error(`expected ${expected} values (ncols ${width} × nrows ${height}), found ${count}`);
    // Point at the lines whose length is off when the file has one line per row.
    if (dataLines.length === height) {
      let shown = 0;
      for (const li of dataLines) {
        const n = lines[li].trim().split(/\s+/).length;
        if (n !== width && shown++ < 5) rep.error(`expected ${width} values on this line, found ${n}`, li + 1);
      }
    }
  }
  if (nodataCount > 0 && options.nodata !== undefined && options.nodata !== "error") {
    rep.warn(`${nodataCount} NODATA cells read as ${options.nodata.replaceWith}`, undefined, "nodata_value");
  }
  return { value: { originX, originY, cellSize, width, height, values }, problems: rep.problems };
}

/** Writes a raster as an ESRI ASCII grid, northernmost row first, values in shortest Float32 form. */
export function formatAsciiGrid(raster: Raster, nodataValue = -9999): string {
  const { width, height, values } = raster;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 1 || height < 1 || values.length !== width * height) {
    throw new RangeError(
      `formatAsciiGrid: raster shape ${String(width)} × ${String(height)} does not match ${values.length} values`,
    );
  }
  const out: string[] = [
    `ncols ${width}`,
    `nrows ${height}`,
    `xllcorner ${formatNumber(raster.originX)}`,
    `yllcorner ${formatNumber(raster.originY)}`,
    `cellsize ${formatNumber(raster.cellSize)}`,
  ];
  // Only declare NODATA when no real value collides with it.
  if (!values.includes(Math.fround(nodataValue))) out.push(`NODATA_value ${formatNumber(nodataValue)}`);
  const row: string[] = new Array(width);
  for (let r = height - 1; r >= 0; r--) {
    for (let c = 0; c < width; c++) row[c] = formatFloat32(values[r * width + c]);
    out.push(row.join(" "));
  }
  return out.join("\n") + "\n";
}

// ---------------------------------------------------------------------------
// settings.json

export interface ScenarioHeader {
  name: string;
  bounds: Scenario["bounds"];
  origin?: Scenario["origin"];
  settings: ModelSettings;
}

const SETTINGS_RULES: { [K in keyof ModelSettings]: NumberRule | readonly string[] | "boolean" } = {
  gridSizeM: { above: 0, max: 1000 },
  userHeightM: { min: 0, max: 100 },
  floorHeightM: { above: 0, max: 20 },
  environment: ["UMa", "UMi"],
  buildingLoss: ["low", "high"],
  diffraction: "boolean",
  otherLossesDb: { min: -100, max: 100 },
  noiseFigureDb: { min: 0, max: 30 },
  coverageThresholdDbm: { min: -200, max: 0 },
  overlapDeltaDb: { min: 0, max: 100 },
  overlapMaxOthers: { integer: true, min: 0 },
  overlapFloorDbm: { min: -200, max: 0 },
  interferenceThresholdDb: { min: -100, max: 100 },
  worstGridDropDb: { min: 0, max: 200 },
};

export function parseSettingsJson(text: string, fileName: string = SCENARIO_FILES.settings): ParseResult<ScenarioHeader> {
  const rep = new Reporter(fileName);
  const data = parseJson(text, rep);
  const header: ScenarioHeader = {
    name: "",
    bounds: { minX: NaN, minY: NaN, maxX: NaN, maxY: NaN },
    settings: { ...DEFAULT_SETTINGS },
  };
  if (data === undefined) return { value: header, problems: rep.problems };
  if (!isObject(data)) {
    rep.error("expected a JSON object");
    return { value: header, problems: rep.problems };
  }
  warnUnknownKeys(rep, data, ["format", "formatVersion", "name", "bounds", "origin", "settings"], undefined, "");
  if (data.format !== undefined && data.format !== FORMAT_NAME) rep.error(`format must be "${FORMAT_NAME}"`, undefined, "format", data.format);
  if (data.formatVersion !== undefined && data.formatVersion !== FORMAT_VERSION) {
    rep.error(`unsupported format version (this reader knows ${FORMAT_VERSION})`, undefined, "formatVersion", data.formatVersion);
  }
  header.name = jsonString(rep, data, "name", undefined, "name").trim();
  if (typeof data.name === "string" && header.name === "") rep.error("empty name", undefined, "name");

  if (!isObject(data.bounds)) rep.error("missing bounds {minX, minY, maxX, maxY}", undefined, "bounds", data.bounds);
  else {
    const b = data.bounds;
    header.bounds = {
      minX: jsonNumber(rep, b, "minX", undefined, "bounds.minX"),
      minY: jsonNumber(rep, b, "minY", undefined, "bounds.minY"),
      maxX: jsonNumber(rep, b, "maxX", undefined, "bounds.maxX"),
      maxY: jsonNumber(rep, b, "maxY", undefined, "bounds.maxY"),
    };
    if (header.bounds.maxX <= header.bounds.minX) rep.error("maxX must be greater than minX", undefined, "bounds.maxX", header.bounds.maxX);
    if (header.bounds.maxY <= header.bounds.minY) rep.error("maxY must be greater than minY", undefined, "bounds.maxY", header.bounds.maxY);
  }
  if (data.origin !== undefined) {
    if (!isObject(data.origin)) rep.error("origin must be {lon, lat}", undefined, "origin", data.origin);
    else {
      header.origin = {
        lon: jsonNumber(rep, data.origin, "lon", undefined, "origin.lon", { min: -180, max: 180 }),
        lat: jsonNumber(rep, data.origin, "lat", undefined, "origin.lat", { min: -90, max: 90 }),
      };
    }
  }

  const s = isObject(data.settings) ? data.settings : undefined;
  if (data.settings !== undefined && !s) rep.error("settings must be an object", undefined, "settings", data.settings);
  if (s) warnUnknownKeys(rep, s, Object.keys(SETTINGS_RULES), undefined, "settings.");
  const settings = header.settings as unknown as Record<string, unknown>;
  for (const [key, rule] of Object.entries(SETTINGS_RULES)) {
    const column = `settings.${key}`;
    const v = s?.[key];
    if (v === undefined) {
      rep.warn(`missing; the default ${JSON.stringify(settings[key])} is used`, undefined, column);
      continue;
    }
    if (rule === "boolean") {
      if (typeof v !== "boolean") rep.error("must be true or false", undefined, column, v);
      else settings[key] = v;
    } else if (Array.isArray(rule)) {
      if (typeof v !== "string" || !rule.includes(v)) rep.error(`must be one of ${rule.join(", ")}`, undefined, column, v);
      else settings[key] = v;
    } else if (typeof v !== "number" || !Number.isFinite(v)) {
      rep.error("not a finite number", undefined, column, v);
    } else {
      const broken = ruleBreak(v, rule as NumberRule);
      if (broken) rep.error(broken, undefined, column, v);
      else settings[key] = v;
    }
  }
  return { value: header, problems: rep.problems };
}

export function formatSettingsJson(scenario: Pick<Scenario, "name" | "bounds" | "origin" | "settings">): string {
  const o: Record<string, unknown> = {
    format: FORMAT_NAME,
    formatVersion: FORMAT_VERSION,
    name: scenario.name,
    bounds: { ...scenario.bounds },
  };
  if (scenario.origin) o.origin = { lon: scenario.origin.lon, lat: scenario.origin.lat };
  o.settings = { ...scenario.settings };
  return JSON.stringify(o, null, 2) + "\n";
}

// ---------------------------------------------------------------------------
// The whole folder, as texts

/** File name → text; missing optional files may be absent. */
export type ScenarioFiles = Partial<Record<ScenarioFileName, string>>;

export interface ScenarioParseReport {
  /** Present only when there are no errors. */
  scenario?: Scenario;
  errors: FormatProblem[];
  warnings: FormatProblem[];
}

/** Checks that a raster covers the bounds; only a warning, as the model may clamp at the edge. */
function coverageWarning(raster: Raster, bounds: Scenario["bounds"], file: string): FormatProblem | undefined {
  const maxX = raster.originX + raster.width * raster.cellSize;
  const maxY = raster.originY + raster.height * raster.cellSize;
  if (raster.originX > bounds.minX || raster.originY > bounds.minY || maxX < bounds.maxX || maxY < bounds.maxY) {
    return {
      severity: "warning",
      file,
      reason: `raster (${raster.originX}, ${raster.originY})–(${maxX}, ${maxY}) does not cover the scenario bounds`,
    };
  }
  return undefined;
}

/** Parses and cross-checks every file of a scenario; collects all problems. */
export function parseScenarioFiles(files: ScenarioFiles): ScenarioParseReport {
  const problems: FormatProblem[] = [];
  const text = (name: ScenarioFileName): string | undefined => {
    const t = files[name];
    if (t === undefined && !OPTIONAL_FILES.includes(name)) problems.push({ severity: "error", file: name, reason: "missing file" });
    return t;
  };
  const take = <T>(result: ParseResult<T>): T => {
    problems.push(...result.problems);
    return result.value;
  };

  const settingsText = text(SCENARIO_FILES.settings);
  const header = settingsText !== undefined ? take(parseSettingsJson(settingsText)) : undefined;
  const bounds = header && Object.values(header.bounds).every(Number.isFinite) ? header.bounds : undefined;

  const beamSetsText = text(SCENARIO_FILES.beamSets);
  const beamSets = beamSetsText !== undefined ? take(parseBeamSetsJson(beamSetsText)) : undefined;
  const beamSetIds = beamSets?.map((b) => b.id);

  const antennasText = text(SCENARIO_FILES.antennas);
  const antennaModels = antennasText !== undefined ? take(parseAntennasJson(antennasText, undefined, { beamSetIds })) : undefined;

  const sitesText = text(SCENARIO_FILES.sites);
  const sites = sitesText !== undefined ? take(parseSitesCsv(sitesText, undefined, { bounds })) : undefined;

  const cellsText = text(SCENARIO_FILES.cells);
  const cells =
    cellsText !== undefined
      ? take(parseCellsCsv(cellsText, undefined, { siteIds: sites?.map((s) => s.id), antennaModels, beamSetIds }))
      : undefined;

  const buildingsText = text(SCENARIO_FILES.buildings);
  const buildings =
    buildingsText !== undefined
      ? take(parseBuildingsGeoJson(buildingsText, undefined, { bounds, floorHeightM: header?.settings.floorHeightM }))
      : undefined;

  const clustersText = text(SCENARIO_FILES.clusters);
  const clusters = clustersText !== undefined ? take(parseClustersGeoJson(clustersText)) : undefined;

  const terrainText = text(SCENARIO_FILES.terrain);
  const terrain = terrainText !== undefined ? take(parseAsciiGrid(terrainText, SCENARIO_FILES.terrain, { nodata: "error" })) : undefined;

  const trafficText = text(SCENARIO_FILES.traffic);
  const traffic =
    trafficText !== undefined
      ? take(parseAsciiGrid(trafficText, SCENARIO_FILES.traffic, { nodata: { replaceWith: 0 }, nonNegative: true }))
      : undefined;

  if (bounds && terrain && terrain.width > 0) {
    const w = coverageWarning(terrain, bounds, SCENARIO_FILES.terrain);
    if (w) problems.push(w);
  }
  if (bounds && traffic && traffic.width > 0) {
    const w = coverageWarning(traffic, bounds, SCENARIO_FILES.traffic);
    if (w) problems.push(w);
  }

  const errors = problems.filter((p) => p.severity === "error");
  const warnings = problems.filter((p) => p.severity === "warning");
  if (errors.length > 0 || !header || !beamSets || !antennaModels || !sites || !cells || !buildings || !clusters || !terrain) {
    return { errors, warnings };
  }
  const scenario: Scenario = {
    name: header.name,
    bounds: header.bounds,
    ...(header.origin ? { origin: header.origin } : {}),
    terrain,
    ...(traffic ? { traffic } : {}),
    antennaModels,
    beamSets,
    sites,
    cells,
    buildings,
    clusters,
    settings: header.settings,
  };
  return { scenario, errors, warnings };
}

/** Parses a scenario from its file texts; throws ScenarioFormatError listing every error. */
export function scenarioFromFiles(files: ScenarioFiles, onWarnings?: (warnings: FormatProblem[]) => void): Scenario {
  const report = parseScenarioFiles(files);
  if (!report.scenario) throw new ScenarioFormatError(report.errors, report.warnings);
  if (onWarnings && report.warnings.length > 0) onWarnings(report.warnings);
  return report.scenario;
}

/** Formats every file of a scenario (traffic.asc only when the scenario has traffic). */
export function formatScenarioFiles(scenario: Scenario): ScenarioFiles {
  const files: ScenarioFiles = {
    [SCENARIO_FILES.settings]: formatSettingsJson(scenario),
    [SCENARIO_FILES.sites]: formatSitesCsv(scenario.sites),
    [SCENARIO_FILES.cells]: formatCellsCsv(scenario.cells),
    [SCENARIO_FILES.antennas]: formatAntennasJson(scenario.antennaModels),
    [SCENARIO_FILES.beamSets]: formatBeamSetsJson(scenario.beamSets),
    [SCENARIO_FILES.buildings]: formatBuildingsGeoJson(scenario.buildings),
    [SCENARIO_FILES.clusters]: formatClustersGeoJson(scenario.clusters),
    [SCENARIO_FILES.terrain]: formatAsciiGrid(scenario.terrain),
  };
  if (scenario.traffic) files[SCENARIO_FILES.traffic] = formatAsciiGrid(scenario.traffic);
  return files;
}

// ---------------------------------------------------------------------------
// Disk

/**
 * Writes the scenario folder (created if needed). A traffic.asc left from an
 * earlier export is removed when the scenario has no traffic, so that reading the
 * folder back gives the scenario just written.
 */
export async function writeScenarioFolder(dir: string, scenario: Scenario): Promise<void> {
  const files = formatScenarioFiles(scenario);
  await mkdir(dir, { recursive: true });
  for (const [name, text] of Object.entries(files)) {
    if (text !== undefined) await writeFile(path.join(dir, name), text, "utf8");
  }
  if (!scenario.traffic) await rm(path.join(dir, SCENARIO_FILES.traffic), { force: true });
}

export interface ReadOptions {
  /** Called once with every warning when the folder is read successfully. */
  onWarnings?: (warnings: FormatProblem[]) => void;
}

/** Reads a scenario folder; throws ScenarioFormatError listing every problem of every file. */
export async function readScenarioFolder(dir: string, options: ReadOptions = {}): Promise<Scenario> {
  const files: ScenarioFiles = {};
  const readProblems: FormatProblem[] = [];
  for (const name of Object.values(SCENARIO_FILES)) {
    try {
      files[name] = await readFile(path.join(dir, name), "utf8");
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      // A missing file is reported by parseScenarioFiles (or is optional).
      if (code !== "ENOENT") {
        readProblems.push({ severity: "error", file: name, reason: `cannot read: ${(e as Error).message}` });
      }
    }
  }
  const report = parseScenarioFiles(files);
  const errors = [...readProblems, ...report.errors];
  if (errors.length > 0 || !report.scenario) throw new ScenarioFormatError(errors, report.warnings);
  if (options.onWarnings && report.warnings.length > 0) options.onWarnings(report.warnings);
  return report.scenario;
}
