// Server lists: per grid, the cells that decide its best server and its overlap test, ranked.
//
// Cells are ranked at a grid by RSRP, highest first, the lower cell index first among equals (so the best server
// of DESIGN.md §2 is the first). With best RSRP b, a grid's list holds the first `slots` cells, in rank order, of
//     {best server} ∪ {c : RSRP(c) ≥ max(floor, b − Δs)},      Δs = Δ + LIST_MARGIN_DB,
// a window LIST_MARGIN_DB deeper than the overlap window max(floor, b − Δ) of the KPIs. slots = cap + 1, where
// cap = overlapCountCap(N) ≥ N + 1: from the list the overlap test (others ≤ N) is exact and the number of others
// is known up to cap (more counts as cap). The deeper window costs nothing in exactness; it lets an incremental
// update tell the new best server's window when the old best server changed (summaryUpdater).
//
// The list of a set of cells is a function of the set alone, not of the order cells are offered in, and the list
// of a union is the list obtained by offering one list's entries to the other (mergeServerLists). So a cold run can
// build partial lists on several threads or processes and merge them — all giving the same bits as building from
// scratch. Why offering is order-free: an entry is dropped either because it falls below the window of a better
// best (the window only rises, and the dropped entry never re-enters), or because `slots` better entries are held
// (anything it would displace later ranks above it too).
import type { Grid } from "./grid";
import type { CellRsrp } from "./cellRsrp";
import type { KpiThresholds } from "./kpi";
import { lowerBound } from "./lowerBound";
import { dbToLinear } from "./decibel";

/** Least cap on the counted overlap others (the lists hold cap + 1 entries). */
export const MIN_OVERLAP_COUNT_CAP = 7;
/** How much deeper than the overlap window Δ the lists keep cells, dB (an engineering choice: results do not depend on it). */
export const LIST_MARGIN_DB = 10;

/** Others counted by the overlap test, at most: max(7, N + 1). */
export function overlapCountCap(overlapMaxOthers: number): number {
  return Math.max(MIN_OVERLAP_COUNT_CAP, Math.floor(overlapMaxOthers) + 1);
}

export type ListThresholds = Pick<KpiThresholds, "overlapFloorDbm" | "overlapDeltaDb" | "overlapMaxOthers">;

export interface ServerLists {
  gridCount: number;
  /** Entries per grid (cap + 1). */
  slots: number;
  floorDbm: number;
  /** The overlap window Δ of the KPIs, and the deeper window Δs = Δ + LIST_MARGIN_DB the lists keep. */
  deltaDb: number;
  storeDeltaDb: number;
  /** Entries held at each grid, 0 … slots (0: no cell reaches it). */
  length: Uint8Array;
  /** Entry k of grid g at g · slots + k, in rank order: cell index and RSRP (dBm). */
  cell: Int32Array;
  dbm: Float32Array;
}

type Allocate = (bytes: number) => ArrayBufferLike;
const heap: Allocate = (bytes) => new ArrayBuffer(bytes);

/** Empty lists; `allocate` gives their memory (e.g. shared memory for threads). */
export function createServerLists(gridCount: number, thresholds: ListThresholds, allocate: Allocate = heap): ServerLists {
  const slots = overlapCountCap(thresholds.overlapMaxOthers) + 1;
  if (slots > 255) throw new RangeError(`server lists: overlapMaxOthers = ${thresholds.overlapMaxOthers} is above 253`);
  return {
    gridCount,
    slots,
    floorDbm: thresholds.overlapFloorDbm,
    deltaDb: thresholds.overlapDeltaDb,
    storeDeltaDb: thresholds.overlapDeltaDb + LIST_MARGIN_DB,
    length: new Uint8Array(allocate(gridCount)),
    cell: new Int32Array(allocate(4 * gridCount * slots)),
    dbm: new Float32Array(allocate(4 * gridCount * slots)),
  };
}

/**
 * Empty lists for `gridCount` grids with the settings of `lists` (a scratch list), built like createServerLists'
 * (one shape for every ServerLists, so the JIT sees one kind of object in offer and its callers).
 */
function listsLike(lists: ServerLists, gridCount: number): ServerLists {
  return {
    gridCount,
    slots: lists.slots,
    floorDbm: lists.floorDbm,
    deltaDb: lists.deltaDb,
    storeDeltaDb: lists.storeDeltaDb,
    length: new Uint8Array(gridCount),
    cell: new Int32Array(gridCount * lists.slots),
    dbm: new Float32Array(gridCount * lists.slots),
  };
}

