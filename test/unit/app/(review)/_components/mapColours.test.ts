import { describe, expect, it } from "vitest";
import { interpolateViridis, schemeTableau10 } from "d3-scale-chromatic";
import {
  cellScale,
  continuousScale,
  deltaDomain,
  parseColour,
  rasterPixels,
  rasterValueAt,
  rsrpDomainOf,
} from "../../../../../app/(review)/_components/mapColours";
import { MAP_RASTER_NO_DATA as ND } from "../../../../../lib/io/mapRaster";

describe("rasterPixels(values, width, height, scale)", () => {
  it("rasterPixels puts the south row (row 0) at the bottom of the image, so north is up", () => {
    // 2 × 2: row 0 (south) = [lo, noData], row 1 (north) = [hi, hi]
    const scale = continuousScale("rsrp", [-130, -60]);
    const px = rasterPixels(new Int16Array([-13000, ND, -6000, -6000]), 2, 2, scale);
    const at = (col: number, imageRow: number) => Array.from(px.subarray((imageRow * 2 + col) * 4, (imageRow * 2 + col) * 4 + 4));
    expect(at(0, 0)).toEqual([...parseColour(interpolateViridis(1)), 255]);
    expect(at(1, 0)).toEqual([...parseColour(interpolateViridis(1)), 255]);
    expect(at(0, 1)).toEqual([...parseColour(interpolateViridis(0)), 255]);
    expect(at(1, 1)[3]).toBe(0);
  });

  it("rasterPixels clamps values outside the display range to the end colours", () => {
    const scale = continuousScale("rsrp", [-130, -60]);
    const px = rasterPixels(new Int16Array([-20000, -1000]), 2, 1, scale);
    expect(Array.from(px.subarray(0, 3))).toEqual(parseColour(interpolateViridis(0)));
    expect(Array.from(px.subarray(4, 7))).toEqual(parseColour(interpolateViridis(1)));
  });

  it("rasterPixels cycles the ten categorical colours for serving-cell indices", () => {
    const px = rasterPixels(new Int16Array([0, 10, 3]), 3, 1, cellScale());
    expect(Array.from(px.subarray(0, 3))).toEqual(parseColour(schemeTableau10[0]));
    expect(Array.from(px.subarray(4, 7))).toEqual(parseColour(schemeTableau10[0]));
    expect(Array.from(px.subarray(8, 11))).toEqual(parseColour(schemeTableau10[3]));
  });

  it("rasterPixels refuses a value count other than width × height", () => {
    expect(() => rasterPixels(new Int16Array(3), 2, 2, cellScale())).toThrow(RangeError);
  });
});

describe("deltaDomain(min, max) and continuousScale(kind, domain)", () => {
  it("deltaDomain is symmetric about zero and covers the largest change", () => {
    expect(deltaDomain(-0.4, 0.2)).toEqual([-1, 1]);
    expect(deltaDomain(-7.5, 2)).toEqual([-10, 10]);
    expect(deltaDomain(null, null)).toEqual([-1, 1]);
    expect(deltaDomain(-90, 0)).toEqual([-30, 30]);
  });

  it("continuousScale refuses an empty or inverted domain", () => {
    expect(() => continuousScale("sinr", [5, 5])).toThrow(/hi > lo/);
    expect(() => continuousScale("sinr", [10, -10])).toThrow(RangeError);
  });

  it("parseColour reads both forms d3-scale-chromatic returns", () => {
    expect(parseColour("#0e6b6b")).toEqual([14, 107, 107]);
    expect(parseColour("rgb(0, 34, 78)")).toEqual([0, 34, 78]);
    expect(() => parseColour("teal")).toThrow(/teal/);
  });
});

describe("rasterValueAt(raster, x, y)", () => {
  const raster = {
    header: { originX: 100, originY: 200, cellSize: 5, width: 2, height: 2 },
    values: new Int16Array([1, 2, 3, ND]),
  };
  it("rasterValueAt reads the position holding (x, y), row 0 south", () => {
    expect(rasterValueAt(raster, 101, 201)).toBe(1);
    expect(rasterValueAt(raster, 109.9, 201)).toBe(2);
    expect(rasterValueAt(raster, 101, 206)).toBe(3);
  });
  it("rasterValueAt gives null outside the plane and on noData", () => {
    expect(rasterValueAt(raster, 99.9, 201)).toBeNull();
    expect(rasterValueAt(raster, 101, 210)).toBeNull();
    expect(rasterValueAt(raster, 106, 206)).toBeNull();
  });
});

describe("rsrpDomainOf(values)", () => {
  /** The same percentiles by sorting, as a reference. */
  function bySort(values: Int16Array): [number, number] {
    const present = [...values].filter((v) => v !== ND).map((v) => v / 100).sort((a, b) => a - b);
    const at = (p: number) => present[Math.min(present.length - 1, Math.floor(p * present.length))];
    return [Math.floor(at(0.02) / 10) * 10, Math.ceil(at(0.98) / 10) * 10];
  }

  it("rsrpDomainOf gives the 2nd and 98th percentiles widened to whole 10 dB steps, skipping noData", () => {
    // −100.00 … −40.01 dBm in 0.01 dB steps (6000 values), with noData between
    const values = new Int16Array(12000).fill(ND);
    for (let i = 0; i < 6000; i++) values[i * 2] = -10000 + i;
    // 2nd percentile −98.80 → −100; 98th −41.20 → −40
    expect(rsrpDomainOf(values)).toEqual([-100, -40]);
    expect(rsrpDomainOf(values)).toEqual(bySort(values));
  });

  it("rsrpDomainOf agrees with sorting on a skewed layer", () => {
    const values = new Int16Array(5000);
    for (let i = 0; i < values.length; i++) values[i] = Math.round(-3100 - 6600 * ((i * 7919) % 5000 / 5000) ** 3);
    expect(rsrpDomainOf(values)).toEqual(bySort(values));
  });

  it("rsrpDomainOf is undefined with fewer than 100 values or a single value everywhere", () => {
    expect(rsrpDomainOf(new Int16Array(99).fill(-8000))).toBeUndefined();
    expect(rsrpDomainOf(new Int16Array(1000).fill(ND))).toBeUndefined();
    expect(rsrpDomainOf(new Int16Array(1000).fill(-8000))).toBeUndefined();
  });
});
