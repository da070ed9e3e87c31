// Simple-polygon helpers on rings of local metric points (first point not repeated).
import type { Point } from "./scenario";

/** Even–odd crossing test (W. R. Franklin's PNPOLY idea, written anew): true when (x, y) lies inside the ring. */
export function pointInPolygon(ring: readonly Point[], x: number, y: number): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const yi = ring[i].y, yj = ring[j].y;
    if (yi > y !== yj > y) {
      const xCross = ring[j].x + ((y - yj) * (ring[i].x - ring[j].x)) / (yi - yj);
      if (x < xCross) inside = !inside;
    }
  }
  return inside;
}

export interface Box {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

export function polygonBounds(ring: readonly Point[]): Box {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const p of ring) {
    if (p.x < minX) minX = p.x;
    if (p.x > maxX) maxX = p.x;
    if (p.y < minY) minY = p.y;
    if (p.y > maxY) maxY = p.y;
  }
  return { minX, minY, maxX, maxY };
}

/**
 * Distance (m) from (x, y) along the unit direction (dx, dy) to the nearest crossing of the ring's edges,
 * Infinity when the ray crosses none. Used for the indoor distance d2D-in toward the site.
 */
export function rayExitDistance(ring: readonly Point[], x: number, y: number, dx: number, dy: number): number {
  let best = Infinity;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const ax = ring[j].x, ay = ring[j].y;
    const ex = ring[i].x - ax, ey = ring[i].y - ay;
    // Solve (x, y) + t (dx, dy) = a + s e for t ≥ 0, s ∈ [0, 1].
    const den = dx * ey - dy * ex;
    if (den === 0) continue;
    const qx = ax - x, qy = ay - y;
    const t = (qx * ey - qy * ex) / den;
    const s = (qx * dy - qy * dx) / den;
    if (t >= 0 && s >= 0 && s <= 1 && t < best) best = t;
  }
  return best;
}

/** Throws a RangeError naming `what` when the ring is not a usable polygon. */
export function assertRing(ring: readonly Point[] | undefined, what: string): void {
  if (!Array.isArray(ring) || ring.length < 3) {
    throw new RangeError(`${what}: polygon needs at least 3 points, got ${Array.isArray(ring) ? ring.length : String(ring)}`);
  }
  for (let i = 0; i < ring.length; i++) {
    const p = ring[i];
    if (!p || !Number.isFinite(p.x) || !Number.isFinite(p.y)) {
      throw new RangeError(`${what}: point ${i} is not finite: ${JSON.stringify(p)}`);
    }
  }
}
