// City-scale runs, cut by cell groups (DESIGN.md §4; the queue in queue.ts moves the pieces between processes).
//
// A group job computes its cells' cold stages (path loss and baseline RSRP within the computation radius, a sparse
// footprint) and reduces them at once to the two exact aggregates the KPIs read (lib/radio): its cells' power sums
// and server lists — a group partial, a few megabytes, whatever the group's size. Partials of disjoint groups merge
// into the network's aggregates exactly (integer sums; lists that depend on the cell set only), so the merged result
// equals a single-process run bit for bit. No cell's arrays are kept: an evaluation recomputes its changed cells (old
// and new values), and where the best-server update cannot tell (serverLists.ts) it asks every cell for its RSRP at
// those few grids only (computeCellPathLoss with `grids`).
import type { Cell, ParameterChange, Scenario, Site } from "../radio/scenario";
import type { Grid } from "../radio/grid";
import { computeCellPathLoss, type CellPathLoss } from "../radio/pathLossStage";
import { computeCellRsrp, type CellRsrp } from "../radio/cellRsrp";
import { addCellPower, addPowerSums, createPowerSums, type PowerSums } from "../radio/powerSums";
import { buildServerLists, cellValuesAt, createServerLists, mergeServerLists, type ServerLists } from "../radio/serverLists";
import { allocateEvaluation, evaluateTiles, evaluationBase, finishEvaluation, GainTables, planEvaluation, sitesOf, type CellSource, type EvaluationBase } from "../radio/evaluation";
import type { KpiResult } from "../radio/kpi";

/** One cell group's share of the network's aggregates. */
export interface GroupPartial {
  /** Cells of the group and the cell × grid pairs their footprints hold. */
  cells: number;
  pairs: number;
  powerSums: PowerSums;
  lists: ServerLists;
}

/**
 * Buffers handed out again once given back, by size: a worker computing group after group then touches memory it
 * already has (fresh memory costs a page fault per 4 KB on first touch, ~2.5 µs here: ~0.1 s per group of 100
 * cells, and two workers faulting at once slow each other down).
 */
export class BufferRecycler {
  private readonly free = new Map<number, ArrayBuffer[]>();
  readonly allocate = (bytes: number): ArrayBuffer => this.free.get(bytes)?.pop() ?? new ArrayBuffer(bytes);

  /** Gives buffers back (their contents are overwritten by the next user). */
  release(...views: (ArrayBufferView | null)[]): void {
    for (const view of views) {
      if (!view || !(view.buffer instanceof ArrayBuffer)) continue;
      const list = this.free.get(view.buffer.byteLength) ?? [];
      if (!list.includes(view.buffer)) list.push(view.buffer);
      this.free.set(view.buffer.byteLength, list);
    }
  }
}

/**
 * The partial of the cells `cellIndices` (each once): their cold stages within `radiusM`, summed and listed.
 * With a recycler, every cell array is taken from it and given back (none is kept).
 */
export function computeGroupPartial(
  scenario: Scenario,
  grid: Grid,
  cellIndices: readonly number[],
  radiusM: number,
  recycler?: BufferRecycler,
  tables = new GainTables(scenario),
  sites = sitesOf(scenario),
): GroupPartial {
  const powerSums = createPowerSums(grid.count);
  const rsrp: CellRsrp[] = [];
  let pairs = 0;
  for (const i of cellIndices) {
    const pathLoss = computeCellPathLoss(scenario, grid, i, { radiusM }, recycler?.allocate);
    const cell = scenario.cells[i];
    const r = computeCellRsrp(grid, pathLoss, cell, sites[i], tables.of(cell), recycler?.allocate);
    addCellPower(powerSums, r, 1);
    // path loss and mW are done with; the dBm and maxima wait for the lists
    recycler?.release(pathLoss.pathLossDb, r.rsrpMw);
    rsrp.push(r);
    pairs += r.rsrpDbm.length;
  }
  const lists = buildServerLists(grid, rsrp, scenario.settings, cellIndices);
  for (const r of rsrp) recycler?.release(r.footprint, r.rsrpDbm, r.tileMaxDbm, r.segmentMaxDbm, r.segmentOffsets);
  return { cells: cellIndices.length, pairs, powerSums, lists };
}

/** Partials of disjoint groups merged one at a time (so only one is read into memory at a time), in any order. */
export class PartialMerger {
  private readonly merged: GroupPartial;

