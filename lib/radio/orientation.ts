// Global ↔ local coordinate rotation of 3GPP TR 38.901 §7.1.
//
// Global frame: x east, y north, z up; θ zenith angle (0° = up, 90° = horizon), φ azimuth counter-clockwise
// from x (east). Compass bearings (clockwise from north) convert with φ = 90° − bearing.
// Antenna orientation: α = bearing of the boresight as a TR rotation about z (α = 90° − azimuthDeg),
// β = downtilt (positive tilts the boresight below the horizon), γ = slant (0 here).

const DEG = Math.PI / 180;

/** TR 38.901 rotation angle α (degrees, CCW from east) of a compass azimuth (degrees, CW from north). */
export function compassToTrAzimuthDeg(compassDeg: number): number {
  return 90 - compassDeg;
}

export interface LocalAngles {
  thetaDeg: number;
  phiDeg: number;
}

/**
 * TR 38.901 eq. (7.1-7) and (7.1-8): local zenith θ' and azimuth φ' (degrees) of a global direction (θ, φ)
 * for an antenna rotated by α (bearing), β (downtilt), γ (slant), all degrees.
 *   θ' = arccos( cosβ cosγ cosθ + (sinβ cosγ cos(φ−α) − sinγ sin(φ−α)) sinθ )
 *   φ' = arg( cosβ sinθ cos(φ−α) − sinβ cosθ + j (cosβ sinγ cosθ + (sinβ sinγ cos(φ−α) + cosγ sin(φ−α)) sinθ) )
 */
export function globalToLocal(thetaDeg: number, phiDeg: number, alphaDeg: number, betaDeg: number, gammaDeg = 0): LocalAngles {
  const t = thetaDeg * DEG;
  const p = (phiDeg - alphaDeg) * DEG;
  const b = betaDeg * DEG;
  const g = gammaDeg * DEG;
  const cosT = Math.cos(t), sinT = Math.sin(t), cosP = Math.cos(p), sinP = Math.sin(p);
  const cosB = Math.cos(b), sinB = Math.sin(b), cosG = Math.cos(g), sinG = Math.sin(g);
  const c = cosB * cosG * cosT + (sinB * cosG * cosP - sinG * sinP) * sinT;
  const re = cosB * sinT * cosP - sinB * cosT;
  const im = cosB * sinG * cosT + (sinB * sinG * cosP + cosG * sinP) * sinT;
  return { thetaDeg: Math.acos(Math.max(-1, Math.min(1, c))) / DEG, phiDeg: Math.atan2(im, re) / DEG };
}

/**
 * The same rotation (γ = 0) applied to a global unit vector (gx, gy, gz), written into out[0..2] as the
 * local unit vector (x' boresight, y' left, z' up): v' = Ry(β)ᵀ Rz(α)ᵀ v, TR 38.901 eq. (7.1-2)/(7.1-4).
 * Allocation-free so the gain pass can use the same algebra per grid.
 */
export function rotateToLocal(gx: number, gy: number, gz: number, cosA: number, sinA: number, cosB: number, sinB: number, out: Float64Array): void {
  const a = gx * cosA + gy * sinA;
  out[0] = cosB * a - sinB * gz;
  out[1] = -gx * sinA + gy * cosA;
  out[2] = sinB * a + cosB * gz;
}
