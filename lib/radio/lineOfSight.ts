// Deterministic line of sight: march the horizontal ray from a grid position toward the antenna at
// grid-size steps through the building-height map (terrain + roofs) and keep the sample of highest
// elevation angle seen from the antenna. A layer of height z at horizontal distance D is in LOS when
// that angle's slope ≤ (z − z_antenna) / D, i.e. no sample rises above the straight 3D line.
import type { HorizontalPlane } from "./horizontalPlane";

/** out[0] = slope (m/m) of the highest sample seen from the antenna (−Infinity: none), out[1] = its distance from the antenna (m), out[2] = its height (m ASL). */
export type HorizonResult = Float64Array;

export function createHorizonResult(): HorizonResult {
  return new Float64Array(3);
}

/**
 * Traces from position centre (px, py) toward the antenna at (ax, ay, az). Samples on building `skipA` or
 * `skipB` are ignored (use −2 for "none"). When `stopAboveSlope` is finite the march stops as soon as a
 * sample exceeds it (the caller only needs to know that every layer is blocked).
 */
export function traceHorizon(
  plane: HorizontalPlane,
  px: number,
  py: number,
  ax: number,
  ay: number,
  az: number,
  skipA: number,
  skipB: number,
  stopAboveSlope: number,
  out: HorizonResult,
): void {
  const W = plane.width, H = plane.height, size = plane.cellSize, invSize = 1 / size;
  const surface = plane.surfaceHeight, building = plane.buildingIndex;
  const dxh = ax - px, dyh = ay - py;
  const D = Math.sqrt(dxh * dxh + dyh * dyh);
  let maxSlope = -Infinity, obstacleS = 0, obstacleH = 0;
  if (D > size) {
    const ux = dxh / D, uy = dyh / D;
    // Samples at k · size from the grid, while at least half a grid from the antenna.
    const steps = Math.floor((D - 0.5 * size) * invSize);
    let fc = (px - plane.originX) * invSize + ux, fr = (py - plane.originY) * invSize + uy;
    let s = D - size;
    for (let k = 1; k <= steps; k++) {
      let col = fc | 0, row = fr | 0;
      if (col >= W) col = W - 1;
      if (row >= H) row = H - 1;
      const idx = row * W + col;
      const b = building[idx];
      if (b !== skipA && b !== skipB) {
        const slope = (surface[idx] - az) / s;
        if (slope > maxSlope) {
          maxSlope = slope;
          obstacleS = s;
          obstacleH = surface[idx];
          if (slope > stopAboveSlope) break;
        }
      }
      fc += ux;
      fr += uy;
      s -= size;
    }
  }
  out[0] = maxSlope;
  out[1] = obstacleS;
  out[2] = obstacleH;
}
