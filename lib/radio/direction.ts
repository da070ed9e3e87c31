// Unit directions from an antenna to its grids: the angle part of the per-cell cache of DESIGN.md §2. They do not
// depend on azimuth, tilt, beam set or power, and every cell whose antenna stands at the same point (the sectors
// of one mast at one height) has the same ones, so one array serves them all. The gain pass (cellRsrp.ts) reads
// them in place of computing d = g − a and d / |d| per grid (measured ~25 % of the gain kernel).
//
// The model's direction IS this Float32 vector: where no array is kept (a few grids of a city run), the gain pass
// rounds the computed vector to Float32 the same way, so both give the same bits.
import type { Grid } from "./grid";

/** Where an antenna stands, local metres (z: absolute height, terrain included). */
export interface AntennaPoint {
  x: number;
  y: number;
  z: number;
}

/** A key equal for exactly the antennas at one point (cells that can share one direction array). */
export function antennaPointKey(point: AntennaPoint): string {
  return `${point.x}\u0000${point.y}\u0000${point.z}`;
}

/**
 * Unit vectors antenna → grid in the global frame (x east, y north, z up), Float32, x y z of entry j at 3j … 3j + 2:
 * for the grids of `footprint` (ascending indices), or every grid when it is null. A grid at the antenna itself
 * gets (0, 0, 0).
 */
export function computeDirections(grid: Grid, antenna: AntennaPoint, footprint: Int32Array | null, allocate: (bytes: number) => ArrayBufferLike = (b) => new ArrayBuffer(b)): Float32Array {
  const n = footprint ? footprint.length : grid.count;
  const out = new Float32Array(allocate(12 * n));
  directionsInto(grid, antenna, footprint, 0, n, out);
  return out;
}

/** The directions of entries [from, to) (of `footprint`, or grids when null) into out, entry j at 3 (j − from). */
export function directionsInto(grid: Grid, antenna: AntennaPoint, footprint: Int32Array | null, from: number, to: number, out: Float32Array): void {
  if (out.length < 3 * (to - from)) throw new RangeError(`directionsInto: room for ${out.length / 3} entries, ${to - from} asked`);
  const gx = grid.x, gy = grid.y, gz = grid.z, ax = antenna.x, ay = antenna.y, az = antenna.z;
  for (let j = from; j < to; j++) {
    const g = footprint === null ? j : footprint[j];
    const dx = gx[g] - ax, dy = gy[g] - ay, dz = gz[g] - az;
    const d2 = dx * dx + dy * dy + dz * dz;
    const inv = d2 > 0 ? 1 / Math.sqrt(d2) : 0;
    const k = 3 * (j - from);
    out[k] = dx * inv;
    out[k + 1] = dy * inv;
    out[k + 2] = dz * inv;
  }
}

/** Kept directions by antenna point (antennaPointKey): one array per mast and height. */
export type DirectionCache = Map<string, Float32Array>;

/**
 * The directions of a dense footprint from `cache`, computed and kept there the first time; undefined for a
 * sparse footprint (the gain pass then computes them itself: footprints of one mast may differ, and sparse ones
 * are small).
 */
export function keptDirections(cache: DirectionCache, grid: Grid, antenna: AntennaPoint, footprint: Int32Array | null, allocate?: (bytes: number) => ArrayBufferLike): Float32Array | undefined {
  if (footprint !== null) return undefined;
  const key = antennaPointKey(antenna);
  let directions = cache.get(key);
  if (!directions || directions.length !== 3 * grid.count) {
    directions = computeDirections(grid, antenna, null, allocate);
    cache.set(key, directions);
  }
  return directions;
}
