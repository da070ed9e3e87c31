import { describe, expect, it } from "vitest";
import {
  CellDispenser,
  cellsByDescendingCost,
  estimateCellCosts,
  prepareEngineThreaded,
  inSharedMemory,
  simulationWorkerFile,
  threadedEngineBuilder,
} from "../../../lib/jobs/simulationThreads";
import { closeSimulationThreadPools, simulationThreadPool } from "../../../lib/jobs/simulationThreadPool";
import { buildGrid } from "../../../lib/radio/grid";
import { prepareEngine } from "../../../lib/radio/engine";
import { sameServerLists } from "../../../lib/radio/serverLists";
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
    // the workers' shares of the server lists add up to the lists of one thread, entry for entry
    expect(sameServerLists(threaded.state.lists, single.state.lists)).toBe(true);
    expect(threaded.baseline.kpis.network).toEqual(single.baseline.kpis.network);
    expect(bytes(threaded.baseline.kpis.perGrid.sinrDb).equals(bytes(single.baseline.kpis.perGrid.sinrDb))).toBe(true);
    const changes = [{ cellId: scenario.cells[2].id, parameter: "azimuthDeg" as const, value: 12.5 }];
    expect(threaded.evaluate(changes).kpis.clusters).toEqual(single.evaluate(changes).kpis.clusters);
    // the workers' copies of one mast's directions end as one array, equal to the single-thread one
    for (let site = 0; site < 3; site++) {
      const [a, b, c] = threaded.pathLoss.slice(3 * site, 3 * site + 3);
      expect(b.direction).toBe(a.direction);
      expect(c.direction).toBe(a.direction);
      expect(bytes(a.direction!).equals(bytes(single.pathLoss[3 * site].direction!))).toBe(true);
    }
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
  it("prepareEngineThreaded shares the cells between this thread and starting workers and still equals prepareEngine", async () => {
    // Fresh workers, so that this thread has start-up time to fill.
    await closeSimulationThreadPools();
    const scenario = generateBenchScenario({ seed: 22, sizeM: 500, sites: 3, gridSizeM: 10 });
    const threaded = await prepareEngineThreaded(scenario, { threads: 2, computeWhileStarting: true });
    const single = prepareEngine(scenario);
    threaded.pathLoss.forEach((pl, i) => expect(bytes(pl.pathLossDb).equals(bytes(single.pathLoss[i].pathLossDb))).toBe(true));
    // the workers' shares of the server lists add up to the lists of one thread, entry for entry
    expect(sameServerLists(threaded.state.lists, single.state.lists)).toBe(true);
    expect(threaded.baseline.kpis.network).toEqual(single.baseline.kpis.network);
  });
});

describe("the kept worker pool", () => {
  const scenario = generateBenchScenario({ seed: 23, sizeM: 400, sites: 2, gridSizeM: 10 });

  it("prepareEngineThreaded keeps its workers for the next run, and a second run on them still equals prepareEngine", async () => {
    await closeSimulationThreadPools();
    const { file } = await simulationWorkerFile();
    expect(file).toMatch(/var\/build\/simulationThreadWorker\.mjs$/);
    await prepareEngineThreaded(scenario, { threads: 2 });
    const pool = simulationThreadPool(file);
    expect(pool.size).toBe(2);
    const other = generateBenchScenario({ seed: 24, sizeM: 300, sites: 2, gridSizeM: 10 });
    const threaded = await prepareEngineThreaded(other, { threads: 2 });
    expect(simulationThreadPool(file)).toBe(pool);
    expect(pool.size).toBe(2);
    const single = prepareEngine(other);
    threaded.pathLoss.forEach((pl, i) => expect(bytes(pl.pathLossDb).equals(bytes(single.pathLoss[i].pathLossDb))).toBe(true));
    // the workers' shares of the server lists add up to the lists of one thread, entry for entry
    expect(sameServerLists(threaded.state.lists, single.state.lists)).toBe(true);
    expect(threaded.baseline.kpis.network).toEqual(single.baseline.kpis.network);
  });

  it("a failed run ends the workers it used, and the next run starts fresh ones", async () => {
    const { file } = await simulationWorkerFile();
    const pool = simulationThreadPool(file);
    expect(pool.size).toBe(2);
    // A run whose worker dies under it fails, and that worker leaves the pool.
    await expect(
      pool.exclusive(1, (workers) => new Promise((_, reject) => {
        workers[0].worker.once("exit", () => reject(new Error("worker gone")));
        void workers[0].worker.terminate();
      })),
    ).rejects.toThrow("worker gone");
    expect(pool.size).toBe(1);
    const engine = await prepareEngineThreaded(scenario, { threads: 2 });
    expect(engine.baseline.kpis.network).toEqual(prepareEngine(scenario).baseline.kpis.network);
    expect(pool.size).toBe(2);
    await closeSimulationThreadPools();
    expect(pool.size).toBe(0);
  });
});

