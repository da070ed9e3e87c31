// Append-only audit events, chained by hash: each event stores the hash of the one before it,
// and its own hash covers that link plus every recorded field. Editing, deleting, inserting
// or reordering any row therefore breaks the chain at a findable place.
//
//   hash(n) = SHA-256( prevHash(n) ‖ canonicalJson(body(n)) ), hex, lower case
//   prevHash(1) = GENESIS_HASH, prevHash(n) = hash(n − 1)
//
// seq must be assigned by the writer (last seq + 1, under a lock), not by a database sequence:
// sequences skip numbers when a transaction rolls back, which this check reports as a gap.

import { createHash } from "node:crypto";

/** The prevHash of the first event: a fixed string of ours, not a hash of anything. */
export const GENESIS_HASH = "beamgate-audit-genesis-v1";

/** The recorded fields of an event (AuditEvent without prevHash and hash). */
export interface AuditEventBody {
  /** 1, 2, 3, … without gaps. */
  seq: number;
  at: Date | string;
  actorId: string | null;
  actorEmail: string | null;
  /** What happened, e.g. "request.approved". */
  action: string;
  entityType: string;
  entityId: string;
  requestId: string | null;
  /** JSON-compatible state before and after (null when not applicable). */
  before: unknown;
  after: unknown;
}

export interface ChainedAuditEvent extends AuditEventBody {
  prevHash: string;
  hash: string;
}

/** Every field the hash covers, in one place; other columns a row may carry are not protected. */
export const HASHED_FIELDS = [
  "seq",
  "at",
  "actorId",
  "actorEmail",
  "action",
  "entityType",
  "entityId",
  "requestId",
  "before",
  "after",
] as const satisfies readonly (keyof AuditEventBody)[];

function isPlainObject(value: object): boolean {
  const proto = Object.getPrototypeOf(value) as unknown;
  return proto === Object.prototype || proto === null;
}

/**
 * Canonical JSON: object keys sorted by UTF-16 code units, no whitespace, numbers in
 * ECMAScript's shortest round-trip form (so -0 is "0"), dates as ISO 8601 UTC strings.
 * Undefined object members are dropped and undefined array entries become null — exactly
 * what a JSON round trip through the database does, so a stored event hashes the same when
 * read back. Anything JSON cannot hold (NaN, Infinity, bigint, functions, Map, class
 * instances) throws RangeError naming its path.
 */