  constructor(
    private readonly scenario: Scenario,
    grid: Grid,
  ) {
    this.merged = { cells: 0, pairs: 0, powerSums: createPowerSums(grid.count), lists: createServerLists(grid.count, scenario.settings) };
  }

  add(partial: GroupPartial): void {
    addPowerSums(this.merged.powerSums, partial.powerSums);
    mergeServerLists(this.merged.lists, partial.lists);
    this.merged.cells += partial.cells;
    this.merged.pairs += partial.pairs;
  }

  /** What is merged so far. */
  partial(): GroupPartial {
    return this.merged;
  }

  /** The network's aggregates; throws when the partials do not hold every cell. */
  finish(): GroupPartial {
    if (this.merged.cells !== this.scenario.cells.length) throw new RangeError(`the partials hold ${this.merged.cells} cells, the network has ${this.scenario.cells.length}`);
    return this.merged;
  }
}

/** The network's aggregates from the partials of disjoint groups covering every cell (in any order). */
export function mergePartials(scenario: Scenario, grid: Grid, partials: readonly GroupPartial[]): GroupPartial {
  const merger = new PartialMerger(scenario, grid);
  for (const part of partials) merger.add(part);
  return merger.finish();
}

/** A network known by its aggregates only: baseline KPIs, and evaluations of changes on it. */
export class SplitNetwork {
  readonly base: EvaluationBase;
  readonly baselineKpis: KpiResult;
  private readonly tables: GainTables;
  private readonly sites: Site[];
  private readonly pathLossCache = new Map<number, CellPathLoss>();

  constructor(
    readonly scenario: Scenario,
    readonly grid: Grid,
    readonly radiusM: number,
    aggregates: { powerSums: PowerSums; lists: ServerLists },
  ) {
    const { base, kpis } = evaluationBase(scenario, grid, aggregates.powerSums, aggregates.lists);
    this.base = base;
    this.baselineKpis = kpis;
    this.tables = new GainTables(scenario);
    this.sites = sitesOf(scenario);
  }

  /** The KPIs with `changes` applied (the same bits as an engine holding every cell would give). */
  evaluate(changes: readonly ParameterChange[]): { kpis: KpiResult; recomputedCellIds: string[]; pointPairs: number } {
    const plan = planEvaluation(this.base, changes);
    if (plan.changed.length === 0) return { kpis: this.baselineKpis, recomputedCellIds: [], pointPairs: 0 };
    let pointPairs = 0;
    const source: CellSource = {
      pathLoss: (i) => this.pathLoss(i),
      baseline: (i) => this.rsrp(this.scenario.cells[i], i, this.pathLoss(i)),
      valuesAt: (grids, now) => {
        // every other cell at these grids only
        const values = new Map<number, Float32Array>();
        for (let c = 0; c < this.scenario.cells.length; c++) {
          if (now.has(c)) continue;
          const pl = computeCellPathLoss(this.scenario, this.grid, c, { radiusM: this.radiusM, grids });
          if (pl.pathLossDb.length === 0) continue;
          pointPairs += pl.pathLossDb.length;
          values.set(c, cellValuesAt(this.rsrp(this.scenario.cells[c], c, pl), grids));
        }
        return (c) => {
          const changed = now.get(c);
          return changed ? cellValuesAt(changed, grids) : (values.get(c) ?? null);
        };
      },
    };
    const out = allocateEvaluation(this.base, source, plan);
    const part = evaluateTiles(this.base, source, plan, out, this.tables, this.sites, 0, this.grid.tileCount, this.grid.tileCount);
    return { kpis: finishEvaluation(this.base, plan, out, [part]), recomputedCellIds: plan.changed.map((i) => plan.scenario.cells[i].id), pointPairs };
  }

  private pathLoss(i: number): CellPathLoss {
    let pl = this.pathLossCache.get(i);
    if (!pl) {
      pl = computeCellPathLoss(this.scenario, this.grid, i, { radiusM: this.radiusM });
      this.pathLossCache.set(i, pl);
    }
    return pl;
  }

  private rsrp(cell: Cell, i: number, pathLoss: CellPathLoss): CellRsrp {
    return computeCellRsrp(this.grid, pathLoss, cell, this.sites[i], this.tables.of(cell));
  }
}
