// Threaded cold prepare: every cell's cold stage (path-loss cache and baseline RSRP, lib/radio computeCellStage)
// runs on a pool of worker threads; the typed arrays come back transferred and are assembled into a ready
// CoverageEngine. Results are bit-identical to prepareEngine: each cell is computed by the same pure function,
// only elsewhere, and assembled in cell order.
//
// Where the time goes, and what this file does about it:
// - Worker start-up: workers run the esbuild bundle of the worker (workerBundle.ts, ~0.2 s to start) rather
//   than the TypeScript source through tsx (~0.8 s each), and are kept between runs (simulationThreadPool.ts),
//   which also keeps their compiled code: a fresh worker runs its first cells 2–3× slower. A fresh pool's
//   workers start before the grid is built, so their start-up overlaps that build.
// - Copies: the grid's arrays go to the workers on SharedArrayBuffers (one copy in all), the results come back
//   transferred (no copy).
// - The tail: cells cost up to 2–3× one another (the line-of-sight march is longer from open, high sites), so
//   they are handed out most expensive first by a sampled estimate; the last cells handed out are small.
// - Idle workers: each holds two cells at a time, so it starts the next as soon as it hands one back.
// - Shared directions: the cells of one mast and antenna height go to one worker where the order allows
//   (CellDispenser), which computes their direction array once (lib/radio/direction.ts).
// - After the last cell: the workers build the server lists, each every other block of tiles, into shared
//   memory; this thread only adds the workers' partial power sums and assembles the engine.
import os from "node:os";
import path from "node:path";
import { assembleEngine, computeCellStage, type CellAggregates, type CellStage, type CoverageEngine } from "../radio/engine";
import { sitesOf } from "../radio/evaluation";
import { addCellPower, addPowerSums, createPowerSums, type PowerSums } from "../radio/powerSums";
import { createServerLists, type ServerLists } from "../radio/serverLists";
import type { BuildListsRequest } from "./simulationThreadWorker";
import { buildGrid, type Grid } from "../radio/grid";
import { planePositionAt } from "../radio/horizontalPlane";
import { createHorizonResult, traceHorizon } from "../radio/lineOfSight";
import type { CellPathLoss, PathLossOptions } from "../radio/pathLossStage";
import { antennaPointOf } from "../radio/cellRsrp";
import { antennaPointKey, type DirectionCache } from "../radio/direction";
import type { Scenario } from "../radio/scenario";
import { validateScenario } from "../radio/validation";
import { ensureWorkerBundle } from "./workerBundle";
import { simulationThreadPool } from "./simulationThreadPool";

export interface SimulationThreadsOptions {
  /** Worker threads (default os.availableParallelism()); 0 computes in this thread. */
  threads?: number;
  /** Called with the fraction of cells done, 0..1. */
  onProgress?: (fraction: number) => void;
  /**
   * The worker module. Default: the esbuild bundle of lib/jobs/simulationThreadWorker.ts under
   * <process.cwd()>/var/build (built when stale), else the .ts source through tsx when bundling fails.
   * process.cwd(), because under Next.js import.meta.url may point into the build output.
   */
  workerFile?: string;
  /** Passed to the path-loss stage (e.g. a computation radius). */
  pathLoss?: PathLossOptions;
  /**
   * Compute cells in this thread after the grid is built while no worker is ready yet (default false). With
   * the bundled worker there is little such time, and this thread would compete with the workers for the
   * cores and block the event loop one cell at a time.
   */
  computeWhileStarting?: boolean;
}

type WorkerReply =
  | { ready: true }
  | { runId: number; cellIndex: number; stage: CellStage }
  | { runId: number; cellIndex: number; error: string }
  | { runId: number; powerSums: PowerSums | null }
  | { runId: number; listsBuilt: true }
  | { runId: number; listsError: string };

/** The worker's TypeScript source (run through tsx when no bundle can be made). */
export function defaultWorkerFile(): string {
  return path.join(process.cwd(), "lib/jobs/simulationThreadWorker.ts");
}

