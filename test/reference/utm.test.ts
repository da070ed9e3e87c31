import { describe, expect, it } from "vitest";
import { toLocal, utmConverter } from "../../lib/io/geo";

describe("UTM projection used by the import (lib/io/geo.ts) against published values", () => {
  // Snyder, J. P. (1987) "Map Projections — A Working Manual", USGS Professional Paper 1395,
  // §8 Transverse Mercator, numerical example for the ellipsoid (p. 269): φ = 40°30′ N,
  // λ = 73°30′ W, λ0 = 75° W, k0 = 0.9996, Clarke 1866 → x = 127 106.5 m, y = 4 484 124.4 m
  // (false easting 500 000 m not included in x). Values recalled from memory; the
  // agreement to 0.1 m below is our check of that recollection.
  it("reproduces Snyder's worked example (Clarke 1866, zone 18) to 0.1 m", () => {
    const [e, n] = utmConverter(18, "north", "clrk66").forward([-73.5, 40.5]);
    expect(Math.abs(e - (500_000 + 127_106.5))).toBeLessThan(0.1);
    expect(Math.abs(n - 4_484_124.4)).toBeLessThan(0.1);
  });

  // UTM definition (NGA.SIG.0012_2.0.0_UTMUPS §2; DMA TM 8358.2): central meridian
  // 6·zone − 183°, false easting 500 000 m, false northing 0 m (north) or 10 000 000 m
  // (south), scale k0 = 0.9996 on the central meridian. Recalled from memory.
  it("puts the central meridian at the equator on the false easting and northing", () => {
    const [e, n] = utmConverter(31, "north").forward([3, 0]);
    expect(e).toBeCloseTo(500_000, 6);
    expect(n).toBeCloseTo(0, 6);
    const [es, ns] = utmConverter(8, "south").forward([-135, 0]);
    expect(es).toBeCloseTo(500_000, 6);
    expect(ns).toBeCloseTo(10_000_000, 6);
  });

  // WGS84 meridian arc from the equator to 45° N: 4 984 944.378 m (recalled from memory,
  // a common geodesy-text value); on the central meridian the UTM northing is k0 times it.
  it("gives k0 × the WGS84 meridian arc as the northing on the central meridian at 45° N", () => {
    const [, n] = utmConverter(31, "north").forward([3, 45]);
    expect(Math.abs(n - 0.9996 * 4_984_944.378)).toBeLessThan(0.01);
  });

  it("local metres are UTM minus the rounded origin, nothing else", () => {
    const proj = { zone: 18, hemisphere: "north" as const, originEasting: 627_100, originNorthing: 4_484_120, origin: { lon: 0, lat: 0 } };
    const [e, n] = utmConverter(18, "north").forward([-73.5, 40.5]);
    const local = toLocal({ lon: -73.5, lat: 40.5 }, proj);
    expect(local.x).toBeCloseTo(e - 627_100, 9);
    expect(local.y).toBeCloseTo(n - 4_484_120, 9);
  });
});
