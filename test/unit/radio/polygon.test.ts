import { describe, expect, it } from "vitest";
import { assertRing, pointInPolygon, polygonBounds, rayExitDistance } from "../../../lib/radio/polygon";

const L = [{ x: 0, y: 0 }, { x: 20, y: 0 }, { x: 20, y: 10 }, { x: 10, y: 10 }, { x: 10, y: 20 }, { x: 0, y: 20 }];

describe("polygon", () => {
  it("pointInPolygon handles a concave ring", () => {
    expect(pointInPolygon(L, 5, 5)).toBe(true);
    expect(pointInPolygon(L, 15, 5)).toBe(true);
    expect(pointInPolygon(L, 5, 15)).toBe(true);
    expect(pointInPolygon(L, 15, 15)).toBe(false);
    expect(pointInPolygon(L, -1, 5)).toBe(false);
  });
  it("rayExitDistance gives the distance to the first edge along the direction", () => {
    expect(rayExitDistance(L, 5, 5, 1, 0)).toBeCloseTo(15, 12);
    expect(rayExitDistance(L, 5, 5, 0, 1)).toBeCloseTo(15, 12);
    expect(rayExitDistance(L, 15, 5, 0, 1)).toBeCloseTo(5, 12);
    expect(rayExitDistance(L, 5, 5, -Math.SQRT1_2, -Math.SQRT1_2)).toBeCloseTo(5 * Math.SQRT2, 12);
  });
  it("polygonBounds and assertRing", () => {
    expect(polygonBounds(L)).toEqual({ minX: 0, minY: 0, maxX: 20, maxY: 20 });
    expect(() => assertRing([{ x: 0, y: 0 }, { x: 1, y: 1 }], "building \"B1\" footprint")).toThrow(/building "B1" footprint.*3 points/);
    expect(() => assertRing([{ x: 0, y: 0 }, { x: 1, y: NaN }, { x: 2, y: 0 }], "x")).toThrow(RangeError);
  });
});
