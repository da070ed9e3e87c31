// Incremental evaluations on the kept worker threads. An engine built by prepareEngineThreaded keeps its whole state
// in shared memory (SharedArrayBuffers); each pool worker is handed that state once (by reference, no copy) and then
// takes one range of tiles of every evaluation (lib/radio/evaluation.ts evaluateTiles): the changed cells' gain pass,
// the power sums, the best-server update and the per-grid KPI pass for its grids. This thread plans the evaluation,
// allocates its outputs in shared memory and adds the tiles' accumulators up in tile order, so the result is the
// same bits as CoverageEngine.evaluate in one thread (tested).
import os from "node:os";
import type { CoverageEngine, CoverageRun } from "../radio/engine";
import { INCREMENTAL_MAX_CHANGED_CELLS } from "../radio/engine";
import { allocateEvaluation, finishEvaluation, planEvaluation, sourceOf, type EngineState, type EvaluationOutputs } from "../radio/evaluation";
import type { Grid } from "../radio/grid";
import type { KpiTiles } from "../radio/kpi";
import type { Cell, ParameterChange } from "../radio/scenario";
import { simulationThreadPool, type PooledWorker } from "./simulationThreadPool";
import { inSharedMemory, sharedMemory, simulationWorkerFile } from "./simulationThreads";

/** Messages of this module to and from simulationThreadWorker.ts. */
export interface EngineStateMessage {
  engineState: { id: number; state: EngineState };
}
export interface EvaluateMessage {
  evaluate: { id: number; engineId: number; changed: number[]; cells: Cell[]; out: EvaluationOutputs; tileFrom: number; tileTo: number };
}
/** missing: the worker no longer holds the engine's state (it keeps a few only); it is handed again. */
export type EvaluateReply = { evaluated: number; part: KpiTiles } | { evaluated: number; error: string } | { evaluated: number; missing: true };

interface SharedEngine {
  id: number;
  state: EngineState;
  /** Pool workers that hold the state. */
  holders: WeakSet<PooledWorker>;
  /** Outputs of finished leased evaluations, taken again by the next (allocateEvaluation). */
  spare: EvaluationOutputs[];
}

const engines = new WeakMap<CoverageEngine, SharedEngine>();
let nextId = 0;

/**
 * The engine's state in shared memory. Built by prepareEngineThreaded it already is (nothing is copied); an engine
 * built in one thread is copied once (its per-cell arrays double in memory).
 */
function sharedEngineOf(engine: CoverageEngine): SharedEngine {
  let entry = engines.get(engine);
  if (!entry) {
    entry = { id: ++nextId, state: inSharedMemory(engine.state), holders: new WeakSet(), spare: [] };
    engines.set(engine, entry);
  }
  return entry;
}

/** Tile ranges of about equal grid counts, one per thread, in tile order. */
export function tileRanges(grid: Grid, parts: number): [number, number][] {
  const ranges: [number, number][] = [];
  let from = 0;
  for (let k = 1; k <= parts && from < grid.tileCount; k++) {
    const target = (grid.count * k) / parts;
    let to = from + 1;
    while (to < grid.tileCount && (k === parts || grid.tileStart[to] < target)) to++;
    ranges.push([from, to]);
    from = to;
  }
  return ranges;
}

export interface SharedEvaluateOptions {
  /** Worker threads (default os.availableParallelism()); below 2 the engine evaluates in this thread. */
  threads?: number;
  /** The worker module (default: the bundled simulationThreadWorker). */
  workerFile?: string;
}

/**
 * engine.evaluate(changes) with the tiles spread over the kept worker threads; the same result, bit for bit. Falls
 * back to this thread when there is nothing to spread (no changed cell, or many: the engine then rebuilds).
 */
export function evaluateOnThreads(engine: CoverageEngine, changes: readonly ParameterChange[], options: SharedEvaluateOptions = {}): Promise<CoverageRun> {
  return evaluate(engine, changes, options, undefined, () => {});
}