/** Bottom of the window below a best RSRP: max(floor, best − delta). */
function windowBottom(best: number, delta: number, floor: number): number {
  const t = best - delta;
  return t < floor ? floor : t;
}

/** True when both were made for the same number of grids and the same thresholds. */
function sameLayout(a: ServerLists, b: ServerLists): boolean {
  return a.gridCount === b.gridCount && a.slots === b.slots && a.floorDbm === b.floorDbm && a.deltaDb === b.deltaDb && a.storeDeltaDb === b.storeDeltaDb;
}

/** True when both hold the same entries (and settings), bit for bit. */
export function sameServerLists(a: ServerLists, b: ServerLists): boolean {
  if (!sameLayout(a, b)) return false;
  for (let g = 0; g < a.gridCount; g++) {
    const n = a.length[g];
    if (n !== b.length[g]) return false;
    for (let k = g * a.slots, end = k + n; k < end; k++) if (a.cell[k] !== b.cell[k] || !Object.is(a.dbm[k], b.dbm[k])) return false;
  }
  return true;
}

/**
 * Offers cell c with RSRP v (dBm) at grid g. Keeps the list equal to the list of (its cells ∪ {c}); a value that
 * is not finite (a cell that does not reach g) changes nothing. Returns true when the list changed.
 */
export function offer(lists: ServerLists, g: number, c: number, v: number): boolean {
  if (!(v > -Infinity && v < Infinity)) return false;
  const S = lists.slots, base = g * S, len = lists.length, cells = lists.cell, dbm = lists.dbm;
  const n = len[g];
  if (n === 0) {
    cells[base] = c;
    dbm[base] = v;
    len[g] = 1;
    return true;
  }
  const b = dbm[base];
  if (v > b || (v === b && c < cells[base])) {
    // ---- a new best: the old entries still inside the new window move down one place
    const t = windowBottom(v, lists.storeDeltaDb, lists.floorDbm);
    let keep = 0;
    while (keep < n && keep < S - 1 && dbm[base + keep] >= t) keep++;
    for (let k = keep; k > 0; k--) {
      cells[base + k] = cells[base + k - 1];
      dbm[base + k] = dbm[base + k - 1];
    }
    cells[base] = c;
    dbm[base] = v;
    len[g] = keep + 1;
    return true;
  }
  // ---- not the best: enters when inside the window and ranked above the last of a full list
  if (v < windowBottom(b, lists.storeDeltaDb, lists.floorDbm)) return false;
  if (n === S) {
    const last = dbm[base + S - 1];
    if (v < last || (v === last && c > cells[base + S - 1])) return false;
  }
  let k = n < S ? n : S - 1;
  while (k > 1 && (v > dbm[base + k - 1] || (v === dbm[base + k - 1] && c < cells[base + k - 1]))) {
    cells[base + k] = cells[base + k - 1];
    dbm[base + k] = dbm[base + k - 1];
    k--;
  }
  cells[base + k] = c;
  dbm[base + k] = v;
  if (n < S) len[g] = n + 1;
  return true;
}

/**
 * Lowest RSRP that can still change grid g's list: an offer below it is a no-op. −Infinity for an empty list.
 * Below min(best, window) nothing enters; with a full list, nothing below its last entry either.
 */
export function entryBar(lists: ServerLists, g: number): number {
  const n = lists.length[g];
  if (n === 0) return -Infinity;
  const base = g * lists.slots;
  const b = lists.dbm[base];
  let t = windowBottom(b, lists.storeDeltaDb, lists.floorDbm);
  if (n === lists.slots && lists.dbm[base + n - 1] > t) t = lists.dbm[base + n - 1];
  return b < t ? b : t;
}

/** Number of entries after the best inside the overlap window max(floor, best − Δ) of the KPIs (0 for an empty list). */
export function overlapOthersAt(lists: ServerLists, g: number): number {
  const n = lists.length[g];
  if (n === 0) return 0;
  const base = g * lists.slots, dbm = lists.dbm;
  const t = windowBottom(dbm[base], lists.deltaDb, lists.floorDbm);
  let k = 1;
  while (k < n && dbm[base + k] >= t) k++;
  return k - 1;
}

// ---------------------------------------------------------------- building

