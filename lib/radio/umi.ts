// Urban micro street canyon (UMi) path loss, 3GPP TR 38.901 Table 7.4.1-1.
// Range clamps are applied by the caller (pathLossStage.ts).
import { breakpointDistanceM } from "./breakpoint";

/**
 * TR 38.901 Table 7.4.1-1, UMi-Street Canyon LOS, dB. fc in GHz, distances and heights in metres.
 *   PL1 = 32.4 + 21 log10(d3D) + 20 log10(fc)                                 for 10 m ≤ d2D ≤ d'BP
 *   PL2 = 32.4 + 40 log10(d3D) + 20 log10(fc) − 9.5 log10(d'BP² + (hBS − hUT)²) for d'BP ≤ d2D ≤ 5 km
 */
export function umiLosDb(d2DM: number, d3DM: number, frequencyGHz: number, bsHeightM: number, utHeightM: number): number {
  const dBp = breakpointDistanceM(frequencyGHz, bsHeightM, utHeightM);
  const logF = 20 * Math.log10(frequencyGHz);
  if (d2DM <= dBp) return 32.4 + 21 * Math.log10(d3DM) + logF;
  const dh = bsHeightM - utHeightM;
  return 32.4 + 40 * Math.log10(d3DM) + logF - 9.5 * Math.log10(dBp * dBp + dh * dh);
}

/**
 * TR 38.901 Table 7.4.1-1, UMi-Street Canyon NLOS, dB: PL = max(PL_UMi-LOS, PL'_UMi-NLOS) with
 *   PL'_UMi-NLOS = 35.3 log10(d3D) + 22.4 + 21.3 log10(fc) − 0.3 (hUT − 1.5)
 */
export function umiNlosDb(d2DM: number, d3DM: number, frequencyGHz: number, bsHeightM: number, utHeightM: number): number {
  const nlos = 35.3 * Math.log10(d3DM) + 22.4 + 21.3 * Math.log10(frequencyGHz) - 0.3 * (utHeightM - 1.5);
  return Math.max(umiLosDb(d2DM, d3DM, frequencyGHz, bsHeightM, utHeightM), nlos);
}
