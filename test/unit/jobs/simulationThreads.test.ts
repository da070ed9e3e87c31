import { describe, expect, it } from "vitest";
import { prepareEngineThreaded, threadedEngineBuilder } from "../../../lib/jobs/simulationThreads";
import { prepareEngine } from "../../../lib/radio/engine";
import { generateBenchScenario } from "../../bench/benchScenario";

const bytes = (a: ArrayBufferView) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

describe("prepareEngineThreaded", () => {
  const scenario = generateBenchScenario({ seed: 21, sizeM: 600, sites: 3, gridSizeM: 10 });

  it("prepareEngineThreaded(scenario, { threads: 2 }) equals the single-thread prepareEngine bit for bit, with progress to 1", async () => {
    const progress: number[] = [];
    const threaded = await prepareEngineThreaded(scenario, { threads: 2, computeWhileStarting: false, onProgress: (f) => progress.push(f) });
    const single = prepareEngine(scenario);
    expect(progress.length).toBe(scenario.cells.length);
    expect(progress[progress.length - 1]).toBe(1);
    for (let i = 1; i < progress.length; i++) expect(progress[i]).toBeGreaterThan(progress[i - 1]);
    threaded.pathLoss.forEach((pl, i) => expect(bytes(pl.pathLossDb).equals(bytes(single.pathLoss[i].pathLossDb))).toBe(true));
    expect(threaded.baseline.kpis.network).toEqual(single.baseline.kpis.network);
    expect(bytes(threaded.baseline.kpis.perGrid.sinrDb).equals(bytes(single.baseline.kpis.perGrid.sinrDb))).toBe(true);
    const changes = [{ cellId: scenario.cells[2].id, parameter: "azimuthDeg" as const, value: 12.5 }];
    expect(threaded.evaluate(changes).kpis.clusters).toEqual(single.evaluate(changes).kpis.clusters);
  });

  it("threadedEngineBuilder fits the (scenario, onProgress) builder shape and threads: 0 runs in-process", async () => {
    const engine = await threadedEngineBuilder({ threads: 0 })(scenario, () => {});
    expect(engine.baseline.kpis.network).toEqual(prepareEngine(scenario).baseline.kpis.network);
  });

  it("prepareEngineThreaded rejects with the worker's trouble (a missing worker file)", async () => {
    await expect(prepareEngineThreaded(scenario, { threads: 1, computeWhileStarting: false, workerFile: "/nonexistent/worker.ts" })).rejects.toThrow();
  });

  it("prepareEngineThreaded validates before starting any thread", async () => {
    const bad = { ...scenario, cells: [{ ...scenario.cells[0], azimuthDeg: 400 }] };
    await expect(prepareEngineThreaded(bad, { threads: 2 })).rejects.toThrow(/azimuthDeg = 400/);
  });
});

describe("prepareEngineThreaded with computeWhileStarting", () => {
  it("prepareEngineThreaded shares the cells between this thread and the workers and still equals prepareEngine", async () => {
    const scenario = generateBenchScenario({ seed: 22, sizeM: 500, sites: 3, gridSizeM: 10 });
    const threaded = await prepareEngineThreaded(scenario, { threads: 2, computeWhileStarting: true });
    const single = prepareEngine(scenario);
    threaded.pathLoss.forEach((pl, i) => expect(bytes(pl.pathLossDb).equals(bytes(single.pathLoss[i].pathLossDb))).toBe(true));
    expect(threaded.baseline.kpis.network).toEqual(single.baseline.kpis.network);
  });
});
