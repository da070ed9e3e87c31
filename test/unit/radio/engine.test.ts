import { describe, expect, it } from "vitest";
import type { ParameterChange, Scenario } from "../../../lib/radio/scenario";
import { prepareEngine, assembleEngine } from "../../../lib/radio/engine";
import { applyChanges } from "../../../lib/radio/applyChanges";
import { buildGrid } from "../../../lib/radio/grid";
import { computeCellPathLoss } from "../../../lib/radio/pathLossStage";
import { generateBenchScenario, seededRandom } from "../../bench/benchScenario";
import { expectIdenticalKpis } from "../../support/identicalKpis";

function randomChanges(scenario: Scenario, seed: number, count: number): ParameterChange[] {
  const rnd = seededRandom(seed);
  const out: ParameterChange[] = [];
  for (let k = 0; k < count; k++) {
    const cell = scenario.cells[Math.floor(rnd() * scenario.cells.length)];
    const model = scenario.antennaModels.find((m) => m.id === cell.antennaModelId)!;
    const pick = Math.floor(rnd() * 5);
    if (pick === 0) out.push({ cellId: cell.id, parameter: "azimuthDeg", value: Math.floor(rnd() * 3600) / 10 });
    else if (pick === 1) out.push({ cellId: cell.id, parameter: "mechanicalTiltDeg", value: model.mechanicalTiltMinDeg + Math.round(rnd() * (model.mechanicalTiltMaxDeg - model.mechanicalTiltMinDeg)) });
    else if (pick === 2) out.push({ cellId: cell.id, parameter: "electricalTiltDeg", value: model.electricalTiltMinDeg + Math.round(rnd() * (model.electricalTiltMaxDeg - model.electricalTiltMinDeg)) });
    else if (pick === 3) out.push({ cellId: cell.id, parameter: "beamSetId", value: model.beamSetIds[Math.floor(rnd() * model.beamSetIds.length)] });
    else out.push({ cellId: cell.id, parameter: "rsPowerDbm", value: model.rsPowerMinDbm + Math.round(rnd() * (model.rsPowerMaxDbm - model.rsPowerMinDbm)) });
  }
  return out;
}


