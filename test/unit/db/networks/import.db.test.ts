import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { importNetwork } from "../../../../lib/db/networks/import";
import { loadScenario } from "../../../../lib/db/networks/data";
import { verifyAuditChain } from "../../../../lib/db/audit";
import { createUser } from "../../../../lib/db/users";
import { createTestDatabase, testDatabaseKind, type TestDatabase } from "../../../support/database";
import { tinyScenario } from "../../../support/tinyScenario";

const PROJECTION = { zone: 8, hemisphere: "south" as const, originEasting: 500_000, originNorthing: 6_100_000, origin: { lon: -135, lat: -35.2 } };

describe(`importNetwork (${testDatabaseKind})`, () => {
  let t: TestDatabase;
  let adminId: string;
  let engineerId: string;
  beforeAll(async () => {
    t = await createTestDatabase();
    adminId = (await createUser(t.db.prisma, { email: "admin@import.test", name: "Admin", role: "admin", passwordHash: "x" })).id;
    engineerId = (await createUser(t.db.prisma, { email: "eng@import.test", name: "Eng", role: "engineer", passwordHash: "x" })).id;
  });
  afterAll(async () => t?.drop());

  it("importNetwork(db, admin, scenario, {projection}) writes network version 1, the UTM zone and one network.import audit event", async () => {
    const scenario = { ...tinyScenario("Import Bay"), origin: PROJECTION.origin };
    const saved = await importNetwork(t.db, { id: adminId, role: "admin" }, scenario, { projection: PROJECTION, note: "from test" });
    expect(saved.counts).toEqual({ sites: 2, cells: 3, buildings: 2, clusters: scenario.clusters.length });
    const row = await t.db.prisma.network.findUniqueOrThrow({ where: { id: saved.networkId }, include: { versions: true } });
    expect(row).toMatchObject({ name: "Import Bay", utmZone: 8, utmHemisphere: "south", originLon: -135, originLat: -35.2 });
    expect(row.versions).toMatchObject([{ number: 1, kind: "import", note: "from test", createdById: adminId }]);
    expect(await loadScenario(t.db.prisma, saved.networkId)).toEqual(scenario);
    const events = await t.db.prisma.auditEvent.findMany({ where: { action: "network.import", entityId: saved.networkId } });
    expect(events).toHaveLength(1);
    expect(events[0]).toMatchObject({ actorId: adminId, actorEmail: "admin@import.test", entityType: "network" });
    expect(events[0].after).toMatchObject({ name: "Import Bay", cells: 3, utmZone: 8, utmHemisphere: "south" });
    expect((await verifyAuditChain(t.db.prisma)).ok).toBe(true);
  });

  it("importNetwork refuses a name that exists, naming it, and writes nothing", async () => {
    const networks = await t.db.prisma.network.count();
    const events = await t.db.prisma.auditEvent.count();
    await expect(importNetwork(t.db, { id: adminId, role: "admin" }, tinyScenario("Import Bay"))).rejects.toThrow(
      /a network named "Import Bay" already exists; importing a new version of an existing network is not supported yet/,
    );
    expect(await t.db.prisma.network.count()).toBe(networks);
    expect(await t.db.prisma.auditEvent.count()).toBe(events);
  });

  it("importNetwork rolls back the audit event with the network when a row fails (one transaction)", async () => {
    const events = await t.db.prisma.auditEvent.count();
    const broken = tinyScenario("Broken Import Bay");
    broken.cells[1] = { ...broken.cells[1], antennaModelId: "NOPE" };
    await expect(importNetwork(t.db, { id: adminId, role: "admin" }, broken)).rejects.toThrow(/unknown antenna model NOPE/);
    expect(await t.db.prisma.network.count({ where: { name: "Broken Import Bay" } })).toBe(0);
    expect(await t.db.prisma.auditEvent.count()).toBe(events);
  });

  it("importNetwork refuses a role without network.import (403) and writes nothing", async () => {
    await expect(importNetwork(t.db, { id: engineerId, role: "engineer" }, tinyScenario("Engineer Bay"))).rejects.toMatchObject({ code: "forbidden" });
    expect(await t.db.prisma.network.count({ where: { name: "Engineer Bay" } })).toBe(0);
  });

  it("importNetwork by the command line (role system) records no actor and no projection for local metres", async () => {
    const saved = await importNetwork(t.db, { id: "cli", role: "system" }, tinyScenario("Local Bay"));
    const row = await t.db.prisma.network.findUniqueOrThrow({ where: { id: saved.networkId }, include: { versions: true } });
    expect(row).toMatchObject({ utmZone: null, utmHemisphere: null });
    expect(row.versions[0].createdById).toBeNull();
    const event = await t.db.prisma.auditEvent.findFirstOrThrow({ where: { action: "network.import", entityId: saved.networkId } });
    expect(event.actorId).toBeNull();
  });
});
