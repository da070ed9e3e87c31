import { describe, expect, it } from "vitest";
import { computeKpis, type KpiThresholds } from "../../../lib/radio/kpi";
import type { CellRsrp } from "../../../lib/radio/cellRsrp";
import { overlapCountCap } from "../../../lib/radio/serverLists";
import { handGrid, cellFromDbm, sparseCellFromDbm, withTiles } from "./kpiFixtures";
import { seededRandom } from "../../bench/benchScenario";

const thresholds: KpiThresholds = { coverageThresholdDbm: -105, overlapDeltaDb: 6, overlapMaxOthers: 3, overlapFloorDbm: -110, interferenceThresholdDb: 0 };

/** Brute force per grid, straight from the definitions, for comparison. */
function bruteForce(cells: CellRsrp[], n: number, noise: number) {
  const out = [];
  for (let g = 0; g < n; g++) {
    let best = -Infinity, bc = -1;
    cells.forEach((c, i) => {
      if (c.rsrpDbm[g] > best) { best = c.rsrpDbm[g]; bc = i; }
    });
    let others = 0, interference = 0;
    cells.forEach((c, i) => {
      if (i === bc) return;
      if (c.rsrpDbm[g] >= thresholds.overlapFloorDbm && c.rsrpDbm[g] >= best - thresholds.overlapDeltaDb) others++;
      interference += c.rsrpMw[g];
    });
    out.push({ best, bc, others, sinr: 10 * Math.log10(cells[bc].rsrpMw[g] / (interference + noise)) });
  }
  return out;
}

describe("computeKpis", () => {
  it("computeKpis equals the brute-force definitions on random data over many tiles (the tile pruning is exact)", () => {
    const rnd = seededRandom(4);
    const n = 600, C = 9;
    const grid = withTiles(handGrid(new Array(n).fill(0).map(() => Math.floor(rnd() * 3) - 1)), new Int32Array([0, 37, 200, 201, 480, 600]));
    // cells strong in different tiles, so pruning has work to skip
    const cells = Array.from({ length: C }, (_, c) =>
      cellFromDbm(`c${c}`, Array.from({ length: n }, (_, g) => -60 - 40 * rnd() - (Math.abs(Math.floor(g / 120) - (c % 5)) * 25)), grid),
    );
    const result = computeKpis({ grid, cells, noiseMw: new Float64Array(C).fill(1e-12), clusters: [{ id: "a", name: "a" }, { id: "b", name: "b" }], thresholds });
    const expected = bruteForce(cells, n, 1e-12);
    expected.forEach((e, g) => {
      expect(result.perGrid.bestCell[g]).toBe(e.bc);
      expect(result.perGrid.bestRsrpDbm[g]).toBe(Math.fround(e.best));
      expect(result.perGrid.overlapOthers[g]).toBe(Math.min(e.others, overlapCountCap(thresholds.overlapMaxOthers)));
      expect(result.perGrid.sinrDb[g]).toBeCloseTo(e.sinr, 4);
    });
    expect(result.network.gridCount).toBe(n);
    expect(result.clusters[0].gridCount + result.clusters[1].gridCount).toBe(Array.from(grid.clusterIndex).filter((k) => k >= 0).length);
  });
  it("computeKpis breaks ties for best server toward the lower cell index and counts the tie as overlap", () => {
    const grid = handGrid([0]);
    const result = computeKpis({ grid, cells: [cellFromDbm("a", [-80]), cellFromDbm("b", [-80])], noiseMw: new Float64Array([1e-12, 1e-12]), clusters: [], thresholds });
    expect(result.perGrid.bestCell[0]).toBe(0);
    expect(result.perGrid.overlapOthers[0]).toBe(1);
  });
  it("computeKpis: coverage is inclusive at the threshold, and a grid no cell reaches fails coverage and interference but passes overlap", () => {
    const grid = handGrid([-1, -1]);
    const covered = cellFromDbm("a", [-105, -150]);
    // a sparse cell that reaches only grid 0
    const sparse = sparseCellFromDbm("b", [0], [-120], grid);
    const r1 = computeKpis({ grid, cells: [covered, sparse], noiseMw: new Float64Array([1e-12, 1e-12]), clusters: [], thresholds });
    expect(r1.perGrid.flags[0] & 1).toBe(1);
    const onlySparse = computeKpis({ grid, cells: [sparse], noiseMw: new Float64Array([1e-12]), clusters: [], thresholds });
    expect(onlySparse.perGrid.bestCell[1]).toBe(-1);
    expect(onlySparse.perGrid.bestRsrpDbm[1]).toBe(-Infinity);
    expect(onlySparse.perGrid.flags[1]).toBe(2); // overlap only
    expect(onlySparse.network.meanBestRsrpDbm).toBe(-120); // the unreached grid is skipped in the mean
    expect(onlySparse.network.coverageRatio).toBe(0);
  });
  it("computeKpis counts best-server area on the lowest layer only, grids on every layer", () => {
    const grid = handGrid([-1, -1, -1], null, [1, 2, 0]);
    const r = computeKpis({ grid, cells: [cellFromDbm("a", [-70, -70, -70])], noiseMw: new Float64Array([1e-12]), clusters: [], thresholds });
    expect(r.cells[0]).toEqual({ cellId: "a", bestServerAreaM2: 50, bestServerGridCount: 3 });
  });
  it("computeKpis refuses arrays that do not match the grid", () => {
    const grid = handGrid([0, 0]);
    expect(() => computeKpis({ grid, cells: [cellFromDbm("a", [-70])], noiseMw: new Float64Array([1e-12]), clusters: [], thresholds })).toThrow(/cell "a"/);
  });
});
