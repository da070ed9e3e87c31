// Thermal noise at the UE receiver.

/** Thermal noise density at 290 K, dBm/Hz (kT, common engineering value). */
export const THERMAL_NOISE_DENSITY_DBM_PER_HZ = -174;

/** N = −174 dBm/Hz + 10 log10(B / Hz) + NF, dBm; B the noise bandwidth in Hz, NF the noise figure in dB. */
export function thermalNoiseDbm(bandwidthHz: number, noiseFigureDb: number): number {
  if (!(bandwidthHz > 0)) throw new RangeError(`thermalNoiseDbm: bandwidthHz must be > 0, got ${bandwidthHz}`);
  return THERMAL_NOISE_DENSITY_DBM_PER_HZ + 10 * Math.log10(bandwidthHz) + noiseFigureDb;
}

export interface CellNoise {
  /** Noise over the whole channel (bandwidthMHz), dBm: for channel-power quantities. */
  channelDbm: number;
  /**
   * Noise over one subcarrier (subcarrierSpacingKHz), dBm. RSRP is a per-resource-element power,
   * so the SINR of the KPIs compares it with the noise of one subcarrier, not of the whole channel.
   */
  resourceElementDbm: number;
}

/** Both noise powers of a cell's carrier for a UE of the given noise figure (dB). */
export function cellNoise(
  cell: { bandwidthMHz: number; subcarrierSpacingKHz: number },
  noiseFigureDb: number,
): CellNoise {
  return {
    channelDbm: thermalNoiseDbm(cell.bandwidthMHz * 1e6, noiseFigureDb),
    resourceElementDbm: thermalNoiseDbm(cell.subcarrierSpacingKHz * 1e3, noiseFigureDb),
  };
}
