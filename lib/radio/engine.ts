// The incremental coverage engine: a cold prepare (grid + per-cell path-loss caches), then cheap
// evaluations of parameter changes that recompute the gain pass of the changed cells only, update the two
// exact aggregates of the baseline (power sums: take the old values out, put the new in; best server and
// overlap count: serverLists.ts summaryUpdater, where the changed cells reach) and rerun the per-grid
// KPI pass. Baseline arrays are never written after creation (copy-on-write: a changed cell gets new arrays),
// and both aggregates are exact functions of the cell set, so a run from scratch and an incremental run give
// bit-identical results.
import type { Cell, ParameterChange, Scenario, Site } from "./scenario";
import { buildGrid, type Grid } from "./grid";
import { computeCellPathLoss, type CellPathLoss, type PathLossOptions } from "./pathLossStage";
import { buildBeamSetGainTable, type BeamSetGainTable } from "./beamGainTable";
import { allocateEvaluation, evaluateTiles, evaluationBase, finishEvaluation, GainTables, planEvaluation, sitesOf, sourceOf, type EngineState, type EvaluationOutputs, type EvaluationPlan } from "./evaluation";
import { antennaPointOf, computeCellRsrp, type CellRsrp } from "./cellRsrp";
import { keptDirections, type DirectionCache } from "./direction";
import { computeKpis, type KpiResult } from "./kpi";
import { MAX_SUMMED_CELLS, sumCellPowers, type PowerSums } from "./powerSums";
import { buildServerLists, overlapCountCap, type ServerLists } from "./serverLists";
import { validateScenario } from "./validation";
import { compareRuns, type ImpactReport } from "./impact";

export interface CoverageRun {
  /** The scenario the run describes (baseline with the changes applied). */
  scenario: Scenario;
  /** Cells whose gain pass was recomputed for this run. */
  recomputedCellIds: string[];
  /** Per-cell RSRP, in scenario.cells order (unchanged cells share the baseline arrays). */
  cells: readonly CellRsrp[];
  kpis: KpiResult;
  /** The run's exact power sums (the baseline's are reused by incremental runs). */
  powerSums: PowerSums;
}

/** The two exact aggregates of a cell set (kpi.ts), as a runner may compute them elsewhere and hand them in. */
export interface CellAggregates {
  powerSums: PowerSums;
  serverLists: ServerLists;
}

/** What a runner may hand to the engine besides the scenario, grid and path-loss caches. */
export interface EngineParts {
  /** The baseline gain passes (computeCellStage's rsrp), checked for shape, not recomputed. */
  baselineCells?: readonly CellRsrp[];
  /** The power sums and server lists of exactly those cells. */
  aggregates?: CellAggregates;
  /** Memory for what the engine builds itself (e.g. shared memory, so threads can read its state). */
  allocate?: (bytes: number) => ArrayBufferLike;
}

/** Beyond this many changed cells an evaluation rebuilds the aggregates instead of updating them (same bits). */
export const INCREMENTAL_MAX_CHANGED_CELLS = 64;

export class CoverageEngine {
  readonly scenario: Scenario;
  readonly grid: Grid;
  readonly pathLoss: readonly CellPathLoss[];
  readonly baseline: CoverageRun;
  /** Everything an evaluation reads (evaluation.ts): plain data, shareable with other threads. */
  readonly state: EngineState;
  private readonly sites: Site[];
  private readonly tables: GainTables;

