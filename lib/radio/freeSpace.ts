// Free-space basic transmission loss between isotropic antennas.

/**
 * ITU-R P.525-4 eq. (4): Lbf = 32.4 + 20 log10(f) + 20 log10(d), dB,
 * with f the frequency in MHz and d the distance in km.
 */
export function freeSpaceLossDb(frequencyMHz: number, distanceKm: number): number {
  if (!(frequencyMHz > 0)) throw new RangeError(`freeSpaceLossDb: frequencyMHz must be > 0, got ${frequencyMHz}`);
  if (!(distanceKm > 0)) throw new RangeError(`freeSpaceLossDb: distanceKm must be > 0, got ${distanceKm}`);
  return 32.4 + 20 * Math.log10(frequencyMHz) + 20 * Math.log10(distanceKm);
}