let bundleWarning = false;
let lastWorkerFile: { file: string; checkedAt: number } | null = null;
const WORKER_FILE_RECHECK_MS = 5_000;

/**
 * The worker module to start: the fresh bundle, or the source when bundling fails (said once on stderr).
 * `rebuilt`: the bundle was just made, so workers kept from before run older code.
 */
export async function simulationWorkerFile(): Promise<{ file: string; rebuilt: boolean }> {
  // The freshness check stats every input of the bundle (1–10 ms): an incremental evaluation, a few tens of ms,
  // should not pay it each time. A source edited meanwhile is picked up at the first check after the interval.
  if (lastWorkerFile && Date.now() - lastWorkerFile.checkedAt < WORKER_FILE_RECHECK_MS) return { file: lastWorkerFile.file, rebuilt: false };
  try {
    const found = await ensureWorkerBundle();
    lastWorkerFile = { file: found.file, checkedAt: Date.now() };
    return found;
  } catch (error) {
    if (!bundleWarning) {
      bundleWarning = true;
      console.warn(`${error instanceof Error ? error.message : String(error)}; simulation workers load the TypeScript source through tsx instead`);
    }
    return { file: defaultWorkerFile(), rebuilt: false };
  }
}

/** Memory every thread of the process can read (SharedArrayBuffer). */
export const sharedMemory = (bytes: number): ArrayBufferLike => new SharedArrayBuffer(bytes);

type TypedArray = Float64Array | Float32Array | Int32Array | Uint16Array | Uint8Array;

/** A copy of `a` in shared memory, or `a` itself when it is already there. */
function sharedCopy<T extends TypedArray>(a: T): T {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const copy = new (a.constructor as new (buffer: ArrayBufferLike) => T)(new SharedArrayBuffer(a.byteLength));
  copy.set(a as never);
  return copy;
}

/**
 * The same plain data (e.g. a grid, an engine's state) with every typed array, at any depth of plain objects and
 * arrays, in shared memory: posting it to a worker then copies no array.
 */
export function inSharedMemory<T>(value: T): T {
  if (ArrayBuffer.isView(value)) return sharedCopy(value as unknown as TypedArray) as unknown as T;
  if (Array.isArray(value)) return value.map(inSharedMemory) as unknown as T;
  if (value && typeof value === "object") return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, inSharedMemory(v)])) as T;
  return value;
}

/** Per-grid work of the cold stage (path-loss formulas, gain pass) in units of one step of the line-of-sight march. */
const GRID_COST_IN_STEPS = 16;
/** Positions traced per cell by the estimate (a lattice of about this many). */
const ESTIMATE_SAMPLES = 1024;

/**
 * Relative cold-stage cost of each cell: a lattice of positions traced exactly as computeCellPathLoss traces
 * them (same early stop), counting march steps plus a fixed cost per grid. Cells of one site with one antenna
 * height trace alike, so the trace is shared. Only an ordering hint: it changes no result.
 */
export function estimateCellCosts(scenario: Scenario, grid: Grid, options: PathLossOptions = {}): Float64Array {
  const plane = grid.plane;
  const positions = plane.width * plane.height;
  const stride = Math.max(1, Math.floor(Math.sqrt(positions / ESTIMATE_SAMPLES)));
  const radius = options.radiusM ?? Infinity;
  const horizon = createHorizonResult();
  const bySiteHeight = new Map<string, number>();
  const costs = new Float64Array(scenario.cells.length);
  scenario.cells.forEach((cell, i) => {
    const key = `${cell.siteId}\u0000${cell.antennaHeightM}`;
    let cost = bySiteHeight.get(key);
    if (cost === undefined) {
      cost = 0;
      const site = scenario.sites.find((s) => s.id === cell.siteId)!;
      const az = site.groundHeightM + cell.antennaHeightM;
      const siteB = plane.buildingIndex[planePositionAt(plane, site.x, site.y)];
      for (let row = stride >> 1; row < plane.height; row += stride) {
        for (let col = stride >> 1; col < plane.width; col += stride) {
          const p = row * plane.width + col;
          const g0 = grid.positionStart[p], layers = grid.positionLayers[p];
          const px = grid.x[g0], py = grid.y[g0];
          const D = Math.hypot(site.x - px, site.y - py);
          if (D > radius) continue;
          const own = plane.buildingIndex[p];
          const stopAbove = scenario.settings.diffraction || D <= 0 ? Infinity : (grid.z[g0 + layers - 1] - az) / D;
          traceHorizon(plane, px, py, site.x, site.y, az, own >= 0 ? own : -2, siteB >= 0 ? siteB : -2, stopAbove, horizon);
          // An early stop ends the march at the blocking sample, horizon[1] metres from the antenna.
          const marched = horizon[0] > stopAbove ? D - horizon[1] : D;
          cost += marched / plane.cellSize + GRID_COST_IN_STEPS * layers;
        }
      }
      bySiteHeight.set(key, cost);
    }
    costs[i] = cost;
  });
  return costs;
}