  /**
   * Use prepareEngine or assembleEngine. `baselineCells`, when given, are the baseline gain passes computed
   * elsewhere by computeCellStage (e.g. on worker threads); they are checked for shape, not recomputed. So are
   * `aggregates`, the power sums and server lists of exactly those cells.
   */
  constructor(scenario: Scenario, grid: Grid, pathLoss: readonly CellPathLoss[], parts: EngineParts = {}) {
    const { baselineCells, aggregates, allocate } = parts;
    validateScenario(scenario);
    if (scenario.cells.length > MAX_SUMMED_CELLS) throw new RangeError(`CoverageEngine: ${scenario.cells.length} cells, at most ${MAX_SUMMED_CELLS}`);
    if (pathLoss.length !== scenario.cells.length) {
      throw new RangeError(`CoverageEngine: ${pathLoss.length} path-loss caches for ${scenario.cells.length} cells`);
    }
    pathLoss.forEach((pl, i) => {
      const cell = scenario.cells[i];
      if (pl.cellId !== cell.id) throw new RangeError(`CoverageEngine: cache ${i} is for cell "${pl.cellId}", expected "${cell.id}"`);
      const expected = pl.footprint ? pl.footprint.length : grid.count;
      if (pl.pathLossDb.length !== expected) throw new RangeError(`cell "${cell.id}": path-loss cache has ${pl.pathLossDb.length} values for ${expected} grids`);
    });
    this.scenario = scenario;
    this.grid = grid;
    this.pathLoss = pathLoss;
    this.sites = sitesOf(scenario);
    this.tables = new GainTables(scenario);
    if (baselineCells) {
      if (baselineCells.length !== scenario.cells.length) throw new RangeError(`CoverageEngine: ${baselineCells.length} baseline RSRP sets for ${scenario.cells.length} cells`);
      baselineCells.forEach((r, i) => {
        if (r.cellId !== scenario.cells[i].id || r.rsrpDbm.length !== pathLoss[i].pathLossDb.length || r.tileMaxDbm.length !== grid.tileCount || r.segmentMaxDbm.length !== grid.segmentCount) {
          throw new RangeError(`CoverageEngine: baseline RSRP ${i} ("${r.cellId}") does not match cell "${scenario.cells[i].id}" and its cache`);
        }
      });
    }
    const cells = baselineCells ? baselineCells.slice() : scenario.cells.map((c, i) => this.cellRsrp(c, i));
    if (aggregates) {
      const lists = aggregates.serverLists, st = scenario.settings;
      if (aggregates.powerSums.hi.length !== grid.count || lists.gridCount !== grid.count) throw new RangeError(`CoverageEngine: aggregates for ${lists.gridCount} grids, the grid has ${grid.count}`);
      if (lists.slots !== overlapCountCap(st.overlapMaxOthers) + 1 || lists.floorDbm !== st.overlapFloorDbm || lists.deltaDb !== st.overlapDeltaDb) {
        throw new RangeError("CoverageEngine: server lists built with other overlap thresholds than the scenario's");
      }
    }
    const powerSums = aggregates?.powerSums ?? sumCellPowers(cells, grid.count, allocate);
    const lists = aggregates?.serverLists ?? buildServerLists(grid, cells, scenario.settings, undefined, allocate);
    const { base, kpis } = evaluationBase(scenario, grid, powerSums, lists, allocate);
    this.state = { ...base, pathLoss, cells };
    this.baseline = { scenario, recomputedCellIds: scenario.cells.map((c) => c.id), cells, kpis, powerSums };
  }

  /** Runs the scenario with `changes` applied, recomputing only the cells whose parameters differ. */
  evaluate(changes: readonly ParameterChange[]): CoverageRun {
    return this.evaluateInto(changes, undefined);
  }

  /**
   * use(evaluate(changes)), with the run's arrays taken from (and given back to) a small pool of this engine: they
   * are valid inside `use` only, so copy what you keep. Saves the fresh memory of each evaluation
   * (allocateEvaluation says what that costs).
   */
  withEvaluation<T>(changes: readonly ParameterChange[], use: (run: CoverageRun) => T): T {
    const spare = this.spareOutputs.pop();
    let outputs: EvaluationOutputs | undefined;
    try {
      const run = this.evaluateInto(changes, spare, (o) => (outputs = o));
      return use(run);
    } finally {
      const back = outputs ?? spare;
      if (back && this.spareOutputs.length < 2) this.spareOutputs.push(back);
    }
  }

  private readonly spareOutputs: EvaluationOutputs[] = [];

  private evaluateInto(changes: readonly ParameterChange[], spare: EvaluationOutputs | undefined, taken?: (outputs: EvaluationOutputs) => void): CoverageRun {
    const plan = planEvaluation(this.state, changes);
    const base = this.baseline;
    const recomputedCellIds = plan.changed.map((i) => plan.scenario.cells[i].id);
    if (plan.changed.length === 0) return { ...base, scenario: plan.scenario, recomputedCellIds };
    if (plan.changed.length > INCREMENTAL_MAX_CHANGED_CELLS) {
      // many cells: rebuilding the aggregates costs less than updating them (the same bits either way)
      const cells = base.cells.slice();
      for (const i of plan.changed) cells[i] = this.cellRsrp(plan.scenario.cells[i], i);
      const powerSums = sumCellPowers(cells, this.grid.count);
      const kpis = computeKpis({ grid: this.grid, noiseMw: this.state.noiseMw, clusters: plan.scenario.clusters, thresholds: plan.scenario.settings, powerSums, cells });
      return { scenario: plan.scenario, recomputedCellIds, cells, kpis, powerSums };
    }
    const source = sourceOf(this.state);
    const out = allocateEvaluation(this.state, source, plan, undefined, spare);
    taken?.(out);
    const part = evaluateTiles(this.state, source, plan, out, this.tables, this.sites, 0, this.grid.tileCount);
    return this.runOf(plan, out, finishEvaluation(this.state, plan, out, [part]));
  }

