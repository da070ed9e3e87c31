import { describe, expect, it } from "vitest";
import { buildGrid } from "../../../lib/radio/grid";
import { computeCellLineOfSight, computeCellPathLoss } from "../../../lib/radio/pathLossStage";
import { planePositionAt } from "../../../lib/radio/horizontalPlane";
import { umaLosDb, umaNlosDb } from "../../../lib/radio/uma";
import { wallPenetrationLossDb } from "../../../lib/radio/buildingEntry";
import { tinyScenario } from "./scenarioFixtures";

const scenario = tinyScenario();
const grid = buildGrid(scenario);
const at = (x: number, y: number, layer = 0) => grid.positionStart[planePositionAt(grid.plane, x, y)] + layer;

describe("computeCellPathLoss", () => {
  const pl = computeCellPathLoss(scenario, grid, 0).pathLossDb;
  const los = computeCellLineOfSight(scenario, grid, 0);
  it("an open grid in view takes the UMa LOS formula with d2D, d3D from the geometry", () => {
    const g = at(87.5, 7.5);
    expect(los[g]).toBe(1);
    const d2 = Math.hypot(82.5, 22.5), d3 = Math.hypot(d2, 10.5);
    expect(pl[g]).toBeCloseTo(umaLosDb(d2, d3, 3.5, 12, 1.5), 4);
  });
  it("a grid behind the building is NLOS and takes max(LOS, NLOS')", () => {
    const g = at(87.5, 32.5);
    expect(los[g]).toBe(0);
    const d2 = Math.hypot(82.5, 2.5), d3 = Math.hypot(d2, 10.5);
    expect(pl[g]).toBeCloseTo(umaNlosDb(d2, d3, 3.5, 12, 1.5), 4);
  });
  it("an indoor grid adds PL_tw + 0.5 d2D-in (distance to its facade toward the site)", () => {
    const g = at(57.5, 32.5); // 17.5 m east of the west facade at x = 40, the site slightly south-west
    const d2 = Math.hypot(52.5, 2.5), d3 = Math.hypot(d2, 10.5);
    const inside = (17.5 * d2) / 52.5; // along the ray toward the site
    expect(los[g]).toBe(1); // the own building is skipped: LOS to its facade
    expect(pl[g]).toBeCloseTo(umaLosDb(d2, d3, 3.5, 12, 1.5) + wallPenetrationLossDb("low", 3.5) + 0.5 * inside, 4);
  });
  it("d2D is clamped to 10 m next to the mast", () => {
    const g = at(7.5, 32.5);
    expect(pl[g]).toBeCloseTo(umaLosDb(10, Math.hypot(10, 10.5), 3.5, 12, 1.5), 4);
  });
  it("settings.diffraction replaces NLOS by LOS + knife-edge loss behind the building", () => {
    const diff = computeCellPathLoss({ ...scenario, settings: { ...scenario.settings, diffraction: true } }, grid, 0).pathLossDb;
    const g = at(87.5, 32.5);
    const d2 = Math.hypot(82.5, 2.5);
    expect(diff[g]).toBeGreaterThan(umaLosDb(d2, Math.hypot(d2, 10.5), 3.5, 12, 1.5) + 6);
    expect(diff[g]).not.toBeCloseTo(pl[g], 1);
  });
  it("radiusM keeps a sparse, ascending footprint of the grids within reach, with the same values", () => {
    const sparse = computeCellPathLoss(scenario, grid, 0, { radiusM: 40 });
    expect(sparse.footprint).not.toBeNull();
    const fp = sparse.footprint!;
    for (let j = 1; j < fp.length; j++) expect(fp[j]).toBeGreaterThan(fp[j - 1]);
    for (let j = 0; j < fp.length; j++) {
      expect(Math.hypot(grid.x[fp[j]] - 5, grid.y[fp[j]] - 30)).toBeLessThanOrEqual(40);
      expect(sparse.pathLossDb[j]).toBe(pl[fp[j]]);
    }
  });
});
