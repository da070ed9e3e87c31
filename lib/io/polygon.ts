// Simple-polygon check for imported footprints and cluster outlines: a ring that crosses or
// touches itself has no well-defined inside, so the grid-to-building and grid-to-cluster
// assignment would depend on the algorithm. O(n²) over edge pairs with a bounding-box
// prefilter; footprints have a handful of vertices, cluster outlines a few hundred.

export interface XY {
  x: number;
  y: number;
}

/** Sign of the cross product (b − a) × (c − a): > 0 left turn, < 0 right turn, 0 collinear. */
function orient(a: XY, b: XY, c: XY): number {
  const v = (b.x - a.x) * (c.y - a.y) - (b.y - a.y) * (c.x - a.x);
  return v > 0 ? 1 : v < 0 ? -1 : 0;
}

/** c lies within the bounding box of segment ab (used once c is known to be collinear). */
function within(a: XY, b: XY, c: XY): boolean {
  return Math.min(a.x, b.x) <= c.x && c.x <= Math.max(a.x, b.x) && Math.min(a.y, b.y) <= c.y && c.y <= Math.max(a.y, b.y);
}

/** Closed segments ab and cd share at least one point (crossing, touching or overlapping). */
export function segmentsIntersect(a: XY, b: XY, c: XY, d: XY): boolean {
  const o1 = orient(a, b, c);
  const o2 = orient(a, b, d);
  const o3 = orient(c, d, a);
  const o4 = orient(c, d, b);
  if (o1 !== o2 && o3 !== o4) return true;
  return (o1 === 0 && within(a, b, c)) || (o2 === 0 && within(a, b, d)) || (o3 === 0 && within(c, d, a)) || (o4 === 0 && within(c, d, b));
}

/**
 * The first pair of edges (indices into the ring; edge k runs from vertex k to vertex k+1,
 * the last one back to vertex 0) that intersect other than at their shared vertex, or
 * undefined for a simple ring. `ring` has no repeated closing point; consecutive duplicate
 * vertices are skipped.
 */
export function findSelfIntersection(ring: readonly XY[]): [number, number] | undefined {
  const v: XY[] = [];
  for (const p of ring) {
    const last = v[v.length - 1];
    if (!last || last.x !== p.x || last.y !== p.y) v.push(p);
  }
  while (v.length > 1 && v[0].x === v[v.length - 1].x && v[0].y === v[v.length - 1].y) v.pop();
  const n = v.length;
  if (n < 3) return undefined;
  for (let i = 0; i < n; i++) {
    const a = v[i];
    const b = v[(i + 1) % n];
    const minX = Math.min(a.x, b.x);
    const maxX = Math.max(a.x, b.x);
    const minY = Math.min(a.y, b.y);
    const maxY = Math.max(a.y, b.y);
    for (let j = i + 1; j < n; j++) {
      const c = v[j];
      const d = v[(j + 1) % n];
      if (Math.max(c.x, d.x) < minX || Math.min(c.x, d.x) > maxX || Math.max(c.y, d.y) < minY || Math.min(c.y, d.y) > maxY) continue;
      if (j === i + 1) {
        // Adjacent edges a→b→d share b; they only overlap when d doubles back along ab.
        if (orient(a, b, d) === 0 && (a.x - b.x) * (d.x - b.x) + (a.y - b.y) * (d.y - b.y) > 0) return [i, j];
      } else if (i === 0 && j === n - 1) {
        // Edges c→a (closing) and a→b share a.
        if (orient(c, a, b) === 0 && (c.x - a.x) * (b.x - a.x) + (c.y - a.y) * (b.y - a.y) > 0) return [i, j];
      } else if (segmentsIntersect(a, b, c, d)) {
        return [i, j];
      }
    }
  }
  return undefined;
}
