import { describe, expect, it } from "vitest";
import { chooseProjection, toLocal, toLonLat, utmEpsg, utmOfEpsg, utmZoneOf } from "../../../lib/io/geo";
import { createRandom } from "../../../lib/io/random";

describe("utmZoneOf(lon)", () => {
  it("cuts the globe into 6° zones from 180° W, with 180° in zone 60", () => {
    expect(utmZoneOf(-180)).toBe(1);
    expect(utmZoneOf(-174.0001)).toBe(1);
    expect(utmZoneOf(-174)).toBe(2);
    expect(utmZoneOf(0)).toBe(31);
    expect(utmZoneOf(-0.0001)).toBe(30);
    expect(utmZoneOf(179.9)).toBe(60);
    expect(utmZoneOf(180)).toBe(60);
    expect(() => utmZoneOf(181)).toThrow(RangeError);
  });
});

describe("chooseProjection(points)", () => {
  it("takes the zone and hemisphere of the centroid", () => {
    expect(chooseProjection([{ lon: -135.2, lat: -35 }, { lon: -134.8, lat: -34.9 }])).toMatchObject({ zone: 8, hemisphere: "south" });
    expect(chooseProjection([{ lon: 20.5, lat: 0.1 }, { lon: 20.6, lat: -0.05 }])).toMatchObject({ zone: 34, hemisphere: "north" });
    // Straddling a zone edge: the centroid decides (mean lon −137.9 → zone 8).
    expect(chooseProjection([{ lon: -138.2, lat: 10 }, { lon: -137.6, lat: 10 }]).zone).toBe(8);
  });

  it("puts local (0, 0) on the south-west corner of the data rounded down to 10 m, so the data is small and positive", () => {
    const rng = createRandom(3);
    const points = Array.from({ length: 50 }, () => ({ lon: rng.uniform(-160.05, -160), lat: rng.uniform(-40.04, -40) }));
    const proj = chooseProjection(points);
    expect(proj.originEasting % 10).toBe(0);
    expect(proj.originNorthing % 10).toBe(0);
    const local = points.map((p) => toLocal(p, proj));
    const minX = Math.min(...local.map((p) => p.x));
    const minY = Math.min(...local.map((p) => p.y));
    expect(minX).toBeGreaterThanOrEqual(0);
    expect(minX).toBeLessThan(10);
    expect(minY).toBeGreaterThanOrEqual(0);
    expect(minY).toBeLessThan(10);
    expect(Math.max(...local.map((p) => p.x))).toBeLessThan(5000);
    // origin is the lon/lat of local (0, 0).
    const back = toLocal(proj.origin, proj);
    expect(Math.hypot(back.x, back.y)).toBeLessThan(1e-6);
  });

  it("refuses no points and positions that are not lon/lat", () => {
    expect(() => chooseProjection([])).toThrow(RangeError);
    expect(() => chooseProjection([{ lon: 10, lat: 95 }])).toThrow(/lat 95/);
    expect(() => chooseProjection([{ lon: NaN, lat: 0 }])).toThrow(RangeError);
  });
});

describe("toLocal(p, proj) and toLonLat(p, proj)", () => {
  it("round-trip within 1 mm, north and south, near and far from the central meridian", () => {
    const rng = createRandom(21);
    for (const centre of [
      { lon: -135, lat: -35 },
      { lon: 2.9, lat: 51 },
      { lon: 174.2, lat: -41.3 },
      { lon: -60.1, lat: 0.02 },
      { lon: 100, lat: 70 },
    ]) {
      const points = Array.from({ length: 40 }, () => ({ lon: centre.lon + rng.uniform(-0.2, 0.2), lat: centre.lat + rng.uniform(-0.2, 0.2) }));
      const proj = chooseProjection(points);
      for (const p of points) {
        const local = toLocal(p, proj);
        const back = toLonLat(local, proj);
        // Compare in metres: project the returned lon/lat again.
        const again = toLocal(back, proj);
        expect(Math.hypot(again.x - local.x, again.y - local.y)).toBeLessThan(1e-3);
        // And in degrees: 1 mm is about 9e-9° of latitude.
        expect(Math.abs(back.lat - p.lat)).toBeLessThan(1e-8);
        expect(Math.abs(back.lon - p.lon) * Math.cos((p.lat * Math.PI) / 180)).toBeLessThan(1e-8);
      }
    }
  });

  it("keeps distances: 0.01° of latitude is about 1.11 km of local y", () => {
    const proj = chooseProjection([{ lon: -135, lat: -35 }]);
    const a = toLocal({ lon: -135, lat: -35 }, proj);
    const b = toLocal({ lon: -135, lat: -34.99 }, proj);
    // Meridian degree at 35° ≈ 110.94 km (WGS84; common textbook value), times k ≈ 0.9996.
    expect(b.y - a.y).toBeGreaterThan(1108);
    expect(b.y - a.y).toBeLessThan(1110);
    expect(Math.abs(b.x - a.x)).toBeLessThan(0.01);
  });

  it("refuses non-finite input with a RangeError", () => {
    const proj = chooseProjection([{ lon: 0, lat: 0 }]);
    expect(() => toLonLat({ x: NaN, y: 0 }, proj)).toThrow(RangeError);
    expect(() => toLocal({ lon: 200, lat: 0 }, proj)).toThrow(RangeError);
  });
});

describe("utmEpsg / utmOfEpsg", () => {
  it("name WGS84 UTM zones 326zz (north) and 327zz (south) both ways", () => {
    expect(utmEpsg(8, "south")).toBe(32708);
    expect(utmOfEpsg(32633)).toEqual({ zone: 33, hemisphere: "north" });
    expect(utmOfEpsg(32760)).toEqual({ zone: 60, hemisphere: "south" });
    expect(utmOfEpsg(3857)).toBeUndefined();
    expect(utmOfEpsg(32600)).toBeUndefined();
  });
});