/**
 * The lists of `cells`, whose cell indices are `indices` (default: their positions). Tile by tile, cells are
 * offered strongest first (by their maximum in the tile), so the bars rise early and weak cells are skipped a
 * segment (or the rest of the tile) at a time; every skip is exact. Each grid's entryBar is kept beside the lists,
 * so that most offers are turned down without a call.
 */
export function buildServerLists(grid: Grid, cells: readonly CellRsrp[], thresholds: ListThresholds, indices?: ArrayLike<number>, allocate: Allocate = heap): ServerLists {
  const lists = createServerLists(grid.count, thresholds, allocate);
  fillServerLists(lists, grid, cells, 0, grid.tileCount, indices);
  return lists;
}

/**
 * The lists of tiles [tileFrom, tileTo) of `lists` (empty there), as buildServerLists makes them: tiles are
 * independent, so threads may fill disjoint ranges of one (shared) set of lists.
 */
export function fillServerLists(lists: ServerLists, grid: Grid, cells: readonly CellRsrp[], tileFrom: number, tileTo: number, indices?: ArrayLike<number>): void {
  if (lists.gridCount !== grid.count) throw new RangeError(`fillServerLists: lists for ${lists.gridCount} grids, the grid has ${grid.count}`);
  for (const cell of cells) checkCell(grid, cell);
  if (indices && indices.length !== cells.length) throw new RangeError(`buildServerLists: ${indices.length} indices for ${cells.length} cells`);
  // the entry bar of each grid of the range (at g − gridFrom) and its lowest per segment
  const gridFrom = grid.tileStart[tileFrom];
  const gridBar = new Float32Array(grid.tileStart[tileTo] - gridFrom).fill(-Infinity);
  const bars = new Float32Array(grid.segmentCount).fill(-Infinity);
  const segStart = grid.segmentStart;
  const C = cells.length;
  const order = new Int32Array(C);
  const key = new Float64Array(C);
  for (let tile = tileFrom; tile < tileTo; tile++) {
    // insertion sort by decreasing tile maximum (any order of equals would do)
    for (let c = 0; c < C; c++) {
      const m = cells[c].tileMaxDbm[tile];
      let i = c;
      while (i > 0 && key[i - 1] < m) {
        order[i] = order[i - 1];
        key[i] = key[i - 1];
        i--;
      }
      order[i] = c;
      key[i] = m;
    }
    const seg0 = grid.tileSegmentStart[tile], seg1 = grid.tileSegmentStart[tile + 1];
    for (let o = 0; o < C; o++) {
      if (key[o] === -Infinity) break;
      // no cell from here on can enter any list of the tile
      let tileBar = Infinity;
      for (let seg = seg0; seg < seg1; seg++) if (bars[seg] < tileBar) tileBar = bars[seg];
      if (key[o] < tileBar) break;
      const k = order[o], cell = cells[k], c = indices ? indices[k] : k, d = cell.rsrpDbm;
      const fp = cell.footprint, offsets = cell.segmentOffsets;
      for (let seg = seg0; seg < seg1; seg++) {
        if (cell.segmentMaxDbm[seg] < bars[seg]) continue;
        let changed = false;
        const from = fp === null ? segStart[seg] : offsets![seg], to = fp === null ? segStart[seg + 1] : offsets![seg + 1];
        for (let j = from; j < to; j++) {
          const v = d[j];
          const g = fp === null ? j : fp[j];
          if (v < gridBar[g - gridFrom]) continue;
          if (offer(lists, g, c, v)) {
            gridBar[g - gridFrom] = entryBar(lists, g);
            changed = true;
          }
        }
        if (changed) {
          let low = Infinity;
          for (let g = segStart[seg], end = segStart[seg + 1]; g < end; g++) if (gridBar[g - gridFrom] < low) low = gridBar[g - gridFrom];
          bars[seg] = low;
        }
      }
    }
  }
}

/** target ← the lists of both cell sets (disjoint sets, same settings). */
export function mergeServerLists(target: ServerLists, source: ServerLists): void {
  if (!sameLayout(source, target)) {
    throw new RangeError("mergeServerLists: the lists were built for different grids or thresholds");
  }
  const S = source.slots;
  for (let g = 0; g < source.gridCount; g++) {
    for (let k = g * S, end = k + source.length[g]; k < end; k++) offer(target, g, source.cell[k], source.dbm[k]);
  }
}

