import { describe, expect, it } from "vitest";
import {
  buildServerLists,
  cellValueAt,
  cellValuesAt,
  createServerLists,
  entryBar,
  LIST_MARGIN_DB,
  mergeServerLists,
  offer,
  overlapCountCap,
  resolveSummaryAt,
  sameServerLists,
  summarizeServerLists,
  summaryBars,
  allocateServerSummary,
  summaryUpdater,
  type ListThresholds,
  type ServerLists,
} from "../../../lib/radio/serverLists";
import type { CellRsrp } from "../../../lib/radio/cellRsrp";
import type { Grid } from "../../../lib/radio/grid";
import { cellFromDbm, handGrid, sparseCellFromDbm, withTiles } from "./kpiFixtures";
import { seededRandom } from "../../bench/benchScenario";

const thresholds: ListThresholds = { overlapFloorDbm: -110, overlapDeltaDb: 6, overlapMaxOthers: 3 };

type Entry = { cell: number; dbm: number };

/**
 * The list of grid g straight from its definition: rank all cells, keep the best and the cells inside the window
 * max(floor, best − deltaDb), first `slots`. With deltaDb = Δ + LIST_MARGIN_DB this is what the lists store; with
 * deltaDb = Δ it is the part the KPIs read.
 */
function definitionList(cells: readonly CellRsrp[], g: number, t: ListThresholds, deltaDb = t.overlapDeltaDb + LIST_MARGIN_DB): Entry[] {
  const all: Entry[] = [];
  cells.forEach((c, i) => {
    const v = cellValueAt(c, g);
    if (v > -Infinity) all.push({ cell: i, dbm: v });
  });
  all.sort((a, b) => b.dbm - a.dbm || a.cell - b.cell);
  if (all.length === 0) return [];
  const window = Math.max(t.overlapFloorDbm, all[0].dbm - deltaDb);
  return all.filter((e, i) => i === 0 || e.dbm >= window).slice(0, overlapCountCap(t.overlapMaxOthers) + 1);
}

function listAt(lists: ServerLists, g: number): Entry[] {
  const out = [];
  for (let k = 0; k < lists.length[g]; k++) out.push({ cell: lists.cell[g * lists.slots + k], dbm: lists.dbm[g * lists.slots + k] });
  return out;
}

/** Random cells on a many-tile grid: values on a 0.5 dB lattice (many ties), crowds inside the window, sparse cells. */
function randomNetwork(seed: number, C = 24, n = 700): { grid: Grid; cells: CellRsrp[] } {
  const rnd = seededRandom(seed);
  const grid = withTiles(handGrid(new Array(n).fill(-1)), new Int32Array([0, 64, 65, 190, 400, 401, 700]));
  const cells = Array.from({ length: C }, (_, c) => {
    const centre = Math.floor(rnd() * n);
    const values = Array.from({ length: n }, (_, g) => Math.round(2 * (-70 - 60 * rnd() * Math.min(1, Math.abs(g - centre) / 200) - 8 * rnd())) / 2);
    if (c % 5 !== 4) return cellFromDbm(`c${c}`, values, grid);
    const grids = values.map((_, g) => g).filter(() => rnd() < 0.4);
    return sparseCellFromDbm(`c${c}`, grids, grids.map((g) => values[g]), grid);
  });
  return { grid, cells };
}

function expectDefinition(lists: ServerLists, cells: readonly CellRsrp[], n: number, t = thresholds): void {
  for (let g = 0; g < n; g++) expect(listAt(lists, g), `grid ${g}`).toEqual(definitionList(cells, g, t));
}

