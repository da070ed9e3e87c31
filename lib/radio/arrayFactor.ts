// Planar-array beam gain: TR 38.901 Table 7.3-1 element pattern times a phase-steered uniform array.
//
// The array lies in the local y'z' plane: `columns` elements along y' (horizontal, spacing d_h wavelengths)
// and `rows` along z' (vertical, spacing d_v). With steering weights w_mn = exp(−j2π(n d_h u_s + m d_v v_s))/√(N M)
// (u = sinθ' sinφ', v = cosθ'), the array factor separates into a vertical and a horizontal factor:
//   |AF|² = F_v(v) · F_h(u),  F(x) = sin²(K ψ/2) / (K sin²(ψ/2)),  ψ = 2π d (x − x_s),
// each normalised so that its peak equals K (array gain 10 log10(N M) at the steering direction).
// Source: the standard uniform-array factor (e.g. TR 36.897 / TR 38.901 §7.3 composite pattern with
// phase-only weights); the closed form is the geometric series sum.
import { elementGainDbi, type ElementParameters } from "./elementPattern";

const DEG = Math.PI / 180;

/**
 * Null fill: a factor never falls more than this far below its own peak (linear, −20 dB). Real panels fill the
 * nulls of the ideal uniform array (common practice in pattern design, not part of TR 38.901); without it the
 * first vertical nulls near the mast make coverage flicker from one grid to the next.
 */
export const ARRAY_FACTOR_NULL_FILL = 0.01;

/** F(x) of a K-element uniform line array at direction cosine difference (x − x_s), spacing d wavelengths, linear. */
export function lineArrayFactor(elements: number, spacingWl: number, cosineOffset: number): number {
  const half = Math.PI * spacingWl * cosineOffset;
  const s = Math.sin(half);
  let f: number;
  if (Math.abs(s) < 1e-9) f = elements;
  else {
    const n = Math.sin(elements * half);
    f = (n * n) / (elements * s * s);
  }
  const floor = elements * ARRAY_FACTOR_NULL_FILL;
  return f < floor ? floor : f;
}

/**
 * Columns switched on to realise a beam of horizontal half-power width `widthDeg` at broadside:
 * N ≈ 0.886 / (d_h · width[rad]) from the uniform-array HPBW approximation (textbook), 1..columns.
 * Fewer active columns → wider beam and less array gain; the element pattern bounds the widest beam.
 */
export function activeColumnsForWidth(widthDeg: number, columns: number, horizontalSpacingWl: number): number {
  const n = Math.round(0.886 / (horizontalSpacingWl * widthDeg * DEG));
  return Math.max(1, Math.min(columns, n));
}

export interface ArrayParameters extends ElementParameters {
  rows: number;
  columns: number;
  verticalSpacingWl: number;
  horizontalSpacingWl: number;
}

export interface SteeredBeam {
  azimuthOffsetDeg: number;
  elevationOffsetDeg: number;
  widthDeg: number;
}

/** Local steering direction of a beam: θ's = 90° + electrical tilt + elevation offset, φ's = −azimuth offset (CW → CCW). */
export function beamSteeringLocal(beam: SteeredBeam, electricalTiltDeg: number): { thetaDeg: number; phiDeg: number } {
  return { thetaDeg: 90 + electricalTiltDeg + beam.elevationOffsetDeg, phiDeg: -beam.azimuthOffsetDeg };
}

/** Array-factor part of one beam, dB (peak 10 log10(rows × activeColumns)), at local direction cosines u, v. */
export function beamArrayFactorDb(array: ArrayParameters, beam: SteeredBeam, electricalTiltDeg: number, u: number, v: number): number {
  const s = beamSteeringLocal(beam, electricalTiltDeg);
  const us = Math.sin(s.thetaDeg * DEG) * Math.sin(s.phiDeg * DEG);
  const vs = Math.cos(s.thetaDeg * DEG);
  const cols = activeColumnsForWidth(beam.widthDeg, array.columns, array.horizontalSpacingWl);
  const fv = lineArrayFactor(array.rows, array.verticalSpacingWl, v - vs);
  const fh = lineArrayFactor(cols, array.horizontalSpacingWl, u - us);
  return 10 * Math.log10(fv) + 10 * Math.log10(fh);
}

/** Gain of one beam, dBi, toward local angles (θ', φ') in degrees: element pattern + array factor (direct, no table). */
export function beamGainDbi(array: ArrayParameters, beam: SteeredBeam, electricalTiltDeg: number, thetaDeg: number, phiDeg: number): number {
  const u = Math.sin(thetaDeg * DEG) * Math.sin(phiDeg * DEG);
  const v = Math.cos(thetaDeg * DEG);
  return elementGainDbi(array, thetaDeg, phiDeg) + beamArrayFactorDb(array, beam, electricalTiltDeg, u, v);
}

/** Gain of a beam set, dBi: the best beam toward (θ', φ') (synchronisation-signal style). */
export function beamSetGainDbi(array: ArrayParameters, beams: readonly SteeredBeam[], electricalTiltDeg: number, thetaDeg: number, phiDeg: number): number {
  let best = -Infinity;
  for (const beam of beams) {
    const g = beamGainDbi(array, beam, electricalTiltDeg, thetaDeg, phiDeg);
    if (g > best) best = g;
  }
  return best;
}
