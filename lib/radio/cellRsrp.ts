// The gain pass: one cell's RSRP toward its grids from its path-loss cache and current parameters.
//   RSRP(c, g) = P_RS(c) + G_beamset(c; θ', φ') − PL(c, g)     (DESIGN.md §2; PL already holds O2I and other losses)
// Powers are kept twice, dBm and linear mW, so the KPI pass needs no exponentiation; the maximum RSRP of
// each grid tile is kept too, so the KPI pass can skip cells that cannot be best or overlap in a tile.
import type { Cell, Site } from "./scenario";
import type { Grid } from "./grid";
import type { CellPathLoss } from "./pathLossStage";
import { ELEMENT_TABLE_SIZE, diamondAngle, type BeamSetGainTable } from "./beamGainTable";
import { compassToTrAzimuthDeg } from "./orientation";

const DEG = Math.PI / 180;

// ---- dB → linear without Math.exp: 10^(x/10) = 2^y, y = x · log2(10) / 10, 2^frac(y) from a linearly
// interpolated table of 4096 intervals (relative error < 4e-9, below Float32 resolution), 2^floor(y) from a table.
const DB_TO_LOG2 = Math.log2(10) / 10;
const EXP2_STEPS = 4096;
const EXP2_FRACTION = new Float64Array(EXP2_STEPS + 1).map((_, i) => Math.pow(2, i / EXP2_STEPS));
const EXP2_MIN = -160, EXP2_MAX = 160; // 2^−160 is below the smallest Float32
const EXP2_INTEGER = new Float64Array(EXP2_MAX - EXP2_MIN + 1).map((_, i) => Math.pow(2, i + EXP2_MIN));

/** 10^(dB / 10) as the gain pass computes it (exported so tests can hold it to Math.pow). */
export function dbToLinear(db: number): number {
  const y = db * DB_TO_LOG2;
  let n = Math.floor(y);
  if (n < EXP2_MIN) return 0;
  if (n > EXP2_MAX) n = EXP2_MAX;
  const t = (y - n) * EXP2_STEPS;
  const i = t | 0;
  const a = EXP2_FRACTION[i];
  return (a + (EXP2_FRACTION[i + 1] - a) * (t - i)) * EXP2_INTEGER[n - EXP2_MIN];
}

export interface CellRsrp {
  cellId: string;
  /** Same footprint as the path-loss cache: grid indices, or null for every grid. */
  footprint: Int32Array | null;
  /** RSRP per footprint entry, dBm. */
  rsrpDbm: Float32Array;
  /** The same power in mW (computed from the Float32 dBm value, so both agree). */
  rsrpMw: Float32Array;
  /** Highest RSRP of the cell in each grid tile, dBm (−Infinity where the footprint misses the tile). */
  tileMaxDbm: Float32Array;
  /** Dense cells only: highest RSRP in each grid segment (grid.segmentStart), dBm; null when sparse. */
  segmentMaxDbm: Float32Array | null;
  /** Sparse footprints only: entries tileOffsets[t] .. tileOffsets[t + 1] − 1 fall in tile t; null when dense. */
  tileOffsets: Int32Array | null;
}

