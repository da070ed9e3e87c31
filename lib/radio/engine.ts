// The incremental coverage engine: a cold prepare (grid + per-cell path-loss caches), then cheap
// evaluations of parameter changes that recompute the gain pass of the changed cells only and rerun
// the KPI pass. Baseline per-cell RSRP arrays are never written after creation (copy-on-write: a changed
// cell gets new arrays), so a run from scratch and an incremental run give bit-identical results.
import type { AntennaModel, BeamSet, Cell, ParameterChange, Scenario, Site } from "./scenario";
import { buildGrid, type Grid } from "./grid";
import { computeCellPathLoss, type CellPathLoss, type PathLossOptions } from "./pathLossStage";
import { buildBeamSetGainTable, type BeamSetGainTable } from "./beamGainTable";
import { computeCellRsrp, type CellRsrp } from "./cellRsrp";
import { computeKpis, type KpiResult } from "./kpi";
import { computePowerSums, type PowerSums } from "./powerSums";
import { cellNoise } from "./noise";
import { applyChanges } from "./applyChanges";
import { validateCell, validateScenario } from "./validation";
import { compareRuns, type ImpactReport } from "./impact";

export interface CoverageRun {
  /** The scenario the run describes (baseline with the changes applied). */
  scenario: Scenario;
  /** Cells whose gain pass was recomputed for this run. */
  recomputedCellIds: string[];
  /** Per-cell RSRP, in scenario.cells order (unchanged cells share the baseline arrays). */
  cells: readonly CellRsrp[];
  kpis: KpiResult;
  /** Per-grid linear power sums of this run (reused by later incremental runs). */
  powerSums: PowerSums;
}

const PARAMETERS_OF_GAIN: readonly (keyof Cell)[] = ["azimuthDeg", "mechanicalTiltDeg", "electricalTiltDeg", "beamSetId", "rsPowerDbm"];

export class CoverageEngine {
  readonly scenario: Scenario;
  readonly grid: Grid;
  readonly pathLoss: readonly CellPathLoss[];
  readonly baseline: CoverageRun;
  private readonly models: Map<string, AntennaModel>;
  private readonly beamSets: Map<string, BeamSet>;
  private readonly sites: Site[];
  private readonly noiseMw: Float64Array;
  private readonly tables = new Map<string, BeamSetGainTable>();

  /**
   * Use prepareEngine or assembleEngine. `baselineCells`, when given, are the baseline gain passes computed
   * elsewhere by computeCellStage (e.g. on worker threads); they are checked for shape, not recomputed.
   */
  constructor(scenario: Scenario, grid: Grid, pathLoss: readonly CellPathLoss[], baselineCells?: readonly CellRsrp[]) {
    validateScenario(scenario);
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
    this.models = new Map(scenario.antennaModels.map((m) => [m.id, m]));
    this.beamSets = new Map(scenario.beamSets.map((s) => [s.id, s]));
    this.sites = scenario.cells.map((c) => scenario.sites.find((s) => s.id === c.siteId)!);
    this.noiseMw = new Float64Array(scenario.cells.map((c) => Math.pow(10, cellNoise(c, scenario.settings.noiseFigureDb).resourceElementDbm / 10)));
    if (baselineCells) {
      if (baselineCells.length !== scenario.cells.length) throw new RangeError(`CoverageEngine: ${baselineCells.length} baseline RSRP sets for ${scenario.cells.length} cells`);
      baselineCells.forEach((r, i) => {
        if (r.cellId !== scenario.cells[i].id || r.rsrpDbm.length !== pathLoss[i].pathLossDb.length || r.tileMaxDbm.length !== grid.tileCount) {
          throw new RangeError(`CoverageEngine: baseline RSRP ${i} ("${r.cellId}") does not match cell "${scenario.cells[i].id}" and its cache`);
        }
      });
    }
    const cells = baselineCells ? baselineCells.slice() : scenario.cells.map((c, i) => this.cellRsrp(c, i));
    const powerSums = computePowerSums(cells, grid.count);
    this.baseline = { scenario, recomputedCellIds: scenario.cells.map((c) => c.id), cells, kpis: this.kpis(scenario, cells, powerSums), powerSums };
  }

