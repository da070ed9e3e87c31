import { describe, expect, it } from "vitest";
import { computeKpis, type KpiThresholds } from "../../../lib/radio/kpi";
import { compareRuns } from "../../../lib/radio/impact";
import { handGrid, cellFromDbm } from "./kpiFixtures";

const thresholds: KpiThresholds = { coverageThresholdDbm: -105, overlapDeltaDb: 6, overlapMaxOthers: 1, overlapFloorDbm: -110, interferenceThresholdDb: 0 };
const noiseMw = new Float64Array([1e-12, 1e-12, 1e-12]);
const clusters = [{ id: "K0", name: "zero" }];

describe("compareRuns", () => {
  const grid = handGrid([0, 0, 0, -1, 0]);
  const before = computeKpis({ grid, noiseMw, clusters, thresholds, cells: [
    cellFromDbm("A", [-100, -70, -80, -90, -70]),
    cellFromDbm("B", [-120, -90, -95, -120, -120]),
    cellFromDbm("C", [-120, -90, -120, -120, -120]),
  ] });
  // after: grid 0 loses coverage (−100 → −107, a 7 dB drop); grid 1 loses overlap (B, C rise within 6 dB);
  // grid 2 loses overlap and interference (B −79 overtakes A −80, C joins at −80: SINR = 10^−7.9 / 2·10^−8 → −2.0 dB);
  // grid 3 drops 3 dB only (not a worst grid); grid 4 is unchanged
  const after = computeKpis({ grid, noiseMw, clusters, thresholds, cells: [
    cellFromDbm("A", [-107, -70, -80, -93, -70]),
    cellFromDbm("B", [-120, -74, -79, -120, -120]),
    cellFromDbm("C", [-120, -75, -80, -120, -120]),
  ] });
  const report = compareRuns(grid, ["A", "B", "C"], ["K0"], before, after, { worstGridDropDb: 6 });

  it("compareRuns lists the grids that got worse, with reasons, ranked by lost conditions then RSRP drop", () => {
    expect(report.worstGrids.map((w) => [w.gridIndex, w.reasons])).toEqual([
      [2, ["overlap-lost", "interference-lost"]],
      [0, ["coverage-lost", "rsrp-drop"]],
      [1, ["overlap-lost"]],
    ]);
    expect(report.worstGridTotal).toBe(3);
    expect([report.worstGrids[0].servingCellBefore, report.worstGrids[0].servingCellAfter]).toEqual(["A", "B"]);
    const w = report.worstGrids[1];
    expect([w.x, w.y, w.floor, w.clusterId, w.servingCellBefore, w.servingCellAfter]).toEqual([2.5, 2.5, 0, "K0", "A", "A"]);
    expect([w.bestRsrpBeforeDbm, w.bestRsrpAfterDbm]).toEqual([-100, -107]);
  });
  it("compareRuns gives deltas as after − before for the network and each cluster", () => {
    expect(report.network.delta.coverageRatio).toBeCloseTo(after.network.coverageRatio! - before.network.coverageRatio!, 15);
    expect(report.network.delta.meanBestRsrpDbm).toBeCloseTo((-7 + 1 - 3) / 5, 9);
    expect(report.clusters[0].delta.overlapRatio).toBeCloseTo(-0.5, 12);
    expect(report.network.delta.weighted).toBeNull();
  });
  it("compareRuns honours the limit and keeps the full count", () => {
    const limited = compareRuns(grid, ["A", "B", "C"], ["K0"], before, after, { worstGridDropDb: 6, limit: 1 });
    expect(limited.worstGrids.map((w) => w.gridIndex)).toEqual([2]);
    expect(limited.worstGridTotal).toBe(3);
    expect(() => compareRuns(grid, [], [], before, after, { worstGridDropDb: 6, limit: -1 })).toThrow(RangeError);
  });
});
