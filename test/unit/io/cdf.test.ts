import { describe, expect, it } from "vitest";
import { cdfPoints } from "../../../lib/io/cdf";
import { MAP_RASTER_NO_DATA as ND } from "../../../lib/io/mapRaster";

describe("cdfPoints(values, points)", () => {
  it("cdfPoints skips noData and runs from the minimum at 0 to the maximum at 1, in dB", () => {
    const pts = cdfPoints(new Int16Array([-9000, ND, -11000, -10000, ND]), 5);
    expect(pts.map((p) => p.fraction)).toEqual([0, 0.25, 0.5, 0.75, 1]);
    // R-7 on sorted [-110, -100, -90]: h = 2F
    expect(pts.map((p) => p.value)).toEqual([-110, -105, -100, -95, -90]);
  });

  it("cdfPoints gives 101 points by default, non-decreasing in value", () => {
    const values = new Int16Array(1000);
    for (let i = 0; i < values.length; i++) values[i] = ((i * 7919) % 1000) - 12000;
    const pts = cdfPoints(values);
    expect(pts).toHaveLength(101);
    for (let k = 1; k < pts.length; k++) expect(pts[k].value).toBeGreaterThanOrEqual(pts[k - 1].value);
    expect(pts[0].value).toBe(-120);
    expect(pts[100].value).toBe(-110.01);
    // the median of -12000 .. -11001 centi-dB is -11500.5
    expect(pts[50].value).toBeCloseTo(-115.005, 6);
  });

  it("cdfPoints of a single value is flat at that value; of no value is empty", () => {
    expect(cdfPoints(new Int16Array([-7350]), 3)).toEqual([
      { value: -73.5, fraction: 0 },
      { value: -73.5, fraction: 0.5 },
      { value: -73.5, fraction: 1 },
    ]);
    expect(cdfPoints(new Int16Array([ND, ND]))).toEqual([]);
    expect(cdfPoints(new Int16Array(0))).toEqual([]);
  });

  it("cdfPoints refuses fewer than 2 points", () => {
    expect(() => cdfPoints(new Int16Array([1]), 1)).toThrow(/points must be an integer ≥ 2, got 1/);
    expect(() => cdfPoints(new Int16Array([1]), 2.5)).toThrow(RangeError);
  });
});