describe("server lists", () => {
  it("overlapCountCap(N) is max(7, N + 1)", () => {
    expect(overlapCountCap(3)).toBe(7);
    expect(overlapCountCap(10)).toBe(11);
  });

  it("buildServerLists equals the definition at every grid (dense and sparse cells, ties, crowded windows)", () => {
    for (const seed of [1, 2, 3]) {
      const { grid, cells } = randomNetwork(seed);
      expectDefinition(buildServerLists(grid, cells, thresholds), cells, grid.count);
    }
    // a crowd of 30 cells within 1 dB saturates the list at cap + 1 entries
    const grid = handGrid([-1]);
    const crowd = Array.from({ length: 30 }, (_, c) => cellFromDbm(`k${c}`, [-80 - (c % 3) * 0.5], grid));
    const lists = buildServerLists(grid, crowd, thresholds);
    expect(lists.length[0]).toBe(8);
    expectDefinition(lists, crowd, 1);
  });

  it("keeps the best below the floor alone, ranked first, and breaks ties toward the lower cell index", () => {
    const grid = handGrid([-1, -1]);
    const cells = [cellFromDbm("a", [-115, -90]), cellFromDbm("b", [-113, -90]), cellFromDbm("c", [-200, -95])];
    const lists = buildServerLists(grid, cells, thresholds);
    expect(listAt(lists, 0)).toEqual([{ cell: 1, dbm: -113 }]);
    expect(listAt(lists, 1)).toEqual([{ cell: 0, dbm: -90 }, { cell: 1, dbm: -90 }, { cell: 2, dbm: -95 }]);
  });

  it("the lists depend on the cell set only: shuffled cells (with their indices) build the same lists", () => {
    const { grid, cells } = randomNetwork(4);
    const built = buildServerLists(grid, cells, thresholds);
    const rnd = seededRandom(44);
    for (let trial = 0; trial < 3; trial++) {
      const order = cells.map((_, i) => i).sort(() => rnd() - 0.5);
      const shuffled = buildServerLists(grid, order.map((i) => cells[i]), thresholds, order);
      expect(sameServerLists(shuffled, built)).toBe(true);
    }
  });

  it("entryBar(g) is a true bar: an offer below it changes nothing", () => {
    const { grid, cells } = randomNetwork(5);
    const lists = buildServerLists(grid, cells, thresholds);
    for (let g = 0; g < grid.count; g += 7) {
      const before = listAt(lists, g);
      const bar = entryBar(lists, g);
      if (bar === -Infinity) continue;
      expect(offer(lists, g, 0, bar - 0.01)).toBe(false);
      expect(offer(lists, g, 0, -Infinity)).toBe(false);
      expect(listAt(lists, g)).toEqual(before);
    }
  });

  it("lists of a partition of the cells merge into the lists of the whole", () => {
    const { grid, cells } = randomNetwork(6);
    const parts = [[0, 7], [7, 9], [9, 24]].map(([a, b]) => buildServerLists(grid, cells.slice(a, b), thresholds, Array.from({ length: b - a }, (_, k) => a + k)));
    const merged = createServerLists(grid.count, thresholds);
    for (const part of [parts[2], parts[0], parts[1]]) mergeServerLists(merged, part);
    expect(sameServerLists(merged, buildServerLists(grid, cells, thresholds))).toBe(true);
    const other = createServerLists(grid.count, { ...thresholds, overlapDeltaDb: 3 });
    expect(() => mergeServerLists(other, parts[0])).toThrow(/different grids or thresholds/);
  });

  it("summaryUpdater + resolveSummaryAt equals the summary of lists built from scratch, for random changes of 1 to 6 cells", () => {
    const rnd = seededRandom(77);
    let totalUnresolved = 0, totalGrids = 0;
    for (const seed of [7, 8, 9]) {
      const { grid, cells } = randomNetwork(seed);
      const base = buildServerLists(grid, cells, thresholds);
      const baseSummary = summarizeServerLists(base);
      const frozen = summarizeServerLists(base);
      for (let trial = 0; trial < 6; trial++) {
        const changed = [...new Set(Array.from({ length: 1 + (trial % 6) }, () => Math.floor(rnd() * cells.length)))];
        const next = cells.slice();
        for (const c of changed) {
          // weaker, stronger or shifted copies, keeping the footprint
          const shift = [-30, -8, -3, 0.5, 6, 25][Math.floor(rnd() * 6)];
          const dbm = cells[c].rsrpDbm.map((v) => Math.round(2 * (v + shift + (rnd() - 0.5) * 4)) / 2);
          next[c] = cells[c].footprint ? sparseCellFromDbm(cells[c].cellId, Array.from(cells[c].footprint!), Array.from(dbm), grid) : cellFromDbm(cells[c].cellId, Array.from(dbm), grid);
        }
        // in two tile ranges, as two threads would
        const out = allocateServerSummary(grid.count);
        const bars = summaryBars(baseSummary, grid, base.floorDbm, base.deltaDb);
        const split = 1 + (trial % (grid.tileCount - 1));
        const update = summaryUpdater(base, baseSummary, out, grid, bars, changed, changed.map((c) => cells[c]), changed.map((c) => next[c]), next.length);
        const unresolved = Int32Array.from([...update(split, grid.tileCount), ...update(0, split)]);
        unresolved.sort();
        resolveSummaryAt(out, base, unresolved, next.length, (c) => cellValuesAt(next[c], unresolved));
        expect(out).toEqual(summarizeServerLists(buildServerLists(grid, next, thresholds)));
        totalUnresolved += unresolved.length;
        totalGrids += grid.count;
      }
      // the base and its summary are untouched
      expectDefinition(base, cells, grid.count);
      expect(baseSummary).toEqual(frozen);
    }
    // some grids need every cell's value (so that path is exercised), most do not
    expect(totalUnresolved).toBeGreaterThan(0);
    expect(totalUnresolved).toBeLessThan(0.25 * totalGrids);
  });
});
