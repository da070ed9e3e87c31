// One simulation job: the scenario as of the request's base version, the engine for it,
// the changes as they stood when the job was queued, the impact against the baseline, and
// the result stored. Never throws: any failure is recorded on the Simulation row.
import type { Prisma } from "../db/open";
import { loadScenario } from "../db/networks/data";
import { fail, markRunning, setProgress, simulationJob, storeResult, type SimulationResult, type SimulationSummary } from "../db/simulations";
import { quantiseCellIndex, quantiseCentiDb } from "../io/mapRaster";
import { CENTI_DB_ENCODING, INDEX_ENCODING } from "../db/simulations";
import { compareRuns } from "../radio/impact";
import { CELL_PARAMETERS, type CellParameter, type ParameterChange, type Scenario } from "../radio/scenario";
import type { CoverageEngine } from "../radio/engine";
import type { Grid } from "../radio/grid";
import type { KpiResult } from "../radio/kpi";
import { getEngine, simulationThreadCount, type EngineBuilder } from "./engineCache";
import { withEvaluationOnThreads } from "./sharedEngine";
import { mapSummaryOf, type MapSummary } from "./mapSummary";

export interface RunSimulationOptions {
  /**
   * Builds the engine instead of the cached default (fault injection in tests, or a
   * different builder). An injected builder's engine is not cached.
   */
  buildEngine?: EngineBuilder;
  /** Most worst grids kept (default 200, the engine's). */
  worstGridLimit?: number;
  /** Least time between two progress writes, ms (default 250). */
  progressIntervalMs?: number;
}

export type RunOutcome = { status: "done"; requestMoved: boolean } | { status: "failed"; error: string };

// Share of the job's progress spent building the engine; evaluation and storing take the rest.
const BUILD_SHARE = 0.85;

/** Writes progress at most every intervalMs, one write at a time; flush waits for the last. */
function progressWriter(prisma: Prisma, simulationId: string, intervalMs: number) {
  let last = 0;
  let pending: Promise<void> = Promise.resolve();
  let writing = false;
  return {
    report(fraction: number) {
      const now = Date.now();
      if (writing || now - last < intervalMs) return;
      last = now;
      writing = true;
      pending = setProgress(prisma, simulationId, fraction)
        .catch(() => {
          /* progress is a courtesy; the result write reports real trouble */
        })
        .finally(() => {
          writing = false;
        });
    },
    flush: () => pending,
  };
}

export function parseChanges(json: unknown, simulationId: string): ParameterChange[] {
  if (!Array.isArray(json)) throw new RangeError(`simulation ${simulationId}: no changes recorded`);
  return json.map((entry: unknown, i) => {
    const e = entry as { cellId?: unknown; parameter?: unknown; value?: unknown };
    if (typeof e.cellId !== "string" || !(CELL_PARAMETERS as readonly unknown[]).includes(e.parameter)) {
      throw new RangeError(`simulation ${simulationId}: changes[${i}] is not a cell parameter change`);
    }
    if (typeof e.value !== "number" && typeof e.value !== "string") {
      throw new RangeError(`simulation ${simulationId}: changes[${i}].value ${JSON.stringify(e.value)} is neither number nor text`);
    }
    return { cellId: e.cellId, parameter: e.parameter as CellParameter, value: e.value };
  });
}

/**
 * The engine cache key: the version, and the settings, which are not versioned. Exported so
 * that the baseline map (mapLayers.ts) shares the engine a simulation of the same version built.
 */
export function engineKey(networkId: string, version: number, scenario: Scenario): string {
  return `${networkId}@${version}#${JSON.stringify(scenario.settings)}`;
}

/** What a result is built from: the network, its grid and its baseline KPIs (an engine, or a city-scale run's view). */
export interface SimulationView {
  scenario: Scenario;
  grid: Grid;
  baselineKpis: KpiResult;
}

export function viewOf(engine: CoverageEngine): SimulationView {
  return { scenario: engine.scenario, grid: engine.grid, baselineKpis: engine.baseline.kpis };
}

/**
 * The stored result of an evaluated run (`after`, its KPIs) against the view's baseline. Copies what it keeps
 * (quantised layers), so `after` may live in reused memory (withEvaluation).
 */
