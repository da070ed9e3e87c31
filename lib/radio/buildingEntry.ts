// Outdoor-to-indoor (O2I) building penetration, 3GPP TR 38.901 §7.4.3.1.

/** Table 7.4.3-1, material penetration losses, dB, f in GHz. */
export function glassLossDb(frequencyGHz: number): number {
  return 2 + 0.2 * frequencyGHz;
}
export function irrGlassLossDb(frequencyGHz: number): number {
  return 23 + 0.3 * frequencyGHz;
}
export function concreteLossDb(frequencyGHz: number): number {
  return 5 + 4 * frequencyGHz;
}

/**
 * TR 38.901 Table 7.4.3-2, PL_tw through the external wall, dB (f in GHz):
 *   low-loss:  5 − 10 log10(0.3·10^(−L_glass/10)    + 0.7·10^(−L_concrete/10))
 *   high-loss: 5 − 10 log10(0.7·10^(−L_IRRglass/10) + 0.3·10^(−L_concrete/10))
 * The model's random part (σP) is left out: the engine is deterministic.
 */
export function wallPenetrationLossDb(model: "low" | "high", frequencyGHz: number): number {
  const concrete = Math.pow(10, -concreteLossDb(frequencyGHz) / 10);
  if (model === "low") return 5 - 10 * Math.log10(0.3 * Math.pow(10, -glassLossDb(frequencyGHz) / 10) + 0.7 * concrete);
  return 5 - 10 * Math.log10(0.7 * Math.pow(10, -irrGlassLossDb(frequencyGHz) / 10) + 0.3 * concrete);
}

/**
 * TR 38.901 Table 7.4.3-2: PL_in = 0.5 d2D-in, dB, d2D-in in metres. The TR draws d2D-in at random;
 * here it is the deterministic distance from the grid to its footprint edge toward the site.
 */
export function indoorLossDb(indoorDistanceM: number): number {
  return 0.5 * indoorDistanceM;
}
