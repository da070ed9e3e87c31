import { describe, expect, it } from "vitest";
import { buildGrid } from "../../../lib/radio/grid";
import { computeCellPathLoss } from "../../../lib/radio/pathLossStage";
import { computeCellRsrp } from "../../../lib/radio/cellRsrp";
import { dbToLinear } from "../../../lib/radio/decibel";
import { buildBeamSetGainTable, tableGainDbi } from "../../../lib/radio/beamGainTable";
import { beamSetGainDbi } from "../../../lib/radio/arrayFactor";
import { globalToLocal, compassToTrAzimuthDeg, rotateToLocal } from "../../../lib/radio/orientation";
import { tinyScenario } from "./scenarioFixtures";

const DEG = Math.PI / 180;

describe("computeCellRsrp", () => {
  const scenario = tinyScenario();
  const cell = { ...scenario.cells[0], azimuthDeg: 70, mechanicalTiltDeg: 4 };
  const grid = buildGrid(scenario);
  const pl = computeCellPathLoss(scenario, grid, 0);
  const model = scenario.antennaModels.find((m) => m.id === cell.antennaModelId)!;
  const beams = scenario.beamSets.find((b) => b.id === cell.beamSetId)!.beams;
  const table = buildBeamSetGainTable(model, beams, cell.electricalTiltDeg);
  const r = computeCellRsrp(grid, pl, cell, scenario.sites[0], table);

  it("computeCellRsrp(g) = P_RS + tableGain(local direction) − PL, the table read exactly as tableGainDbi", () => {
    const out = new Float64Array(3);
    const alpha = compassToTrAzimuthDeg(70) * DEG, beta = 4 * DEG;
    for (let g = 0; g < grid.count; g += 7) {
      const dx = grid.x[g] - 5, dy = grid.y[g] - 30, dz = grid.z[g] - 22, d = Math.hypot(dx, dy, dz);
      rotateToLocal(dx / d, dy / d, dz / d, Math.cos(alpha), Math.sin(alpha), Math.cos(beta), Math.sin(beta), out);
      expect(r.rsrpDbm[g]).toBeCloseTo(18 + tableGainDbi(table, out[0], out[1], out[2]) - pl.pathLossDb[g], 4);
    }
  });
  it("computeCellRsrp agrees with the direct TR 38.901 pattern through globalToLocal within 0.3 dB", () => {
    for (let g = 0; g < grid.count; g += 11) {
      const dx = grid.x[g] - 5, dy = grid.y[g] - 30, dz = grid.z[g] - 22;
      const theta = Math.atan2(Math.hypot(dx, dy), dz) / DEG;
      const phi = Math.atan2(dy, dx) / DEG;
      const local = globalToLocal(theta, phi, compassToTrAzimuthDeg(70), 4);
      const direct = 18 + beamSetGainDbi(model, beams, cell.electricalTiltDeg, local.thetaDeg, local.phiDeg) - pl.pathLossDb[g];
      expect(Math.abs(r.rsrpDbm[g] - direct)).toBeLessThan(0.3);
    }
  });
  it("keeps mW equal to Math.fround(dbToLinear) of the stored Float32 dBm, and the per-segment and per-tile maxima", () => {
    for (let g = 0; g < grid.count; g += 13) expect(r.rsrpMw[g]).toBe(Math.fround(dbToLinear(r.rsrpDbm[g])));
    for (let s = 0; s < grid.segmentCount; s++) {
      let m = -Infinity;
      for (let g = grid.segmentStart[s]; g < grid.segmentStart[s + 1]; g++) m = Math.max(m, r.rsrpDbm[g]);
      expect(r.segmentMaxDbm[s]).toBe(m);
    }
    for (let t = 0; t < grid.tileCount; t++) {
      let m = -Infinity;
      for (let g = grid.tileStart[t]; g < grid.tileStart[t + 1]; g++) m = Math.max(m, r.rsrpDbm[g]);
      expect(r.tileMaxDbm[t]).toBe(m);
    }
  });
  it("a sparse footprint gets the same RSRP at its grids, and segment offsets locating them", () => {
    const sparse = computeCellRsrp(grid, computeCellPathLoss(scenario, grid, 0, { radiusM: 40 }), cell, scenario.sites[0], table);
    const fp = sparse.footprint!;
    expect(fp.length).toBeGreaterThan(0);
    expect(fp.length).toBeLessThan(grid.count);
    for (let j = 0; j < fp.length; j++) expect(sparse.rsrpDbm[j]).toBe(r.rsrpDbm[fp[j]]);
    const offsets = sparse.segmentOffsets!;
    for (let s = 0; s < grid.segmentCount; s++) {
      for (let j = offsets[s]; j < offsets[s + 1]; j++) {
        expect(fp[j]).toBeGreaterThanOrEqual(grid.segmentStart[s]);
        expect(fp[j]).toBeLessThan(grid.segmentStart[s + 1]);
      }
    }
    expect(offsets[grid.segmentCount]).toBe(fp.length);
  });
});

describe("dbToLinear", () => {
  it("dbToLinear(x) = 10^(x/10) within 1e-8 relative from −200 to +60 dB, 0 far below Float32 range", () => {
    for (let x = -200; x <= 60; x += 0.0137) expect(Math.abs(dbToLinear(x) / Math.pow(10, x / 10) - 1)).toBeLessThan(1e-8);
    expect(dbToLinear(-600)).toBe(0);
  });
});
