// Uploaded tables (CSV files and .xlsx sheets) before they meet the scenario-folder parsers:
// text decoding with clear encoding errors, delimiter detection, header aliases, and a
// canonical re-serialisation that keeps every record on its original row number so the
// folder parsers' problems still point at the user's own row. The CSV parsing itself is
// scenarioFolder's parseCsv; nothing here splits CSV text.

import ExcelJS from "exceljs";
import { formatCsv, formatNumber, normaliseHeader, parseCsv, type CsvRecord, type FormatProblem } from "./scenarioFolder";

// ---------------------------------------------------------------------------
// Text decoding

/**
 * Decodes an uploaded text file as UTF-8. A UTF-8 byte-order mark is dropped; a UTF-16/32
 * mark, NUL bytes (UTF-16 without a mark, or a binary file) and invalid UTF-8 are errors.
 */
export function decodeUtf8(bytes: Uint8Array, file: string): { text?: string; problem?: FormatProblem } {
  const fail = (reason: string, row?: number): { problem: FormatProblem } => ({
    problem: { severity: "error", file, reason, ...(row !== undefined ? { row } : {}) },
  });
  if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
    const order = bytes[0] === 0xff ? "little-endian" : "big-endian";
    return fail(`wrong encoding: the file is UTF-16 (${order} byte-order mark ${bytes[0].toString(16).toUpperCase()} ${bytes[1].toString(16).toUpperCase()}); save it as UTF-8`);
  }
  const probe = Math.min(bytes.length, 4096);
  for (let i = 0; i < probe; i++) {
    if (bytes[i] === 0) return fail("wrong encoding: NUL bytes found (UTF-16 without a byte-order mark, or not a text file); save it as UTF-8 text");
  }
  try {
    return { text: new TextDecoder("utf-8", { fatal: true }).decode(bytes) };
  } catch {
    // Find the line of the first bad byte sequence for the message.
    const loose = new TextDecoder("utf-8").decode(bytes);
    const at = loose.indexOf("\ufffd");
    const row = at >= 0 ? loose.slice(0, at).split("\n").length : undefined;
    return fail("wrong encoding: not valid UTF-8 (perhaps saved as Latin-1 or Windows-1252); save it as UTF-8", row);
  }
}

// ---------------------------------------------------------------------------
// Headers

/**
 * Import header matching: camelCase split into words, then scenarioFolder's rule (trimmed,
 * lower case, spaces and hyphens as underscores), brackets dropped and ":" / "." read as "_":
 * "Azimuth (deg)", "azimuthDeg", "AZIMUTH_DEG" and "azimuth-deg" all give "azimuth_deg";
 * "RS power (dBm)" gives "rs_power_dbm" (unit spellings dBm, dBi, dB, kHz, MHz, GHz are kept whole).
 */
export function normaliseImportHeader(name: string): string {
  // Unit spellings with an inner capital (dBm, kHz) are words, not camelCase.
  const words = name
    .trim()
    .replace(/dBm|dBi|dB|kHz|MHz|GHz/g, (unit) => unit.toLowerCase())
    .replace(/([a-z0-9])([A-Z])/g, "$1_$2");
  return normaliseHeader(words.replace(/[()[\]{}]/g, " ").replace(/[:.]/g, "_"))
    .replace(/_+/g, "_")
    .replace(/^_|_$/g, "");
}

/** Canonical column → accepted header names (after normaliseImportHeader). */
export type AliasTable = Readonly<Record<string, readonly string[]>>;

export const SITE_HEADER_ALIASES: AliasTable = {
  site_id: ["site_id", "site", "siteid", "site_code"],
  name: ["name", "site_name"],
  lon: ["lon", "lng", "long", "longitude", "lon_deg", "longitude_deg"],
  lat: ["lat", "latitude", "lat_deg", "latitude_deg"],
  x_m: ["x_m", "x", "local_x_m"],
  y_m: ["y_m", "y", "local_y_m"],
  ground_m: ["ground_m", "ground", "ground_height_m", "ground_height", "elevation_m", "ground_elevation_m"],
};

export const CELL_HEADER_ALIASES: AliasTable = {
  cell_id: ["cell_id", "cell", "cellid", "cell_name", "sector_id", "id"],
  site_id: ["site_id", "site", "siteid"],
  antenna_model: ["antenna_model", "antenna_model_id", "antenna", "antenna_type", "model"],
  antenna_height_m: ["antenna_height_m", "antenna_height", "height_m", "height"],
  azimuth_deg: ["azimuth_deg", "azimuth", "bearing", "bearing_deg", "az", "az_deg"],
  mechanical_tilt_deg: ["mechanical_tilt_deg", "mechanical_tilt", "mech_tilt", "mech_tilt_deg", "m_tilt", "mtilt"],
  electrical_tilt_deg: ["electrical_tilt_deg", "electrical_tilt", "elec_tilt", "elec_tilt_deg", "e_tilt", "etilt"],
  beam_set: ["beam_set", "beam_set_id", "beamset", "beamset_id"],
  rs_power_dbm: ["rs_power_dbm", "rs_power", "rspower", "reference_signal_power_dbm", "rs_dbm"],
  frequency_mhz: ["frequency_mhz", "frequency", "freq_mhz", "freq", "carrier_mhz"],
  bandwidth_mhz: ["bandwidth_mhz", "bandwidth", "bw_mhz", "bw"],
  scs_khz: ["scs_khz", "scs", "subcarrier_spacing_khz", "subcarrier_spacing"],
};

