// The gain pass: one cell's RSRP toward its grids from its path-loss cache and current parameters.
//   RSRP(c, g) = P_RS(c) + G_beamset(c; θ', φ') − PL(c, g)     (DESIGN.md §2; PL already holds O2I and other losses)
// computed as link = fround(G − PL), then RSRP = fround(P_RS + link); the link gain is kept, so that a change of
// power alone is one addition per grid (powerShiftInto) and gives the same bits as the whole pass.
// Powers are kept twice, dBm and linear mW (Float32, from the Float32 dBm by decibel.ts's conversion), so the
// KPI pass needs no exponentiation. The maximum RSRP of each grid segment and tile is kept too, so the server
// lists (serverLists.ts) can skip a whole segment of a cell that cannot enter any of its lists. The pass can run
// on a part of the grid at a time (gainPassInto, powerAndMaximaInto), so threads can share one cell.
import type { Cell, Site } from "./scenario";
import type { Grid } from "./grid";
import type { CellPathLoss } from "./pathLossStage";
import { ELEMENT_TABLE_SIZE, diamondAngle, type BeamSetGainTable } from "./beamGainTable";
import { compassToTrAzimuthDeg } from "./orientation";
import { DB_TO_LOG2, EXP2_FRACTION, EXP2_INTEGER, EXP2_MAX, EXP2_MIN, EXP2_STEPS, ROUNDING_SHIFT } from "./decibel";
import { lowerBound } from "./lowerBound";
import { directionsInto, type AntennaPoint } from "./direction";

const DEG = Math.PI / 180;

export interface CellRsrp {
  cellId: string;
  /** Same footprint as the path-loss cache: grid indices (ascending), or null for every grid. */
  footprint: Int32Array | null;
  /** RSRP per footprint entry, dBm: Math.fround(P_RS + linkDb). */
  rsrpDbm: Float32Array;
  /**
   * The link gain per footprint entry, dB: Math.fround(G_beamset − PL), the RSRP without the cell's RS power, so a
   * change of power alone is one addition per grid (powerShiftInto) rather than a gain pass. Null only in
   * hand-made sets (tests); a cell without it is recomputed whole.
   */
  linkDb: Float32Array | null;
  /** The same power in mW: Math.fround(dbToLinear(rsrpDbm)). */
  rsrpMw: Float32Array;
  /** Highest RSRP of the cell in each grid tile, dBm (−Infinity where the footprint misses the tile). */
  tileMaxDbm: Float32Array;
  /** Highest RSRP in each grid segment (grid.segmentStart), dBm (−Infinity where the footprint misses it). */
  segmentMaxDbm: Float32Array;
  /** Sparse footprints only: entries segmentOffsets[s] … segmentOffsets[s + 1] − 1 fall in segment s; null when dense. */
  segmentOffsets: Int32Array | null;
}

/** Computes one cell's RSRP arrays. `table` must be built for the cell's antenna model, beam set and electrical tilt. */
export function computeCellRsrp(grid: Grid, pathLoss: CellPathLoss, cell: Cell, site: Site, table: BeamSetGainTable, allocate?: (bytes: number) => ArrayBufferLike): CellRsrp {
  const out = allocateCellRsrp(grid, cell.id, pathLoss.footprint, allocate);
  gainPassInto(grid, pathLoss, cell, site, table, out, 0, grid.tileCount);
  return out;
}

/** Empty RSRP arrays for one cell, with the segment offsets of a sparse footprint filled in. */
export function allocateCellRsrp(grid: Grid, cellId: string, footprint: Int32Array | null, allocate: (bytes: number) => ArrayBufferLike = (b) => new ArrayBuffer(b)): CellRsrp {
  const n = footprint ? footprint.length : grid.count;
  let segmentOffsets: Int32Array | null = null;
  if (footprint) {
    segmentOffsets = new Int32Array(allocate(4 * (grid.segmentCount + 1)));
    let j = 0;
    for (let seg = 0; seg < grid.segmentCount; seg++) {
      segmentOffsets[seg] = j;
      const end = grid.segmentStart[seg + 1];
      while (j < n && footprint[j] < end) j++;
    }
    segmentOffsets[grid.segmentCount] = n;
  }
  return {
    cellId,
    footprint,
    rsrpDbm: new Float32Array(allocate(4 * n)),
    linkDb: new Float32Array(allocate(4 * n)),
    rsrpMw: new Float32Array(allocate(4 * n)),
    tileMaxDbm: new Float32Array(allocate(4 * grid.tileCount)),
    segmentMaxDbm: new Float32Array(allocate(4 * grid.segmentCount)),
    segmentOffsets,
  };
}

