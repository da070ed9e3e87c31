// The audit trail in the database: appends under a lock so that seq has no gaps and each
// event names its predecessor's hash; verification reads the whole chain in seq order.
import type { Database, Prisma } from "./open";
import { chainEvent, verifyChain, type ChainedAuditEvent, type ChainVerdict } from "../changes/auditChain";

// Any fixed number of ours: serialises appends across connections on a server.
const AUDIT_LOCK_KEY = 720_411_304;

/** Prisma's transaction client (what $transaction hands its callback). */
export type Tx = Parameters<Parameters<Prisma["$transaction"]>[0]>[0];

export interface AuditInput {
  action: string;
  entityType: string;
  entityId: string;
  actorId?: string | null;
  actorEmail?: string | null;
  requestId?: string | null;
  before?: unknown;
  after?: unknown;
  at?: Date;
}

/** Appends one event inside the caller's transaction (so it lands with the change it records). */
export async function appendAuditEventTx(tx: Tx, input: AuditInput): Promise<ChainedAuditEvent> {
  await tx.$executeRawUnsafe(`select pg_advisory_xact_lock(${AUDIT_LOCK_KEY})`);
  const head = await tx.auditHead.findUnique({ where: { id: 1 } });
  // Stored with millisecond precision, so hash what will be read back.
  const at = new Date(Math.floor((input.at ?? new Date()).getTime()));
  const event = chainEvent(head ? { seq: head.seq, hash: head.hash } : null, {
    at,
    actorId: input.actorId ?? null,
    actorEmail: input.actorEmail ?? null,
    action: input.action,
    entityType: input.entityType,
    entityId: input.entityId,
    requestId: input.requestId ?? null,
    before: input.before ?? null,
    after: input.after ?? null,
  });
  // Written with raw SQL and the JSON as text: Prisma's Json parameter path was seen to round
  // some doubles to 16 significant digits on the way in, which would break the hash of what is
  // read back. Text cast to jsonb keeps every digit.
  await tx.$executeRawUnsafe(
    `insert into "AuditEvent" (seq, at, "actorId", "actorEmail", action, "entityType", "entityId", "requestId", before, after, "prevHash", hash)
     values ($1, $2::timestamp(3), $3, $4, $5, $6, $7, $8, $9::jsonb, $10::jsonb, $11, $12)`,
    event.seq,
    at.toISOString().replace("T", " ").replace("Z", ""),
    event.actorId,
    event.actorEmail,
    event.action,
    event.entityType,
    event.entityId,
    event.requestId,
    event.before === null ? null : JSON.stringify(event.before),
    event.after === null ? null : JSON.stringify(event.after),
    event.prevHash,
    event.hash,
  );
  await tx.auditHead.upsert({
    where: { id: 1 },
    create: { id: 1, seq: event.seq, hash: event.hash },
    update: { seq: event.seq, hash: event.hash },
  });
  return event;
}

/** Appends one event in a transaction of its own. */
export async function appendAuditEvent(db: Database | { prisma: Prisma }, input: AuditInput): Promise<ChainedAuditEvent> {
  return db.prisma.$transaction((tx) => appendAuditEventTx(tx, input));
}

function toChained(row: {
  seq: number;
  at: Date;
  actorId: string | null;
  actorEmail: string | null;
  action: string;
  entityType: string;
  entityId: string;
  requestId: string | null;
  before: unknown;
  after: unknown;
  prevHash: string;
  hash: string;
}): ChainedAuditEvent {
  return { ...row, before: row.before ?? null, after: row.after ?? null };
}

export interface AuditEventDto extends Omit<ChainedAuditEvent, "at"> {
  at: string;
}

export async function listAuditEvents(
  prisma: Prisma,
  filter: { requestId?: string; entityId?: string; take?: number; beforeSeq?: number } = {},
): Promise<AuditEventDto[]> {
  const rows = await prisma.auditEvent.findMany({
    where: {
      ...(filter.requestId ? { requestId: filter.requestId } : {}),
      ...(filter.entityId ? { entityId: filter.entityId } : {}),
      ...(filter.beforeSeq ? { seq: { lt: filter.beforeSeq } } : {}),
    },
    orderBy: { seq: "desc" },
    take: filter.take ?? 200,
  });
  return rows.map((row) => ({ ...toChained(row), at: row.at.toISOString() }));
}

export type AuditVerdict = ChainVerdict & { headSeq: number | null };

/** Verifies the whole chain, and that its last link is the recorded head (no truncation). */
export async function verifyAuditChain(prisma: Prisma): Promise<AuditVerdict> {
  const rows = await prisma.auditEvent.findMany({ orderBy: { seq: "asc" } });
  const head = await prisma.auditHead.findUnique({ where: { id: 1 } });
  const verdict = verifyChain(rows.map(toChained));
  const headSeq = head?.seq ?? null;
  if (!verdict.ok) return { ...verdict, headSeq };
  const last = rows[rows.length - 1];
  if ((head?.seq ?? 0) !== (last?.seq ?? 0) || (head && head.hash !== last?.hash)) {
    const missingFrom = (last?.seq ?? 0) + 1;
    return {
      ok: false,
      brokenAt: missingFrom,
      index: rows.length,
      reason: "seq_gap",
      message: `audit event ${missingFrom}: the chain ends at ${last?.seq ?? 0} but its recorded head is ${head?.seq ?? 0}; events at the end were removed`,
      headSeq,
    };
  }
  return { ...verdict, headSeq };
}
