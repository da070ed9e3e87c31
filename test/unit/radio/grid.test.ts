import { describe, expect, it } from "vitest";
import { buildGrid } from "../../../lib/radio/grid";
import { tinyScenario } from "./scenarioFixtures";

describe("buildGrid", () => {
  const traffic = { originX: 0, originY: 0, cellSize: 100, width: 1, height: 1, values: new Float32Array([6]) };
  const grid = buildGrid(tinyScenario({ traffic }));
  it("buildGrid has one outdoor layer per open position and one layer per floor in the building", () => {
    // 240 positions, 16 of them in a 3-floor building
    expect(grid.count).toBe(224 + 16 * 3);
  });
  it("indoor layers sit at 1.5, 4.5, 7.5 m above ground (z above sea level) and share the position", () => {
    const p = grid.plane.buildingIndex.indexOf(0);
    const g0 = grid.positionStart[p];
    expect(grid.positionLayers[p]).toBe(3);
    expect(Array.from(grid.floor.subarray(g0, g0 + 3))).toEqual([1, 2, 3]);
    expect(Array.from(grid.heightAboveGround.subarray(g0, g0 + 3))).toEqual([1.5, 4.5, 7.5]);
    expect(Array.from(grid.z.subarray(g0, g0 + 3))).toEqual([11.5, 14.5, 17.5]);
    expect(grid.x[g0]).toBe(grid.x[g0 + 2]);
  });
  it("indoor floors divide the position's traffic weight, so the total equals the raster's per-position sum", () => {
    let total = 0;
    for (const w of grid.weight!) total += w;
    expect(total).toBeCloseTo(240 * 6, 9);
    const p = grid.plane.buildingIndex.indexOf(0);
    expect(grid.weight![grid.positionStart[p]]).toBe(2);
  });
  it("stores grids tile by tile: tileStart partitions 0..count and positionIndex maps back to each grid's place", () => {
    expect(grid.tileStart[0]).toBe(0);
    expect(grid.tileStart[grid.tileCount]).toBe(grid.count);
    for (let g = 0; g < grid.count; g++) {
      const p = grid.positionIndex[g];
      const col = p % grid.plane.width, row = Math.floor(p / grid.plane.width);
      expect(grid.x[g]).toBe(2.5 + 5 * col);
      expect(grid.y[g]).toBe(2.5 + 5 * row);
    }
  });
});
