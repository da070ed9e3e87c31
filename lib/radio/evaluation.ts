// An incremental evaluation, cut so that its heavy part can run on any number of threads:
//   planEvaluation     (one thread)  which cells change, checked against their hardware
//   allocateEvaluation (one thread)  the output arrays (on shared memory when threads will fill them)
//   evaluateTiles      (any thread)  for the grids of a tile range: the changed cells' gain pass, the power sums
//                                    and the best-server summary updated, the per-grid KPI pass
//   finishEvaluation   (one thread)  the tiles' accumulators added up in tile order, percentiles, the run
// The state it reads (EngineState) holds only plain data and typed arrays, so it can live in shared memory and be
// read by every thread at once; nothing in it is ever written after the engine is built.
import type { AntennaModel, BeamSet, Cell, ParameterChange, Scenario, Site } from "./scenario";
import type { Grid } from "./grid";
import type { CellPathLoss } from "./pathLossStage";
import { buildBeamSetGainTable, type BeamSetGainTable } from "./beamGainTable";
import { allocateCellRsrp, gainPassInto, powerShiftInto, withCellId, type CellRsrp } from "./cellRsrp";
import { allocateKpiGrids, computeKpis, createKpiTiles, finishKpis, kpiGridPass, type KpiGrids, type KpiPercentiles, type KpiResult, type KpiTiles } from "./kpi";
import { gatherQuantileValues, type QuantilePlan } from "./quantile";
import { applyPowerChanges, createPowerSums, type PowerSums } from "./powerSums";
import { allocateServerSummary, cellValuesAt, resolveSummaryAt, summarizeServerLists, summaryBars, summaryUpdater, type ServerLists, type ServerSummary } from "./serverLists";
import { cellNoise } from "./noise";
import { applyChanges } from "./applyChanges";
import { validateCell } from "./validation";

/** The baseline an evaluation starts from: the network's aggregates, without any one cell's arrays. */
export interface EvaluationBase {
  scenario: Scenario;
  grid: Grid;
  /** Per-resource-element noise of each cell, mW. */
  noiseMw: Float64Array;
  powerSums: PowerSums;
  lists: ServerLists;
  servers: ServerSummary;
  /** summaryBars of the servers. */
  bars: Float32Array;
}

type Allocate = (bytes: number) => ArrayBufferLike;
const heap: Allocate = (bytes) => new ArrayBuffer(bytes);

/**
 * The baseline of a cell set from its two exact aggregates, and its KPIs. `allocate` gives the memory of the
 * server summary (e.g. shared memory, so threads can read it).
 */
export function evaluationBase(scenario: Scenario, grid: Grid, powerSums: PowerSums, lists: ServerLists, allocate: Allocate = heap): { base: EvaluationBase; kpis: KpiResult } {
  const servers = summarizeServerLists(lists, allocate);
  const noiseMw = new Float64Array(scenario.cells.map((c) => Math.pow(10, cellNoise(c, scenario.settings.noiseFigureDb).resourceElementDbm / 10)));
  const kpis = computeKpis({ grid, noiseMw, clusters: scenario.clusters, thresholds: scenario.settings, powerSums, servers, cellIds: scenario.cells.map((c) => c.id) });
  return { base: { scenario, grid, noiseMw, powerSums, lists, servers, bars: summaryBars(servers, grid, lists.floorDbm, lists.deltaDb) }, kpis };
}

/** An engine's baseline: the aggregates and every cell's arrays. */
export interface EngineState extends EvaluationBase {
  /** Per cell, in scenario.cells order. */
  pathLoss: readonly CellPathLoss[];
  cells: readonly CellRsrp[];
}

/**
 * Where an evaluation finds single cells: a changed cell's path-loss cache and baseline RSRP, and, where the server
 * update cannot tell (serverLists.ts), every cell's RSRP at a few grids. An engine holds all of them (sourceOf);
 * a city-scale run computes them when asked (lib/jobs/splitEvaluation.ts).
 */
