// Shared by the request writes and the simulation reports: one write transaction shape and
// the snapshot the pure rules decide on.
import type { Prisma } from "../open";
import type { Tx } from "../audit";
import { DomainError } from "../../changes/errors";
import type { RequestSnapshot, RequestState } from "../../changes/rules";

// Any fixed number of ours, distinct from the audit lock. Every write that touches change
// requests or cell values takes it first, so that transactions locking several request rows
// (approve marks others stale, implement rewrites cells) always lock in the same order and
// cannot deadlock against each other on a PostgreSQL server. The optimistic version check
// (updateMany where version) still decides who wins.
const REQUEST_WRITE_LOCK_KEY = 720_411_305;

/** Runs fn in one transaction holding the request-write lock. */
export async function writeTransaction<T>(prisma: Prisma, fn: (tx: Tx) => Promise<T>): Promise<T> {
  return prisma.$transaction(
    async (tx) => {
      await tx.$executeRawUnsafe(`select pg_advisory_xact_lock(${REQUEST_WRITE_LOCK_KEY})`);
      return fn(tx);
    },
    // The embedded database runs one transaction at a time: a waiting one may queue a while.
    { maxWait: 30_000, timeout: 60_000 },
  );
}

export interface RequestRowForRules {
  id: string;
  networkId: string;
  state: string;
  authorId: string;
  revision: number;
  version: number;
  stale: boolean;
  baseVersion: number;
}

/** The revision of the latest successfully finished submission simulation, or null. */
export async function simulatedRevisionTx(tx: Tx | Prisma, requestId: string): Promise<number | null> {
  const latest = await tx.simulation.findFirst({
    where: { requestId, purpose: "submission", status: "done" },
    orderBy: [{ finishedAt: "desc" }, { createdAt: "desc" }],
    select: { revision: true },
  });
  return latest?.revision ?? null;
}

export function snapshotOf(row: RequestRowForRules, simulatedRevision: number | null): RequestSnapshot {
  return {
    id: row.id,
    state: row.state as RequestState,
    authorId: row.authorId,
    revision: row.revision,
    simulatedRevision,
    stale: row.stale,
    version: row.version,
  };
}

/** The request row or DomainError("not_found"). */
export async function requestRowTx(tx: Tx, id: string) {
  const row = await tx.changeRequest.findUnique({ where: { id }, include: { items: { orderBy: { position: "asc" } } } });
  if (!row) throw new DomainError("not_found", `change request ${id} does not exist`, { context: { requestId: id } });
  return row;
}

/**
 * The optimistic lock: writes the patch only if the row still has the version that was read.
 * Two writers that read the same version cannot both pass.
 */
export async function updateIfVersion(
  tx: Tx,
  id: string,
  readVersion: number,
  data: Parameters<Tx["changeRequest"]["updateMany"]>[0]["data"],
): Promise<void> {
  const { count } = await tx.changeRequest.updateMany({ where: { id, version: readVersion }, data });
  if (count !== 1) {
    throw new DomainError(
      "conflict",
      `change request ${id} changed while this write was in progress (version ${readVersion} read); reload and try again`,
      { field: "version", context: { requestId: id, expectedVersion: readVersion } },
    );
  }
}
