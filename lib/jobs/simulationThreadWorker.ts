// Worker thread of simulationThreads.ts, kept between runs (simulationThreadPool.ts). Per run it receives the
// scenario and the grid once (the grid's arrays on SharedArrayBuffers, so no copy), then computes one cell's
// cold stage (path-loss cache + baseline RSRP) per request and hands the typed arrays back transferred. It also
// adds each cell's power to its own partial power sums (exact and order-free), handed back at the end of the run
// for the main thread to add up, so the main thread does not redo that work alone after the last cell; then it
// builds the server lists of its share of the tiles. Between runs it also takes incremental evaluations
// (sharedEngine.ts): it keeps the shared state of the last engines it was handed, computes its share of the tiles
// of each evaluation and gathers the percentiles' values from those grids. Usually started from its esbuild
// bundle (workerBundle.ts), so it imports nothing but lib/radio and node:.
import { parentPort } from "node:worker_threads";
import { computeCellStage } from "../radio/engine";
import { evaluateTiles, gatherEvaluationQuantiles, GainTables, shareBlocks, sitesOf, sourceOf, type BlockShare, type CellSource, type EngineState } from "../radio/evaluation";
import { fillServerLists, type ServerLists } from "../radio/serverLists";
import type { CellRsrp } from "../radio/cellRsrp";
import type { Site } from "../radio/scenario";
import type { EngineStateMessage, EvaluateMessage, EvaluateReply, GatherMessage } from "./sharedEngine";
import type { Grid } from "../radio/grid";
import type { PathLossOptions } from "../radio/pathLossStage";
import type { DirectionCache } from "../radio/direction";
import type { Scenario } from "../radio/scenario";
import { addCellPower, createPowerSums, type PowerSums } from "../radio/powerSums";

export interface WorkerRun {
  runId: number;
  scenario: Scenario;
  grid: Grid;
  options: PathLossOptions;
  /** Compute into shared memory (posted by reference) rather than transferring plain buffers. */
  shared?: boolean;
}

/** The server lists of a cold run's share of the tiles, built into shared lists (every cell's arrays are shared). */
export interface BuildListsRequest {
  buildLists: { runId: number; grid: Grid; cells: CellRsrp[]; lists: ServerLists; share: BlockShare };
}

/** finish: hand back the partial power sums and drop the run; release: drop the run (after a failure). */
export type WorkerRequest =
  | { run: WorkerRun }
  | BuildListsRequest
  | { runId: number; cellIndex: number }
  | { finish: number }
  | { release: number }
  | EngineStateMessage
  | EvaluateMessage
  | GatherMessage;

if (!parentPort) throw new Error("simulationThreadWorker.ts must run as a worker thread");
const port = parentPort;
/** Tiles per block when workers take turns building a cold run's server lists (a few, so each gets a fair part). */
const LIST_BLOCK_TILES = 4;
let run: WorkerRun | null = null;
let partial: PowerSums | null = null;
/** The run's direction arrays by antenna point (shared runs only: a transferred array leaves this thread). */
let directions: DirectionCache = new Map();

/** Engine states held for evaluations, newest last; a few only, since each keeps its shared memory alive. */
const ENGINES_KEPT = 2;
const engines = new Map<number, { state: EngineState; source: CellSource; tables: GainTables; sites: Site[] }>();

function evaluate(message: EvaluateMessage["evaluate"]): EvaluateReply {
  const held = engines.get(message.engineId);
  if (!held) return { evaluated: message.id, missing: true };
  const { state, source, tables, sites } = held;
  const cells = state.scenario.cells.slice();
  message.changed.forEach((i, k) => (cells[i] = message.cells[k]));
  const plan = { scenario: { ...state.scenario, cells }, changed: message.changed };
  return { evaluated: message.id, part: evaluateTiles(state, source, plan, message.out, tables, sites, 0, state.grid.tileCount, undefined, message.share) };
}

function gather(message: GatherMessage["gather"]): EvaluateReply {
  const held = engines.get(message.engineId);
  if (!held) return { evaluated: message.id, missing: true };
  gatherEvaluationQuantiles(held.state, message.out, message.rsrp, message.sinr, 0, held.state.grid.tileCount, undefined, message.share);
  return { evaluated: message.id };
}

port.on("message", (message: WorkerRequest) => {
  if ("engineState" in message) {
    const { id, state } = message.engineState;
    engines.delete(id);
    engines.set(id, { state, source: sourceOf(state), tables: new GainTables(state.scenario), sites: sitesOf(state.scenario) });
    while (engines.size > ENGINES_KEPT) engines.delete(engines.keys().next().value as number);
    return;
  }
  if ("evaluate" in message || "gather" in message) {
    let reply: EvaluateReply;
    try {
      reply = "evaluate" in message ? evaluate(message.evaluate) : gather(message.gather);
    } catch (error) {
      const id = "evaluate" in message ? message.evaluate.id : message.gather.id;
      reply = { evaluated: id, error: error instanceof Error ? `${error.name}: ${error.message}` : String(error) };
    }
    port.postMessage(reply);
    return;
  }
  if ("buildLists" in message) {
    const { runId, grid, cells, lists, share } = message.buildLists;
    try {
      for (const [from, to] of shareBlocks(0, grid.tileCount, LIST_BLOCK_TILES, share)) fillServerLists(lists, grid, cells, from, to);
      port.postMessage({ runId, listsBuilt: true });
    } catch (error) {
      port.postMessage({ runId, listsError: error instanceof Error ? `${error.name}: ${error.message}` : String(error) });
    }
    return;
  }
  if ("run" in message) {
    run = message.run;
    partial = null;
    directions = new Map();
    return;
  }
  if ("release" in message || "finish" in message) {
    const runId = "release" in message ? message.release : message.finish;
    if (run?.runId !== runId) return;
    if ("finish" in message) {
      const powerSums = partial;
      port.postMessage({ runId, powerSums }, powerSums ? [powerSums.hi.buffer as ArrayBuffer, powerSums.lo.buffer as ArrayBuffer] : []);
    }
    run = null;
    partial = null;
    directions = new Map();
    return;
  }
  const { runId, cellIndex } = message;
  try {
    if (!run || run.runId !== runId) throw new Error(`no scenario and grid received for run ${runId}`);
    const stage = run.shared
      ? computeCellStage(run.scenario, run.grid, cellIndex, run.options, (bytes) => new SharedArrayBuffer(bytes), directions)
      : computeCellStage(run.scenario, run.grid, cellIndex, run.options);
    partial ??= createPowerSums(run.grid.count);
    addCellPower(partial, stage.rsrp, 1);
    const buffers = new Set<ArrayBuffer>();
    for (const a of [stage.pathLoss.pathLossDb, stage.pathLoss.footprint, stage.pathLoss.direction, stage.rsrp.rsrpDbm, stage.rsrp.linkDb, stage.rsrp.rsrpMw, stage.rsrp.tileMaxDbm, stage.rsrp.segmentMaxDbm, stage.rsrp.segmentOffsets]) {
      if (a && !(a.buffer instanceof SharedArrayBuffer)) buffers.add(a.buffer as ArrayBuffer);
    }
    port.postMessage({ runId, cellIndex, stage }, [...buffers]);
  } catch (error) {
    port.postMessage({ runId, cellIndex, error: error instanceof Error ? `${error.name}: ${error.message}` : String(error) });
  }
});
port.postMessage({ ready: true });