/** The same arrays under another cell id (built like allocateCellRsrp's, so that every CellRsrp has one shape). */
export function withCellId(r: CellRsrp, cellId: string): CellRsrp {
  return { cellId, footprint: r.footprint, rsrpDbm: r.rsrpDbm, linkDb: r.linkDb, rsrpMw: r.rsrpMw, tileMaxDbm: r.tileMaxDbm, segmentMaxDbm: r.segmentMaxDbm, segmentOffsets: r.segmentOffsets };
}

/** Footprint entries (or grids, when dense) of tiles [tileFrom, tileTo). */
export function entryRange(grid: Grid, footprint: Int32Array | null, tileFrom: number, tileTo: number): [number, number] {
  const g0 = grid.tileStart[tileFrom], g1 = grid.tileStart[tileTo];
  return footprint === null ? [g0, g1] : [lowerBound(footprint, g0), lowerBound(footprint, g1)];
}

/**
 * The gain pass over the footprint entries in tiles [tileFrom, tileTo): out.rsrpDbm, then out.rsrpMw and the
 * segment and tile maxima of those tiles (powerAndMaximaInto; a loop of its own measured faster than inside the
 * gain kernel).
 */
export function gainPassInto(grid: Grid, pathLoss: CellPathLoss, cell: Cell, site: Site, table: BeamSetGainTable, out: CellRsrp, tileFrom: number, tileTo: number): void {
  const footprint = pathLoss.footprint;
  const [from, to] = entryRange(grid, footprint, tileFrom, tileTo);
  const link = requireLink(out);
  if (pathLoss.direction) gainKernel(pathLoss.direction, 0, pathLoss.pathLossDb, link, out.rsrpDbm, from, to, cell, table);
  else {
    // no kept directions (a few grids of a city run): the same Float32 vectors, computed for these entries
    if (directionScratch.length < 3 * (to - from)) directionScratch = new Float32Array(3 * (to - from));
    directionsInto(grid, antennaPointOf(cell, site), footprint, from, to, directionScratch);
    gainKernel(directionScratch, from, pathLoss.pathLossDb, link, out.rsrpDbm, from, to, cell, table);
  }
  powerAndMaximaInto(grid, out, tileFrom, tileTo);
}

/** gainPassInto's directions where the cache keeps none, kept between calls (each thread has its own). */
let directionScratch = new Float32Array(0);

/** Where a cell's antenna stands. */
export function antennaPointOf(cell: Cell, site: Site): AntennaPoint {
  return { x: site.x, y: site.y, z: site.groundHeightM + cell.antennaHeightM };
}

/** Entries [from, to): direction (direction.ts) at entry j − shift, entry j of pl, link and dbm. */
function gainKernel(
  direction: Float32Array,
  shift: number,
  pl: Float32Array,
  link: Float32Array,
  dbm: Float32Array,
  from: number,
  to: number,
  cell: Cell,
  table: BeamSetGainTable,
): void {
  // TR 38.901 §7.1 rotation: α = 90° − compass azimuth, β = mechanical downtilt, γ = 0.
  const alpha = compassToTrAzimuthDeg(cell.azimuthDeg) * DEG, beta = cell.mechanicalTiltDeg * DEG;
  const cosA = Math.cos(alpha), sinA = Math.sin(alpha), cosB = Math.cos(beta), sinB = Math.sin(beta);
  const rsPower = cell.rsPowerDbm, elementGain = table.elementGainDbi;
  const S = table.size, M = S - 1, half = 0.5 * M, lattice = table.beamMaxDb;
  const E = ELEMENT_TABLE_SIZE - 1, halfE = 0.5 * E, quarterE = 0.25 * E;
  const ev = table.elementVerticalDb, eh = table.elementHorizontalDb;
  const floorA = -table.maxAttenuationDb;

  for (let j = from; j < to; j++) {
    const q = 3 * (j - shift);
    // ---- global unit direction antenna → grid, then local (x' boresight, y' left, z' up), TR 38.901 eq. (7.1-7/8)
    const ux = direction[q], uy = direction[q + 1], uz = direction[q + 2];
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
    // ---- received power: (P_RS + G_E,max) + A_element + A_beam − PL
    // ---- link gain G_E,max + A_element + A_beam − PL, then the received power P_RS + link (each rounded to Float32)
    const g = Math.fround(elementGain + el + (ga + (gb - ga) * fv) - pl[j]);
    link[j] = g;
    dbm[j] = rsPower + g;
  }
}

