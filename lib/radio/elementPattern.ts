// Antenna element radiation pattern, 3GPP TR 38.901 Table 7.3-1.

/** The element parameters of Table 7.3-1 (a subset of AntennaModel). */
export interface ElementParameters {
  elementHBeamwidthDeg: number;
  elementVBeamwidthDeg: number;
  elementGainDbi: number;
  frontToBackDb: number;
  sideLobeLevelDb: number;
}

/** Table 7.3-1 vertical cut: A'_dB(θ'', φ''=0) = −min(12((θ'' − 90°)/θ3dB)², SLA_V), dB; θ'' zenith in degrees. */
export function elementVerticalCutDb(element: ElementParameters, thetaDeg: number): number {
  const r = (thetaDeg - 90) / element.elementVBeamwidthDeg;
  return -Math.min(12 * r * r, element.sideLobeLevelDb);
}

/** Table 7.3-1 horizontal cut: A'_dB(θ''=90°, φ'') = −min(12(φ''/φ3dB)², A_max), dB; φ'' in degrees, (−180, 180]. */
export function elementHorizontalCutDb(element: ElementParameters, phiDeg: number): number {
  const r = phiDeg / element.elementHBeamwidthDeg;
  return -Math.min(12 * r * r, element.frontToBackDb);
}

/**
 * Table 7.3-1 3D pattern: A''(θ'', φ'') = −min(−(A'(θ'', 0) + A'(90°, φ'')), A_max) + G_E,max, dBi,
 * angles in local (antenna) coordinates, degrees.
 */
export function elementGainDbi(element: ElementParameters, thetaDeg: number, phiDeg: number): number {
  const a = elementVerticalCutDb(element, thetaDeg) + elementHorizontalCutDb(element, phiDeg);
  return -Math.min(-a, element.frontToBackDb) + element.elementGainDbi;
}
