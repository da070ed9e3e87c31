import { describe, expect, it } from "vitest";
import type { Scenario } from "../../lib/radio/scenario";
import { DEFAULT_SETTINGS } from "../../lib/radio/scenario";
import { ANTENNA_MODEL_CATALOGUE, BEAM_SET_CATALOGUE } from "../../lib/radio/beamSets";
import { prepareEngine } from "../../lib/radio/engine";

// Common practice (not a published standard): properties an RF engineer expects of any coverage model.

function flatScenario(cells: Scenario["cells"], sites: Scenario["sites"], size: number, gridSizeM = 10): Scenario {
  return {
    name: "flat",
    bounds: { minX: 0, minY: 0, maxX: size, maxY: size },
    terrain: { originX: 0, originY: 0, cellSize: size, width: 1, height: 1, values: new Float32Array([0]) },
    antennaModels: ANTENNA_MODEL_CATALOGUE.map((m) => ({ ...m })),
    beamSets: BEAM_SET_CATALOGUE.map((b) => ({ ...b })),
    sites,
    cells,
    buildings: [],
    clusters: [],
    settings: { ...DEFAULT_SETTINGS, gridSizeM },
  };
}

describe("common practice on flat open ground", () => {
  // A planned layout: 3 × 3 three-sector sites 500 m apart, 25 m masts, 6° electrical tilt (the main beam meets
  // the ground ~240 m out, inside the cell). Tilting further down pulls the footprint in. (In a badly planned
  // network — beams at the horizon, overshooting neighbours, upward beams — a cell can gain near grids that sat
  // in its first vertical null, so the property is a planning rule, not a law.)
  it("more downtilt never enlarges a cell's best-server area (electrical and mechanical, planned layout)", () => {
    const sites = [];
    const cells = [];
    for (let r = 0; r < 3; r++) {
      for (let c = 0; c < 3; c++) {
        const id = `M${r}${c}`;
        sites.push({ id, name: id, x: 250 + 500 * c, y: 250 + 500 * r, groundHeightM: 0 });
        for (let k = 0; k < 3; k++) {
          cells.push({
            id: `${id}-${k}`, siteId: id, antennaModelId: "panel-8x4", antennaHeightM: 25, azimuthDeg: (30 + 120 * k) % 360,
            mechanicalTiltDeg: 0, electricalTiltDeg: 6, beamSetId: "broad-single", rsPowerDbm: 18,
            frequencyMHz: 3500, bandwidthMHz: 20, subcarrierSpacingKHz: 30,
          });
        }
      }
    }
    const scenario = flatScenario(cells, sites, 1500, 10);
    const engine = prepareEngine(scenario);
    // the three cells of the centre site
    for (const cellIndex of [12, 13, 14]) {
      const cell = scenario.cells[cellIndex];
      for (const [parameter, from, to] of [["electricalTiltDeg", 6, 15], ["mechanicalTiltDeg", 0, 10]] as const) {
        let previous = Infinity;
        for (let tilt = from; tilt <= to; tilt += 1) {
          const run = engine.evaluate([{ cellId: cell.id, parameter, value: tilt }]);
          const area = run.kpis.cells[cellIndex].bestServerAreaM2;
          expect(area, `${cell.id} ${parameter} ${tilt}`).toBeLessThanOrEqual(previous);
          previous = area;
        }
      }
    }
  });

  it("three identical cells at 0°, 120°, 240° on one mast split best-server areas at ±60° from each boresight (within one grid)", () => {
    const size = 1000, grid = 10;
    const site = { id: "M", name: "mast", x: 500, y: 500, groundHeightM: 0 };
    const cells = [0, 120, 240].map((azimuthDeg, i) => ({
      id: `C${i}`, siteId: "M", antennaModelId: "panel-8x4", antennaHeightM: 30, azimuthDeg, mechanicalTiltDeg: 2,
      electricalTiltDeg: 4, beamSetId: "broad-single", rsPowerDbm: 18, frequencyMHz: 3500, bandwidthMHz: 20, subcarrierSpacingKHz: 30,
    }));
    const engine = prepareEngine(flatScenario(cells, [site], size, grid));
    const g = engine.grid, best = engine.baseline.kpis.perGrid.bestCell;
    let checked = 0;
    for (let i = 0; i < g.count; i++) {
      const dx = g.x[i] - 500, dy = g.y[i] - 500;
      const r = Math.hypot(dx, dy);
      if (r < 200 || r > 480) continue;
      const bearing = ((Math.atan2(dx, dy) * 180) / Math.PI + 360) % 360;
      const tolerance = ((grid * Math.SQRT1_2) / r) * (180 / Math.PI); // half a grid diagonal, seen from the mast
      const boundaries = [60, 180, 300];
      if (boundaries.some((b) => Math.abs(bearing - b) <= tolerance)) continue;
      const expected = bearing < 60 || bearing > 300 ? 0 : bearing < 180 ? 1 : 2;
      expect(best[i], `grid at bearing ${bearing.toFixed(2)}°, r ${r.toFixed(0)} m`).toBe(expected);
      checked++;
    }
    expect(checked).toBeGreaterThan(1500);
  });
});
