// Threaded cold prepare: the grid is built here, then every cell's cold stage (path-loss cache and baseline
// RSRP, lib/radio computeCellStage) runs on a pool of worker threads; the typed arrays come back
// transferred and are assembled into a ready CoverageEngine. Results are bit-identical to prepareEngine:
// each cell is computed by the same pure function, only elsewhere.
import { Worker } from "node:worker_threads";
import os from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { assembleEngine, computeCellStage, type CellStage, type CoverageEngine } from "../radio/engine";
import { buildGrid } from "../radio/grid";
import type { PathLossOptions } from "../radio/pathLossStage";
import type { Scenario } from "../radio/scenario";
import { validateScenario } from "../radio/validation";

export interface SimulationThreadsOptions {
  /** Worker threads (default os.availableParallelism()); 0 computes in this thread. */
  threads?: number;
  /** Called with the fraction of cells done, 0..1. */
  onProgress?: (fraction: number) => void;
  /**
   * The worker module. Default: <process.cwd()>/lib/jobs/simulationThreadWorker.ts, because under Next.js
   * import.meta.url may point into the build output rather than the source tree.
   */
  workerFile?: string;
  /** Passed to the path-loss stage (e.g. a computation radius). */
  pathLoss?: PathLossOptions;
  /**
   * Compute cells in this thread while no worker has started yet (default true): worker start-up (loading tsx
   * and lib/radio) takes most of a second that this thread would otherwise spend waiting. Blocks the event
   * loop for one cell at a time, as the in-process builder does.
   */
  computeWhileStarting?: boolean;
}

type WorkerReply = { ready: true } | { cellIndex: number; stage: CellStage } | { cellIndex: number; error: string };

export function defaultWorkerFile(): string {
  return path.join(process.cwd(), "lib/jobs/simulationThreadWorker.ts");
}

/**
 * Starts a worker on `file`. A .ts file is loaded through tsx: `execArgv: ["--import", "tsx"]` does not
 * install tsx's hooks inside a worker on Node 20 ("Unknown file extension .ts"), so a two-line bootstrap
 * registers tsx's ESM API in the worker and then imports the file. Compiled .js/.mjs files start directly.
 */
export function startWorker(file: string, workerData: unknown): Worker {
  if (!file.endsWith(".ts")) return new Worker(file, { workerData });
  const url = JSON.stringify(pathToFileURL(file).href);
  const bootstrap = `import("tsx/esm/api").then((api) => { api.register(); return import(${url}); });`;
  return new Worker(bootstrap, { eval: true, workerData });
}

/** Validates, builds the grid, spreads the per-cell cold stage over worker threads and returns the engine. */
export async function prepareEngineThreaded(scenario: Scenario, options: SimulationThreadsOptions = {}): Promise<CoverageEngine> {
  validateScenario(scenario);
  const grid = buildGrid(scenario);
  const cellCount = scenario.cells.length;
  const threads = Math.max(0, Math.min(options.threads ?? os.availableParallelism(), cellCount));
  const onProgress = options.onProgress ?? (() => {});
  const stages: CellStage[] = new Array(cellCount);
  let done = 0;

  if (threads === 0) {
    for (let i = 0; i < cellCount; i++) {
      stages[i] = computeCellStage(scenario, grid, i, options.pathLoss);
      onProgress(++done / cellCount);
    }
  } else {
    const file = options.workerFile ?? defaultWorkerFile();
    const workers: Worker[] = [];
    try {
      await new Promise<void>((resolve, reject) => {
        let next = 0;
        let failed = false;
        let ready = 0;
        const fail = (error: Error) => {
          if (failed) return;
          failed = true;
          reject(error);
        };
        const finishOne = (cellIndex: number, stage: CellStage) => {
          stages[cellIndex] = stage;
          onProgress(++done / cellCount);
          if (done === cellCount) resolve();
        };
        const feed = (worker: Worker) => {
          if (next < cellCount) worker.postMessage({ cellIndex: next++ });
          else worker.postMessage({ stop: true });
        };
        for (let t = 0; t < threads; t++) {
          const worker = startWorker(file, { scenario, grid, options: options.pathLoss ?? {} });
          workers.push(worker);
          worker.on("message", (reply: WorkerReply) => {
            if (failed) return;
            if ("ready" in reply) {
              ready++;
              return feed(worker);
            }
            if ("error" in reply) return fail(new Error(`cell "${scenario.cells[reply.cellIndex].id}": ${reply.error}`));
            finishOne(reply.cellIndex, reply.stage);
            if (done < cellCount) feed(worker);
          });
          worker.on("error", (error) => fail(error));
          worker.on("exit", (code) => {
            if (code !== 0 && done < cellCount) fail(new Error(`simulation worker exited with code ${code} (${file})`));
          });
        }
        // ---- while the workers load, this thread takes cells one at a time
        if (options.computeWhileStarting ?? true) {
          const step = () => {
            if (failed || ready > 0 || next >= cellCount) return;
            const i = next++;
            try {
              finishOne(i, computeCellStage(scenario, grid, i, options.pathLoss));
            } catch (error) {
              return fail(error instanceof Error ? error : new Error(String(error)));
            }
            setImmediate(step);
          };
          setImmediate(step);
        }
      });
    } finally {
      await Promise.all(workers.map((w) => w.terminate()));
    }
  }
  return assembleEngine(
    scenario,
    grid,
    stages.map((s) => s.pathLoss),
    stages.map((s) => s.rsrp),
  );
}

/** The same, shaped as lib/jobs/engineCache.ts's EngineBuilder: (scenario, onProgress) → engine. */
export function threadedEngineBuilder(options: Omit<SimulationThreadsOptions, "onProgress"> = {}) {
  return (scenario: Scenario, onProgress: (fraction: number) => void): Promise<CoverageEngine> =>
    prepareEngineThreaded(scenario, { ...options, onProgress });
}
