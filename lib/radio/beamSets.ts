// Default catalogue of beam sets and antenna models (data, our own names). lib/io's demo generator and the
// database seed copy these into scenarios; the engine itself only uses what a scenario carries.
import type { AntennaModel, Beam, BeamSet } from "./scenario";

function sweep(offsets: readonly number[], elevationOffsetDeg: number, widthDeg: number): Beam[] {
  return offsets.map((azimuthOffsetDeg) => ({ azimuthOffsetDeg, elevationOffsetDeg, widthDeg }));
}

export const BEAM_SET_CATALOGUE: readonly BeamSet[] = [
  {
    id: "broad-single",
    name: "Broad single beam",
    description: "One sector-wide beam at boresight; the classic wide sector.",
    beams: sweep([0], 0, 65),
  },
  {
    id: "wide-pair",
    name: "Wide pair",
    description: "Two broad beams 25° either side of boresight, for suburban sectors.",
    beams: sweep([-25, 25], 0, 35),
  },
  {
    id: "horizontal-sweep-8",
    name: "Horizontal sweep, 8 beams",
    description: "Eight narrow beams 15° apart across ±52.5° of the sector, all at the electrical tilt.",
    beams: sweep([-52.5, -37.5, -22.5, -7.5, 7.5, 22.5, 37.5, 52.5], 0, 15),
  },
  {
    id: "high-rise-stack",
    name: "High-rise stack",
    description: "Three azimuths × three elevations (0°, 6°, 12° up) for tall buildings near the site.",
    beams: [0, -6, -12].flatMap((elevation) => sweep([-20, 0, 20], elevation, 25)),
  },
  {
    id: "corridor-narrow",
    name: "Narrow corridor",
    description: "Three narrow beams along boresight at 0°, 2° and 4° extra downtilt, for a road or rail corridor.",
    beams: [0, 2, 4].flatMap((elevation) => sweep([0], elevation, 10)),
  },
  {
    id: "dual-layer",
    name: "Dual layer",
    description: "Two medium beams (±15°) at the tilt plus two 8° further down for the near area.",
    beams: [0, 8].flatMap((elevation) => sweep([-15, 15], elevation, 35)),
  },
  {
    id: "hot-spot-4",
    name: "Hot spot, 4 beams",
    description: "Four beams (±10°, ±30°) 4° below the tilt, for a small cell over a square or campus.",
    beams: sweep([-30, -10, 10, 30], 4, 20),
  },
];

const ELEMENT = {
  elementHBeamwidthDeg: 65,
  elementVBeamwidthDeg: 65,
  elementGainDbi: 8,
  frontToBackDb: 30,
  sideLobeLevelDb: 30,
} as const;

export const ANTENNA_MODEL_CATALOGUE: readonly AntennaModel[] = [
  {
    id: "panel-8x4",
    name: "Macro panel 8 × 4",
    ...ELEMENT,
    rows: 8,
    columns: 4,
    verticalSpacingWl: 0.7,
    horizontalSpacingWl: 0.5,
    electricalTiltMinDeg: 0,
    electricalTiltMaxDeg: 15,
    mechanicalTiltMinDeg: -2,
    mechanicalTiltMaxDeg: 12,
    rsPowerMinDbm: 6,
    rsPowerMaxDbm: 24,
    beamSetIds: ["broad-single", "horizontal-sweep-8", "high-rise-stack", "corridor-narrow", "dual-layer"],
  },
  {
    id: "panel-12x8",
    name: "High-capacity panel 12 × 8",
    ...ELEMENT,
    rows: 12,
    columns: 8,
    verticalSpacingWl: 0.5,
    horizontalSpacingWl: 0.5,
    electricalTiltMinDeg: 0,
    electricalTiltMaxDeg: 15,
    mechanicalTiltMinDeg: -2,
    mechanicalTiltMaxDeg: 10,
    rsPowerMinDbm: 6,
    rsPowerMaxDbm: 24,
    beamSetIds: ["broad-single", "horizontal-sweep-8", "high-rise-stack", "corridor-narrow", "dual-layer", "hot-spot-4"],
  },
  {
    id: "panel-4x2",
    name: "Small-cell panel 4 × 2",
    ...ELEMENT,
    rows: 4,
    columns: 2,
    verticalSpacingWl: 0.5,
    horizontalSpacingWl: 0.5,
    electricalTiltMinDeg: 0,
    electricalTiltMaxDeg: 10,
    mechanicalTiltMinDeg: 0,
    mechanicalTiltMaxDeg: 20,
    rsPowerMinDbm: 0,
    rsPowerMaxDbm: 15,
    beamSetIds: ["broad-single", "dual-layer", "hot-spot-4"],
  },
];