/** Cells handed to a worker before it has returned any. */
const CELLS_IN_FLIGHT = 2;

/** Cells looked at past the first one left when a taker looks for a cell of an antenna point it already holds. */
const AFFINITY_LOOKAHEAD = 8;

/**
 * Hands out cells in an order (cell order until reorder), each once. A taker gets the first cell left whose antenna
 * point no other taker holds, looking a few cells ahead (co-sited cells cost alike, so the cost order keeps them
 * together); failing that, the first cell left. So the cells of one mast and height mostly go to one worker, which
 * computes their directions (direction.ts) once, rather than to every worker in turn.
 */
export class CellDispenser {
  private order: number[];
  private readonly handed: Uint8Array;
  private readonly owner = new Map<string, number>();
  private left: number;

  constructor(private readonly points: readonly string[]) {
    this.order = points.map((_, i) => i);
    this.handed = new Uint8Array(points.length);
    this.left = points.length;
  }

  get remaining(): number {
    return this.left;
  }

  /** The cells not handed out yet are offered in `order` from now on (it must list every cell once). */
  reorder(order: readonly number[]): void {
    if (order.length !== this.points.length) throw new RangeError(`CellDispenser: an order of ${order.length} cells for ${this.points.length}`);
    this.order = order.filter((i) => !this.handed[i]);
  }

  /** The next cell for `taker` (from the back of the order when `fromBack`), −1 when none is left. */
  take(taker: number, fromBack = false): number {
    const order = this.order;
    while (order.length > 0 && this.handed[fromBack ? order[order.length - 1] : order[0]]) (fromBack ? order.pop() : order.shift());
    if (order.length === 0) return -1;
    let pick = fromBack ? order.length - 1 : 0;
    for (let seen = 0, k = pick; seen <= AFFINITY_LOOKAHEAD && k >= 0 && k < order.length; k += fromBack ? -1 : 1) {
      if (this.handed[order[k]]) continue;
      seen++;
      const holder = this.owner.get(this.points[order[k]]);
      if (holder === undefined || holder === taker) {
        pick = k;
        break;
      }
    }
    const cell = order[pick];
    this.handed[cell] = 1;
    this.left--;
    if (!this.owner.has(this.points[cell])) this.owner.set(this.points[cell], taker);
    return cell;
  }
}

/** The antenna point (direction.ts antennaPointKey) of each cell, in cell order. */
export function antennaPointKeys(scenario: Scenario): string[] {
  return sitesOf(scenario).map((site, i) => antennaPointKey(antennaPointOf(scenario.cells[i], site)));
}

/** Cell indices, most expensive first (ties in cell order). */
export function cellsByDescendingCost(costs: Float64Array): number[] {
  return Array.from(costs.keys()).sort((a, b) => costs[b] - costs[a] || a - b);
}

let runs = 0;

