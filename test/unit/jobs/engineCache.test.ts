import os from "node:os";
import { afterEach, describe, expect, it } from "vitest";
import { buildEngine, simulationThreadCount } from "../../../lib/jobs/engineCache";
import { prepareEngine } from "../../../lib/radio/engine";
import { generateBenchScenario } from "../../bench/benchScenario";

const bytes = (a: ArrayBufferView) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);
const saved = process.env.BEAMGATE_SIMULATION_THREADS;
afterEach(() => {
  if (saved === undefined) delete process.env.BEAMGATE_SIMULATION_THREADS;
  else process.env.BEAMGATE_SIMULATION_THREADS = saved;
});

describe("buildEngine", () => {
  it("buildEngine(scenario, onProgress) builds on worker threads bit-identical to prepareEngine, progress rising to 1", async () => {
    process.env.BEAMGATE_SIMULATION_THREADS = "2";
    const scenario = generateBenchScenario({ seed: 41, sizeM: 400, sites: 3, gridSizeM: 10 });
    const progress: number[] = [];
    const engine = await buildEngine(scenario, (f) => progress.push(f));
    const single = prepareEngine(scenario);
    expect(progress).toHaveLength(scenario.cells.length);
    expect(progress.at(-1)).toBe(1);
    engine.pathLoss.forEach((pl, i) => expect(bytes(pl.pathLossDb).equals(bytes(single.pathLoss[i].pathLossDb))).toBe(true));
    expect(bytes(engine.baseline.kpis.perGrid.bestRsrpDbm).equals(bytes(single.baseline.kpis.perGrid.bestRsrpDbm))).toBe(true);
    expect(engine.baseline.kpis.clusters).toEqual(single.baseline.kpis.clusters);
  });

  it("simulationThreadCount() is BEAMGATE_SIMULATION_THREADS, else every core, and refuses a bad value by name", () => {
    delete process.env.BEAMGATE_SIMULATION_THREADS;
    expect(simulationThreadCount()).toBe(os.availableParallelism());
    process.env.BEAMGATE_SIMULATION_THREADS = "3";
    expect(simulationThreadCount()).toBe(3);
    process.env.BEAMGATE_SIMULATION_THREADS = "0";
    expect(() => simulationThreadCount()).toThrow(/BEAMGATE_SIMULATION_THREADS.*"0"/);
    process.env.BEAMGATE_SIMULATION_THREADS = "two";
    expect(() => simulationThreadCount()).toThrow(/BEAMGATE_SIMULATION_THREADS.*"two"/);
  });
});