/**
 * use(evaluateOnThreads(...)), with the run's arrays taken from (and given back to) a small pool of the engine:
 * they are valid inside `use` only, so copy what you keep (engine.withEvaluation is the one-thread twin).
 */
export async function withEvaluationOnThreads<T>(engine: CoverageEngine, changes: readonly ParameterChange[], use: (run: CoverageRun) => T | Promise<T>, options: SharedEvaluateOptions = {}): Promise<T> {
  const threads = Math.min(options.threads ?? os.availableParallelism(), engine.grid.tileCount);
  if (threads < 2) return engine.withEvaluation(changes, use) as T | Promise<T>;
  const sharedEngine = sharedEngineOf(engine);
  const spare = sharedEngine.spare.pop();
  let outputs: EvaluationOutputs | undefined;
  try {
    return await use(await evaluate(engine, changes, options, spare, (o) => (outputs = o)));
  } finally {
    const back = outputs ?? spare;
    if (back && sharedEngine.spare.length < 2) sharedEngine.spare.push(back);
  }
}

async function evaluate(
  engine: CoverageEngine,
  changes: readonly ParameterChange[],
  options: SharedEvaluateOptions,
  spare: EvaluationOutputs | undefined,
  taken: (outputs: EvaluationOutputs) => void,
): Promise<CoverageRun> {
  const threads = Math.min(options.threads ?? os.availableParallelism(), engine.grid.tileCount);
  const plan = planEvaluation(engine.state, changes);
  if (threads < 2 || plan.changed.length === 0 || plan.changed.length > INCREMENTAL_MAX_CHANGED_CELLS) return engine.evaluate(changes);
  const sharedEngine = sharedEngineOf(engine);
  const state = sharedEngine.state;
  const out = allocateEvaluation(state, sourceOf(state), plan, sharedMemory, spare);
  taken(out);
  const ranges = tileRanges(engine.grid, threads);
  const { file, rebuilt } = options.workerFile ? { file: options.workerFile, rebuilt: false } : await simulationWorkerFile();
  const id = ++nextId;
  const parts = await simulationThreadPool(file, rebuilt).exclusive(ranges.length, (pooled) =>
    Promise.all(
      ranges.map(
        ([tileFrom, tileTo], k) =>
          new Promise<KpiTiles>((resolve, reject) => {
            const holder = pooled[k];
            const worker = holder.worker;
            const off = () => {
              worker.off("message", onMessage);
              worker.off("error", onError);
              worker.off("exit", onExit);
            };
            const cells = plan.changed.map((i) => plan.scenario.cells[i]);
            const send = () => worker.postMessage({ evaluate: { id, engineId: sharedEngine.id, changed: plan.changed, cells, out, tileFrom, tileTo } } satisfies EvaluateMessage);
            const handOver = () => worker.postMessage({ engineState: { id: sharedEngine.id, state } } satisfies EngineStateMessage);
            let handedAgain = false;
            const onMessage = (reply: EvaluateReply) => {
              if (!reply || reply.evaluated !== id) return;
              if ("missing" in reply && !handedAgain) {
                handedAgain = true;
                handOver();
                send();
                return;
              }
              off();
              if ("part" in reply) resolve(reply.part);
              else reject(new Error(`evaluation of tiles ${tileFrom}…${tileTo - 1}: ${"error" in reply ? reply.error : "the worker lost the engine's state"}`));
            };
            const onError = (error: Error) => {
              off();
              reject(error);
            };
            const onExit = (code: number) => {
              off();
              reject(new Error(`simulation worker exited with code ${code} during an evaluation`));
            };
            worker.on("message", onMessage);
            worker.on("error", onError);
            worker.on("exit", onExit);
            if (!sharedEngine.holders.has(holder)) {
              handOver();
              sharedEngine.holders.add(holder);
            }
            send();
          }),
      ),
    ),
  );
  return engine.runOf(plan, out, finishEvaluation(state, plan, out, parts));
}
