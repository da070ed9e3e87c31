// A small hand-made network for database tests: two sites, three cells, two buildings,
// one cluster. Invented values; only the shapes matter here.
import { DEFAULT_SETTINGS, type Scenario } from "../../lib/radio/scenario";

export function tinyScenario(name = "Test Bay"): Scenario {
  const width = 20;
  const height = 10;
  return {
    name,
    bounds: { minX: 0, minY: 0, maxX: 200, maxY: 100 },
    terrain: { originX: 0, originY: 0, cellSize: 10, width, height, values: Float32Array.from({ length: width * height }, (_, i) => (i % width) * 0.25) },
    antennaModels: [
      {
        id: "panel-8x4", name: "Test panel", elementHBeamwidthDeg: 65, elementVBeamwidthDeg: 65, elementGainDbi: 8,
        frontToBackDb: 30, sideLobeLevelDb: 30, rows: 8, columns: 4, verticalSpacingWl: 0.8, horizontalSpacingWl: 0.5,
        electricalTiltMinDeg: 0, electricalTiltMaxDeg: 15, mechanicalTiltMinDeg: -5, mechanicalTiltMaxDeg: 15,
        rsPowerMinDbm: 0, rsPowerMaxDbm: 24, beamSetIds: ["broad-single", "horizontal-sweep-8"],
      },
    ],
    beamSets: [
      { id: "broad-single", name: "Broad single", description: "one wide beam", beams: [{ azimuthOffsetDeg: 0, elevationOffsetDeg: 0, widthDeg: 65 }] },
      {
        id: "horizontal-sweep-8", name: "Horizontal sweep", description: "eight narrow beams",
        beams: Array.from({ length: 8 }, (_, i) => ({ azimuthOffsetDeg: -52.5 + i * 15, elevationOffsetDeg: 0, widthDeg: 15 })),
      },
    ],
    sites: [
      { id: "S1", name: "North quay", x: 50, y: 50, groundHeightM: 1.5 },
      { id: "S2", name: "Old mill", x: 150, y: 50, groundHeightM: 3.75 },
    ],
    cells: [
      { id: "S1-A", siteId: "S1", antennaModelId: "panel-8x4", antennaHeightM: 25, azimuthDeg: 0, mechanicalTiltDeg: 2, electricalTiltDeg: 4, beamSetId: "broad-single", rsPowerDbm: 15.2, frequencyMHz: 1800, bandwidthMHz: 20, subcarrierSpacingKHz: 15 },
      { id: "S1-B", siteId: "S1", antennaModelId: "panel-8x4", antennaHeightM: 25, azimuthDeg: 120, mechanicalTiltDeg: 2, electricalTiltDeg: 6, beamSetId: "horizontal-sweep-8", rsPowerDbm: 15.2, frequencyMHz: 1800, bandwidthMHz: 20, subcarrierSpacingKHz: 15 },
      { id: "S2-A", siteId: "S2", antennaModelId: "panel-8x4", antennaHeightM: 30, azimuthDeg: 270.5, mechanicalTiltDeg: 0, electricalTiltDeg: 3, beamSetId: "broad-single", rsPowerDbm: 18, frequencyMHz: 3500, bandwidthMHz: 40, subcarrierSpacingKHz: 30 },
    ],
    buildings: [
      { id: "B1", footprint: [{ x: 80, y: 20 }, { x: 100, y: 20 }, { x: 100, y: 40 }, { x: 80, y: 40 }], heightM: 13, floors: 4 },
      { id: "B2", footprint: [{ x: 110, y: 60 }, { x: 130, y: 60 }, { x: 120, y: 80 }], heightM: 4, floors: 1 },
    ],
    clusters: [{ id: "K1", name: "Whole bay", polygon: [{ x: 0, y: 0 }, { x: 200, y: 0 }, { x: 200, y: 100 }, { x: 0, y: 100 }] }],
    settings: { ...DEFAULT_SETTINGS },
  };
}