/** Computes one cell's RSRP arrays. `table` must be built for the cell's antenna model, beam set and electrical tilt. */
export function computeCellRsrp(grid: Grid, pathLoss: CellPathLoss, cell: Cell, site: Site, table: BeamSetGainTable): CellRsrp {
  const n = pathLoss.pathLossDb.length;
  const footprint = pathLoss.footprint;
  const pl = pathLoss.pathLossDb;
  const dbm = new Float32Array(n);
  const mw = new Float32Array(n);
  const gx = grid.x, gy = grid.y, gz = grid.z;
  const ax = site.x, ay = site.y, az = site.groundHeightM + cell.antennaHeightM;
  // TR 38.901 §7.1 rotation: α = 90° − compass azimuth, β = mechanical downtilt, γ = 0.
  const alpha = compassToTrAzimuthDeg(cell.azimuthDeg) * DEG, beta = cell.mechanicalTiltDeg * DEG;
  const cosA = Math.cos(alpha), sinA = Math.sin(alpha), cosB = Math.cos(beta), sinB = Math.sin(beta);
  const power = cell.rsPowerDbm;
  const S = table.size, M = S - 1, half = 0.5 * M, lattice = table.beamMaxDb;
  const E = ELEMENT_TABLE_SIZE - 1, halfE = 0.5 * E, quarterE = 0.25 * E;
  const ev = table.elementVerticalDb, eh = table.elementHorizontalDb;
  const floorA = -table.maxAttenuationDb, ge = table.elementGainDbi;

  for (let j = 0; j < n; j++) {
    const g = footprint === null ? j : footprint[j];
    // ---- global unit direction antenna → grid, then local (x' boresight, y' left, z' up), TR 38.901 eq. (7.1-7/8)
    const dx = gx[g] - ax, dy = gy[g] - ay, dz = gz[g] - az;
    const d2 = dx * dx + dy * dy + dz * dz;
    const inv = d2 > 0 ? 1 / Math.sqrt(d2) : 0;
    const ux = dx * inv, uy = dy * inv, uz = dz * inv;
    const a = ux * cosA + uy * sinA;
    const lx = cosB * a - sinB * uz;
    const ly = uy * cosA - ux * sinA;
    const lz = sinB * a + cosB * uz;
    // ---- element pattern from its cut tables (same arithmetic as tableGainDbi)
    let t = (lz + 1) * halfE;
    if (t < 0) t = 0;
    let i = t | 0;
    if (i >= E) i = E - 1;
    let f = t - i;
    const av = ev[i] + (ev[i + 1] - ev[i]) * f;
    t = diamondAngle(lx, ly) * quarterE;
    i = t | 0;
    if (i >= E) i = E - 1;
    f = t - i;
    let el = av + eh[i] + (eh[i + 1] - eh[i]) * f;
    if (el < floorA) el = floorA;
    // ---- best beam from the (u, v) lattice
    let tu = (ly + 1) * half;
    let tv = (lz + 1) * half;
    if (tu < 0) tu = 0;
    if (tv < 0) tv = 0;
    let iu = tu | 0, iv = tv | 0;
    if (iu >= M) iu = M - 1;
    if (iv >= M) iv = M - 1;
    const fu = tu - iu, fv = tv - iv;
    const k = iv * S + iu;
    const ga = lattice[k] + (lattice[k + 1] - lattice[k]) * fu;
    const gb = lattice[k + S] + (lattice[k + S + 1] - lattice[k + S]) * fu;
    const gain = ge + el + (ga + (gb - ga) * fv);
    // ---- received power
    const r = Math.fround(power + gain - pl[j]);
    dbm[j] = r;
    // 10^(r/10), inlined dbToLinear
    const y = r * DB_TO_LOG2;
    let e = Math.floor(y);
    if (e < EXP2_MIN) mw[j] = 0;
    else {
      if (e > EXP2_MAX) e = EXP2_MAX;
      const te = (y - e) * EXP2_STEPS;
      const ie = te | 0;
      const a0 = EXP2_FRACTION[ie];
      mw[j] = (a0 + (EXP2_FRACTION[ie + 1] - a0) * (te - ie)) * EXP2_INTEGER[e - EXP2_MIN];
    }
  }

  // ---- per-tile maxima (and tile offsets of a sparse footprint)
  const tileMaxDbm = new Float32Array(grid.tileCount).fill(-Infinity);
  let tileOffsets: Int32Array | null = null;
  let segmentMaxDbm: Float32Array | null = null;
  if (footprint === null) {
    segmentMaxDbm = new Float32Array(grid.segmentCount);
    const segStart = grid.segmentStart;
    for (let seg = 0; seg < grid.segmentCount; seg++) {
      let m = -Infinity;
      for (let g = segStart[seg], end = segStart[seg + 1]; g < end; g++) if (dbm[g] > m) m = dbm[g];
      segmentMaxDbm[seg] = m;
    }
    for (let tile = 0; tile < grid.tileCount; tile++) {
      let m = -Infinity;
      for (let seg = grid.tileSegmentStart[tile], end = grid.tileSegmentStart[tile + 1]; seg < end; seg++) if (segmentMaxDbm[seg] > m) m = segmentMaxDbm[seg];
      tileMaxDbm[tile] = m;
    }
  } else {
    tileOffsets = new Int32Array(grid.tileCount + 1);
    let j = 0;
    for (let tile = 0; tile < grid.tileCount; tile++) {
      tileOffsets[tile] = j;
      let m = -Infinity;
      const end = grid.tileStart[tile + 1];
      for (; j < n && footprint[j] < end; j++) if (dbm[j] > m) m = dbm[j];
      tileMaxDbm[tile] = m;
    }
    tileOffsets[grid.tileCount] = n;
  }
  return { cellId: cell.id, footprint, rsrpDbm: dbm, rsrpMw: mw, tileMaxDbm, segmentMaxDbm, tileOffsets };
}
