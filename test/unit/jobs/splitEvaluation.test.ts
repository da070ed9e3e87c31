import { describe, expect, it } from "vitest";
import { prepareEngine } from "../../../lib/radio/engine";
import { buildGrid } from "../../../lib/radio/grid";
import { computeCellPathLoss } from "../../../lib/radio/pathLossStage";
import { cellValuesAt } from "../../../lib/radio/serverLists";
import type { ParameterChange, Scenario } from "../../../lib/radio/scenario";
import { BufferRecycler, computeGroupPartial, mergePartials, SplitNetwork } from "../../../lib/jobs/splitEvaluation";
import { generateBenchScenario, seededRandom } from "../../bench/benchScenario";
import { expectIdenticalKpis } from "../../support/identicalKpis";



function randomChanges(scenario: Scenario, seed: number, count: number): ParameterChange[] {
  const rnd = seededRandom(seed);
  return Array.from({ length: count }, () => {
    const cell = scenario.cells[Math.floor(rnd() * scenario.cells.length)];
    const model = scenario.antennaModels.find((m) => m.id === cell.antennaModelId)!;
    const pick = Math.floor(rnd() * 3);
    if (pick === 0) return { cellId: cell.id, parameter: "azimuthDeg" as const, value: Math.floor(rnd() * 3600) / 10 };
    if (pick === 1) return { cellId: cell.id, parameter: "rsPowerDbm" as const, value: model.rsPowerMinDbm };
    return { cellId: cell.id, parameter: "electricalTiltDeg" as const, value: model.electricalTiltMaxDeg };
  });
}

describe("split (city-scale) evaluation", () => {
  const scenario = generateBenchScenario({ seed: 5, sizeM: 600, sites: 4, gridSizeM: 10 });
  const radiusM = 350;
  const grid = buildGrid(scenario);
  const engine = prepareEngine(scenario, { radiusM });

  it("computeCellPathLoss with `grids` gives the whole-grid values at every layer of those grids' positions", () => {
    const whole = computeCellPathLoss(scenario, grid, 3);
    const grids = Int32Array.from([7, 8, 500, 501, grid.count - 1]);
    const part = computeCellPathLoss(scenario, grid, 3, { grids });
    for (let j = 0; j < part.footprint!.length; j++) expect(part.pathLossDb[j]).toBe(whole.pathLossDb[part.footprint![j]]);
    for (const g of grids) expect(part.footprint).toContain(g);
    expect(() => computeCellPathLoss(scenario, grid, 3, { grids: Int32Array.from([9, 2]) })).toThrow(/must ascend/);
  });

  it("partials of cell groups, computed in any order, merge into the single-process baseline bit for bit", () => {
    const groups = [[8, 9, 10, 11], [0, 1, 2, 3, 4], [5, 6, 7]];
    // one recycler for every group, as a worker keeps it from job to job
    const recycler = new BufferRecycler();
    const network = new SplitNetwork(scenario, grid, radiusM, mergePartials(scenario, grid, groups.map((g) => computeGroupPartial(scenario, grid, g, radiusM, recycler))));
    expectIdenticalKpis(network.baselineKpis, engine.baseline.kpis);
    expect(() => mergePartials(scenario, grid, [computeGroupPartial(scenario, grid, [0, 1], radiusM)])).toThrow(/hold 2 cells/);
  });

  it("evaluate(changes) equals the engine holding every cell, asking every cell for a few grids where it must", () => {
    const network = new SplitNetwork(scenario, grid, radiusM, mergePartials(scenario, grid, [computeGroupPartial(scenario, grid, scenario.cells.map((_, i) => i), radiusM)]));
    let asked = 0;
    for (let trial = 0; trial < 5; trial++) {
      const changes = randomChanges(scenario, 70 + trial, 1 + trial);
      const result = network.evaluate(changes);
      expectIdenticalKpis(result.kpis, engine.evaluate(changes).kpis);
      asked += result.pointPairs;
    }
    expect(asked).toBeGreaterThan(0);
    // the point values are those of the whole footprint
    const full = engine.baseline.cells[2];
    const grids = full.footprint!.slice(0, 5);
    expect(Array.from(cellValuesAt(full, grids))).toEqual(Array.from(full.rsrpDbm.slice(0, 5)));
  });
});