  /** The run of a finished evaluation (evaluation.ts), however its tiles were computed. */
  runOf(plan: EvaluationPlan, out: EvaluationOutputs, kpis: KpiResult): CoverageRun {
    const cells = this.baseline.cells.slice();
    plan.changed.forEach((i, k) => (cells[i] = out.changedCells[k]));
    return { scenario: plan.scenario, recomputedCellIds: plan.changed.map((i) => plan.scenario.cells[i].id), cells, kpis, powerSums: out.powerSums };
  }

  /** KPI deltas and worst grids of `changes` against the baseline. */
  impact(changes: readonly ParameterChange[], limit?: number): ImpactReport {
    return this.compare(this.evaluate(changes), limit);
  }

  /** KPI deltas and worst grids of an evaluated run against the baseline. */
  compare(after: CoverageRun, limit?: number): ImpactReport {
    return compareRuns(
      this.grid,
      this.scenario.cells.map((c) => c.id),
      this.scenario.clusters.map((c) => c.id),
      this.baseline.kpis,
      after.kpis,
      { worstGridDropDb: this.scenario.settings.worstGridDropDb, limit },
    );
  }

  /** The gain table of (antenna model, beam set, electrical tilt), built once and kept. */
  gainTable(cell: Cell): BeamSetGainTable {
    return this.tables.of(cell);
  }

  private cellRsrp(cell: Cell, i: number): CellRsrp {
    return computeCellRsrp(this.grid, this.pathLoss[i], cell, this.sites[i], this.gainTable(cell));
  }
}

/** Builds an engine from an already computed grid and per-cell caches (e.g. from worker threads). */
export function assembleEngine(scenario: Scenario, grid: Grid, pathLoss: readonly CellPathLoss[], parts: EngineParts = {}): CoverageEngine {
  return new CoverageEngine(scenario, grid, pathLoss, parts);
}

export interface CellStage {
  pathLoss: CellPathLoss;
  /** The cell's baseline gain pass, exactly as CoverageEngine computes it. */
  rsrp: CellRsrp;
}

/**
 * The whole cold work of one cell: its path-loss cache and its baseline RSRP. Pure and deterministic, so a
 * runner may spread cells over threads and hand the (plain typed-array) results to assembleEngine; `allocate`
 * gives their memory (e.g. shared memory). The scenario must have passed validateScenario. `directions` keeps the
 * direction arrays (direction.ts) for the next cells at the same antenna point; without it, each cell gets its own.
 */
export function computeCellStage(
  scenario: Scenario,
  grid: Grid,
  cellIndex: number,
  options: PathLossOptions = {},
  allocate?: (bytes: number) => ArrayBufferLike,
  directions: DirectionCache = new Map(),
): CellStage {
  const cell = scenario.cells[cellIndex];
  const model = scenario.antennaModels.find((m) => m.id === cell.antennaModelId);
  const beamSet = scenario.beamSets.find((b) => b.id === cell.beamSetId);
  const site = scenario.sites.find((s) => s.id === cell.siteId);
  if (!model || !beamSet || !site) throw new RangeError(`cell "${cell.id}": run validateScenario first (unknown model, beam set or site)`);
  const pathLoss = cellPathLossWithDirections(scenario, grid, cellIndex, options, directions, allocate);
  const table = buildBeamSetGainTable(model, beamSet.beams, cell.electricalTiltDeg);
  return { pathLoss, rsrp: computeCellRsrp(grid, pathLoss, cell, site, table, allocate) };
}

/** A cell's path-loss cache with its antenna's directions kept (dense footprints), shared through `directions`. */
export function cellPathLossWithDirections(
  scenario: Scenario,
  grid: Grid,
  cellIndex: number,
  options: PathLossOptions,
  directions: DirectionCache,
  allocate?: (bytes: number) => ArrayBufferLike,
): CellPathLoss {
  const cell = scenario.cells[cellIndex];
  const site = scenario.sites.find((s) => s.id === cell.siteId);
  if (!site) throw new RangeError(`cell "${cell.id}": siteId "${cell.siteId}" names no site`);
  const pathLoss = computeCellPathLoss(scenario, grid, cellIndex, options, allocate);
  const direction = keptDirections(directions, grid, antennaPointOf(cell, site), pathLoss.footprint, allocate);
  return direction ? { cellId: pathLoss.cellId, footprint: pathLoss.footprint, pathLossDb: pathLoss.pathLossDb, direction } : pathLoss;
}

/** The cold part, single-threaded: validate, build the grid and every cell's path-loss cache. */
export function prepareEngine(scenario: Scenario, options: PathLossOptions = {}): CoverageEngine {
  validateScenario(scenario);
  const grid = buildGrid(scenario);
  const directions: DirectionCache = new Map();
  const pathLoss = scenario.cells.map((_, i) => cellPathLossWithDirections(scenario, grid, i, options, directions));
  return new CoverageEngine(scenario, grid, pathLoss);
}