/** Validates, builds the grid, spreads the per-cell cold stage over worker threads and returns the engine. */
export async function prepareEngineThreaded(scenario: Scenario, options: SimulationThreadsOptions = {}): Promise<CoverageEngine> {
  validateScenario(scenario);
  const cellCount = scenario.cells.length;
  const threads = Math.max(0, Math.min(options.threads ?? os.availableParallelism(), cellCount));
  const onProgress = options.onProgress ?? (() => {});
  const stages: CellStage[] = new Array(cellCount);
  let done = 0;

  if (threads === 0) {
    const grid = buildGrid(scenario);
    const directions: DirectionCache = new Map();
    for (let i = 0; i < cellCount; i++) {
      stages[i] = computeCellStage(scenario, grid, i, options.pathLoss, undefined, directions);
      onProgress(++done / cellCount);
    }
    return assembleEngine(
      scenario,
      grid,
      stages.map((s) => s.pathLoss),
      { baselineCells: stages.map((s) => s.rsrp) },
    );
  }

  const { file, rebuilt } = options.workerFile ? { file: options.workerFile, rebuilt: false } : await simulationWorkerFile();
  const runId = ++runs;
  let grid: Grid | undefined;
  // Partial power sums: one from each worker at the end, and this thread's for the cells it computes itself.
  const partials: (PowerSums | null)[] = [];
  let own = null as PowerSums | null;
  let lists: ServerLists | undefined;
  const ownDirections: DirectionCache = new Map();
  await simulationThreadPool(file, rebuilt).exclusive(threads, (pooled) =>
    new Promise<void>((resolve, reject) => {
      const workers = pooled.map((p) => p.worker);
      let failed = false;
      // Workers take cells from the front of the order; this thread (computeWhileStarting) from the back.
      const dispenser = new CellDispenser(antennaPointKeys(scenario));
      let ready = pooled.filter((p) => p.ready).length;
      const listeners: (() => void)[] = [];
      let awaitingAggregates = 0;
      const finish = (error?: Error) => {
        if (failed) return;
        failed = true;
        for (const off of listeners) off();
        if (error) {
          for (const worker of workers) worker.postMessage({ release: runId });
          return reject(error);
        }
        resolve();
      };
      const finishOne = (cellIndex: number, stage: CellStage) => {
        stages[cellIndex] = stage;
        onProgress(++done / cellCount);
        if (done === cellCount) {
          // every cell is in: collect each worker's partial aggregates
          awaitingAggregates = workers.length;
          for (const worker of workers) worker.postMessage({ finish: runId });
        }
      };
      // ---- every cell is in: the workers build the server lists, taking turns block by block of tiles
      let awaitingLists = 0;
      const buildLists = () => {
        try {
          lists = createServerLists(grid!.count, scenario.settings, sharedMemory);
          const cells = stages.map((s) => s.rsrp);
          awaitingLists = workers.length;
          workers.forEach((worker, index) => worker.postMessage({ buildLists: { runId, grid: grid!, cells, lists: lists!, share: { index, count: workers.length } } } satisfies BuildListsRequest));
        } catch (error) {
          finish(error instanceof Error ? error : new Error(String(error)));
        }
      };
      const feed = (worker: (typeof workers)[number]) => {
        const cellIndex = dispenser.take(workers.indexOf(worker));
        if (cellIndex >= 0) worker.postMessage({ runId, cellIndex });
      };

      for (const worker of workers) {
        const onMessage = (reply: WorkerReply) => {
          if (failed) return;
          if ("ready" in reply) {
            ready++;
            return;
          }
          if (reply.runId !== runId) return;
          if ("powerSums" in reply) {
            partials.push(reply.powerSums);
            if (--awaitingAggregates === 0) buildLists();
            return;
          }
          if ("listsError" in reply) return finish(new Error(`server lists: ${reply.listsError}`));
          if ("listsBuilt" in reply) {
            if (--awaitingLists === 0) finish();
            return;
          }
          if ("error" in reply) return finish(new Error(`cell "${scenario.cells[reply.cellIndex].id}": ${reply.error}`));
          finishOne(reply.cellIndex, reply.stage);
          if (done < cellCount) feed(worker);
        };
        const onError = (error: Error) => finish(error);
        const onExit = (code: number) => finish(new Error(`simulation worker exited with code ${code} (${file})`));
        worker.on("message", onMessage);
        worker.on("error", onError);
        worker.on("exit", onExit);
        listeners.push(() => {
          worker.off("message", onMessage);
          worker.off("error", onError);
          worker.off("exit", onExit);
        });
      }

      // ---- the grid (built once, shared with every worker) and the order of the cells
      try {
        // The grid, and everything the workers compute, live in shared memory: the engine's state can then be read
        // by the same workers for its incremental evaluations (sharedEngine.ts), without a copy.
        grid = inSharedMemory(buildGrid(scenario));
        const run = { runId, scenario, grid, options: options.pathLoss ?? {}, shared: true };
        // Each worker gets the run and its first cells now (a worker still starting finds them queued, in
        // order); the cost estimate then runs here while they compute, and orders the cells still to hand out.
        // A worker holds CELLS_IN_FLIGHT cells at a time, so that it starts the next one at once when it hands a
        // result back, rather than wait for this thread to answer (measured ~5 % of a worker's time idle with one).
        for (const worker of workers) {
          worker.postMessage({ run });
          for (let k = 0; k < CELLS_IN_FLIGHT; k++) feed(worker);
        }
        dispenser.reorder(cellsByDescendingCost(estimateCellCosts(scenario, grid, options.pathLoss)));
      } catch (error) {
        return finish(error instanceof Error ? error : new Error(String(error)));
      }

      // ---- while no worker is ready, this thread takes the small cells one at a time
      if (options.computeWhileStarting ?? false) {
        const step = () => {
          if (failed || ready > 0 || dispenser.remaining === 0) return;
          const i = dispenser.take(workers.length, true);
          try {
            const stage = computeCellStage(scenario, grid!, i, options.pathLoss, sharedMemory, ownDirections);
            own ??= createPowerSums(grid!.count);
            addCellPower(own, stage.rsrp, 1);
            finishOne(i, stage);
          } catch (error) {
            return finish(error instanceof Error ? error : new Error(String(error)));
          }
          setImmediate(step);
        };
        setImmediate(step);
      }
    }),
  );
  partials.push(own);
  const cells = stages.map((s) => s.rsrp);
  const powerSums = createPowerSums(grid!.count, sharedMemory);
  for (const part of partials) if (part) addPowerSums(powerSums, part);
  // The server lists were built by the workers, tile by tile with the strongest cells first (far cheaper than cell
  // by cell), each its share of the tiles.
  const aggregates: CellAggregates = { powerSums, serverLists: lists! };
  return assembleEngine(scenario, grid!, withOneDirectionEach(scenario, stages.map((s) => s.pathLoss)), { baselineCells: cells, aggregates, allocate: sharedMemory });
}

/**
 * Path-loss caches whose direction arrays are one per antenna point: each worker kept its own for the cells it
 * computed, the same values, so the copies beyond the first are let go.
 */
function withOneDirectionEach(scenario: Scenario, caches: CellPathLoss[]): CellPathLoss[] {
  const points = antennaPointKeys(scenario);
  const first = new Map<string, Float32Array>();
  return caches.map((cache, i) => {
    if (!cache.direction) return cache;
    const key = `${cache.direction.length}:${points[i]}`;
    const kept = first.get(key);
    if (!kept) first.set(key, cache.direction);
    return kept && kept !== cache.direction ? { cellId: cache.cellId, footprint: cache.footprint, pathLossDb: cache.pathLossDb, direction: kept } : cache;
  });
}

/** The same, shaped as lib/jobs/engineCache.ts's EngineBuilder: (scenario, onProgress) → engine. */
export function threadedEngineBuilder(options: Omit<SimulationThreadsOptions, "onProgress"> = {}) {
  return (scenario: Scenario, onProgress: (fraction: number) => void): Promise<CoverageEngine> =>
    prepareEngineThreaded(scenario, { ...options, onProgress });
}
