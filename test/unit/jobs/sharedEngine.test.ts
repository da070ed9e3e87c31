import { afterAll, describe, expect, it } from "vitest";
import { prepareEngine } from "../../../lib/radio/engine";
import type { KpiResult } from "../../../lib/radio/kpi";
import type { ParameterChange, Scenario } from "../../../lib/radio/scenario";
import { prepareEngineThreaded } from "../../../lib/jobs/simulationThreads";
import { evaluateOnThreads, withEvaluationOnThreads } from "../../../lib/jobs/sharedEngine";
import { closeSimulationThreadPools } from "../../../lib/jobs/simulationThreadPool";
import { generateBenchScenario, seededRandom } from "../../bench/benchScenario";
import { expectIdenticalKpis } from "../../support/identicalKpis";

function randomChanges(scenario: Scenario, seed: number, count: number): ParameterChange[] {
  const rnd = seededRandom(seed);
  return Array.from({ length: count }, () => {
    const cell = scenario.cells[Math.floor(rnd() * scenario.cells.length)];
    const model = scenario.antennaModels.find((m) => m.id === cell.antennaModelId)!;
    return rnd() < 0.5
      ? { cellId: cell.id, parameter: "azimuthDeg" as const, value: Math.floor(rnd() * 3600) / 10 }
      : { cellId: cell.id, parameter: "electricalTiltDeg" as const, value: model.electricalTiltMinDeg + Math.round(rnd() * (model.electricalTiltMaxDeg - model.electricalTiltMinDeg)) };
  });
}



describe("evaluateOnThreads", () => {
  afterAll(() => closeSimulationThreadPools());
  const scenario = generateBenchScenario({ seed: 5, sizeM: 900, sites: 5, gridSizeM: 10, traffic: true });

  it("equals engine.evaluate bit for bit, on a threaded engine (shared state) and on a one-thread engine (copied once)", async () => {
    const threaded = await prepareEngineThreaded(scenario, { threads: 2 });
    const single = prepareEngine(scenario);
    for (let trial = 0; trial < 4; trial++) {
      const changes = randomChanges(scenario, 40 + trial, 1 + trial);
      const expected = single.evaluate(changes);
      expectIdenticalKpis((await evaluateOnThreads(threaded, changes, { threads: 2 })).kpis, expected.kpis);
      expectIdenticalKpis((await evaluateOnThreads(single, changes, { threads: 2 })).kpis, expected.kpis);
    }
    // and the impact built on a threaded run equals the one-thread impact
    const changes = randomChanges(scenario, 9, 3);
    expect(threaded.compare(await evaluateOnThreads(threaded, changes, { threads: 2 }))).toEqual(single.impact(changes));
  });

  it("hands a worker that has forgotten the engine its state again", async () => {
    const engines = await Promise.all([1, 2, 3].map((seed) => prepareEngineThreaded(generateBenchScenario({ seed, sizeM: 500, sites: 2, gridSizeM: 10 }), { threads: 2 })));
    // each worker keeps two engines: the third evaluation pushes out the first, which is then evaluated again
    for (const engine of [...engines, engines[0]]) {
      const changes = randomChanges(engine.scenario, 3, 2);
      expectIdenticalKpis((await evaluateOnThreads(engine, changes, { threads: 2 })).kpis, engine.evaluate(changes).kpis);
    }
  });
});

describe("leased evaluations", () => {
  afterAll(() => closeSimulationThreadPools());
  const scenario = generateBenchScenario({ seed: 6, sizeM: 700, sites: 3, gridSizeM: 10 });

  it("withEvaluationOnThreads and engine.withEvaluation give each run the result of evaluate, reusing the arrays of the last", async () => {
    const engine = await prepareEngineThreaded(scenario, { threads: 2 });
    const seen: { sinr: Float32Array; copy: Float32Array; kpis: KpiResult }[] = [];
    for (let trial = 0; trial < 3; trial++) {
      const changes = randomChanges(scenario, 60 + trial, 2);
      const expected = engine.evaluate(changes).kpis;
      for (const lease of [
        (use: (run: { kpis: KpiResult }) => void) => withEvaluationOnThreads(engine, changes, use, { threads: 2 }),
        async (use: (run: { kpis: KpiResult }) => void) => engine.withEvaluation(changes, use),
      ]) {
        await lease((run) => {
          expectIdenticalKpis(run.kpis, expected);
          seen.push({ sinr: run.kpis.perGrid.sinrDb, copy: run.kpis.perGrid.sinrDb.slice(), kpis: run.kpis });
        });
      }
    }
    // the arrays were taken again: a later lease overwrote an earlier run's SINR in place
    const reused = seen.filter((s, i) => seen.some((t, j) => j > i && t.sinr === s.sinr));
    expect(reused.length).toBeGreaterThan(0);
  });
});
