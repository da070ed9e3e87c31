// The field crew's sheet for an approved request: one row per parameter to set, with the
// exact value found and the value to leave, plus the rows that undo it. CSV (RFC 4180) for
// spreadsheets and JSON for tools.

import type { CellParameter } from "../radio/scenario";
import { DomainError } from "./errors";
import type { RequestState } from "./rules";

/** Shown wherever the work order is (DESIGN §5). */
export const SAFETY_NOTICE =
  "The predicted impact comes from a coverage model and is an estimate: confirm it with drive tests or measurements. " +
  "RF exposure compliance and the change window follow local regulations and licensed practice.";

export interface WorkOrderSource {
  id: string;
  title: string;
  state: RequestState;
  /** Name (or e-mail) of the owner who approved it. */
  approvedBy: string;
  approvedAt?: Date | string | null;
  windowStart?: Date | string | null;
  windowEnd?: Date | string | null;
  items: readonly {
    cellId: string;
    parameter: CellParameter;
    oldValue: number | string;
    newValue: number | string;
  }[];
}

export interface WorkOrderRow {
  requestId: string;
  /** 1, 2, 3, … in the order to carry out. */
  step: number;
  cellId: string;
  parameter: CellParameter;
  /** Human name with unit, e.g. "Electrical tilt (°)". */
  parameterLabel: string;
  /** The value the crew should find before touching it. */
  fromValue: number | string;
  /** The value to leave. */
  toValue: number | string;
}

export interface WorkOrder {
  requestId: string;
  title: string;
  approvedBy: string;
  approvedAt: string | null;
  windowStart: string | null;
  windowEnd: string | null;
  notice: string;
  rows: WorkOrderRow[];
  /** Undo: the same items in reverse order, new value back to old. */
  rollbackRows: WorkOrderRow[];
}

export const PARAMETER_LABELS: Readonly<Record<CellParameter, string>> = {
  azimuthDeg: "Azimuth (°)",
  mechanicalTiltDeg: "Mechanical tilt (°)",
  electricalTiltDeg: "Electrical tilt (°)",
  beamSetId: "Beam set",
  rsPowerDbm: "RS power (dBm)",
};

function isoOrNull(value: Date | string | null | undefined, field: string, requestId: string): string | null {
  if (value === null || value === undefined) return null;
  const date = value instanceof Date ? value : new Date(value);
  if (Number.isNaN(date.getTime())) {
    throw new RangeError(`work order for request ${requestId}: ${field} ${JSON.stringify(String(value))} is not a date`);
  }
  return date.toISOString();
}

/** Build the work order; only approved (or already implemented, for the rollback sheet) requests have one. */
export function buildWorkOrder(source: WorkOrderSource): WorkOrder {
  if (source.state !== "approved" && source.state !== "implemented") {
    throw new DomainError(
      "illegal_transition",
      `request ${source.id} is "${source.state}"; a work order exists only once it is approved`,
      { context: { requestId: source.id, state: source.state } },
    );
  }
  const rows = source.items.map(
    (item, i): WorkOrderRow => ({
      requestId: source.id,
      step: i + 1,
      cellId: item.cellId,
      parameter: item.parameter,
      parameterLabel: PARAMETER_LABELS[item.parameter],
      fromValue: item.oldValue,
      toValue: item.newValue,
    }),
  );
  // Undo in reverse, so that a partly applied order unwinds from the last step taken.
  const rollbackRows = [...rows].reverse().map(
    (row, i): WorkOrderRow => ({ ...row, step: i + 1, fromValue: row.toValue, toValue: row.fromValue }),
  );
  return {
    requestId: source.id,
    title: source.title,
    approvedBy: source.approvedBy,
    approvedAt: isoOrNull(source.approvedAt, "approvedAt", source.id),
    windowStart: isoOrNull(source.windowStart, "windowStart", source.id),
    windowEnd: isoOrNull(source.windowEnd, "windowEnd", source.id),
    notice: SAFETY_NOTICE,
    rows,
    rollbackRows,
  };
}

const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?$/i;

export type CsvValue = string | number | boolean | null | undefined;

/**
 * One CSV field per RFC 4180 §2: quoted when it holds a comma, a double quote, CR or LF, with
 * inner quotes doubled. Text that a spreadsheet would run as a formula (starting with = + - @,
 * tab or CR) gets a leading apostrophe first (OWASP "CSV injection", common practice); numbers
 * and plain decimals are never touched, so -3 stays a number.
 */
export function csvField(value: CsvValue): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") {
    if (!Number.isFinite(value)) throw new RangeError(`csvField: ${value} is not a finite number`);
    return String(value);
  }
  let text = typeof value === "boolean" ? String(value) : value;
  // A plain decimal such as "-3" (a value read back as text) is data, not a formula.
  if (/^[=+\-@\t\r]/.test(text) && !DECIMAL.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** Header plus rows, CRLF after every record (RFC 4180 §2.1–2.3). */
export function formatCsv(header: readonly string[], rows: readonly (readonly CsvValue[])[]): string {
  for (const [i, row] of rows.entries()) {
    if (row.length !== header.length) {
      throw new RangeError(`formatCsv: row ${i + 1} has ${row.length} fields, the header ${header.length}`);
    }
  }
  return [header, ...rows].map((row) => row.map(csvField).join(",") + "\r\n").join("");
}

export const WORK_ORDER_CSV_HEADER = [
  "request",
  "title",
  "step",
  "cell",
  "parameter",
  "from_value",
  "to_value",
  "window_start",
  "window_end",
  "approved_by",
] as const;

/** The work order (or its rollback sheet) as CSV text. */
export function workOrderCsv(order: WorkOrder, sheet: "work" | "rollback" = "work"): string {
  const rows = sheet === "work" ? order.rows : order.rollbackRows;
  return formatCsv(
    WORK_ORDER_CSV_HEADER,
    rows.map((row) => [
      order.requestId,
      order.title,
      row.step,
      row.cellId,
      row.parameterLabel,
      row.fromValue,
      row.toValue,
      order.windowStart,
      order.windowEnd,
      order.approvedBy,
    ]),
  );
}

/** The whole work order, rollback included, as indented JSON. */
export function workOrderJson(order: WorkOrder): string {
  return `${JSON.stringify(order, null, 2)}\n`;
}
