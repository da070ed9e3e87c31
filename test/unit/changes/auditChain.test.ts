import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import {
  GENESIS_HASH,
  canonicalJson,
  chainEvent,
  hashEvent,
  verifyChain,
  type AuditEventBody,
  type ChainedAuditEvent,
} from "../../../lib/changes/auditChain";

function body(i: number): Omit<AuditEventBody, "seq"> {
  return {
    at: new Date(Date.UTC(2026, 2, 1, 8, i)),
    actorId: `user-${i % 3}`,
    actorEmail: null,
    action: i % 2 === 0 ? "request.submitted" : "request.approved",
    entityType: "ChangeRequest",
    entityId: `cr-${i}`,
    requestId: `cr-${i}`,
    before: { state: "draft", revision: i },
    after: { state: "submitted", revision: i, items: [{ cellId: "C1", newValue: 4.5 }] },
  };
}

function chain(n: number): ChainedAuditEvent[] {
  const out: ChainedAuditEvent[] = [];
  for (let i = 0; i < n; i++) out.push(chainEvent(out.length === 0 ? null : out[out.length - 1], body(i)));
  return out;
}

describe("canonicalJson(value)", () => {
  it("sorts keys at every depth and drops whitespace", () => {
    expect(canonicalJson({ b: 1, a: { d: [3, { z: 1, y: 2 }], c: "x" } })).toBe('{"a":{"c":"x","d":[3,{"y":2,"z":1}]},"b":1}');
  });

  it("gives the same text whatever order the keys were inserted in", () => {
    expect(canonicalJson({ x: 1, y: 2 })).toBe(canonicalJson({ y: 2, x: 1 }));
  });

  it("writes numbers in shortest round-trip form and -0 as 0", () => {
    expect(canonicalJson([1.5, 0.1 + 0.2, 1e21, -0, 100])).toBe("[1.5,0.30000000000000004,1e+21,0,100]");
  });

  it("writes dates as ISO UTC strings, whatever the time zone", () => {
    expect(canonicalJson({ at: new Date("2026-03-01T23:00:00+01:00") })).toBe('{"at":"2026-03-01T22:00:00.000Z"}');
  });

  it("drops undefined members and writes undefined array entries as null, as a JSON round trip does", () => {
    const value = { a: undefined, b: [undefined, 1] };
    expect(canonicalJson(value)).toBe('{"b":[null,1]}');
    expect(canonicalJson(JSON.parse(JSON.stringify(value)))).toBe(canonicalJson(value));
  });

  it("refuses what JSON cannot hold, naming the path", () => {
    expect(() => canonicalJson({ a: [1, NaN] })).toThrow(/\$\.a\[1\] is NaN/);
    expect(() => canonicalJson({ a: Infinity })).toThrow(RangeError);
    expect(() => canonicalJson({ m: new Map() })).toThrow(/\$\.m is a Map/);
    expect(() => canonicalJson(10n)).toThrow(/bigint/);
    expect(() => canonicalJson(new Date("nope"))).toThrow(/invalid Date/);
  });
});

describe("hashEvent(prevHash, event)", () => {
  it("is SHA-256 hex of prevHash followed by the canonical body", () => {
    const event = { ...body(0), seq: 1 };
    // Written out by hand: keys in code-unit order, `at` in UTC.
    const canonical =
      '{"action":"request.submitted","actorEmail":null,"actorId":"user-0",' +
      '"after":{"items":[{"cellId":"C1","newValue":4.5}],"revision":0,"state":"submitted"},' +
      '"at":"2026-03-01T08:00:00.000Z","before":{"revision":0,"state":"draft"},' +
      '"entityId":"cr-0","entityType":"ChangeRequest","requestId":"cr-0","seq":1}';
    const expected = createHash("sha256").update(GENESIS_HASH + canonical).digest("hex");
    expect(hashEvent(GENESIS_HASH, event)).toBe(expected);
    expect(hashEvent(GENESIS_HASH, event)).toMatch(/^[0-9a-f]{64}$/);
  });

  it("depends on the previous hash", () => {
    const event = { ...body(0), seq: 1 };
    expect(hashEvent(GENESIS_HASH, event)).not.toBe(hashEvent("0".repeat(64), event));
  });

  it("hashes a Date and the same instant written with an offset alike", () => {
    const event = { ...body(0), seq: 1 };
    expect(hashEvent("p", { ...event, at: "2026-03-01T09:00:00+01:00" })).toBe(hashEvent("p", event));
  });

  it("ignores columns outside the hashed fields", () => {
    const event = { ...body(0), seq: 1 };
    expect(hashEvent("p", { ...event, extra: "x" } as AuditEventBody)).toBe(hashEvent("p", event));
  });
});