describe("CoverageEngine", () => {
  const scenario = generateBenchScenario({ seed: 3, sizeM: 700, sites: 4, gridSizeM: 10, traffic: true });
  const engine = prepareEngine(scenario);

  it("evaluate(changes) is bit-identical to a run from scratch on the changed scenario (random changes)", () => {
    for (let trial = 0; trial < 4; trial++) {
      const changes = randomChanges(scenario, 100 + trial, 1 + trial * 2);
      const incremental = engine.evaluate(changes);
      const full = prepareEngine(applyChanges(scenario, changes)).baseline;
      expectIdenticalKpis(incremental.kpis, full.kpis);
    }
  });

  it("evaluate(changes) gives a power-only change (one addition per grid) the very RSRP a gain pass from scratch gives", () => {
    const cells = [0, 5, 9].map((i) => scenario.cells[i]);
    const changes: ParameterChange[] = cells.map((c, k) => ({ cellId: c.id, parameter: "rsPowerDbm", value: c.rsPowerDbm - 1.7 + k }));
    const incremental = engine.evaluate(changes);
    const full = prepareEngine(applyChanges(scenario, changes)).baseline;
    for (const i of [0, 5, 9]) {
      expect(incremental.cells[i].rsrpDbm).toEqual(full.cells[i].rsrpDbm);
      expect(incremental.cells[i].rsrpMw).toEqual(full.cells[i].rsrpMw);
      expect(incremental.cells[i].linkDb).toEqual(engine.baseline.cells[i].linkDb);
    }
    expectIdenticalKpis(incremental.kpis, full.kpis);
  });

  it("evaluate(changes) recomputes only the changed cells and shares the baseline arrays of the others", () => {
    const changes: ParameterChange[] = [
      { cellId: scenario.cells[1].id, parameter: "azimuthDeg", value: (scenario.cells[1].azimuthDeg + 30) % 360 },
      { cellId: scenario.cells[5].id, parameter: "rsPowerDbm", value: scenario.cells[5].rsPowerDbm - 3 },
    ];
    const run = engine.evaluate(changes);
    expect(run.recomputedCellIds).toEqual([scenario.cells[1].id, scenario.cells[5].id]);
    run.cells.forEach((c, i) => {
      if (i === 1 || i === 5) expect(c).not.toBe(engine.baseline.cells[i]);
      else expect(c).toBe(engine.baseline.cells[i]);
    });
    // copy-on-write: the baseline is untouched and still equals a fresh baseline
    expectIdenticalKpis(engine.baseline.kpis, prepareEngine(scenario).baseline.kpis);
  });

  it("evaluate([]) reproduces the baseline and a change to the same value recomputes nothing", () => {
    expectIdenticalKpis(engine.evaluate([]).kpis, engine.baseline.kpis);
    const same = engine.evaluate([{ cellId: scenario.cells[0].id, parameter: "azimuthDeg", value: scenario.cells[0].azimuthDeg }]);
    expect(same.recomputedCellIds).toEqual([]);
  });

  it("a lower power on one cell lowers its RSRP by exactly that many dB everywhere (within Float32 rounding)", () => {
    const run = engine.evaluate([{ cellId: scenario.cells[2].id, parameter: "rsPowerDbm", value: scenario.cells[2].rsPowerDbm - 4 }]);
    const before = engine.baseline.cells[2].rsrpDbm, after = run.cells[2].rsrpDbm;
    for (let g = 0; g < before.length; g += 97) expect(before[g] - after[g]).toBeCloseTo(4, 4);
  });

  it("assembleEngine(scenario, grid, caches) from separately computed caches equals prepareEngine", () => {
    const grid = buildGrid(scenario);
    const caches = scenario.cells.map((_, i) => computeCellPathLoss(scenario, grid, i));
    expectIdenticalKpis(assembleEngine(scenario, grid, caches).baseline.kpis, engine.baseline.kpis);
  });

  it("assembleEngine refuses caches of the wrong cell or length", () => {
    const grid = engine.grid;
    const caches = [...engine.pathLoss];
    expect(() => assembleEngine(scenario, grid, caches.slice(1))).toThrow(RangeError);
    const swapped = [caches[1], caches[0], ...caches.slice(2)];
    expect(() => assembleEngine(scenario, grid, swapped)).toThrow(/cache 0 is for cell/);
    const short = [{ ...caches[0], pathLossDb: caches[0].pathLossDb.subarray(1) }, ...caches.slice(1)];
    expect(() => assembleEngine(scenario, grid, short)).toThrow(RangeError);
  });

  it("impact(changes) reports deltas after − before and ranks worst grids by lost conditions, then RSRP drop", () => {
    const cell = scenario.cells[0];
    const report = engine.impact([{ cellId: cell.id, parameter: "rsPowerDbm", value: scenario.antennaModels.find((m) => m.id === cell.antennaModelId)!.rsPowerMinDbm }], 50);
    expect(report.network.delta.coverageRatio).toBeCloseTo(report.network.after.coverageRatio! - report.network.before.coverageRatio!, 15);
    expect(report.worstGrids.length).toBeLessThanOrEqual(50);
    expect(report.worstGridTotal).toBeGreaterThan(0);
    for (let i = 1; i < report.worstGrids.length; i++) {
      const a = report.worstGrids[i - 1], b = report.worstGrids[i];
      const lostA = a.reasons.filter((r) => r !== "rsrp-drop").length, lostB = b.reasons.filter((r) => r !== "rsrp-drop").length;
      expect(lostA).toBeGreaterThanOrEqual(lostB);
      if (lostA === lostB) expect(a.bestRsrpBeforeDbm! - a.bestRsrpAfterDbm!).toBeGreaterThanOrEqual(b.bestRsrpBeforeDbm! - b.bestRsrpAfterDbm! - 1e-9);
    }
  });

  it("sparse footprints (radiusM) still give identical full and incremental runs", () => {
    const sparse = prepareEngine(scenario, { radiusM: 300 });
    expect(sparse.pathLoss[0].footprint).not.toBeNull();
    const changes = randomChanges(scenario, 9, 3);
    const full = assembleEngine(applyChanges(scenario, changes), sparse.grid, sparse.pathLoss).baseline;
    expectIdenticalKpis(sparse.evaluate(changes).kpis, full.kpis);
  });
});
