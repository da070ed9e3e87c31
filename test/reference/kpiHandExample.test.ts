import { describe, expect, it } from "vitest";
import { computeKpis, GRID_COVERED, GRID_OVERLAP_OK, GRID_INTERFERENCE_OK } from "../../lib/radio/kpi";
import { handGrid, cellFromDbm } from "../unit/radio/kpiFixtures";

// Source: DESIGN.md §2 "KPIs per grid" definitions, computed by hand below (3 cells A, B, C; 4 grids).
// Thresholds: coverage −105 dBm, overlap Δ = 6 dB, N = 1, floor −110 dBm, interference 0 dB; noise 1e-12 mW (−120 dBm).
//
// grid  A     B     C     best     covered  window max(−110, best−6)  others  overlap  SINR = best/(others + noise)
// g0   −70   −73   −90   A −70    yes      −76: B                     1       pass     1e-7/(5.0119e-8 + 1e-9 + 1e-12) → 2.9141 dB pass
// g1  −100  −104  −106   A −100   yes      −106: B, C (inclusive)     2       FAIL     1e-10/(3.9811e-11 + 2.5119e-11 + 1e-12) → 1.8092 dB pass
// g2  −108  −107  −125   B −107   no       −110: A                    1       pass     1.9953e-11/(1.5849e-11 + 3.1623e-13 + 1e-12) → 0.6535 dB pass
// g3  −130  −128  −140   B −128   no       −110: none (best < floor)  0       pass     1.5849e-13/(1e-13 + 1e-14 + 1e-12) → −8.4532 dB FAIL
// coverage 2/4 = 0.5, overlap 3/4 = 0.75, interference 3/4 = 0.75; mean best (−70 −100 −107 −128)/4 = −101.25 dBm;
// mean SINR (2.9141 + 1.8092 + 0.6535 − 8.4532)/4 = −0.7691 dB; best sorted −128, −107, −100, −70 → R-7:
// p5 = −128 + 0.15·21 = −124.85, p50 = −107 + 0.5·7 = −103.5, p95 = −100 + 0.85·30 = −74.5.
// Weights 1, 2, 3, 4: coverage (1+2)/10 = 0.3, overlap (1+3+4)/10 = 0.8, interference (1+2+3)/10 = 0.6,
// weighted mean best (−70 − 200 − 321 − 512)/10 = −110.3 dBm.
// Clusters: g0, g1 in cluster 0; g2 in cluster 1; g3 in none. Best-server area: A and B two grids × 25 m² each.
describe("computeKpis on the hand-computed three-cell, four-grid example", () => {
  const grid = handGrid([0, 0, 1, -1], [1, 2, 3, 4]);
  const cells = [
    cellFromDbm("A", [-70, -100, -108, -130]),
    cellFromDbm("B", [-73, -104, -107, -128]),
    cellFromDbm("C", [-90, -106, -125, -140]),
  ];
  const result = computeKpis({
    grid,
    cells,
    noiseMw: new Float64Array([1e-12, 1e-12, 1e-12]),
    clusters: [{ id: "K0", name: "zero" }, { id: "K1", name: "one" }],
    thresholds: { coverageThresholdDbm: -105, overlapDeltaDb: 6, overlapMaxOthers: 1, overlapFloorDbm: -110, interferenceThresholdDb: 0 },
  });

  it("computeKpis gives the per-grid best server, counts, SINR and flags of the table", () => {
    expect(Array.from(result.perGrid.bestCell)).toEqual([0, 0, 1, 1]);
    expect(Array.from(result.perGrid.bestRsrpDbm)).toEqual([-70, -100, -107, -128]);
    expect(Array.from(result.perGrid.overlapOthers)).toEqual([1, 2, 1, 0]);
    const sinr = [2.9141, 1.8092, 0.6535, -8.4532];
    sinr.forEach((s, g) => expect(result.perGrid.sinrDb[g]).toBeCloseTo(s, 3));
    const all = GRID_COVERED | GRID_OVERLAP_OK | GRID_INTERFERENCE_OK;
    expect(Array.from(result.perGrid.flags)).toEqual([all, GRID_COVERED | GRID_INTERFERENCE_OK, GRID_OVERLAP_OK | GRID_INTERFERENCE_OK, GRID_OVERLAP_OK]);
  });
  it("computeKpis gives the network ratios, means and R-7 percentiles of the table", () => {
    const n = result.network;
    expect(n.gridCount).toBe(4);
    expect(n.coverageRatio).toBe(0.5);
    expect(n.overlapRatio).toBe(0.75);
    expect(n.interferenceRatio).toBe(0.75);
    expect(n.meanBestRsrpDbm).toBeCloseTo(-101.25, 9);
    expect(n.meanSinrDb!).toBeCloseTo(-0.7691, 3);
    expect(n.p5BestRsrpDbm!).toBeCloseTo(-124.85, 9);
    expect(n.p50BestRsrpDbm!).toBeCloseTo(-103.5, 9);
    expect(n.p95BestRsrpDbm!).toBeCloseTo(-74.5, 9);
  });
  it("computeKpis gives the traffic-weighted ratios of the table", () => {
    const w = result.network.weighted!;
    expect(w.totalWeight).toBe(10);
    expect(w.coverageRatio).toBeCloseTo(0.3, 12);
    expect(w.overlapRatio).toBeCloseTo(0.8, 12);
    expect(w.interferenceRatio).toBeCloseTo(0.6, 12);
    expect(w.meanBestRsrpDbm!).toBeCloseTo(-110.3, 9);
  });
  it("computeKpis splits the ratios per cluster and the best-server areas per cell", () => {
    expect(result.clusters.map((c) => [c.clusterId, c.gridCount, c.coverageRatio, c.overlapRatio, c.interferenceRatio])).toEqual([
      ["K0", 2, 1, 0.5, 1],
      ["K1", 1, 0, 1, 1],
    ]);
    expect(result.cells.map((c) => [c.cellId, c.bestServerAreaM2])).toEqual([["A", 50], ["B", 50], ["C", 0]]);
  });
});
