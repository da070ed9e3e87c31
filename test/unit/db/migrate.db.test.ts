import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { applyMigrations, readMigrations } from "../../../lib/db/migrate";
import { createTestDatabase, testDatabaseKind, type TestDatabase } from "../../support/database";

describe(`migrations (${testDatabaseKind})`, () => {
  let t: TestDatabase;
  beforeAll(async () => {
    t = await createTestDatabase();
  });
  afterAll(async () => t?.drop());

  it("applyMigrations(db) is idempotent: a second run applies nothing", async () => {
    expect(await applyMigrations(t.db)).toEqual([]);
    const rows = await t.db.query<{ name: string }>(`select name from "_beamgate_migrations" order by name`);
    expect(rows.map((r) => r.name)).toEqual(readMigrations().map((m) => m.name));
  });

  it("applyMigrations(db) refuses a migration whose text changed after it was applied", async () => {
    const files = readMigrations().map((m, i) => (i === 0 ? { ...m, checksum: "0".repeat(64) } : m));
    await expect(applyMigrations(t.db, files)).rejects.toThrow(/was changed after it was applied/);
  });

  it("the audit table refuses updates and deletes", async () => {
    await t.db.exec(
      `insert into "AuditEvent"(seq, at, action, "entityType", "entityId", "prevHash", hash) values (1000000, now(), 'x', 'y', 'z', 'p', 'h-${Date.now()}')`,
    );
    await expect(t.db.exec(`update "AuditEvent" set action = 'edited'`)).rejects.toThrow(/append-only/);
    await expect(t.db.exec(`delete from "AuditEvent"`)).rejects.toThrow(/append-only/);
  });
});