describe("inSharedMemory and the cell order", () => {
  const scenario = generateBenchScenario({ seed: 25, sizeM: 400, sites: 3, gridSizeM: 10 });
  const grid = buildGrid(scenario);

  it("inSharedMemory(grid) copies every typed array onto a SharedArrayBuffer with the same bytes", () => {
    const shared = inSharedMemory(grid);
    for (const [name, value] of [...Object.entries(grid), ...Object.entries(grid.plane).map(([k, v]) => [`plane.${k}`, v] as const)]) {
      if (!ArrayBuffer.isView(value)) continue;
      const copy = (name.startsWith("plane.") ? (shared.plane as unknown as Record<string, ArrayBufferView>)[name.slice(6)] : (shared as unknown as Record<string, ArrayBufferView>)[name]);
      expect(copy.buffer, name).toBeInstanceOf(SharedArrayBuffer);
      expect(bytes(copy).equals(bytes(value)), name).toBe(true);
    }
    expect(shared.count).toBe(grid.count);
  });

  it("estimateCellCosts gives cells of one mast and height one cost, and a radius shrinks every cost", () => {
    const dense = estimateCellCosts(scenario, grid);
    expect(dense[0]).toBe(dense[1]);
    expect(dense[0]).toBeGreaterThan(0);
    const sparse = estimateCellCosts(scenario, grid, { radiusM: 100 });
    sparse.forEach((c, i) => expect(c).toBeLessThan(dense[i]));
  });

  it("cellsByDescendingCost orders by cost, most first, ties in cell order", () => {
    expect(cellsByDescendingCost(new Float64Array([1, 5, 5, 2]))).toEqual([1, 2, 3, 0]);
  });

  it("CellDispenser hands each cell out once, keeps a mast's cells with the taker that has its first, and lets a taker left without work take any", () => {
    // cells 0–2 on mast A, 3–5 on mast B, 6 alone on C
    const dispenser = new CellDispenser(["A", "A", "A", "B", "B", "B", "C"]);
    expect(dispenser.take(0)).toBe(0);
    expect(dispenser.take(1)).toBe(3); // 1 and 2 stay with taker 0
    dispenser.reorder([6, 5, 4, 3, 2, 1, 0]);
    expect(dispenser.take(0)).toBe(6); // C is nobody's yet: the first of the order
    expect(dispenser.take(0)).toBe(2); // B's cells are taker 1's: taker 0 looks ahead to its own mast
    expect(dispenser.take(1)).toBe(5);
    expect(dispenser.take(1)).toBe(4);
    expect(dispenser.take(1)).toBe(1); // nothing of B left: taker 1 takes what is left
    expect(dispenser.remaining).toBe(0);
    expect(dispenser.take(0)).toBe(-1);
    expect(() => dispenser.reorder([0])).toThrow(/order of 1 cells for 7/);
    // from the back (this thread while the workers start): the last cells of the order
    const back = new CellDispenser(["A", "A", "B"]);
    expect(back.take(0)).toBe(0);
    expect(back.take(1, true)).toBe(2);
    expect(back.take(1, true)).toBe(1);
  });
});
