// The open folder, the database and back: demo town → scenario folder → importNetwork → loadScenario →
// scenario folder → read again. Nothing may be lost or rounded on the way, and the coverage model must
// not be able to tell the two apart.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { generateDemoTown } from "../../../lib/io/demoTown";
import { readScenarioFolder, writeScenarioFolder } from "../../../lib/io/scenarioFolder";
import { importNetwork } from "../../../lib/db/networks/import";
import { loadScenario } from "../../../lib/db/networks/data";
import { prepareEngine } from "../../../lib/radio/engine";
import type { Scenario } from "../../../lib/radio/scenario";
import { createTestDatabase, testDatabaseKind, type TestDatabase } from "../../support/database";

/** loadScenario sorts every collection by code; sort the original the same way to compare. */
function sortedById(s: Scenario): Scenario {
  const byId = <T extends { id: string }>(rows: readonly T[]) => [...rows].sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
  return {
    ...s,
    antennaModels: byId(s.antennaModels),
    beamSets: byId(s.beamSets),
    sites: byId(s.sites),
    cells: byId(s.cells),
    buildings: byId(s.buildings),
    clusters: byId(s.clusters),
  };
}

describe(`scenario folder ⇄ database round trip (${testDatabaseKind})`, () => {
  let t: TestDatabase;
  let dir: string;
  let original: Scenario;
  let reread: Scenario;

  beforeAll(async () => {
    t = await createTestDatabase();
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "beamgate-roundtrip-"));
    const town = generateDemoTown(7);
    // 20 m grids keep the two engine runs quick; the round trip itself does not depend on it.
    original = { ...town, settings: { ...town.settings, gridSizeM: 20 } };
    await writeScenarioFolder(path.join(dir, "in"), original);
    const read = await readScenarioFolder(path.join(dir, "in"));
    const saved = await importNetwork(t.db, { id: "test", role: "system" }, read, { note: "round trip" });
    await writeScenarioFolder(path.join(dir, "out"), await loadScenario(t.db.prisma, saved.networkId));
    reread = await readScenarioFolder(path.join(dir, "out"));
  });
  afterAll(async () => {
    await t?.drop();
    if (dir) fs.rmSync(dir, { recursive: true, force: true });
  });

  it("importNetwork(read folder) then loadScenario → writeScenarioFolder → readScenarioFolder gives the same scenario", () => {
    expect(reread.cells.length).toBeGreaterThan(0);
    expect(reread.buildings.length).toBeGreaterThan(0);
    expect(sortedById(reread)).toEqual(sortedById(original));
    expect(Array.from(reread.terrain.values)).toEqual(Array.from(original.terrain.values));
  });

  it("prepareEngine on the original and on the round-tripped scenario gives identical network and cluster KPIs", () => {
    // Same cell order on both sides: a different order would only change the order of float sums.
    const before = prepareEngine(sortedById(original)).baseline.kpis;
    const after = prepareEngine(sortedById(reread)).baseline.kpis;
    expect(after.network).toEqual(before.network);
    expect(after.clusters).toEqual(before.clusters);
    expect(after.clusters.length).toBe(original.clusters.length);
  });
});
