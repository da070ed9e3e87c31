// Antenna models and beam sets used by the demo town. Kept here as plain data so
// that lib/io does not depend on the radio catalogue while both are being written;
// the lead may replace these with the lib/radio catalogue once it exists.
//
// Element values follow the shape of 3GPP TR 38.901 Table 7.3-1 (65° beamwidths,
// 8 dBi, 30 dB front-to-back and side-lobe floor) where an entry says "38.901";
// the other beamwidths, array sizes and ranges are invented but typical of common
// practice for macro panels (recalled from general knowledge, not from a datasheet).

import type { AntennaModel, Beam, BeamSet } from "../radio/scenario";

/** Builds a rectangular fan of beams: every azimuth offset at every elevation offset. */
function fan(azimuthOffsetsDeg: number[], elevationOffsetsDeg: number[], widthDeg: number): Beam[] {
  const beams: Beam[] = [];
  for (const elevationOffsetDeg of elevationOffsetsDeg) {
    for (const azimuthOffsetDeg of azimuthOffsetsDeg) {
      beams.push({ azimuthOffsetDeg, elevationOffsetDeg, widthDeg });
    }
  }
  return beams;
}

export const DEMO_BEAM_SETS: BeamSet[] = [
  {
    id: "broad-single",
    name: "Broad single",
    description: "One wide beam over the whole sector; the classic macro sector shape.",
    beams: fan([0], [0], 65),
  },
  {
    id: "wide-pair",
    name: "Wide pair",
    description: "Two broad beams either side of boresight, for suburban sectors.",
    beams: fan([-25, 25], [0], 35),
  },
  {
    id: "horizontal-sweep-8",
    name: "Horizontal sweep (8)",
    description: "Eight narrow beams swept across ±52.5° at one elevation, for open streets and squares.",
    beams: fan([-52.5, -37.5, -22.5, -7.5, 7.5, 22.5, 37.5, 52.5], [0], 15),
  },
  {
    id: "high-rise-stack",
    name: "High-rise stack",
    description: "Four azimuths at three elevations, two of them raised, to reach upper floors of nearby towers.",
    beams: fan([-30, -10, 10, 30], [-14, -7, 0], 20),
  },
  {
    id: "corridor-narrow",
    name: "Narrow corridor",
    description: "Two narrow beams close to boresight, for a street or waterfront corridor.",
    beams: fan([-6, 6], [0], 12),
  },
  {
    id: "dual-layer",
    name: "Dual layer",
    description: "Four azimuths at two elevations (near and far ring).",
    beams: fan([-37.5, -12.5, 12.5, 37.5], [0, 8], 25),
  },
];

export const DEMO_ANTENNA_MODELS: AntennaModel[] = [
  {
    id: "passive-8x1-1800",
    name: "Passive panel 8×1, 1800 MHz",
    // Element per 38.901 Table 7.3-1.
    elementHBeamwidthDeg: 65,
    elementVBeamwidthDeg: 65,
    elementGainDbi: 8,
    frontToBackDb: 30,
    sideLobeLevelDb: 30,
    rows: 8,
    columns: 1,
    verticalSpacingWl: 0.8,
    horizontalSpacingWl: 0.5,
    electricalTiltMinDeg: 0,
    electricalTiltMaxDeg: 10,
    mechanicalTiltMinDeg: -2,
    mechanicalTiltMaxDeg: 10,
    rsPowerMinDbm: 6,
    rsPowerMaxDbm: 20,
    beamSetIds: ["broad-single"],
  },
  {
    id: "passive-8x2-1800",
    name: "Passive panel 8×2, 1800 MHz",
    elementHBeamwidthDeg: 65,
    elementVBeamwidthDeg: 65,
    elementGainDbi: 8,
    frontToBackDb: 30,
    sideLobeLevelDb: 30,
    rows: 8,
    columns: 2,
    verticalSpacingWl: 0.8,
    horizontalSpacingWl: 0.5,
    electricalTiltMinDeg: 0,
    electricalTiltMaxDeg: 12,
    mechanicalTiltMinDeg: -2,
    mechanicalTiltMaxDeg: 10,
    rsPowerMinDbm: 6,
    rsPowerMaxDbm: 20,
    beamSetIds: ["broad-single", "wide-pair"],
  },
  {
    id: "active-4x8-3500",
    name: "Active array 4×8, 3500 MHz",
    elementHBeamwidthDeg: 90,
    elementVBeamwidthDeg: 65,
    elementGainDbi: 8,
    frontToBackDb: 30,
    sideLobeLevelDb: 30,
    rows: 4,
    columns: 8,
    verticalSpacingWl: 0.7,
    horizontalSpacingWl: 0.5,
    electricalTiltMinDeg: 0,
    electricalTiltMaxDeg: 15,
    mechanicalTiltMinDeg: 0,
    mechanicalTiltMaxDeg: 10,
    rsPowerMinDbm: 8,
    rsPowerMaxDbm: 24,
    beamSetIds: [
      "broad-single",
      "wide-pair",
      "horizontal-sweep-8",
      "high-rise-stack",
      "corridor-narrow",
      "dual-layer",
    ],
  },
  {
    id: "active-8x8-3500",
    name: "Active array 8×8, 3500 MHz",
    elementHBeamwidthDeg: 90,
    elementVBeamwidthDeg: 65,
    elementGainDbi: 8,
    frontToBackDb: 30,
    sideLobeLevelDb: 30,
    rows: 8,
    columns: 8,
    verticalSpacingWl: 0.7,
    horizontalSpacingWl: 0.5,
    electricalTiltMinDeg: 0,
    electricalTiltMaxDeg: 15,
    mechanicalTiltMinDeg: 0,
    mechanicalTiltMaxDeg: 10,
    rsPowerMinDbm: 8,
    rsPowerMaxDbm: 24,
    beamSetIds: ["broad-single", "horizontal-sweep-8", "high-rise-stack", "corridor-narrow", "dual-layer"],
  },
  {
    id: "compact-2x4-3500",
    name: "Compact array 2×4, 3500 MHz",
    elementHBeamwidthDeg: 90,
    elementVBeamwidthDeg: 80,
    elementGainDbi: 6,
    frontToBackDb: 25,
    sideLobeLevelDb: 25,
    rows: 2,
    columns: 4,
    verticalSpacingWl: 0.7,
    horizontalSpacingWl: 0.5,
    electricalTiltMinDeg: 0,
    electricalTiltMaxDeg: 10,
    mechanicalTiltMinDeg: 0,
    mechanicalTiltMaxDeg: 15,
    rsPowerMinDbm: 4,
    rsPowerMaxDbm: 18,
    beamSetIds: ["broad-single", "wide-pair", "corridor-narrow"],
  },
];
