// Precomputed lookup tables for a beam set's gain, so the gain pass needs no trigonometry per grid.
//
// Toward a local unit direction (x' boresight, y' left, z' up), with u = y' = sinθ' sinφ' and v = z' = cosθ':
//   - the array factor of every beam is F_v(v) · F_h(u) (arrayFactor.ts), a smooth function of (u, v), so the
//     best beam's array factor max_b [10 log10 F_v,b(v) + 10 log10 F_h,b(u)] is tabulated on a GAIN_TABLE_SIZE²
//     lattice over [−1, 1]² and read bilinearly;
//   - the element pattern (TR 38.901 Table 7.3-1) needs θ' and φ': its vertical cut is tabulated over v
//     (θ' = arccos v) and its horizontal cut over the "diamond angle" of (x', y') (a monotonic, division-only
//     stand-in for atan2), both on ELEMENT_TABLE_SIZE points, then combined exactly as the table prescribes.
// beamGainTable.test.ts bounds the interpolation error against the direct formulas of arrayFactor.ts.
import { activeColumnsForWidth, beamSteeringLocal, lineArrayFactor, type ArrayParameters, type SteeredBeam } from "./arrayFactor";
import { elementHorizontalCutDb, elementVerticalCutDb, type ElementParameters } from "./elementPattern";

const DEG = Math.PI / 180;

/** Lattice points per axis over [−1, 1] for the best-beam array factor. */
export const GAIN_TABLE_SIZE = 257;
/** Points of the element cut tables. */
export const ELEMENT_TABLE_SIZE = 8193;

export interface BeamSetGainTable {
  /** Lattice points per axis of beamMaxDb. */
  size: number;
  /** Best beam's array factor, dB, [row over v][column over u]. */
  beamMaxDb: Float32Array;
  /** Element vertical cut A_v over v ∈ [−1, 1], dB. */
  elementVerticalDb: Float32Array;
  /** Element horizontal cut A_h over the diamond angle p ∈ [0, 4], dB. */
  elementHorizontalDb: Float32Array;
  elementGainDbi: number;
  /** A_max of Table 7.3-1, dB. */
  maxAttenuationDb: number;
}

/** Diamond angle of (x, y): monotonic in atan2(y, x) over [0, 4) (0 = +x, 1 = +y, 2 = −x, 3 = −y). */
export function diamondAngle(x: number, y: number): number {
  if (y >= 0) return x >= 0 ? (x + y === 0 ? 0 : y / (x + y)) : 1 - x / (-x + y);
  return x < 0 ? 2 - y / (-x - y) : 3 + x / (x - y);
}

/** Inverse of diamondAngle: atan2(y, x) in degrees, (−180, 180], of diamond angle p. */
export function diamondToDeg(p: number): number {
  const q = Math.min(3, Math.floor(p));
  const f = p - q;
  let x: number, y: number;
  if (q === 0) { x = 1 - f; y = f; }
  else if (q === 1) { x = -f; y = 1 - f; }
  else if (q === 2) { x = -(1 - f); y = -f; }
  else { x = f; y = -(1 - f); }
  return Math.atan2(y, x) / DEG;
}

const elementCache = new WeakMap<object, { vertical: Float32Array; horizontal: Float32Array }>();

/** Element cut tables of an antenna model (cached per model object). */
export function elementCutTables(element: ElementParameters): { vertical: Float32Array; horizontal: Float32Array } {
  const cached = elementCache.get(element);
  if (cached) return cached;
  const vertical = new Float32Array(ELEMENT_TABLE_SIZE);
  const horizontal = new Float32Array(ELEMENT_TABLE_SIZE);
  for (let i = 0; i < ELEMENT_TABLE_SIZE; i++) {
    const v = -1 + (2 * i) / (ELEMENT_TABLE_SIZE - 1);
    vertical[i] = elementVerticalCutDb(element, Math.acos(v) / DEG);
    horizontal[i] = elementHorizontalCutDb(element, diamondToDeg((4 * i) / (ELEMENT_TABLE_SIZE - 1)));
  }
  const tables = { vertical, horizontal };
  elementCache.set(element, tables);
  return tables;
}

