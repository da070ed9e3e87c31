// Administration writes on a real database: each lands with its audit event, bad input names its field.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createNetwork } from "../../../lib/db/networks/mutations";
import { loadScenario } from "../../../lib/db/networks/data";
import { createUserAudited, updateKpiSettings, updateUserAudited, type AdminActor } from "../../../lib/db/admin";
import { createUser } from "../../../lib/db/users";
import { listAuditEvents, verifyAuditChain } from "../../../lib/db/audit";
import { DomainError } from "../../../lib/changes/errors";
import { createTestDatabase, testDatabaseKind, type TestDatabase } from "../../support/database";
import { tinyScenario } from "../../support/tinyScenario";

describe(`administration (${testDatabaseKind})`, () => {
  let t: TestDatabase;
  let admin: AdminActor;
  let networkId: string;
  beforeAll(async () => {
    t = await createTestDatabase();
    networkId = (await createNetwork(t.db.prisma, tinyScenario(), { kind: "seed", note: "test" })).networkId;
    const user = await createUser(t.db.prisma, { email: "admin@example.test", name: "Admin", role: "admin", passwordHash: "x" });
    admin = { id: user.id, role: "admin", email: user.email };
  });
  afterAll(async () => t?.drop());

  it("createUserAudited / updateUserAudited write audit events without the password hash", async () => {
    const user = await createUserAudited(t.db, admin, { email: " New@Example.test ", name: "New one", role: "engineer", passwordHash: "secret-hash" });
    expect(user).toMatchObject({ email: "new@example.test", role: "engineer", active: true });
    const bad = await createUserAudited(t.db, admin, { email: "new@example.test", name: "Again", role: "wizard", passwordHash: "x" }).catch((e: unknown) => e as DomainError);
    expect((bad as DomainError).details.map((d) => d.path)).toEqual(["role"]);
    const dup = await createUserAudited(t.db, admin, { email: "new@example.test", name: "Again", role: "viewer", passwordHash: "x" }).catch((e: unknown) => e as DomainError);
    expect((dup as DomainError).details).toEqual([{ path: "email", message: "new@example.test is already in use" }]);
    await updateUserAudited(t.db, admin, user.id, { role: "owner", passwordHash: "other-hash" });
    await expect(updateUserAudited(t.db, admin, admin.id, { active: false })).rejects.toMatchObject({ code: "forbidden" });
    await expect(updateUserAudited(t.db, { id: user.id, role: "owner" }, user.id, { role: "admin" })).rejects.toMatchObject({ code: "forbidden" });
    const events = await listAuditEvents(t.db.prisma, { entityId: user.id });
    expect(events.map((e) => e.action)).toEqual(["user.updated", "user.created"]);
    expect(events[0]).toMatchObject({ actorId: admin.id, before: { role: "engineer" }, after: { role: "owner", passwordChanged: true } });
    expect(JSON.stringify(events)).not.toMatch(/secret-hash|other-hash/);
  });

  it("updateKpiSettings(db, actor, networkId, settings) checks ranges by field name and audits the change", async () => {
    const error = await updateKpiSettings(t.db, admin, networkId, { gridSizeM: 0, coverageThresholdDbm: -30, environment: "rural", colour: 1 }).catch(
      (e: unknown) => e as DomainError,
    );
    expect((error as DomainError).code).toBe("invalid");
    expect((error as DomainError).details.map((d) => d.path).sort()).toEqual(["colour", "coverageThresholdDbm", "environment", "gridSizeM"]);
    expect((await loadScenario(t.db.prisma, networkId)).settings.gridSizeM).toBe(5);
    const settings = await updateKpiSettings(t.db, admin, networkId, { coverageThresholdDbm: -100, overlapMaxOthers: 2 });
    expect(settings).toMatchObject({ coverageThresholdDbm: -100, overlapMaxOthers: 2, gridSizeM: 5 });
    expect((await loadScenario(t.db.prisma, networkId)).settings.coverageThresholdDbm).toBe(-100);
    const [event] = await listAuditEvents(t.db.prisma, { entityId: networkId });
    expect(event).toMatchObject({ action: "settings.updated", before: { coverageThresholdDbm: -105, overlapMaxOthers: 3 }, after: { coverageThresholdDbm: -100, overlapMaxOthers: 2 } });
    await expect(updateKpiSettings(t.db, { id: "x", role: "owner" }, networkId, { gridSizeM: 10 })).rejects.toMatchObject({ code: "forbidden" });
    expect((await verifyAuditChain(t.db.prisma)).ok).toBe(true);
  });
});
