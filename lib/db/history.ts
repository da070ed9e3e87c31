// The temporal record read back: every value a cell parameter has had, with the request
// that set it; the network as of a date or version; the list of versions.
import type { Prisma } from "./open";
import { listCells, type CellRow } from "./networks/data";
import { decodeParameterValue } from "./networks/values";
import { DomainError } from "../changes/errors";
import { CELL_PARAMETERS, type CellParameter } from "../radio/scenario";

export interface ParameterHistoryEntry {
  value: number | string;
  validFrom: string;
  /** null while the value holds. */
  validTo: string | null;
  fromVersion: number;
  toVersion: number | null;
  changeRequestId: string | null;
  requestNumber: number | null;
  requestTitle: string | null;
}

/** Oldest first, per parameter; every parameter present (empty when never recorded). */
export type CellHistory = Record<CellParameter, ParameterHistoryEntry[]>;

export async function cellHistory(prisma: Prisma, networkId: string, cellCode: string): Promise<CellHistory> {
  const cell = await prisma.cell.findUnique({ where: { networkId_code: { networkId, code: cellCode } }, select: { id: true } });
  if (!cell) {
    throw new DomainError("not_found", `network ${networkId} has no cell ${JSON.stringify(cellCode)}`, { context: { networkId, cellCode } });
  }
  const rows = await prisma.cellParameterValue.findMany({
    where: { cellId: cell.id },
    orderBy: [{ parameter: "asc" }, { validFrom: "asc" }, { fromVersion: "asc" }],
  });
  const requestIds = [...new Set(rows.map((r) => r.changeRequestId).filter((id): id is string => id !== null))];
  const requests = new Map(
    (await prisma.changeRequest.findMany({ where: { id: { in: requestIds } }, select: { id: true, number: true, title: true } })).map(
      (r) => [r.id, r],
    ),
  );
  const out = Object.fromEntries(CELL_PARAMETERS.map((p) => [p, [] as ParameterHistoryEntry[]])) as CellHistory;
  for (const row of rows) {
    const parameter = row.parameter as CellParameter;
    if (!(parameter in out)) continue;
    const request = row.changeRequestId ? requests.get(row.changeRequestId) : undefined;
    out[parameter].push({
      value: decodeParameterValue(parameter, row.value),
      validFrom: row.validFrom.toISOString(),
      validTo: row.validTo?.toISOString() ?? null,
      fromVersion: row.fromVersion,
      toVersion: row.toVersion,
      changeRequestId: row.changeRequestId,
      requestNumber: request?.number ?? null,
      requestTitle: request?.title ?? null,
    });
  }
  return out;
}

/** The cells as they were at a moment (a Date) or in a version (a number). */
export async function networkAsOf(prisma: Prisma, networkId: string, when: Date | number): Promise<CellRow[]> {
  if (typeof when === "number") {
    if (!Number.isInteger(when) || when < 1) throw new RangeError(`networkAsOf: version must be a whole number ≥ 1, got ${when}`);
    return listCells(prisma, networkId, { version: when });
  }
  if (Number.isNaN(when.getTime())) throw new RangeError("networkAsOf: the date is invalid");
  return listCells(prisma, networkId, { date: when });
}

export interface NetworkVersionDto {
  number: number;
  kind: string;
  note: string;
  createdAt: string;
  createdByName: string | null;
  changeRequestId: string | null;
  requestNumber: number | null;
}

/** Newest first. */
export async function listVersions(prisma: Prisma, networkId: string): Promise<NetworkVersionDto[]> {
  const rows = await prisma.networkVersion.findMany({
    where: { networkId },
    orderBy: { number: "desc" },
    include: { createdBy: { select: { name: true } } },
  });
  const requestIds = [...new Set(rows.map((r) => r.changeRequestId).filter((id): id is string => id !== null))];
  const numbers = new Map(
    (await prisma.changeRequest.findMany({ where: { id: { in: requestIds } }, select: { id: true, number: true } })).map((r) => [r.id, r.number]),
  );
  return rows.map((row) => ({
    number: row.number,
    kind: row.kind,
    note: row.note,
    createdAt: row.createdAt.toISOString(),
    createdByName: row.createdBy?.name ?? null,
    changeRequestId: row.changeRequestId,
    requestNumber: row.changeRequestId ? (numbers.get(row.changeRequestId) ?? null) : null,
  }));
}