export function resultOf(view: SimulationView, after: KpiResult, worstGridLimit?: number): SimulationResult {
  const { scenario, grid } = view;
  const cellIds = scenario.cells.map((c) => c.id);
  const report = compareRuns(
    grid,
    cellIds,
    scenario.clusters.map((c) => c.id),
    view.baselineKpis,
    after,
    { worstGridDropDb: scenario.settings.worstGridDropDb, limit: worstGridLimit },
  );
  const before = view.baselineKpis.perGrid;
  const now = after.perGrid;
  const rsrpBefore = quantiseCentiDb(before.bestRsrpDbm), rsrpAfter = quantiseCentiDb(now.bestRsrpDbm);
  const sinrBefore = quantiseCentiDb(before.sinrDb), sinrAfter = quantiseCentiDb(now.sinrDb);
  // The map's geometry and the CDFs ride in the summary, so the impact page needs neither grid nor layers.
  const summary: SimulationSummary & { map: MapSummary } = {
    network: report.network,
    clusters: report.clusters,
    cells: report.cells,
    serverCellIds: cellIds,
    map: mapSummaryOf(grid, { bestRsrpBefore: rsrpBefore, bestRsrpAfter: rsrpAfter, sinrBefore, sinrAfter }),
  };
  return {
    summary,
    worstGrids: { grids: report.worstGrids, total: report.worstGridTotal },
    layers: [
      { layer: "before.bestRsrp", encoding: CENTI_DB_ENCODING, values: rsrpBefore },
      { layer: "after.bestRsrp", encoding: CENTI_DB_ENCODING, values: rsrpAfter },
      { layer: "before.sinr", encoding: CENTI_DB_ENCODING, values: sinrBefore },
      { layer: "after.sinr", encoding: CENTI_DB_ENCODING, values: sinrAfter },
      { layer: "before.server", encoding: INDEX_ENCODING, values: quantiseCellIndex(before.bestCell) },
      { layer: "after.server", encoding: INDEX_ENCODING, values: quantiseCellIndex(now.bestCell) },
    ],
  };
}

/**
 * The job without its safety net: marks the simulation running, runs it and stores the result;
 * throws on any failure and records nothing about it (the queue's retries decide whether a failure
 * is final, lib/jobs/queue.ts). runSimulation is this plus the recorded failure.
 */
export async function executeSimulation(
  db: { prisma: Prisma },
  simulationId: string,
  options: RunSimulationOptions = {},
): Promise<{ requestMoved: boolean }> {
  const prisma = db.prisma;
  const progress = progressWriter(prisma, simulationId, options.progressIntervalMs ?? 250);
  try {
    await markRunning(prisma, simulationId);
    const { changes: recorded, networkId, baseVersion } = await simulationJob(prisma, simulationId);
    const changes = parseChanges(recorded, simulationId);
    const scenario = await loadScenario(prisma, networkId, { version: baseVersion });
    const onBuild = (fraction: number) => progress.report(fraction * BUILD_SHARE);
    const engine = options.buildEngine
      ? await options.buildEngine(scenario, onBuild)
      : await getEngine(engineKey(networkId, baseVersion, scenario), scenario, onBuild);
    // on the kept worker threads, the run's arrays reused between simulations (read here, then given back)
    const threads = options.buildEngine ? 0 : simulationThreadCount();
    const result = await withEvaluationOnThreads(engine, changes, (after) => resultOf(viewOf(engine), after.kpis, options.worstGridLimit), { threads });
    progress.report(0.95);
    await progress.flush();
    const stored = await storeResult(prisma, simulationId, result);
    return { requestMoved: stored.requestMoved };
  } finally {
    await progress.flush();
  }
}

export async function runSimulation(
  db: { prisma: Prisma },
  simulationId: string,
  options: RunSimulationOptions = {},
): Promise<RunOutcome> {
  try {
    const stored = await executeSimulation(db, simulationId, options);
    return { status: "done", requestMoved: stored.requestMoved };
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    try {
      await fail(db.prisma, simulationId, message);
    } catch (recordError) {
      // Nowhere left to record it but the log.
      console.error(`simulation ${simulationId} failed (${message}) and the failure could not be recorded:`, recordError);
    }
    return { status: "failed", error: message };
  }
}
