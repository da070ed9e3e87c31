// Bulk change upload: a CSV of (cell, parameter, new value) rows that becomes the items of
// one change request. Only the shape is checked here — parameter names, numbers where the
// parameter is numeric, duplicates; the database layer then runs lib/changes validateItems
// against the baseline network (cell exists, hardware ranges, supported beam sets).
//
// Two layouts are accepted (./import-format.md):
//   long:  cell_id,parameter,new_value        one row per change
//   wide:  cell_id,azimuth_deg,electrical_tilt_deg,...   one row per cell, empty = unchanged

import type { CellParameter } from "../radio/scenario";
import { parseNumberText, type FormatProblem } from "./scenarioFolder";
import { CELL_HEADER_ALIASES, csvTable, decodeUtf8, normaliseImportHeader, resolveHeader, type AliasTable } from "./importTable";

export interface BulkChangeItem {
  cellId: string;
  parameter: CellParameter;
  newValue: number | string;
}

export interface BulkChangesResult {
  /** Empty when any problem is an error. */
  items: BulkChangeItem[];
  /** Where each item was read: sources[i] is the CSV row and column of items[i] (for mapping later refusals back). */
  sources: { row: number; column: string }[];
  problems: FormatProblem[];
}

/** cells.csv column → the model's parameter name. */
const COLUMN_PARAMETER: Readonly<Record<string, CellParameter>> = {
  azimuth_deg: "azimuthDeg",
  mechanical_tilt_deg: "mechanicalTiltDeg",
  electrical_tilt_deg: "electricalTiltDeg",
  beam_set: "beamSetId",
  rs_power_dbm: "rsPowerDbm",
};

const BULK_HEADER_ALIASES: AliasTable = {
  cell_id: CELL_HEADER_ALIASES.cell_id,
  parameter: ["parameter", "param", "parameter_name", "field"],
  new_value: ["new_value", "value", "new", "to", "new_val"],
};

/** The parameter a written name means ("azimuth", "Mechanical tilt (deg)", "beamSetId", ...), or undefined. */
export function parameterOfName(name: string): CellParameter | undefined {
  const column = resolveHeader(name, CELL_HEADER_ALIASES);
  return column !== undefined ? COLUMN_PARAMETER[column] : undefined;
}

/** Columns people keep beside their changes; ignored in the wide layout. */
const NOTE_COLUMNS = ["comment", "comments", "note", "notes", "reason", "old_value", "old"];

const ACCEPTED = Object.keys(COLUMN_PARAMETER)
  .map((c) => `${c} (${COLUMN_PARAMETER[c]})`)
  .join(", ");

/** Parses uploaded bytes (UTF-8 checks as for the network import), then the CSV. */
export function parseBulkChangesUpload(bytes: Uint8Array, fileName: string): BulkChangesResult {
  if (bytes.length === 0) return { items: [], sources: [], problems: [{ severity: "error", file: fileName, reason: "empty file" }] };
  const decoded = decodeUtf8(bytes, fileName);
  if (decoded.problem) return { items: [], sources: [], problems: [decoded.problem] };
  return parseBulkChangesCsv(decoded.text!, fileName);
}