/**
 * A change of RS power alone, over the entries in tiles [tileFrom, tileTo): out takes `from`'s link gains and
 * rsrpDbm = Math.fround(rsPowerDbm + link), exactly what the gain pass gives for that power, then its mW and maxima.
 */
export function powerShiftInto(grid: Grid, from: CellRsrp, rsPowerDbm: number, out: CellRsrp, tileFrom: number, tileTo: number): void {
  const source = requireLink(from), link = requireLink(out), dbm = out.rsrpDbm;
  if (source.length !== link.length) throw new RangeError(`powerShiftInto: cell "${from.cellId}" has ${source.length} values, its new set ${link.length}`);
  const [first, end] = entryRange(grid, from.footprint, tileFrom, tileTo);
  const p = rsPowerDbm;
  for (let j = first; j < end; j++) {
    const g = source[j];
    link[j] = g;
    dbm[j] = p + g;
  }
  powerAndMaximaInto(grid, out, tileFrom, tileTo);
}

function requireLink(cell: CellRsrp): Float32Array {
  if (!cell.linkDb) throw new RangeError(`cell "${cell.cellId}": no link gains kept (a hand-made RSRP set)`);
  return cell.linkDb;
}

/**
 * For the entries in tiles [tileFrom, tileTo): out.rsrpMw = Math.fround(dbToLinear(out.rsrpDbm)) (decibel.ts,
 * inlined), the maxima of out.rsrpDbm per segment and per tile.
 */
export function powerAndMaximaInto(grid: Grid, out: CellRsrp, tileFrom: number, tileTo: number): void {
  const dbm = out.rsrpDbm, mw = out.rsrpMw, segStart = grid.segmentStart, offsets = out.segmentOffsets;
  const segmentMax = out.segmentMaxDbm, tileMax = out.tileMaxDbm;
  // local constants: a bundler turns module constants into `var`s that V8 re-checks on every use (decibel.ts)
  const R = ROUNDING_SHIFT, log2 = DB_TO_LOG2, steps = EXP2_STEPS, fraction = EXP2_FRACTION, integer = EXP2_INTEGER, nMin = EXP2_MIN, nMax = EXP2_MAX;
  for (let tile = tileFrom; tile < tileTo; tile++) {
    let tm = -Infinity;
    for (let seg = grid.tileSegmentStart[tile], segEnd = grid.tileSegmentStart[tile + 1]; seg < segEnd; seg++) {
      let m = -Infinity;
      const from = offsets === null ? segStart[seg] : offsets[seg];
      const to = offsets === null ? segStart[seg + 1] : offsets[seg + 1];
      for (let j = from; j < to; j++) {
        const r = dbm[j];
        if (r > m) m = r;
        const y = r * log2;
        let e = y + R - R;
        let p = 0;
        if (e >= nMin) {
          if (e > nMax) e = nMax;
          const te = (y - e + 0.5) * steps;
          const ie = te | 0;
          const f0 = fraction[ie];
          p = (f0 + (fraction[ie + 1] - f0) * (te - ie)) * integer[e - nMin];
        }
        mw[j] = p;
      }
      segmentMax[seg] = m;
      if (m > tm) tm = m;
    }
    tileMax[tile] = tm;
  }
}