// ---------------------------------------------------------------- what the KPIs read

/** Per grid: the best server (−1 where no cell reaches), its RSRP (−Infinity then), and the overlap others (≤ cap). */
export interface ServerSummary {
  bestCell: Int32Array;
  bestDbm: Float32Array;
  /** The best server's power in mW, as the gain pass has it: Math.fround(dbToLinear(bestDbm)), 0 where none. */
  bestMw: Float32Array;
  others: Uint16Array;
}

/** The KPIs' reading of the lists at every grid. */
export function summarizeServerLists(lists: ServerLists, allocate: Allocate = heap): ServerSummary {
  const G = lists.gridCount, S = lists.slots;
  const summary = allocateServerSummary(G, allocate);
  summary.bestCell.fill(-1);
  summary.bestDbm.fill(-Infinity);
  for (let g = 0; g < G; g++) {
    if (lists.length[g] === 0) continue;
    const best = lists.dbm[g * S];
    summary.bestCell[g] = lists.cell[g * S];
    summary.bestDbm[g] = best;
    summary.bestMw[g] = dbToLinear(best); // stored as Float32: the gain pass's mW of that RSRP
    summary.others[g] = overlapOthersAt(lists, g);
  }
  return summary;
}

/**
 * Lowest RSRP, per grid segment, that can change what the KPIs read (best server and overlap count): per grid
 * min(best, max(floor, best − Δ)), −Infinity where no cell reaches.
 */
export function summaryBars(summary: ServerSummary, grid: Grid, floorDbm: number, deltaDb: number): Float32Array {
  const bars = new Float32Array(grid.segmentCount);
  for (let seg = 0; seg < grid.segmentCount; seg++) {
    let low = Infinity;
    for (let g = grid.segmentStart[seg], end = grid.segmentStart[seg + 1]; g < end; g++) {
      const bar = kpiBar(summary.bestDbm[g], floorDbm, deltaDb);
      if (bar < low) low = bar;
    }
    bars[seg] = low;
  }
  return bars;
}

function kpiBar(best: number, floor: number, delta: number): number {
  const window = windowBottom(best, delta, floor);
  return best < window ? best : window;
}

// ---------------------------------------------------------------- incremental update

/**
 * What the KPIs read after cells `changed` (indices, each once) took the values of `newCells` (same order) instead
 * of `oldCells`, written into `out`, a range of tiles per call of the returned function. `lists` and `base` are the
 * exact lists of the whole cell set with the old values and their summary; `bars` its summaryBars. A call for
 * tiles [tileFrom, tileTo) needs the new cells' values there (and nowhere else) and writes those grids of `out`
 * only. Only grids where an old or a new changed value reaches the bar are looked at; elsewhere nothing the KPIs
 * read can change. Each call returns the grids (ascending) whose new best server or overlap count cannot be told
 * from the old list and the changed cells alone (a changed cell left a list behind which further cells may hide):
 * resolveSummaryAt must fill them. Exact: once those are resolved, `out` equals the summary of lists built from
 * scratch.
 */