/** Builds the table of one (antenna model, beam set, electrical tilt) combination. */
export function buildBeamSetGainTable(array: ArrayParameters, beams: readonly SteeredBeam[], electricalTiltDeg: number, size = GAIN_TABLE_SIZE): BeamSetGainTable {
  const B = beams.length;
  if (B === 0) throw new RangeError("buildBeamSetGainTable: a beam set needs at least one beam");
  // ---- per-beam array factors on the lattice axes, dB
  const fv = new Float64Array(B * size);
  const fh = new Float64Array(B * size);
  for (let b = 0; b < B; b++) {
    const s = beamSteeringLocal(beams[b], electricalTiltDeg);
    const us = Math.sin(s.thetaDeg * DEG) * Math.sin(s.phiDeg * DEG);
    const vs = Math.cos(s.thetaDeg * DEG);
    const cols = activeColumnsForWidth(beams[b].widthDeg, array.columns, array.horizontalSpacingWl);
    for (let i = 0; i < size; i++) {
      const x = -1 + (2 * i) / (size - 1);
      fv[b * size + i] = 10 * Math.log10(lineArrayFactor(array.rows, array.verticalSpacingWl, x - vs));
      fh[b * size + i] = 10 * Math.log10(lineArrayFactor(cols, array.horizontalSpacingWl, x - us));
    }
  }
  // ---- best beam at each lattice node
  const beamMaxDb = new Float32Array(size * size);
  for (let j = 0; j < size; j++) {
    for (let i = 0; i < size; i++) {
      let best = -Infinity;
      for (let b = 0; b < B; b++) {
        const g = fv[b * size + j] + fh[b * size + i];
        if (g > best) best = g;
      }
      beamMaxDb[j * size + i] = best;
    }
  }
  const element = elementCutTables(array);
  return {
    size,
    beamMaxDb,
    elementVerticalDb: element.vertical,
    elementHorizontalDb: element.horizontal,
    elementGainDbi: array.elementGainDbi,
    maxAttenuationDb: array.frontToBackDb,
  };
}

/**
 * Gain of the beam set (best beam), dBi, toward the local unit direction (x', y', z').
 * The same arithmetic as the inlined loop of cellRsrp.ts (kept in step by cellRsrp.test.ts).
 */
export function tableGainDbi(table: BeamSetGainTable, x: number, y: number, z: number): number {
  const E = ELEMENT_TABLE_SIZE - 1;
  const ev = table.elementVerticalDb, eh = table.elementHorizontalDb;
  // element: A = −min(−(A_v + A_h), A_max) + G_E,max
  let t = (z + 1) * 0.5 * E;
  if (t < 0) t = 0;
  let i = t | 0;
  if (i >= E) i = E - 1;
  let f = t - i;
  const av = ev[i] + (ev[i + 1] - ev[i]) * f;
  t = diamondAngle(x, y) * 0.25 * E;
  i = t | 0;
  if (i >= E) i = E - 1;
  f = t - i;
  let a = av + eh[i] + (eh[i + 1] - eh[i]) * f;
  if (a < -table.maxAttenuationDb) a = -table.maxAttenuationDb;
  // best beam: bilinear on the (u, v) lattice
  const S = table.size, M = S - 1, half = 0.5 * M, lattice = table.beamMaxDb;
  let tu = (y + 1) * half;
  let tv = (z + 1) * half;
  if (tu < 0) tu = 0;
  if (tv < 0) tv = 0;
  let iu = tu | 0, iv = tv | 0;
  if (iu >= M) iu = M - 1;
  if (iv >= M) iv = M - 1;
  const fu = tu - iu, fv = tv - iv;
  const k = iv * S + iu;
  const ga = lattice[k] + (lattice[k + 1] - lattice[k]) * fu;
  const gb = lattice[k + S] + (lattice[k + S + 1] - lattice[k + S]) * fu;
  return table.elementGainDbi + a + (ga + (gb - ga) * fv);
}
