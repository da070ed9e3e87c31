// Stage partials on a real database (embedded, and PostgreSQL when BEAMGATE_TEST_DB=postgres): what goes in comes
// back bit for bit, a second write of a part replaces the first, the unlogged table takes the migrations.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildGrid } from "../../../lib/radio/grid";
import { samePowerSums } from "../../../lib/radio/powerSums";
import { sameServerLists } from "../../../lib/radio/serverLists";
import { computeGroupPartial } from "../../../lib/jobs/splitEvaluation";
import {
  deleteStagePartials,
  forEachGroupPartial,
  loadStagePartial,
  stagePartialRowCount,
  storedGroupPairs,
  storedGroupParts,
  storeStagePartial,
  WHOLE_NETWORK_PART,
} from "../../../lib/db/stagePartials";
import { createTestDatabase, type TestDatabase } from "../../support/database";
import { generateBenchScenario } from "../../bench/benchScenario";

describe("stage partials", () => {
  let t: TestDatabase;
  beforeAll(async () => {
    t = await createTestDatabase();
  }, 60_000);
  afterAll(async () => {
    await t?.drop();
  });
  const scenario = generateBenchScenario({ seed: 4, sizeM: 500, sites: 2, gridSizeM: 10 });
  const grid = buildGrid(scenario);

  it("loadStagePartial returns exactly what storeStagePartial stored, sparse and dense groups alike", async () => {
    const sparse = computeGroupPartial(scenario, grid, [0, 2, 4], 150);
    const dense = computeGroupPartial(scenario, grid, [1, 3, 5], 5000);
    await storeStagePartial(t.db, "k1", 0, sparse);
    await storeStagePartial(t.db, "k1", 1, dense);
    for (const [part, want] of [[0, sparse], [1, dense]] as const) {
      const got = (await loadStagePartial(t.db, "k1", part, scenario.settings))!;
      expect(got.cells).toBe(3);
      expect(got.pairs).toBe(want.pairs);
      expect(samePowerSums(got.powerSums, want.powerSums)).toBe(true);
      expect(sameServerLists(got.lists, want.lists)).toBe(true);
    }
    expect(sparse.pairs).toBeLessThan(dense.pairs);
    expect(await storedGroupParts(t.db, "k1")).toEqual([0, 1]);
    expect(await storedGroupPairs(t.db.prisma, "k1")).toBe(sparse.pairs + dense.pairs);
    const seen: number[] = [];
    await forEachGroupPartial(t.db, "k1", scenario.settings, (part) => seen.push(part));
    expect(seen).toEqual([0, 1]);
    expect(await loadStagePartial(t.db, "k1", WHOLE_NETWORK_PART, scenario.settings)).toBeNull();
  });

  it("storing a part again replaces it (one row per part), and the settings must match the stored lists", async () => {
    await storeStagePartial(t.db, "k2", 0, computeGroupPartial(scenario, grid, [0], 100));
    const wider = computeGroupPartial(scenario, grid, [0], 300);
    await storeStagePartial(t.db, "k2", 0, wider);
    expect(await stagePartialRowCount(t.db.prisma, "k2")).toBe(1);
    expect((await loadStagePartial(t.db, "k2", 0, scenario.settings))!.pairs).toBe(wider.pairs);
    await expect(loadStagePartial(t.db, "k2", 0, { ...scenario.settings, overlapMaxOthers: 12 })).rejects.toThrow(/8 entries per grid, the settings give 14/);
    expect(await deleteStagePartials(t.db.prisma, "k2")).toBe(1);
  });
});
