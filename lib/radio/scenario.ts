// The coverage model's input: one network described in its own local metric
// coordinates (x east, y north, metres). Everything the model needs and nothing
// about storage, the web or the workflow. lib/io reads and writes it; lib/db
// turns database rows into it; lib/radio computes on it.

/** A point in the network's local metric coordinates (metres, x east, y north). */
export interface Point {
  x: number;
  y: number;
}

/**
 * A regular raster: row-major Float32Array, `width` columns by `height` rows.
 * Cell (col, row) has its centre at
 *   x = originX + (col + 0.5) * cellSize,  y = originY + (row + 0.5) * cellSize,
 * i.e. the origin is the south-west corner and rows run northwards.
 */
export interface Raster {
  originX: number;
  originY: number;
  cellSize: number;
  width: number;
  height: number;
  values: Float32Array;
}

/** Antenna hardware: the element pattern, the planar array and the allowed ranges. */
export interface AntennaModel {
  id: string;
  name: string;
  /** Element horizontal half-power beamwidth, degrees (TR 38.901 Table 7.3-1 φ3dB). */
  elementHBeamwidthDeg: number;
  /** Element vertical half-power beamwidth, degrees (TR 38.901 Table 7.3-1 θ3dB). */
  elementVBeamwidthDeg: number;
  /** Element maximum directional gain, dBi (TR 38.901 Table 7.3-1 GE,max). */
  elementGainDbi: number;
  /** Front-to-back ratio and side-lobe floor, dB (TR 38.901 Table 7.3-1 Am and SLAV, both 30). */
  frontToBackDb: number;
  sideLobeLevelDb: number;
  /** Planar array: element rows (vertical) and columns (horizontal). */
  rows: number;
  columns: number;
  /** Element spacing in wavelengths, vertical and horizontal. */
  verticalSpacingWl: number;
  horizontalSpacingWl: number;
  /** Hardware ranges; values outside are refused. */
  electricalTiltMinDeg: number;
  electricalTiltMaxDeg: number;
  mechanicalTiltMinDeg: number;
  mechanicalTiltMaxDeg: number;
  /** Reference-signal power per resource element, dBm. */
  rsPowerMinDbm: number;
  rsPowerMaxDbm: number;
  /** Beam sets this hardware supports (ids from the beam-set catalogue). */
  beamSetIds: string[];
}

/** One beam of a beam set, relative to the antenna's boresight after tilt. */
export interface Beam {
  /** Horizontal steering offset from boresight, degrees (positive = clockwise seen from above). */
  azimuthOffsetDeg: number;
  /** Vertical steering offset, degrees (positive = further down). Electrical tilt adds to it. */
  elevationOffsetDeg: number;
  /** Intended horizontal half-power width of the beam, degrees. */
  widthDeg: number;
}

/** A named list of beams; a cell's gain toward a grid is that of its best beam. */
export interface BeamSet {
  id: string;
  name: string;
  description: string;
  beams: Beam[];
}

export interface Site {
  id: string;
  name: string;
  x: number;
  y: number;
  /** Ground height above sea level at the mast, metres. */
  groundHeightM: number;
}

/** The parameters a change request may alter. */
export type CellParameter =
  | "azimuthDeg"
  | "mechanicalTiltDeg"
  | "electricalTiltDeg"
  | "beamSetId"
  | "rsPowerDbm";

export const CELL_PARAMETERS: readonly CellParameter[] = [
  "azimuthDeg",
  "mechanicalTiltDeg",
  "electricalTiltDeg",
  "beamSetId",
  "rsPowerDbm",
];

export interface Cell {
  id: string;
  siteId: string;
  antennaModelId: string;
  /** Antenna centre height above local ground, metres. */
  antennaHeightM: number;
  /** Bearing of the boresight, degrees clockwise from north, [0, 360). */
  azimuthDeg: number;
  /** Mechanical downtilt, degrees (positive = down). */
  mechanicalTiltDeg: number;
  /** Electrical downtilt applied to every beam of the set, degrees (positive = down). */
  electricalTiltDeg: number;
  /** Beam set id from the catalogue. */
  beamSetId: string;
  /** Reference-signal power per resource element, dBm. */
  rsPowerDbm: number;
  /** Carrier centre frequency, MHz. */
  frequencyMHz: number;
  /** Channel bandwidth, MHz. */
  bandwidthMHz: number;
  /** Subcarrier spacing, kHz (15 or 30). */
  subcarrierSpacingKHz: number;
}

export interface Building {
  id: string;
  /** Footprint as a simple polygon ring (not repeated first point), local metres. */
  footprint: Point[];
  /** Roof height above local ground, metres. */
  heightM: number;
  floors: number;
}

export interface Cluster {
  id: string;
  name: string;
  /** Simple polygon ring (not repeated first point), local metres. */
  polygon: Point[];
}

/** KPI thresholds and model options. Defaults are common practice, not a standard. */
export interface ModelSettings {
  /** Horizontal grid size, metres (default 5). */
  gridSizeM: number;
  /** Outdoor user height and first indoor floor height above ground, metres (default 1.5). */
  userHeightM: number;
  /** Floor-to-floor spacing, metres (default 3). */
  floorHeightM: number;
  /** Path-loss scenario of TR 38.901 Table 7.4.1-1. */
  environment: "UMa" | "UMi";
  /** Building entry loss model for indoor grids (TR 38.901 §7.4.3). */
  buildingLoss: "low" | "high";
  /** Add knife-edge over-roof diffraction (ITU-R P.526) on obstructed paths. */
  diffraction: boolean;
  /** Other fixed losses (body, cable), dB. */
  otherLossesDb: number;
  /** UE noise figure, dB. */
  noiseFigureDb: number;
  coverageThresholdDbm: number;
  overlapDeltaDb: number;
  overlapMaxOthers: number;
  overlapFloorDbm: number;
  interferenceThresholdDb: number;
  /** A grid that loses more than this many dB of best RSRP is a worst grid. */
  worstGridDropDb: number;
}

export const DEFAULT_SETTINGS: ModelSettings = {
  gridSizeM: 5,
  userHeightM: 1.5,
  floorHeightM: 3,
  environment: "UMa",
  buildingLoss: "low",
  diffraction: false,
  otherLossesDb: 0,
  noiseFigureDb: 7,
  coverageThresholdDbm: -105,
  overlapDeltaDb: 6,
  overlapMaxOthers: 3,
  overlapFloorDbm: -110,
  interferenceThresholdDb: 0,
  worstGridDropDb: 6,
};

/** One network, complete, as the model sees it. */
export interface Scenario {
  name: string;
  /** Area the grids cover (local metres). */
  bounds: { minX: number; minY: number; maxX: number; maxY: number };
  /** Optional geographic anchor: WGS84 longitude/latitude of local (0, 0). */
  origin?: { lon: number; lat: number };
  /** Ground height above sea level, metres. */
  terrain: Raster;
  /** Optional traffic weight per horizontal position (any non-negative unit). */
  traffic?: Raster;
  antennaModels: AntennaModel[];
  beamSets: BeamSet[];
  sites: Site[];
  cells: Cell[];
  buildings: Building[];
  clusters: Cluster[];
  settings: ModelSettings;
}

/** One proposed parameter value for one cell. */
export interface ParameterChange {
  cellId: string;
  parameter: CellParameter;
  value: number | string;
}