export function canonicalJson(value: unknown, path = "$"): string {
  if (value === null) return "null";
  switch (typeof value) {
    case "boolean":
      return value ? "true" : "false";
    case "string":
      return JSON.stringify(value);
    case "number":
      if (!Number.isFinite(value)) throw new RangeError(`canonicalJson: ${path} is ${value}, which JSON cannot hold`);
      return JSON.stringify(value);
    case "object":
      break;
    default:
      throw new RangeError(`canonicalJson: ${path} is a ${typeof value}, which JSON cannot hold`);
  }
  const object = value as object;
  if (object instanceof Date) {
    if (Number.isNaN(object.getTime())) throw new RangeError(`canonicalJson: ${path} is an invalid Date`);
    return JSON.stringify(object.toISOString());
  }
  if (Array.isArray(object)) {
    const parts = object.map((entry: unknown, i) => (entry === undefined ? "null" : canonicalJson(entry, `${path}[${i}]`)));
    return `[${parts.join(",")}]`;
  }
  if (!isPlainObject(object)) {
    const name = (object.constructor as { name?: string } | undefined)?.name ?? "object";
    throw new RangeError(`canonicalJson: ${path} is a ${name}, not a plain object`);
  }
  const record = object as Record<string, unknown>;
  const keys = Object.keys(record)
    .filter((k) => record[k] !== undefined)
    .sort();
  const parts = keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(record[k], `${path}.${k}`)}`);
  return `{${parts.join(",")}}`;
}

/** The hashed body of an event: exactly HASHED_FIELDS, absent ones as null, `at` as ISO UTC. */
export function bodyOf(event: AuditEventBody): Record<(typeof HASHED_FIELDS)[number], unknown> {
  const at = event.at instanceof Date ? event.at : new Date(event.at);
  if (Number.isNaN(at.getTime())) throw new RangeError(`audit event ${event.seq}: at ${JSON.stringify(event.at)} is not a date`);
  return {
    seq: event.seq,
    at: at.toISOString(),
    actorId: event.actorId ?? null,
    actorEmail: event.actorEmail ?? null,
    action: event.action,
    entityType: event.entityType,
    entityId: event.entityId,
    requestId: event.requestId ?? null,
    before: event.before ?? null,
    after: event.after ?? null,
  };
}

/** SHA-256 (FIPS 180-4) of prevHash followed by the canonical body, as 64 lower-case hex digits. */
export function hashEvent(prevHash: string, event: AuditEventBody): string {
  return createHash("sha256")
    .update(prevHash, "utf8")
    .update(canonicalJson(bodyOf(event)), "utf8")
    .digest("hex");
}

/** The next event of the chain after `previous` (null for the first): seq, prevHash and hash filled in. */
export function chainEvent(
  previous: Pick<ChainedAuditEvent, "seq" | "hash"> | null,
  body: Omit<AuditEventBody, "seq">,
): ChainedAuditEvent {
  const seq = previous === null ? 1 : previous.seq + 1;
  const prevHash = previous === null ? GENESIS_HASH : previous.hash;
  const full: AuditEventBody = { ...body, seq };
  return { ...full, prevHash, hash: hashEvent(prevHash, full) };
}

export type ChainBreak =
  /** A seq is missing: a row was deleted (or never written). */
  | "seq_gap"
  /** Rows are not in seq order, or a seq repeats: rows were moved or duplicated. */
  | "out_of_order"
  /** The row does not point at the previous row's hash: a row before it was removed, replaced or re-hashed. */
  | "prev_hash_mismatch"
  /** The row's content does not give its stored hash: a field or the hash itself was edited. */
  | "hash_mismatch";

export type ChainVerdict =
  | { ok: true; count: number; lastHash: string }
  | { ok: false; brokenAt: number; index: number; reason: ChainBreak; message: string };

/** Where a verified stretch starts: by default the very first event. */
export interface ChainAnchor {
  seq: number;
  prevHash: string;
}

/**
 * Check events given in ascending seq order (as read with ORDER BY seq). Reports the first
 * break: `brokenAt` is the seq of the row where the chain stops holding, `index` its
 * position in the list. An empty list is a valid (empty) chain.
 */
export function verifyChain(
  events: readonly ChainedAuditEvent[],
  anchor: ChainAnchor = { seq: 1, prevHash: GENESIS_HASH },
): ChainVerdict {
  const seqs = new Set(events.map((e) => e.seq));
  let expectedSeq = anchor.seq;
  let expectedPrev = anchor.prevHash;
  for (let index = 0; index < events.length; index++) {
    const event = events[index];
    const fail = (reason: ChainBreak, message: string): ChainVerdict => ({
      ok: false,
      brokenAt: event.seq,
      index,
      reason,
      message: `audit event ${event.seq} (row ${index + 1}): ${message}`,
    });
    if (event.seq !== expectedSeq) {
      // A missing seq that turns up later means moved rows, not deleted ones.
      if (event.seq < expectedSeq || seqs.has(expectedSeq)) {
        return fail("out_of_order", `expected seq ${expectedSeq} here, found ${event.seq}; rows are out of order or repeated`);
      }
      return fail("seq_gap", `expected seq ${expectedSeq}, found ${event.seq}; event ${expectedSeq} is missing`);
    }
    if (event.prevHash !== expectedPrev) {
      return fail(
        "prev_hash_mismatch",
        index === 0 && anchor.prevHash === GENESIS_HASH
          ? "the first event does not start from the genesis value"
          : `prevHash does not equal the hash of event ${expectedSeq - 1}`,
      );
    }
    if (hashEvent(event.prevHash, event) !== event.hash) {
      return fail("hash_mismatch", "its content does not give its stored hash; a field or the hash was edited");
    }
    expectedSeq = event.seq + 1;
    expectedPrev = event.hash;
  }
  return { ok: true, count: events.length, lastHash: events.length === 0 ? anchor.prevHash : expectedPrev };
}
