// Sampling of the scenario's regular rasters (see Raster in scenario.ts for the cell-centre convention).
import type { Raster } from "./scenario";

/** Throws a RangeError naming `what` when the raster's shape is inconsistent. */
export function assertRaster(raster: Raster, what: string): void {
  if (!raster || !(raster.values instanceof Float32Array)) throw new RangeError(`${what}: values must be a Float32Array`);
  if (!Number.isInteger(raster.width) || raster.width < 1) throw new RangeError(`${what}: width must be a positive integer, got ${raster.width}`);
  if (!Number.isInteger(raster.height) || raster.height < 1) throw new RangeError(`${what}: height must be a positive integer, got ${raster.height}`);
  if (!(raster.cellSize > 0)) throw new RangeError(`${what}: cellSize must be > 0, got ${raster.cellSize}`);
  if (!Number.isFinite(raster.originX) || !Number.isFinite(raster.originY)) {
    throw new RangeError(`${what}: origin must be finite, got (${raster.originX}, ${raster.originY})`);
  }
  if (raster.values.length !== raster.width * raster.height) {
    throw new RangeError(`${what}: values.length ${raster.values.length} != width × height ${raster.width * raster.height}`);
  }
}

/** Bilinear interpolation between cell centres, clamped at the edges (for continuous fields such as terrain). */
export function sampleBilinear(raster: Raster, x: number, y: number): number {
  const { width, height, values } = raster;
  let fx = (x - raster.originX) / raster.cellSize - 0.5;
  let fy = (y - raster.originY) / raster.cellSize - 0.5;
  fx = fx < 0 ? 0 : fx > width - 1 ? width - 1 : fx;
  fy = fy < 0 ? 0 : fy > height - 1 ? height - 1 : fy;
  const c0 = Math.min(width - 2 < 0 ? 0 : width - 2, Math.floor(fx));
  const r0 = Math.min(height - 2 < 0 ? 0 : height - 2, Math.floor(fy));
  const c1 = Math.min(width - 1, c0 + 1), r1 = Math.min(height - 1, r0 + 1);
  const tx = fx - c0, ty = fy - r0;
  const a = values[r0 * width + c0], b = values[r0 * width + c1];
  const c = values[r1 * width + c0], d = values[r1 * width + c1];
  return (a + (b - a) * tx) * (1 - ty) + (c + (d - c) * tx) * ty;
}

/** Value of the cell containing (x, y), or `outside` when the point is off the raster (for densities such as traffic). */
export function sampleNearest(raster: Raster, x: number, y: number, outside = 0): number {
  const col = Math.floor((x - raster.originX) / raster.cellSize);
  const row = Math.floor((y - raster.originY) / raster.cellSize);
  if (col < 0 || row < 0 || col >= raster.width || row >= raster.height) return outside;
  return raster.values[row * raster.width + col];
}
