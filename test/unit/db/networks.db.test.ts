import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createNetwork } from "../../../lib/db/networks/mutations";
import { listCells, listNetworks, loadScenario } from "../../../lib/db/networks/data";
import { createTestDatabase, testDatabaseKind, type TestDatabase } from "../../support/database";
import { tinyScenario } from "../../support/tinyScenario";

describe(`network store (${testDatabaseKind})`, () => {
  let t: TestDatabase;
  beforeAll(async () => {
    t = await createTestDatabase();
  });
  afterAll(async () => t?.drop());

  it("createNetwork then loadScenario gives the same scenario back, rasters bit for bit", async () => {
    const scenario = tinyScenario();
    const { networkId, versionNumber } = await createNetwork(t.db.prisma, scenario, { kind: "seed", note: "test" });
    expect(versionNumber).toBe(1);
    const loaded = await loadScenario(t.db.prisma, networkId);
    expect(loaded).toEqual(scenario);
    expect(Array.from(loaded.terrain.values)).toEqual(Array.from(scenario.terrain.values));
    const [summary] = await listNetworks(t.db.prisma);
    expect(summary).toMatchObject({ name: "Test Bay", sites: 2, cells: 3, buildings: 2, latestVersion: 1 });
  });

  it("createNetwork writes nothing when any row is bad (one transaction)", async () => {
    const scenario = tinyScenario("Broken Bay");
    scenario.cells[2] = { ...scenario.cells[2], siteId: "NOPE" };
    await expect(createNetwork(t.db.prisma, scenario, { kind: "import", note: "bad" })).rejects.toThrow(/unknown site NOPE/);
    expect(await t.db.prisma.network.count({ where: { name: "Broken Bay" } })).toBe(0);
    expect(await t.db.prisma.site.count({ where: { code: "S1", network: { name: "Broken Bay" } } })).toBe(0);
  });

  it("listCells(asOf version 1) reads the temporal record and equals the current values", async () => {
    const [summary] = await listNetworks(t.db.prisma);
    const current = await listCells(t.db.prisma, summary.id);
    const asOf = await listCells(t.db.prisma, summary.id, { version: 1 });
    expect(asOf).toEqual(current);
    expect(await listCells(t.db.prisma, summary.id, { date: new Date(Date.now() - 86_400_000) })).toEqual([]);
  });
});