export function summaryUpdater(
  lists: ServerLists,
  base: ServerSummary,
  out: ServerSummary,
  grid: Grid,
  bars: Float32Array,
  changed: readonly number[],
  oldCells: readonly CellRsrp[],
  newCells: readonly CellRsrp[],
  cellCount: number,
): (tileFrom: number, tileTo: number) => Int32Array {
  if (changed.length !== newCells.length || changed.length !== oldCells.length) throw new RangeError("summaryUpdater: one old and one new RSRP set per changed cell");
  const S = lists.slots, floor = lists.floorDbm, delta = lists.deltaDb, storeDelta = lists.storeDeltaDb;
  const isChanged = new Uint8Array(cellCount);
  for (const c of changed) {
    if (!(c >= 0 && c < cellCount)) throw new RangeError(`summaryUpdater: cell index ${c} outside 0…${cellCount - 1}`);
    isChanged[c] = 1;
  }
  for (const cell of oldCells) checkCell(grid, cell);
  for (const cell of newCells) checkCell(grid, cell);
  const K = changed.length;
  // Values per grid, dense (−Infinity where a sparse cell does not reach): the old ones now, the new ones per call.
  const oldValues = oldCells.map((cell) => {
    if (cell.footprint === null) return cell.rsrpDbm;
    const values = new Float32Array(grid.count).fill(-Infinity);
    for (let j = 0; j < cell.footprint.length; j++) values[cell.footprint[j]] = cell.rsrpDbm[j];
    return values;
  });
  const newValues = newCells.map((cell) => (cell.footprint === null ? cell.rsrpDbm : new Float32Array(grid.count)));
  // One grid's list is rebuilt here, in a one-grid scratch list.
  const scratch = listsLike(lists, 1);
  const len = lists.length, listCell = lists.cell, listDbm = lists.dbm;

  return (tileFrom, tileTo) => {
    const gridFrom = grid.tileStart[tileFrom], gridTo = grid.tileStart[tileTo];
    out.bestCell.set(base.bestCell.subarray(gridFrom, gridTo), gridFrom);
    out.bestDbm.set(base.bestDbm.subarray(gridFrom, gridTo), gridFrom);
    out.bestMw.set(base.bestMw.subarray(gridFrom, gridTo), gridFrom);
    out.others.set(base.others.subarray(gridFrom, gridTo), gridFrom);
    newCells.forEach((cell, q) => {
      const fp = cell.footprint;
      if (fp === null) return;
      newValues[q].fill(-Infinity, gridFrom, gridTo);
      for (let j = lowerBound(fp, gridFrom); j < fp.length && fp[j] < gridTo; j++) newValues[q][fp[j]] = cell.rsrpDbm[j];
    });
    const unresolved: number[] = [];
    for (let seg = grid.tileSegmentStart[tileFrom], segEnd = grid.tileSegmentStart[tileTo]; seg < segEnd; seg++) {
      let touched = false;
      for (let q = 0; q < K && !touched; q++) touched = oldCells[q].segmentMaxDbm[seg] >= bars[seg] || newCells[q].segmentMaxDbm[seg] >= bars[seg];
      if (!touched) continue;
      for (let g = grid.segmentStart[seg], end = grid.segmentStart[seg + 1]; g < end; g++) {
        // ---- nothing the KPIs read changes where every old and new changed value stays below the grid's bar
        const bar = kpiBar(base.bestDbm[g], floor, delta);
        let reaches = false;
        for (let q = 0; q < K && !reaches; q++) reaches = oldValues[q][g] >= bar || newValues[q][g] >= bar;
        if (!reaches) continue;
        // ---- the old list without the changed cells, then the new values offered
        const base0 = g * S, n = len[g];
        let kept = 0;
        for (let k = 0; k < n; k++) {
          const c = listCell[base0 + k];
          if (isChanged[c] === 0) {
            scratch.cell[kept] = c;
            scratch.dbm[kept] = listDbm[base0 + k];
            kept++;
          }
        }
        scratch.length[0] = kept;
        for (let q = 0; q < K; q++) offer(scratch, 0, changed[q], newValues[q][g]);
        const m = scratch.length[0];
        if (kept < n) {
          // Something left the list. Unchanged cells outside the old list may now count; what is known of them (one
          // inclusive bound): a full list → ranked after its last entry; else below the old window max(floor, best −
          // Δs), or ranked after the best when the best was below the floor. (Nothing left: the kept list was the
          // exact list of the unchanged cells, and the offers made it exact.)
          const oldBest = listDbm[base0];
          const hiddenBound = n === S ? listDbm[base0 + S - 1] : oldBest >= floor ? windowBottom(oldBest, storeDelta, floor) : oldBest;
          // An entry certainly ranks above every hidden cell when it stayed from the old list or beats the bound.
          let exact = m > 0 && (isChanged[scratch.cell[0]] === 0 || scratch.dbm[0] > hiddenBound);
          if (exact) {
            if (!(hiddenBound < windowBottom(scratch.dbm[0], delta, floor))) {
              // hidden cells could be in the overlap window: fine only if a full list of certain entries ranks above them
              if (m < S) exact = false;
              else for (let k = 1; k < m && exact; k++) if (isChanged[scratch.cell[k]] === 1 && !(scratch.dbm[k] > hiddenBound)) exact = false;
            }
          }
          if (!exact) {
            unresolved.push(g);
            continue;
          }
        }
        if (m === 0) {
          out.bestCell[g] = -1;
          out.bestDbm[g] = -Infinity;
          out.bestMw[g] = 0;
          out.others[g] = 0;
        } else {
          out.bestCell[g] = scratch.cell[0];
          if (out.bestDbm[g] !== scratch.dbm[0]) {
            out.bestDbm[g] = scratch.dbm[0];
            out.bestMw[g] = dbToLinear(scratch.dbm[0]);
          }
          out.others[g] = overlapOthersAt(scratch, 0);
        }
      }
    }
    return Int32Array.from(unresolved);
  };
}

