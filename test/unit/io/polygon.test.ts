import { describe, expect, it } from "vitest";
import { findSelfIntersection, segmentsIntersect } from "../../../lib/io/polygon";

const pts = (xy: number[][]) => xy.map(([x, y]) => ({ x, y }));

/** segmentsIntersect of [[ax, ay], [bx, by], [cx, cy], [dx, dy]]. */
const meet = (xy: number[][]): boolean => {
  const [a, b, c, d] = pts(xy);
  return segmentsIntersect(a, b, c, d);
};

describe("segmentsIntersect(a, b, c, d)", () => {
  it("sees crossings, touches and collinear overlaps, and nothing else", () => {
    expect(meet([[0, 0], [10, 10], [0, 10], [10, 0]])).toBe(true); // crossing
    expect(meet([[0, 0], [10, 0], [5, 0], [5, 5]])).toBe(true); // T-touch
    expect(meet([[0, 0], [10, 0], [5, 0], [15, 0]])).toBe(true); // collinear overlap
    expect(meet([[0, 0], [10, 0], [11, 0], [15, 0]])).toBe(false); // collinear, apart
    expect(meet([[0, 0], [10, 0], [0, 1], [10, 1]])).toBe(false); // parallel
    expect(meet([[0, 0], [4, 4], [6, 6], [10, 0]])).toBe(false); // would cross only if extended
  });
});

describe("findSelfIntersection(ring)", () => {
  it("passes simple rings: triangle, square, concave L", () => {
    expect(findSelfIntersection(pts([[0, 0], [10, 0], [5, 8]]))).toBeUndefined();
    expect(findSelfIntersection(pts([[0, 0], [10, 0], [10, 10], [0, 10]]))).toBeUndefined();
    expect(findSelfIntersection(pts([[0, 0], [10, 0], [10, 4], [4, 4], [4, 10], [0, 10]]))).toBeUndefined();
  });

  it("finds the crossing edges of a bow tie", () => {
    expect(findSelfIntersection(pts([[0, 0], [10, 10], [10, 0], [0, 10]]))).toEqual([0, 2]);
  });

  it("finds a ring that touches itself at a vertex and a spike that doubles back", () => {
    // Vertices 2 and 5 are the same point (5, 5): the ring touches itself there.
    expect(findSelfIntersection(pts([[0, 0], [10, 0], [5, 5], [10, 10], [0, 10], [5, 5]]))).toBeDefined();
    // Edge 1 runs back along edge 0.
    expect(findSelfIntersection(pts([[0, 0], [10, 0], [5, 0], [5, 5]]))).toEqual([0, 1]);
  });

  it("skips repeated consecutive vertices and a repeated closing point", () => {
    expect(findSelfIntersection(pts([[0, 0], [0, 0], [10, 0], [10, 10], [0, 10], [0, 0]]))).toBeUndefined();
  });
});