export interface CellSource {
  pathLoss(cellIndex: number): CellPathLoss;
  baseline(cellIndex: number): CellRsrp;
  /**
   * Every cell's RSRP at `grids` (ascending), the changed cells at their new values (`now`): a function of the cell
   * index giving the values in grid order (−Infinity where the cell does not reach), or null where none reaches.
   */
  valuesAt(grids: Int32Array, now: ReadonlyMap<number, CellRsrp>): (cellIndex: number) => ArrayLike<number> | null;
}

/** The cell source of an engine's state. */
export function sourceOf(state: EngineState): CellSource {
  return {
    pathLoss: (i) => state.pathLoss[i],
    baseline: (i) => state.cells[i],
    valuesAt: (grids, now) => (c) => cellValuesAt(now.get(c) ?? state.cells[c], grids),
  };
}

export interface EvaluationPlan {
  scenario: Scenario;
  /** Indices of the cells whose gain changes, ascending. */
  changed: number[];
}

export interface EvaluationOutputs {
  /** New RSRP of each changed cell (plan order), to be filled. */
  changedCells: CellRsrp[];
  powerSums: PowerSums;
  servers: ServerSummary;
  grids: KpiGrids;
}

const PARAMETERS_OF_GAIN: readonly (keyof Cell)[] = ["azimuthDeg", "mechanicalTiltDeg", "electricalTiltDeg", "beamSetId", "rsPowerDbm"];

/** True when of the parameters the gain pass reads, only the RS power differs. */
function onlyPowerDiffers(before: Cell, after: Cell): boolean {
  return PARAMETERS_OF_GAIN.every((k) => k === "rsPowerDbm" || before[k] === after[k]) && before.rsPowerDbm !== after.rsPowerDbm;
}

/** Applies the changes and finds (and checks) the cells whose gain pass must be redone. */
export function planEvaluation(state: EvaluationBase, changes: readonly ParameterChange[]): EvaluationPlan {
  const base = state.scenario;
  const scenario = applyChanges(base, changes);
  const models = new Map(base.antennaModels.map((m) => [m.id, m]));
  const beamSets = new Map(base.beamSets.map((s) => [s.id, s]));
  const changed: number[] = [];
  scenario.cells.forEach((cell, i) => {
    const old = base.cells[i];
    if (cell !== old && PARAMETERS_OF_GAIN.some((k) => cell[k] !== old[k])) {
      validateCell(scenario, cell, models, beamSets);
      changed.push(i);
    }
  });
  return { scenario, changed };
}

/**
 * The output arrays of an evaluation. With `spare` (the outputs of an earlier evaluation on the same state, no
 * longer used) its arrays are taken again: every output is overwritten whole, and memory that is already mapped
 * spares the first-touch page faults of fresh buffers (measured ~2.5 µs per 4 KB page here, ~12 ms for the 20 MB
 * of a 300 000-grid evaluation, and two threads faulting at once wait on each other).
 */
export function allocateEvaluation(state: EvaluationBase, source: CellSource, plan: EvaluationPlan, allocate: Allocate = heap, spare?: EvaluationOutputs): EvaluationOutputs {
  const G = state.grid.count;
  const spareDense = (spare?.changedCells ?? []).filter((c) => c.footprint === null);
  return {
    changedCells: plan.changed.map((i) => {
      const footprint = source.pathLoss(i).footprint, cellId = state.scenario.cells[i].id;
      const reused = footprint === null ? spareDense.pop() : undefined;
      return reused ? withCellId(reused, cellId) : allocateCellRsrp(state.grid, cellId, footprint, allocate);
    }),
    powerSums: spare?.powerSums ?? createPowerSums(G, allocate),
    servers: spare?.servers ?? allocateServerSummary(G, allocate),
    grids: spare?.grids ?? allocateKpiGrids(G, allocate),
  };
}

/** Gain tables by (antenna model, beam set, electrical tilt), built once per thread. */
export class GainTables {
  private readonly tables = new Map<string, BeamSetGainTable>();
  private readonly models: Map<string, AntennaModel>;
  private readonly beamSets: Map<string, BeamSet>;