/** Angle columns: a header naming radians is refused rather than misread as degrees. */
const ANGLE_COLUMNS = new Set(["azimuth_deg", "mechanical_tilt_deg", "electrical_tilt_deg"]);

/** Canonical column of a header, or undefined when the header is not accepted. */
export function resolveHeader(header: string, aliases: AliasTable): string | undefined {
  const name = normaliseImportHeader(header);
  for (const [canonical, names] of Object.entries(aliases)) if (names.includes(name)) return canonical;
  return undefined;
}

// ---------------------------------------------------------------------------
// Tables

/** One uploaded table: a header record and its data records, with their rows in the source. */
export interface SourceTable {
  /** How problems name it: the file name, or "book.xlsx (sheet cells)". */
  file: string;
  header: CsvRecord;
  records: CsvRecord[];
  /** CSV rows must have as many fields as the header; spreadsheet rows may stop early. */
  strictWidth: boolean;
}

export interface TableMapping {
  /** Canonical column → field index. */
  index: Map<string, number>;
  /** Canonical column → the header as the user wrote it (for problem reports). */
  written: Map<string, string>;
}

/**
 * Reads a CSV upload into a table. Reports parseCsv's problems, an empty file, a header
 * without data rows (when `needRows`), and a header that only splits on ';' or tab.
 */
export function csvTable(text: string, file: string, problems: FormatProblem[], needRows = true): SourceTable | undefined {
  const csv = parseCsv(text, file);
  problems.push(...csv.problems);
  const [header, ...records] = csv.value;
  if (!header) {
    problems.push({ severity: "error", file, reason: "empty file: expected a header row" });
    return undefined;
  }
  if (header.fields.length === 1) {
    const only = header.fields[0];
    const delimiter = only.includes(";") ? ["';' (semicolon)", ";"] : only.includes("\t") ? ["tab", "\t"] : undefined;
    if (delimiter) {
      problems.push({
        severity: "error",
        file,
        row: header.row,
        value: only.length > 80 ? `${only.slice(0, 77)}...` : only,
        reason: `wrong delimiter: the header is separated by ${delimiter[0]}, not commas; save the file as comma-separated CSV`,
      });
      return undefined;
    }
  }
  if (needRows && records.length === 0) {
    problems.push({ severity: "error", file, row: header.row, reason: "header only: the file has no data rows" });
    return undefined;
  }
  return { file, header, records, strictWidth: true };
}

/**
 * Maps a table's header to canonical columns: unknown headers are warnings, two headers for
 * one column and missing required columns are errors (the message lists the accepted names).
 */
export function mapHeader(
  table: SourceTable,
  aliases: AliasTable,
  required: readonly string[],
  problems: FormatProblem[],
): TableMapping | undefined {
  const index = new Map<string, number>();
  const written = new Map<string, string>();
  const row = table.header.row;
  let ok = true;
  table.header.fields.forEach((raw, k) => {
    const shown = raw.trim();
    if (shown === "") return;
    const canonical = resolveHeader(raw, aliases);
    const name = normaliseImportHeader(raw);
    if (canonical === undefined) {
      // "azimuth_rad", "mech_tilt_radians": an angle column in the wrong unit.
      const radians = /_rad(ians)?$/.exec(name);
      const angle = radians ? resolveHeader(`${name.slice(0, radians.index)}_deg`, aliases) : undefined;
      if (angle !== undefined && ANGLE_COLUMNS.has(angle)) {
        problems.push({ severity: "error", file: table.file, row, column: shown, reason: "angles must be in degrees; convert the column and name it " + angle });
        ok = false;
      } else {
        problems.push({ severity: "warning", file: table.file, row, column: shown, reason: "unknown column; ignored" });
      }
      return;
    }
    if (index.has(canonical)) {
      problems.push({
        severity: "error",
        file: table.file,
        row,
        column: shown,
        reason: `duplicate column: "${written.get(canonical)}" and "${shown}" both mean ${canonical}`,
      });
      ok = false;
      return;
    }
    index.set(canonical, k);
    written.set(canonical, shown);
  });
  for (const column of required) {
    if (!index.has(column)) {
      problems.push({
        severity: "error",
        file: table.file,
        row,
        column,
        reason: `missing column (accepted headers: ${aliases[column].join(", ")})`,
      });
      ok = false;
    }
  }
  return ok ? { index, written } : undefined;
}

