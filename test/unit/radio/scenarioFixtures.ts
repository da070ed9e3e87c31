// A tiny hand-made scenario for grid / path-loss tests: 100 m × 60 m, flat ground at 10 m, one building.
import type { Scenario } from "../../../lib/radio/scenario";
import { DEFAULT_SETTINGS } from "../../../lib/radio/scenario";
import { ANTENNA_MODEL_CATALOGUE, BEAM_SET_CATALOGUE } from "../../../lib/radio/beamSets";

export function tinyScenario(overrides: Partial<Scenario> = {}): Scenario {
  return {
    name: "tiny",
    bounds: { minX: 0, minY: 0, maxX: 100, maxY: 60 },
    terrain: { originX: 0, originY: 0, cellSize: 50, width: 2, height: 2, values: new Float32Array([10, 10, 10, 10]) },
    antennaModels: ANTENNA_MODEL_CATALOGUE.map((m) => ({ ...m })),
    beamSets: BEAM_SET_CATALOGUE.map((b) => ({ ...b })),
    sites: [{ id: "S1", name: "mast", x: 5, y: 30, groundHeightM: 10 }],
    cells: [
      {
        id: "C1", siteId: "S1", antennaModelId: "panel-8x4", antennaHeightM: 12, azimuthDeg: 90, mechanicalTiltDeg: 0,
        electricalTiltDeg: 2, beamSetId: "broad-single", rsPowerDbm: 18, frequencyMHz: 3500, bandwidthMHz: 20, subcarrierSpacingKHz: 30,
      },
    ],
    // a 20 m × 20 m, 3-floor, 10 m tall block between x = 40 and 60, y = 20 and 40
    buildings: [{ id: "B1", footprint: [{ x: 40, y: 20 }, { x: 60, y: 20 }, { x: 60, y: 40 }, { x: 40, y: 40 }], heightM: 10, floors: 3 }],
    clusters: [{ id: "K1", name: "east", polygon: [{ x: 50, y: 0 }, { x: 100, y: 0 }, { x: 100, y: 60 }, { x: 50, y: 60 }] }],
    settings: { ...DEFAULT_SETTINGS, gridSizeM: 5 },
    ...overrides,
  };
}
