// Cell stages in the database: what goes in comes out bit for bit (dense, sparse and whole-area
// footprints), and storing a stage again overwrites its row instead of adding one.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cellStageRowCount, deleteCellStages, loadCellStages, storeCellStages, storedStageCellIds, storedStagePairs } from "../../../lib/db/cellStages";
import { computeCellStage, type CellStage } from "../../../lib/radio/engine";
import { buildGrid } from "../../../lib/radio/grid";
import { validateScenario } from "../../../lib/radio/validation";
import { createTestDatabase, testDatabaseKind, type TestDatabase } from "../../support/database";
import { tinyScenario } from "../../support/tinyScenario";

const bytes = (a: ArrayBufferView | null) => (a ? Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString("base64") : null);

function expectSameStage(got: CellStage, want: CellStage) {
  expect(got.pathLoss.cellId).toBe(want.pathLoss.cellId);
  expect(bytes(got.pathLoss.footprint)).toBe(bytes(want.pathLoss.footprint));
  expect(bytes(got.pathLoss.pathLossDb)).toBe(bytes(want.pathLoss.pathLossDb));
  for (const key of ["rsrpDbm", "rsrpMw", "tileMaxDbm", "segmentMaxDbm", "tileOffsets"] as const) {
    expect(bytes(got.rsrp[key]), key).toBe(bytes(want.rsrp[key]));
  }
  expect(got.rsrp.footprint).toBe(got.pathLoss.footprint);
}

describe(`cell stages (${testDatabaseKind})`, () => {
  let t: TestDatabase;
  beforeAll(async () => {
    t = await createTestDatabase();
  }, 60_000);
  afterAll(async () => {
    await t?.drop();
  });

  it("loadCellStages(db, key, ids) returns exactly what storeCellStages stored, for dense, sparse and whole-area footprints", async () => {
    const scenario = tinyScenario();
    validateScenario(scenario);
    const grid = buildGrid(scenario);
    const cases: [string, CellStage][] = [
      ["dense", computeCellStage(scenario, grid, 0)],
      ["sparse", computeCellStage(scenario, grid, 1, { radiusM: 60 })],
      ["whole area", computeCellStage(scenario, grid, 2, { radiusM: 1000 })],
    ];
    expect(cases[0][1].pathLoss.footprint).toBeNull();
    expect(cases[1][1].pathLoss.footprint!.length).toBeLessThan(grid.count);
    expect(cases[2][1].pathLoss.footprint!.length).toBe(grid.count);
    await storeCellStages(t.db, "k1", cases.map(([, stage]) => stage));
    const loaded = await loadCellStages(t.db, "k1", scenario.cells.map((c) => c.id));
    cases.forEach(([, want], i) => expectSameStage(loaded[i], want));
    expect(await storedStagePairs(t.db.prisma, "k1")).toBe(cases.reduce((n, [, s]) => n + s.pathLoss.pathLossDb.length, 0));
  });

  it("storeCellStages(db, key, stages) again upserts: one row per (key, cell), the latest values", async () => {
    const scenario = tinyScenario();
    validateScenario(scenario);
    const grid = buildGrid(scenario);
    await storeCellStages(t.db, "k2", [computeCellStage(scenario, grid, 0, { radiusM: 40 })]);
    const wider = computeCellStage(scenario, grid, 0, { radiusM: 90 });
    await storeCellStages(t.db, "k2", [wider]);
    expect(await cellStageRowCount(t.db.prisma, "k2")).toBe(1);
    expect([...(await storedStageCellIds(t.db.prisma, "k2"))]).toEqual([scenario.cells[0].id]);
    expectSameStage((await loadCellStages(t.db, "k2", [scenario.cells[0].id]))[0], wider);
    await expect(loadCellStages(t.db, "k2", [scenario.cells[1].id])).rejects.toThrow(/k2 \/ "S1-B" is not stored/);
    expect(await deleteCellStages(t.db.prisma, "k2")).toBe(1);
  });
});
