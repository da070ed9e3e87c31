// Urban macro (UMa) path loss, 3GPP TR 38.901 Table 7.4.1-1.
// The functions are the table's formulas as printed; range clamps (d2D ≥ 10 m, hUT 1.5–22.5 m)
// are applied by the caller (pathLossStage.ts) so that they are stated in one place.
import { breakpointDistanceM } from "./breakpoint";

/**
 * TR 38.901 Table 7.4.1-1, UMa LOS, dB. fc in GHz, distances and heights in metres.
 *   PL1 = 28.0 + 22 log10(d3D) + 20 log10(fc)                               for 10 m ≤ d2D ≤ d'BP
 *   PL2 = 28.0 + 40 log10(d3D) + 20 log10(fc) − 9 log10(d'BP² + (hBS − hUT)²) for d'BP ≤ d2D ≤ 5 km
 */
export function umaLosDb(d2DM: number, d3DM: number, frequencyGHz: number, bsHeightM: number, utHeightM: number): number {
  const dBp = breakpointDistanceM(frequencyGHz, bsHeightM, utHeightM);
  const logF = 20 * Math.log10(frequencyGHz);
  if (d2DM <= dBp) return 28.0 + 22 * Math.log10(d3DM) + logF;
  const dh = bsHeightM - utHeightM;
  return 28.0 + 40 * Math.log10(d3DM) + logF - 9 * Math.log10(dBp * dBp + dh * dh);
}

/**
 * TR 38.901 Table 7.4.1-1, UMa NLOS, dB: PL = max(PL_UMa-LOS, PL'_UMa-NLOS) with
 *   PL'_UMa-NLOS = 13.54 + 39.08 log10(d3D) + 20 log10(fc) − 0.6 (hUT − 1.5)
 */
export function umaNlosDb(d2DM: number, d3DM: number, frequencyGHz: number, bsHeightM: number, utHeightM: number): number {
  const nlos = 13.54 + 39.08 * Math.log10(d3DM) + 20 * Math.log10(frequencyGHz) - 0.6 * (utHeightM - 1.5);
  return Math.max(umaLosDb(d2DM, d3DM, frequencyGHz, bsHeightM, utHeightM), nlos);
}