describe("verifyChain(events)", () => {
  it("accepts an intact chain and an empty one", () => {
    const events = chain(6);
    expect(events[0].prevHash).toBe(GENESIS_HASH);
    expect(events.map((e) => e.seq)).toEqual([1, 2, 3, 4, 5, 6]);
    expect(verifyChain(events)).toEqual({ ok: true, count: 6, lastHash: events[5].hash });
    expect(verifyChain([])).toEqual({ ok: true, count: 0, lastHash: GENESIS_HASH });
  });

  it("accepts the chain after a JSON round trip (as read back from the database)", () => {
    const events = JSON.parse(JSON.stringify(chain(4))) as ChainedAuditEvent[];
    expect(typeof events[0].at).toBe("string");
    expect(verifyChain(events).ok).toBe(true);
  });

  it("detects an edited field at that row", () => {
    const events = chain(5);
    events[2] = { ...events[2], after: { ...(events[2].after as object), state: "approved" } };
    expect(verifyChain(events)).toMatchObject({ ok: false, brokenAt: 3, index: 2, reason: "hash_mismatch" });

    const actor = chain(5);
    actor[4] = { ...actor[4], actorId: "someone-else" };
    expect(verifyChain(actor)).toMatchObject({ ok: false, brokenAt: 5, reason: "hash_mismatch" });
  });

  it("detects an edited field whose hash was recomputed, at the next row", () => {
    const events = chain(5);
    const forged = { ...events[1], action: "request.rejected" };
    events[1] = { ...forged, hash: hashEvent(forged.prevHash, forged) };
    expect(verifyChain(events)).toMatchObject({ ok: false, brokenAt: 3, reason: "prev_hash_mismatch" });
  });

  it("detects a changed stored hash", () => {
    const events = chain(4);
    events[3] = { ...events[3], hash: "f".repeat(64) };
    expect(verifyChain(events)).toMatchObject({ ok: false, brokenAt: 4, reason: "hash_mismatch" });
  });

  it("detects a deleted row as a gap", () => {
    const events = chain(5);
    events.splice(2, 1);
    const verdict = verifyChain(events);
    expect(verdict).toMatchObject({ ok: false, brokenAt: 4, index: 2, reason: "seq_gap" });
    if (!verdict.ok) expect(verdict.message).toContain("event 3 is missing");
  });

  it("detects a deleted row whose successors were renumbered, by the broken link", () => {
    const events = chain(5);
    events.splice(2, 1);
    const renumbered = events.map((e, i) => ({ ...e, seq: i + 1 }));
    // Renumbering changes the hashed seq of rows 1..: the first renumbered row fails.
    expect(verifyChain(renumbered)).toMatchObject({ ok: false, brokenAt: 3 });
  });

  it("detects deleting the first row", () => {
    const events = chain(3).slice(1);
    expect(verifyChain(events)).toMatchObject({ ok: false, brokenAt: 2, index: 0, reason: "seq_gap" });
    // Even renumbered to start at 1, it does not start from genesis.
    const shifted = { ...events[0], seq: 1 };
    expect(verifyChain([shifted])).toMatchObject({ ok: false, reason: "prev_hash_mismatch" });
  });

  it("detects two swapped rows", () => {
    const events = chain(5);
    [events[1], events[2]] = [events[2], events[1]];
    expect(verifyChain(events)).toMatchObject({ ok: false, brokenAt: 3, index: 1, reason: "out_of_order" });
  });

  it("detects two rows whose contents were swapped while keeping their seq", () => {
    const events = chain(5);
    const a = events[1];
    const b = events[2];
    events[1] = { ...b, seq: a.seq };
    events[2] = { ...a, seq: b.seq };
    expect(verifyChain(events)).toMatchObject({ ok: false, brokenAt: 2 });
  });

  it("detects a repeated row", () => {
    const events = chain(3);
    events.splice(2, 0, events[1]);
    expect(verifyChain(events)).toMatchObject({ ok: false, index: 2, reason: "out_of_order" });
  });

  it("verifies a later stretch from an anchor", () => {
    const events = chain(6);
    const tail = events.slice(3);
    expect(verifyChain(tail, { seq: 4, prevHash: events[2].hash })).toEqual({ ok: true, count: 3, lastHash: events[5].hash });
    expect(verifyChain(tail).ok).toBe(false);
  });
});