/** Reports CSV records whose field count differs from the header's. */
export function checkWidths(table: SourceTable, problems: FormatProblem[]): void {
  if (!table.strictWidth) return;
  const width = table.header.fields.length;
  for (const r of table.records) {
    if (r.fields.length !== width) {
      problems.push({ severity: "error", file: table.file, row: r.row, reason: `expected ${width} fields, found ${r.fields.length}` });
    }
  }
}

/**
 * Writes canonical CSV text in which the header and every record sit on their original line
 * (blank padding lines, which parseCsv skips but counts), so the folder parsers' rows are the
 * user's rows. `fields(record)` gives the canonical fields of one record in `columns` order.
 */
export function canonicalCsv(
  table: SourceTable,
  columns: readonly string[],
  fields: (record: CsvRecord, index: number) => string[],
): string {
  const lines: string[] = [];
  const put = (row: number, values: readonly string[]): void => {
    while (lines.length < row - 1) lines.push("");
    // A line break inside a field would shift the following rows; no id or number has one.
    lines.push(formatCsv(values.map((v) => v.replace(/[\r\n]+/g, " ")), []).slice(0, -1));
  };
  put(table.header.row, columns);
  table.records.forEach((r, k) => put(r.row, fields(r, k)));
  return lines.join("\n") + "\n";
}

/** Problems of the folder parsers name canonical columns; show the user's header instead. */
export function renameColumns(problems: readonly FormatProblem[], mapping: TableMapping): FormatProblem[] {
  return problems.map((p) => (p.column !== undefined && mapping.written.has(p.column) ? { ...p, column: mapping.written.get(p.column) } : p));
}

// ---------------------------------------------------------------------------
// Spreadsheets (.xlsx)

/** Text of one spreadsheet cell value as exceljs gives it. */
function cellText(v: unknown): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "number") return Number.isFinite(v) ? formatNumber(v) : String(v);
  if (typeof v === "string") return v;
  if (typeof v === "boolean") return v ? "TRUE" : "FALSE";
  if (v instanceof Date) return v.toISOString();
  if (typeof v === "object") {
    const o = v as Record<string, unknown>;
    if (Array.isArray(o.richText)) return o.richText.map((t) => String((t as { text?: unknown }).text ?? "")).join("");
    if ("result" in o) return cellText(o.result);
    if ("formula" in o || "sharedFormula" in o) return ""; // a formula never calculated: no value
    if (typeof o.error === "string") return o.error;
    if (typeof o.text === "string") return o.text;
  }
  return String(v);
}

/**
 * Reads the named sheets of an .xlsx workbook (names matched case-insensitively) into
 * tables; rows are the sheet's row numbers. The caller has already checked the size.
 */
export async function xlsxTables(
  bytes: Uint8Array,
  file: string,
  sheets: readonly string[],
  problems: FormatProblem[],
): Promise<Map<string, SourceTable>> {
  const out = new Map<string, SourceTable>();
  const workbook = new ExcelJS.Workbook();
  try {
    await workbook.xlsx.load(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
  } catch (e) {
    problems.push({ severity: "error", file, reason: `not a readable .xlsx workbook: ${(e as Error).message}` });
    return out;
  }
  const found = workbook.worksheets.map((w) => w.name);
  for (const wanted of sheets) {
    const sheet = workbook.worksheets.find((w) => w.name.trim().toLowerCase() === wanted);
    const sheetFile = `${file} (sheet ${wanted})`;
    if (!sheet) {
      problems.push({ severity: "error", file, column: wanted, reason: `missing sheet "${wanted}" (sheets found: ${found.join(", ") || "none"})` });
      continue;
    }
    const records: CsvRecord[] = [];
    sheet.eachRow({ includeEmpty: false }, (row, rowNumber) => {
      // row.values is 1-based (index 0 unused) and sparse.
      const values = row.values as unknown[];
      const fields: string[] = [];
      for (let c = 1; c < values.length; c++) fields.push(cellText(values[c]).trim() === "" ? "" : cellText(values[c]));
      while (fields.length > 0 && fields[fields.length - 1] === "") fields.pop();
      if (fields.length > 0) records.push({ row: rowNumber, fields });
    });
    const [header, ...data] = records;
    if (!header) {
      problems.push({ severity: "error", file: sheetFile, reason: "empty sheet: expected a header row" });
      continue;
    }
    if (data.length === 0) {
      problems.push({ severity: "error", file: sheetFile, row: header.row, reason: "header only: the sheet has no data rows" });
      continue;
    }
    out.set(wanted, { file: sheetFile, header, records: data, strictWidth: false });
  }
  return out;
}