/** A summary's arrays, allocated (on `allocate`'s buffers, e.g. shared memory) and empty. */
export function allocateServerSummary(gridCount: number, allocate: Allocate = heap): ServerSummary {
  return {
    bestCell: new Int32Array(allocate(4 * gridCount)),
    bestDbm: new Float32Array(allocate(4 * gridCount)),
    bestMw: new Float32Array(allocate(4 * gridCount)),
    others: new Uint16Array(allocate(2 * gridCount)),
  };
}

/**
 * Fills the summary at `grids` (ascending) from every cell's value there: valuesOf(c) gives cell c's RSRP at each
 * of `grids` in order (−Infinity where it does not reach), or null when it reaches none of them.
 */
export function resolveSummaryAt(summary: ServerSummary, lists: ServerLists, grids: Int32Array, cellCount: number, valuesOf: (c: number) => ArrayLike<number> | null): void {
  const part = listsLike(lists, grids.length);
  rebuildListsAt(part, Int32Array.from(grids.keys()), cellCount, valuesOf);
  const resolved = summarizeServerLists(part);
  for (let k = 0; k < grids.length; k++) {
    summary.bestCell[grids[k]] = resolved.bestCell[k];
    summary.bestDbm[grids[k]] = resolved.bestDbm[k];
    summary.bestMw[grids[k]] = resolved.bestMw[k];
    summary.others[grids[k]] = resolved.others[k];
  }
}

/**
 * Rebuilds the lists at `grids` (ascending, each emptied) from every cell's value there: valuesOf(c) gives cell c's
 * RSRP at each of `grids` in order (−Infinity where it does not reach), or null when it reaches none of them.
 */
export function rebuildListsAt(lists: ServerLists, grids: Int32Array, cellCount: number, valuesOf: (c: number) => ArrayLike<number> | null): void {
  for (let k = 0; k < grids.length; k++) lists.length[grids[k]] = 0;
  for (let c = 0; c < cellCount; c++) {
    const values = valuesOf(c);
    if (values === null) continue;
    for (let k = 0; k < grids.length; k++) {
      const v = values[k];
      if (v > -Infinity) offer(lists, grids[k], c, v);
    }
  }
}

/** A cell's RSRP at each of `grids` (ascending), −Infinity where a sparse footprint misses. */
export function cellValuesAt(cell: CellRsrp, grids: Int32Array): Float32Array {
  const out = new Float32Array(grids.length);
  const fp = cell.footprint, d = cell.rsrpDbm;
  if (fp === null) {
    for (let k = 0; k < grids.length; k++) out[k] = d[grids[k]];
    return out;
  }
  let j = 0;
  for (let k = 0; k < grids.length; k++) {
    const g = grids[k];
    while (j < fp.length && fp[j] < g) j++;
    out[k] = j < fp.length && fp[j] === g ? d[j] : -Infinity;
  }
  return out;
}

/** Cell c's RSRP at grid g (−Infinity outside a sparse footprint). */
export function cellValueAt(cell: CellRsrp, g: number): number {
  const fp = cell.footprint;
  if (fp === null) return cell.rsrpDbm[g];
  const j = lowerBound(fp, g);
  return j < fp.length && fp[j] === g ? cell.rsrpDbm[j] : -Infinity;
}

function checkCell(grid: Grid, cell: CellRsrp): void {
  const expected = cell.footprint ? cell.footprint.length : grid.count;
  if (cell.rsrpDbm.length !== expected || cell.tileMaxDbm.length !== grid.tileCount || cell.segmentMaxDbm.length !== grid.segmentCount) {
    throw new RangeError(`cell "${cell.cellId}" has ${cell.rsrpDbm.length} values for ${expected} grids (or maxima for another grid)`);
  }
  if (cell.footprint && (!cell.segmentOffsets || cell.segmentOffsets.length !== grid.segmentCount + 1)) {
    throw new RangeError(`cell "${cell.cellId}": a sparse footprint needs segment offsets for ${grid.segmentCount} segments`);
  }
}
