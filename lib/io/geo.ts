// WGS84 longitude/latitude ↔ the scenario's local metres (x east, y north).
//
// The model works in a flat metric frame, so an imported network is projected once with
// the Universal Transverse Mercator zone that holds the data's centroid and then shifted so
// that local (0, 0) is the south-west corner of the data's projected bounding box, rounded
// down to 10 m. Local coordinates of the data are therefore small and non-negative, and the
// shift is a round number so an engineer can still read real UTM values off them.
//
// UTM zone rule (UTM definition, NGA.SIG.0012 §2 / DMA TM 8358.2; recalled from memory):
//   zone = floor((lon + 180) / 6) + 1, 1…60 (lon = 180 belongs to zone 60);
//   hemisphere "north" when the centroid's latitude ≥ 0 (false northing 0), else "south"
//   (false northing 10 000 000 m). The Norway / Svalbard exceptions are not applied: the
//   model only needs one consistent conformal plane, not the official zone.
// Within ±3° of the zone's central meridian the UTM scale error is below 1 part in 1000
// (k0 = 0.9996 on the meridian, ≈ 1.0010 at 3° off at the equator), which is far below the
// 5 m grid for a city-sized network.

import proj4 from "proj4";

export interface LonLat {
  lon: number;
  lat: number;
}

export interface LocalPoint {
  x: number;
  y: number;
}

export type Hemisphere = "north" | "south";

/** A UTM zone plus the local shift: local = (easting − originEasting, northing − originNorthing). */
export interface LocalProjection {
  zone: number;
  hemisphere: Hemisphere;
  /** UTM easting / northing of local (0, 0), metres (multiples of 10). */
  originEasting: number;
  originNorthing: number;
  /** WGS84 longitude/latitude of local (0, 0) (what Scenario.origin records). */
  origin: LonLat;
}

const WGS84_LONLAT = "+proj=longlat +datum=WGS84 +no_defs";
/** Local (0, 0) is rounded down to this many metres. */
const ORIGIN_STEP_M = 10;

/** The UTM zone (1…60) holding a longitude. */
export function utmZoneOf(lon: number): number {
  if (!Number.isFinite(lon) || lon < -180 || lon > 180) throw new RangeError(`utmZoneOf: longitude ${String(lon)} is outside −180…180`);
  return Math.min(60, Math.floor((lon + 180) / 6) + 1);
}

/**
 * proj4 definition of a UTM zone. `ellps` other than WGS84 exists only so the reference
 * test can rerun a textbook example on its ellipsoid through this same definition.
 */
export function utmDefinition(zone: number, hemisphere: Hemisphere, ellps = "WGS84"): string {
  if (!Number.isInteger(zone) || zone < 1 || zone > 60) throw new RangeError(`utmDefinition: zone ${String(zone)} is not a whole number 1…60`);
  const datum = ellps === "WGS84" ? "+datum=WGS84" : `+ellps=${ellps}`;
  return `+proj=utm +zone=${zone}${hemisphere === "south" ? " +south" : ""} ${datum} +units=m +no_defs`;
}

type Converter = { forward(p: number[]): number[]; inverse(p: number[]): number[] };
const converters = new Map<string, Converter>();

/** A cached lon/lat ↔ UTM converter (building one per point would dominate the cost). */
export function utmConverter(zone: number, hemisphere: Hemisphere, ellps = "WGS84"): Converter {
  const def = utmDefinition(zone, hemisphere, ellps);
  let c = converters.get(def);
  if (!c) {
    c = proj4(WGS84_LONLAT, def) as unknown as Converter;
    converters.set(def, c);
  }
  return c;
}

function checkLonLat(p: LonLat, what: string): void {
  if (!Number.isFinite(p.lon) || !Number.isFinite(p.lat) || p.lon < -180 || p.lon > 180 || p.lat < -90 || p.lat > 90) {
    throw new RangeError(`${what}: (lon ${String(p.lon)}, lat ${String(p.lat)}) is not a WGS84 position (lon −180…180, lat −90…90)`);
  }
}

/**
 * Picks the UTM zone of the points' centroid and the local origin (south-west corner of their
 * projected bounding box, rounded down to 10 m). The centroid is the mean longitude and latitude,
 * which is fine for data that spans a few degrees at most (not across the antimeridian).
 */
export function chooseProjection(points: readonly LonLat[]): LocalProjection {
  if (points.length === 0) throw new RangeError("chooseProjection: no points to place");
  // Sum in Float64 (plain numbers); the mean only picks the zone.
  let sumLon = 0;
  let sumLat = 0;
  for (const p of points) {
    checkLonLat(p, "chooseProjection");
    sumLon += p.lon;
    sumLat += p.lat;
  }
  const zone = utmZoneOf(sumLon / points.length);
  const hemisphere: Hemisphere = sumLat / points.length >= 0 ? "north" : "south";
  const c = utmConverter(zone, hemisphere);
  let minE = Infinity;
  let minN = Infinity;
  for (const p of points) {
    const [e, n] = c.forward([p.lon, p.lat]);
    if (e < minE) minE = e;
    if (n < minN) minN = n;
  }
  const originEasting = Math.floor(minE / ORIGIN_STEP_M) * ORIGIN_STEP_M;
  const originNorthing = Math.floor(minN / ORIGIN_STEP_M) * ORIGIN_STEP_M;
  const [lon, lat] = c.inverse([originEasting, originNorthing]);
  return { zone, hemisphere, originEasting, originNorthing, origin: { lon, lat } };
}

/** WGS84 lon/lat → local metres of the projection. */
export function toLocal(p: LonLat, proj: LocalProjection): LocalPoint {
  checkLonLat(p, "toLocal");
  const [e, n] = utmConverter(proj.zone, proj.hemisphere).forward([p.lon, p.lat]);
  return { x: e - proj.originEasting, y: n - proj.originNorthing };
}

/** Local metres of the projection → WGS84 lon/lat. */
export function toLonLat(p: LocalPoint, proj: LocalProjection): LonLat {
  if (!Number.isFinite(p.x) || !Number.isFinite(p.y)) throw new RangeError(`toLonLat: (${String(p.x)}, ${String(p.y)}) is not a finite point`);
  const [lon, lat] = utmConverter(proj.zone, proj.hemisphere).inverse([p.x + proj.originEasting, p.y + proj.originNorthing]);
  return { lon, lat };
}

/** EPSG code of the WGS84 UTM zone (326zz north, 327zz south). */
export function utmEpsg(zone: number, hemisphere: Hemisphere): number {
  return (hemisphere === "north" ? 32600 : 32700) + zone;
}

/** The zone and hemisphere of a WGS84 UTM EPSG code, or undefined for any other code. */
export function utmOfEpsg(code: number): { zone: number; hemisphere: Hemisphere } | undefined {
  if (code > 32600 && code <= 32660) return { zone: code - 32600, hemisphere: "north" };
  if (code > 32700 && code <= 32760) return { zone: code - 32700, hemisphere: "south" };
  return undefined;
}
