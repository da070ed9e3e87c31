// Single knife-edge diffraction, ITU-R P.526.

/**
 * ITU-R P.526-15 eq. (31): J(ν) = 6.9 + 20 log10( sqrt((ν − 0.1)² + 1) + ν − 0.1 ), dB,
 * valid for ν > −0.78; below that the loss is taken as 0 dB (as the recommendation advises).
 * ν is the dimensionless Fresnel–Kirchhoff diffraction parameter.
 */
export function knifeEdgeLossDb(nu: number): number {
  if (!(nu > -0.78)) return 0;
  const a = nu - 0.1;
  return 6.9 + 20 * Math.log10(Math.sqrt(a * a + 1) + a);
}

/**
 * ITU-R P.526-15 eq. (26): ν = h sqrt( (2/λ) (1/d1 + 1/d2) ), dimensionless,
 * with h the height of the edge above the straight line between the terminals (m, negative below),
 * d1, d2 the distances from the terminals to the edge (m) and λ the wavelength (m).
 */
export function fresnelParameter(heightAboveLineM: number, d1M: number, d2M: number, wavelengthM: number): number {
  return heightAboveLineM * Math.sqrt((2 / wavelengthM) * (1 / d1M + 1 / d2M));
}