  constructor(scenario: Scenario) {
    this.models = new Map(scenario.antennaModels.map((m) => [m.id, m]));
    this.beamSets = new Map(scenario.beamSets.map((s) => [s.id, s]));
  }

  of(cell: Cell): BeamSetGainTable {
    const key = `${cell.antennaModelId}\u0000${cell.beamSetId}\u0000${cell.electricalTiltDeg}`;
    let table = this.tables.get(key);
    if (!table) {
      const model = this.models.get(cell.antennaModelId), beamSet = this.beamSets.get(cell.beamSetId);
      if (!model || !beamSet) throw new RangeError(`cell "${cell.id}": unknown antenna model "${cell.antennaModelId}" or beam set "${cell.beamSetId}"`);
      table = buildBeamSetGainTable(model, beamSet.beams, cell.electricalTiltDeg);
      this.tables.set(key, table);
    }
    return table;
  }
}

/** The site of each cell, in cell order. */
export function sitesOf(scenario: Scenario): Site[] {
  const byId = new Map(scenario.sites.map((s) => [s.id, s]));
  return scenario.cells.map((c) => {
    const site = byId.get(c.siteId);
    if (!site) throw new RangeError(`cell "${c.id}": siteId "${c.siteId}" names no site`);
    return site;
  });
}

/** Tiles taken through the whole pipeline at a time: their intermediate arrays stay in the cache between stages. */
export const EVALUATION_BLOCK_TILES = 2;

/** Which blocks of an evaluation one caller takes: block k when k mod count = index (threads take turns). */
export interface BlockShare {
  index: number;
  count: number;
}

/** The blocks [first tile, end tile) of tiles [tileFrom, tileTo) that a share takes, in order. */
export function shareBlocks(tileFrom: number, tileTo: number, blockTiles: number, share: BlockShare): [number, number][] {
  if (!(share.count >= 1 && share.index >= 0 && share.index < share.count)) throw new RangeError(`share ${share.index} of ${share.count}`);
  if (!(blockTiles >= 1)) throw new RangeError(`blocks of ${blockTiles} tiles`);
  const blocks: [number, number][] = [];
  for (let k = 0, block = tileFrom; block < tileTo; k++, block += blockTiles) if (k % share.count === share.index) blocks.push([block, Math.min(tileTo, block + blockTiles)]);
  return blocks;
}

/**
 * The heavy part for the grids of tiles [tileFrom, tileTo), or of a share of its blocks: writes those grids of every
 * output and returns the tiles' accumulators. Calls on one evaluation may run on different threads at once (they
 * write disjoint parts). The range is cut into blocks of a few tiles (`blockTiles`), each taken through every stage
 * in turn, so that what one stage writes is still in the cache when the next reads it. With a `share`, this call
 * takes every count-th block only: threads taking turns block by block each get a fair part of wherever a change
 * reaches, which a split into halves does not (a change near one edge of the area would load one thread alone).
 * A source that is dear to ask for a few grids (a city run) takes the whole range as one block, so that it is asked
 * once.
 */