  /** Runs the scenario with `changes` applied, recomputing only the cells whose parameters differ. */
  evaluate(changes: readonly ParameterChange[]): CoverageRun {
    const scenario = applyChanges(this.scenario, changes);
    const changed: number[] = [];
    scenario.cells.forEach((cell, i) => {
      const base = this.scenario.cells[i];
      if (cell !== base && PARAMETERS_OF_GAIN.some((k) => cell[k] !== base[k])) {
        validateCell(scenario, cell, this.models, this.beamSets);
        changed.push(i);
      }
    });
    const cells = this.baseline.cells.slice();
    const unchanged = cells.map(() => true);
    for (const i of changed) {
      cells[i] = this.cellRsrp(scenario.cells[i], i);
      unchanged[i] = false;
    }
    const powerSums = computePowerSums(cells, this.grid.count, this.baseline.powerSums, unchanged);
    return { scenario, recomputedCellIds: changed.map((i) => scenario.cells[i].id), cells, kpis: this.kpis(scenario, cells, powerSums), powerSums };
  }

  /** KPI deltas and worst grids of `changes` against the baseline. */
  impact(changes: readonly ParameterChange[], limit?: number): ImpactReport {
    const after = this.evaluate(changes);
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
    const key = `${cell.antennaModelId}\u0000${cell.beamSetId}\u0000${cell.electricalTiltDeg}`;
    let table = this.tables.get(key);
    if (!table) {
      table = buildBeamSetGainTable(this.models.get(cell.antennaModelId)!, this.beamSets.get(cell.beamSetId)!.beams, cell.electricalTiltDeg);
      this.tables.set(key, table);
    }
    return table;
  }

  private cellRsrp(cell: Cell, i: number): CellRsrp {
    return computeCellRsrp(this.grid, this.pathLoss[i], cell, this.sites[i], this.gainTable(cell));
  }

  private kpis(scenario: Scenario, cells: readonly CellRsrp[], powerSums: PowerSums): KpiResult {
    return computeKpis({ grid: this.grid, cells, noiseMw: this.noiseMw, clusters: scenario.clusters, thresholds: scenario.settings, powerSums });
  }
}

/** Builds an engine from an already computed grid and per-cell caches (e.g. from worker threads). */
export function assembleEngine(scenario: Scenario, grid: Grid, pathLoss: readonly CellPathLoss[], baselineCells?: readonly CellRsrp[]): CoverageEngine {
  return new CoverageEngine(scenario, grid, pathLoss, baselineCells);
}

export interface CellStage {
  pathLoss: CellPathLoss;
  /** The cell's baseline gain pass, exactly as CoverageEngine computes it. */
  rsrp: CellRsrp;
}

/**
 * The whole cold work of one cell: its path-loss cache and its baseline RSRP. Pure and deterministic, so a
 * runner may spread cells over threads and hand the (plain typed-array) results to assembleEngine.
 * The scenario must have passed validateScenario.
 */
export function computeCellStage(scenario: Scenario, grid: Grid, cellIndex: number, options: PathLossOptions = {}): CellStage {
  const cell = scenario.cells[cellIndex];
  const pathLoss = computeCellPathLoss(scenario, grid, cellIndex, options);
  const model = scenario.antennaModels.find((m) => m.id === cell.antennaModelId);
  const beamSet = scenario.beamSets.find((b) => b.id === cell.beamSetId);
  const site = scenario.sites.find((s) => s.id === cell.siteId);
  if (!model || !beamSet || !site) throw new RangeError(`cell "${cell.id}": run validateScenario first (unknown model, beam set or site)`);
  const table = buildBeamSetGainTable(model, beamSet.beams, cell.electricalTiltDeg);
  return { pathLoss, rsrp: computeCellRsrp(grid, pathLoss, cell, site, table) };
}

/** The cold part, single-threaded: validate, build the grid and every cell's path-loss cache. */
export function prepareEngine(scenario: Scenario, options: PathLossOptions = {}): CoverageEngine {
  validateScenario(scenario);
  const grid = buildGrid(scenario);
  const pathLoss = scenario.cells.map((_, i) => computeCellPathLoss(scenario, grid, i, options));
  return new CoverageEngine(scenario, grid, pathLoss);
}
