// Breakpoint distance of the TR 38.901 UMa / UMi LOS path-loss formulas.

/** Speed of light in vacuum, m/s (TR 38.901 Table 7.4.1-1 note 1 uses c = 3.0e8 m/s). */
export const SPEED_OF_LIGHT_M_PER_S = 3.0e8;

/** Effective environment height h_E, metres; TR 38.901 Table 7.4.1-1 note 1 (fixed to 1 m here, as for UMi). */
export const EFFECTIVE_ENVIRONMENT_HEIGHT_M = 1;

/**
 * TR 38.901 Table 7.4.1-1 note 1: d'BP = 4 h'BS h'UT fc / c, metres,
 * with h'BS = hBS − hE and h'UT = hUT − hE (metres), fc the centre frequency in Hz and c in m/s.
 */
export function breakpointDistanceM(frequencyGHz: number, bsHeightM: number, utHeightM: number): number {
  const hBs = bsHeightM - EFFECTIVE_ENVIRONMENT_HEIGHT_M;
  const hUt = utHeightM - EFFECTIVE_ENVIRONMENT_HEIGHT_M;
  return (4 * hBs * hUt * frequencyGHz * 1e9) / SPEED_OF_LIGHT_M_PER_S;
}
