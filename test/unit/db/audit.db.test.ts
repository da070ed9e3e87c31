import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { appendAuditEvent, listAuditEvents, verifyAuditChain } from "../../../lib/db/audit";
import { createTestDatabase, testDatabaseKind, type TestDatabase } from "../../support/database";

describe(`audit store (${testDatabaseKind})`, () => {
  let t: TestDatabase;
  beforeAll(async () => {
    t = await createTestDatabase();
  });
  afterAll(async () => t?.drop());

  it("appendAuditEvent keeps every digit of a double, so the chain verifies after a read back", async () => {
    // 17 significant digits: a value that a 16-digit path would change.
    const after = { originLon: -135.00131506152144, originLat: -35.00105445152739, tiny: 5e-324, big: 1.7976931348623157e308, text: "é \\u2028 \"q\"" };
    await appendAuditEvent(t.db, { action: "network.import", entityType: "network", entityId: "n1", after, at: new Date("2026-12-02T06:25:30.589Z") });
    await appendAuditEvent(t.db, { action: "x", entityType: "y", entityId: "z", before: { a: [1, 2.5, null] } });
    const [, first] = await listAuditEvents(t.db.prisma);
    expect(first.after).toEqual(after);
    expect(first.at).toBe("2026-12-02T06:25:30.589Z");
    expect(await verifyAuditChain(t.db.prisma)).toMatchObject({ ok: true, count: 2 });
  });
});