export function evaluateTiles(
  state: EvaluationBase,
  source: CellSource,
  plan: EvaluationPlan,
  out: EvaluationOutputs,
  tables: GainTables,
  sites: readonly Site[],
  tileFrom: number,
  tileTo: number,
  blockTiles = EVALUATION_BLOCK_TILES,
  share: BlockShare = { index: 0, count: 1 },
): KpiTiles {
  const { grid } = state;
  const C = state.scenario.cells.length;
  const oldCells = plan.changed.map((i) => source.baseline(i));
  const changedTables = plan.changed.map((i) => tables.of(plan.scenario.cells[i]));
  const updateServers = summaryUpdater(state.lists, state.servers, out.servers, grid, state.bars, plan.changed, oldCells, out.changedCells, C);
  const kpiInputs = { grid, servers: out.servers, powerSums: out.powerSums, noiseMw: state.noiseMw, thresholds: plan.scenario.settings, clusterCount: plan.scenario.clusters.length };
  const blocks = shareBlocks(tileFrom, tileTo, blockTiles, share);
  const accumulators = createKpiTiles(blocks.reduce((n, [from, to]) => n + to - from, 0), kpiInputs.clusterCount, C);
  const now = new Map(plan.changed.map((i, k) => [i, out.changedCells[k]]));
  const changedPathLoss = plan.changed.map((i) => source.pathLoss(i));
  // a cell whose RS power alone changed keeps its link gains: its new RSRP is one addition per grid
  const powerOnly = plan.changed.map((i, k) => oldCells[k].linkDb !== null && onlyPowerDiffers(state.scenario.cells[i], plan.scenario.cells[i]));
  for (const [block, blockEnd] of blocks) {
    // ---- the changed cells' gain pass
    plan.changed.forEach((i, k) => {
      const cell = plan.scenario.cells[i];
      if (powerOnly[k]) powerShiftInto(grid, oldCells[k], cell.rsPowerDbm, out.changedCells[k], block, blockEnd);
      else gainPassInto(grid, changedPathLoss[k], cell, sites[i], changedTables[k], out.changedCells[k], block, blockEnd);
    });
    // ---- power sums: the old values out, the new in (exact)
    applyPowerChanges(state.powerSums, out.powerSums, grid.tileStart[block], grid.tileStart[blockEnd], oldCells, out.changedCells);
    // ---- best server and overlap count: updated where the changed cells reach, rebuilt from every cell where the
    // update cannot tell
    const unresolved = updateServers(block, blockEnd);
    if (unresolved.length > 0) resolveSummaryAt(out.servers, state.lists, unresolved, C, source.valuesAt(unresolved, now));
    // ---- the per-grid KPI pass
    kpiGridPass(kpiInputs, out.grids, block, blockEnd, accumulators);
  }
  return accumulators;
}

/** Buffers and start offsets of one share's part of the percentile gathering (quantile.ts). */
export interface QuantileGathering {
  plan: QuantilePlan;
  buffers: Float32Array[];
  /** Where this share starts writing in each buffer (quantileSlotOffsets); moved on as it writes. */
  fill: Int32Array;
}

/**
 * The values of best RSRP and SINR that the percentiles need, gathered from the grids of a share of the blocks
 * (the same tiles and share its evaluateTiles call took): lets threads gather where they computed, in parallel,
 * rather than one thread reading every grid.
 */
export function gatherEvaluationQuantiles(
  state: EvaluationBase,
  out: EvaluationOutputs,
  rsrp: QuantileGathering,
  sinr: QuantileGathering,
  tileFrom: number,
  tileTo: number,
  blockTiles = EVALUATION_BLOCK_TILES,
  share: BlockShare = { index: 0, count: 1 },
): void {
  const { grid } = state;
  for (const [block, blockEnd] of shareBlocks(tileFrom, tileTo, blockTiles, share)) {
    const from = grid.tileStart[block], to = grid.tileStart[blockEnd];
    gatherQuantileValues(rsrp.plan, out.servers.bestDbm, grid.clusterIndex, rsrp.buffers, rsrp.fill, from, to);
    gatherQuantileValues(sinr.plan, out.grids.sinrDb, grid.clusterIndex, sinr.buffers, sinr.fill, from, to);
  }
}

/**
 * The KPIs of a finished evaluation: `parts` are evaluateTiles' accumulators, holding every tile once; `percentiles`
 * when the callers gathered them (gatherEvaluationQuantiles), else they are gathered here.
 */
export function finishEvaluation(state: EvaluationBase, plan: EvaluationPlan, out: EvaluationOutputs, parts: readonly KpiTiles[], percentiles?: KpiPercentiles): KpiResult {
  return finishKpis(
    state.grid,
    out.servers,
    out.grids,
    parts,
    plan.scenario.clusters,
    plan.scenario.cells.map((c) => c.id),
    percentiles,
  );
}
