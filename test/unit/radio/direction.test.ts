import { describe, expect, it } from "vitest";
import { buildGrid } from "../../../lib/radio/grid";
import { computeCellPathLoss } from "../../../lib/radio/pathLossStage";
import { antennaPointOf, computeCellRsrp } from "../../../lib/radio/cellRsrp";
import { computeDirections, keptDirections, type DirectionCache } from "../../../lib/radio/direction";
import { buildBeamSetGainTable } from "../../../lib/radio/beamGainTable";
import { prepareEngine } from "../../../lib/radio/engine";
import { tinyScenario } from "./scenarioFixtures";
import { generateBenchScenario } from "../../bench/benchScenario";

describe("directions", () => {
  const scenario = tinyScenario();
  const grid = buildGrid(scenario);
  const cell = scenario.cells[0], site = scenario.sites[0];
  const antenna = antennaPointOf(cell, site);

  it("computeDirections(grid, antenna, null) holds unit vectors pointing from the antenna to each grid", () => {
    const d = computeDirections(grid, antenna, null);
    expect(d.length).toBe(3 * grid.count);
    for (let g = 0; g < grid.count; g += 5) {
      const dx = grid.x[g] - antenna.x, dy = grid.y[g] - antenna.y, dz = grid.z[g] - antenna.z, r = Math.hypot(dx, dy, dz);
      expect(d[3 * g]).toBeCloseTo(dx / r, 6);
      expect(d[3 * g + 1]).toBeCloseTo(dy / r, 6);
      expect(d[3 * g + 2]).toBeCloseTo(dz / r, 6);
    }
  });

  it("computeDirections gives (0, 0, 0) for a grid at the antenna and follows a sparse footprint", () => {
    const at = { x: grid.x[7], y: grid.y[7], z: grid.z[7] };
    expect(Array.from(computeDirections(grid, at, null).subarray(21, 24))).toEqual([0, 0, 0]);
    const footprint = new Int32Array([3, 40, 41]);
    const sparse = computeDirections(grid, antenna, footprint), dense = computeDirections(grid, antenna, null);
    footprint.forEach((g, j) => expect(Array.from(sparse.subarray(3 * j, 3 * j + 3))).toEqual(Array.from(dense.subarray(3 * g, 3 * g + 3))));
  });

  it("the gain pass gives the same bits with kept directions as with directions it computes itself", () => {
    const table = buildBeamSetGainTable(scenario.antennaModels.find((m) => m.id === cell.antennaModelId)!, scenario.beamSets.find((b) => b.id === cell.beamSetId)!.beams, cell.electricalTiltDeg);
    const pathLoss = computeCellPathLoss(scenario, grid, 0);
    const tilted = { ...cell, azimuthDeg: 63.5, mechanicalTiltDeg: 3 };
    const without = computeCellRsrp(grid, pathLoss, tilted, site, table);
    const kept = computeCellRsrp(grid, { ...pathLoss, direction: computeDirections(grid, antenna, null) }, tilted, site, table);
    expect(kept.rsrpDbm).toEqual(without.rsrpDbm);
    expect(kept.rsrpMw).toEqual(without.rsrpMw);
  });

  it("keptDirections keeps one array per antenna point, for dense footprints only", () => {
    const cache: DirectionCache = new Map();
    const a = keptDirections(cache, grid, antenna, null)!;
    expect(keptDirections(cache, grid, { ...antenna }, null)).toBe(a);
    expect(keptDirections(cache, grid, { ...antenna, z: antenna.z + 1 }, null)).not.toBe(a);
    expect(keptDirections(cache, grid, antenna, new Int32Array([1, 2]))).toBeUndefined();
  });

  it("prepareEngine shares one direction array among the cells of one mast and height", () => {
    const bench = generateBenchScenario({ seed: 3, sizeM: 400, sites: 2, gridSizeM: 10 });
    const engine = prepareEngine(bench);
    const [a, b, c, d] = engine.pathLoss;
    expect(a.direction).toBeDefined();
    expect(b.direction).toBe(a.direction);
    expect(c.direction).toBe(a.direction);
    expect(d.direction).not.toBe(a.direction);
  });
});