/** Parses a bulk-change CSV; every problem names the file, row and column. */
export function parseBulkChangesCsv(text: string, fileName: string): BulkChangesResult {
  const problems: FormatProblem[] = [];
  const items: BulkChangeItem[] = [];
  const sources: { row: number; column: string }[] = [];
  const table = csvTable(text, fileName, problems);
  if (!table) return { items: [], sources: [], problems };
  const error = (reason: string, row: number, column?: string, value?: string): void => {
    problems.push({ severity: "error", file: fileName, row, reason, ...(column !== undefined ? { column } : {}), ...(value !== undefined ? { value } : {}) });
  };

  // Header: the cell column, then either parameter + new_value or parameter columns.
  const headerRow = table.header.row;
  let cellIndex = -1;
  let parameterIndex = -1;
  let valueIndex = -1;
  const wide: { index: number; parameter: CellParameter; written: string }[] = [];
  const unknown: { index: number; written: string }[] = [];
  table.header.fields.forEach((raw, k) => {
    const written = raw.trim();
    if (written === "") return;
    const column = resolveHeader(raw, BULK_HEADER_ALIASES);
    const parameter = parameterOfName(raw);
    const slot = column === "cell_id" ? "cell" : column === "parameter" ? "parameter" : column === "new_value" ? "value" : undefined;
    if (slot) {
      const current = slot === "cell" ? cellIndex : slot === "parameter" ? parameterIndex : valueIndex;
      if (current >= 0) error(`duplicate column: "${table.header.fields[current].trim()}" and "${written}" mean the same`, headerRow, written);
      else if (slot === "cell") cellIndex = k;
      else if (slot === "parameter") parameterIndex = k;
      else valueIndex = k;
    } else if (parameter) {
      const twin = wide.find((w) => w.parameter === parameter);
      if (twin) error(`duplicate column: "${twin.written}" and "${written}" both set ${parameter}`, headerRow, written);
      else wide.push({ index: k, parameter, written });
    } else {
      unknown.push({ index: k, written });
    }
  });
  const long = parameterIndex >= 0 || valueIndex >= 0;
  if (cellIndex < 0) error(`missing column (accepted headers: ${CELL_HEADER_ALIASES.cell_id.join(", ")})`, headerRow, "cell_id");
  if (long) {
    if (parameterIndex < 0) error(`missing column (accepted headers: ${BULK_HEADER_ALIASES.parameter.join(", ")})`, headerRow, "parameter");
    if (valueIndex < 0) error(`missing column (accepted headers: ${BULK_HEADER_ALIASES.new_value.join(", ")})`, headerRow, "new_value");
    if (wide.length > 0) error("give either parameter + new_value columns or one column per parameter, not both", headerRow, wide[0].written);
  } else if (wide.length === 0) {
    error(`no change columns: expected parameter and new_value, or columns named after parameters (${ACCEPTED})`, headerRow);
  }
  for (const u of unknown) {
    // A misspelt parameter column in the wide layout would silently drop changes, so it is an
    // error there; other cell columns and notes are only ignored.
    const name = normaliseImportHeader(u.written);
    const harmless = long || resolveHeader(u.written, CELL_HEADER_ALIASES) !== undefined || NOTE_COLUMNS.includes(name);
    if (harmless) problems.push({ severity: "warning", file: fileName, row: headerRow, column: u.written, reason: "not a parameter a change request alters; ignored" });
    else error(`unknown column: not a parameter (accepted: ${ACCEPTED})`, headerRow, u.written);
  }
  if (problems.some((p) => p.severity === "error")) return { items: [], sources: [], problems };

  const width = table.header.fields.length;
  const cellColumn = table.header.fields[cellIndex].trim();
  const seen = new Map<string, number>();
  const add = (row: number, cellId: string, parameter: CellParameter, raw: string, column: string): void => {
    let newValue: number | string;
    if (parameter === "beamSetId") {
      newValue = raw.trim();
      if (newValue === "") return error("empty; a beam-set id is required", row, column);
    } else {
      const n = parseNumberText(raw);
      if (n === undefined) return error(raw.trim() === "" ? "empty; a number is required" : `not a finite number (${parameter} is numeric)`, row, column, raw);
      newValue = n;
    }
    const key = `${cellId}\u0000${parameter}`;
    const first = seen.get(key);
    if (first !== undefined) return error(`duplicate change: cell ${cellId} ${parameter} is already set on row ${first}`, row, column, raw);
    seen.set(key, row);
    items.push({ cellId, parameter, newValue });
    sources.push({ row, column });
  };
  for (const r of table.records) {
    if (r.fields.length !== width) {
      error(`expected ${width} fields, found ${r.fields.length}`, r.row);
      continue;
    }
    const cellId = r.fields[cellIndex].trim();
    if (cellId === "") {
      error("empty cell id", r.row, cellColumn);
      continue;
    }
    if (long) {
      const rawParameter = r.fields[parameterIndex];
      const parameter = parameterOfName(rawParameter);
      const parameterColumn = table.header.fields[parameterIndex].trim();
      if (!parameter) {
        error(`unknown parameter "${normaliseImportHeader(rawParameter)}" (accepted: ${ACCEPTED})`, r.row, parameterColumn, rawParameter);
        continue;
      }
      add(r.row, cellId, parameter, r.fields[valueIndex], table.header.fields[valueIndex].trim());
    } else {
      let any = false;
      for (const w of wide) {
        if (r.fields[w.index].trim() === "") continue; // empty = unchanged
        any = true;
        add(r.row, cellId, w.parameter, r.fields[w.index], w.written);
      }
      if (!any) problems.push({ severity: "warning", file: fileName, row: r.row, column: cellColumn, value: cellId, reason: "row changes nothing (every parameter empty)" });
    }
  }
  const failed = problems.some((p) => p.severity === "error");
  return { items: failed ? [] : items, sources: failed ? [] : sources, problems };
}
