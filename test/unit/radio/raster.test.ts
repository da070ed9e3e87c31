import { describe, expect, it } from "vitest";
import { assertRaster, sampleBilinear, sampleNearest } from "../../../lib/radio/raster";

const r = { originX: 0, originY: 0, cellSize: 10, width: 2, height: 2, values: new Float32Array([0, 10, 20, 30]) };

describe("raster", () => {
  it("sampleBilinear interpolates between cell centres and clamps outside", () => {
    expect(sampleBilinear(r, 5, 5)).toBe(0);
    expect(sampleBilinear(r, 10, 5)).toBe(5);
    expect(sampleBilinear(r, 10, 10)).toBe(15);
    expect(sampleBilinear(r, -100, 500)).toBe(20);
  });
  it("sampleNearest returns the containing cell, or the outside value", () => {
    expect(sampleNearest(r, 12, 3)).toBe(10);
    expect(sampleNearest(r, 3, 19)).toBe(20);
    expect(sampleNearest(r, 25, 3, -1)).toBe(-1);
  });
  it("assertRaster refuses inconsistent shapes with the value quoted", () => {
    expect(() => assertRaster({ ...r, width: 3 }, "terrain")).toThrow(/terrain: values.length 4 != width × height 6/);
    expect(() => assertRaster({ ...r, cellSize: 0 }, "traffic")).toThrow(RangeError);
  });
});
