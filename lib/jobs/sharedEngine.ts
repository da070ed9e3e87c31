// Incremental evaluations on the kept worker threads. An engine built by prepareEngineThreaded keeps its whole state
// in shared memory (SharedArrayBuffers); each pool worker is handed that state once (by reference, no copy) and then
// takes its turn of the blocks of tiles of every evaluation (lib/radio/evaluation.ts evaluateTiles): the changed
// cells' gain pass, the power sums, the best-server update and the per-grid KPI pass for its grids. Then, once this
// thread has added the workers' histograms up and knows which bins hold the percentiles, each worker gathers the
// values of those bins from its own grids (gatherEvaluationQuantiles) into shared buffers. This thread plans the
// evaluation, allocates its outputs in shared memory and adds the tiles' accumulators up in tile order, so the
// result is the same bits as CoverageEngine.evaluate in one thread (tested).
import os from "node:os";
import type { CoverageEngine, CoverageRun } from "../radio/engine";
import { INCREMENTAL_MAX_CHANGED_CELLS } from "../radio/engine";
import { allocateEvaluation, finishEvaluation, planEvaluation, sourceOf, type BlockShare, type EngineState, type EvaluationOutputs, type QuantileGathering } from "../radio/evaluation";
import { kpiQuantilePlans, type KpiPercentiles, type KpiTiles } from "../radio/kpi";
import { allocateQuantileSlots, quantileSlotOffsets, quantilesOfPlan, type QuantilePlan } from "../radio/quantile";
import type { Cell, ParameterChange } from "../radio/scenario";
import { simulationThreadPool, type PooledWorker } from "./simulationThreadPool";
import { inSharedMemory, sharedMemory, simulationWorkerFile } from "./simulationThreads";

/** Messages of this module to and from simulationThreadWorker.ts. */
export interface EngineStateMessage {
  engineState: { id: number; state: EngineState };
}
export interface EvaluateMessage {
  evaluate: { id: number; engineId: number; changed: number[]; cells: Cell[]; out: EvaluationOutputs; share: BlockShare };
}
/** The second step of an evaluation: the percentiles' values of the worker's grids (same share as its evaluate). */
export interface GatherMessage {
  gather: { id: number; engineId: number; out: EvaluationOutputs; share: BlockShare; rsrp: QuantileGathering; sinr: QuantileGathering };
}
/** missing: the worker no longer holds the engine's state (it keeps a few only); it is handed again. */
export type EvaluateReply = StepDone | { evaluated: number; error: string } | { evaluated: number; missing: true };
/** A finished step: an evaluation's accumulators, or nothing for a gathering (it wrote into shared memory). */
export interface StepDone {
  evaluated: number;
  part?: KpiTiles;
}

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
  // the workers take turns block by block (evaluateTiles' share), so each gets a fair part of wherever the change reaches
  const shares: BlockShare[] = Array.from({ length: threads }, (_, index) => ({ index, count: threads }));
  const { file, rebuilt } = options.workerFile ? { file: options.workerFile, rebuilt: false } : await simulationWorkerFile();
  const cells = plan.changed.map((i) => plan.scenario.cells[i]);
  const { parts, percentiles } = await simulationThreadPool(file, rebuilt).exclusive(shares.length, async (pooled) => {
    const ask = (k: number, message: EvaluateMessage | GatherMessage) => askWorker(pooled[k], sharedEngine, message);
    const parts = await Promise.all(
      shares.map(async (share, k) => {
        const reply = await ask(k, { evaluate: { id: ++nextId, engineId: sharedEngine.id, changed: plan.changed, cells, out, share } });
        if (!reply.part) throw new Error(`evaluation share ${share.index + 1} of ${share.count}: no accumulators came back`);
        return reply.part;
      }),
    );
    // ---- the percentiles: the bins that hold them from the added-up histograms, their values gathered by each
    // worker from its own grids into disjoint places of shared buffers
    const plans = kpiQuantilePlans(parts, plan.scenario.clusters.length);
    const gathering = (quantilePlan: QuantilePlan, histograms: Int32Array[]) => {
      const buffers = allocateQuantileSlots(quantilePlan, sharedMemory);
      return { quantilePlan, buffers, fills: quantileSlotOffsets(quantilePlan, histograms) };
    };
    const rsrp = gathering(plans.rsrp, parts.map((p) => p.rsrpHistogram)), sinr = gathering(plans.sinr, parts.map((p) => p.sinrHistogram));
    await Promise.all(
      shares.map((share, k) =>
        ask(k, {
          gather: {
            id: ++nextId,
            engineId: sharedEngine.id,
            out,
            share,
            rsrp: { plan: rsrp.quantilePlan, buffers: rsrp.buffers, fill: rsrp.fills[k] },
            sinr: { plan: sinr.quantilePlan, buffers: sinr.buffers, fill: sinr.fills[k] },
          },
        }),
      ),
    );
    const percentiles: KpiPercentiles = { rsrp: quantilesOfPlan(rsrp.quantilePlan, rsrp.buffers), sinr: quantilesOfPlan(sinr.quantilePlan, sinr.buffers) };
    return { parts, percentiles };
  });
  return engine.runOf(plan, out, finishEvaluation(state, plan, out, parts, percentiles));
}

/**
 * Sends one evaluation step to a pool worker and waits for its reply; hands the engine's state over first when the
 * worker does not hold it (or says it no longer does).
 */
function askWorker(holder: PooledWorker, sharedEngine: SharedEngine, message: EvaluateMessage | GatherMessage): Promise<StepDone> {
  const worker = holder.worker;
  const id = "evaluate" in message ? message.evaluate.id : message.gather.id;
  const what = "evaluate" in message ? "evaluation" : "percentile gathering";
  const handOver = () => worker.postMessage({ engineState: { id: sharedEngine.id, state: sharedEngine.state } } satisfies EngineStateMessage);
  return new Promise((resolve, reject) => {
    let handedAgain = false;
    const off = () => {
      worker.off("message", onMessage);
      worker.off("error", onError);
      worker.off("exit", onExit);
    };
    const onMessage = (reply: EvaluateReply) => {
      if (!reply || reply.evaluated !== id) return;
      if ("missing" in reply && !handedAgain) {
        handedAgain = true;
        handOver();
        worker.postMessage(message);
        return;
      }
      off();
      if ("error" in reply) reject(new Error(`${what}: ${reply.error}`));
      else if ("missing" in reply) reject(new Error(`${what}: the worker lost the engine's state`));
      else resolve(reply as StepDone);
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
    worker.postMessage(message);
  });
}
