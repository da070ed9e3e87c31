// GeoTIFF terrain: reading with the geotiff package, and a minimal writer of our own for the
// generated fixtures and tests (geotiff's writer always adds a default whole-globe
// georeference, so it cannot write the "no georeference" case, and it writes value by value).
//
// Georeference tags and keys: OGC GeoTIFF 1.1 (OGC 19-008r4) — ModelPixelScale (33550),
// ModelTiepoint (33922), ModelTransformation (34264), GeoKeyDirectory (34735);
// GTModelTypeGeoKey (1024: 1 projected, 2 geographic), GTRasterTypeGeoKey (1025: 1 PixelIsArea,
// 2 PixelIsPoint), GeographicTypeGeoKey (2048), ProjectedCSTypeGeoKey (3072). NODATA is the
// GDAL_NODATA ASCII tag (42113), a GDAL convention.

import { fromArrayBuffer } from "geotiff";
import type { FormatProblem } from "./scenarioFolder";
import { utmOfEpsg, type Hemisphere } from "./geo";

export type RasterCrs =
  | { kind: "geographic"; epsg: number }
  | { kind: "utm"; epsg: number; zone: number; hemisphere: Hemisphere }
  /** No (or user-defined) coordinate system: read as local metres when the positions are local metres. */
  | { kind: "unspecified" }
  | { kind: "unsupported"; epsg: number };

/** A north-up raster in its own coordinate system; row 0 is the northernmost row, as in the file. */
export interface GeoRaster {
  width: number;
  height: number;
  values: Float32Array;
  /** x (or lon) of the western edge and y (or lat) of the northern edge of the raster. */
  west: number;
  north: number;
  /** Pixel size along x and y, both positive, in the CRS's units. */
  pixelWidth: number;
  pixelHeight: number;
  crs: RasterCrs;
  /** Value marking a missing cell (NaN cells are missing too). */
  nodata?: number;
}

const USER_DEFINED = 32767;

function describe(crs: RasterCrs): string {
  switch (crs.kind) {
    case "geographic":
      return `EPSG:${crs.epsg} (longitude/latitude)`;
    case "utm":
      return `EPSG:${crs.epsg} (UTM zone ${crs.zone} ${crs.hemisphere})`;
    case "unspecified":
      return "no coordinate system";
    case "unsupported":
      return `EPSG:${crs.epsg}`;
  }
}
export { describe as describeRasterCrs };

function num(v: unknown): number[] | undefined {
  if (v === undefined || v === null) return undefined;
  if (typeof v === "number") return [v];
  if (ArrayBuffer.isView(v) || Array.isArray(v)) return Array.from(v as ArrayLike<number>, Number);
  return undefined;
}

/**
 * Reads band 1 of the first image of a GeoTIFF. Every problem names the file; a TIFF without
 * georeference (no tiepoint + pixel scale and no transformation) is an error.
 */
export async function readGeoTiff(bytes: Uint8Array, file: string): Promise<{ value?: GeoRaster; problems: FormatProblem[] }> {
  const problems: FormatProblem[] = [];
  const error = (reason: string, column?: string, value?: string): void => {
    problems.push({ severity: "error", file, reason, ...(column ? { column } : {}), ...(value !== undefined ? { value } : {}) });
  };
  const warn = (reason: string, column?: string): void => {
    problems.push({ severity: "warning", file, reason, ...(column ? { column } : {}) });
  };
  try {
    const buffer = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
    const tiff = await fromArrayBuffer(buffer);
    const image = await tiff.getImage(0);
    const fd = image.getFileDirectory();
    const load = async (tag: string): Promise<unknown> => (fd.hasTag(tag as never) ? fd.loadValue(tag as never) : undefined);
    const scale = num(await load("ModelPixelScale"));
    const tie = num(await load("ModelTiepoint"));
    const transform = num(await load("ModelTransformation"));
    // parseGeoKeyDirectory reads these synchronously, so load them first.
    await load("GeoKeyDirectory");
    await load("GeoAsciiParams");
    await load("GeoDoubleParams");
    const width = image.getWidth();
    const height = image.getHeight();
    if (width < 1 || height < 1) {
      error(`empty image (${width} × ${height})`);
      return { problems };
    }

    let west: number;
    let north: number;
    let pixelWidth: number;
    let pixelHeight: number;
    if (scale && tie && scale.length >= 2 && tie.length >= 6) {
      if (tie.length > 6) warn("several tiepoints; only the first is used", "ModelTiepoint");
      pixelWidth = scale[0];
      pixelHeight = scale[1];
      // Tiepoint (i, j, k, x, y, z): raster point (i, j) sits at model (x, y).
      west = tie[3] - tie[0] * pixelWidth;
      north = tie[4] + tie[1] * pixelHeight;
    } else if (transform && transform.length >= 16) {
      if (transform[1] !== 0 || transform[4] !== 0) {
        error("rotated or sheared rasters (ModelTransformation with rotation terms) are not supported; warp it north-up first", "ModelTransformation");
        return { problems };
      }
      pixelWidth = transform[0];
      pixelHeight = -transform[5];
      west = transform[3];
      north = transform[7];
    } else {
      error(
        "GeoTIFF has no georeference (neither ModelTiepoint + ModelPixelScale nor ModelTransformation); the terrain cannot be placed",
        "ModelTiepoint",
      );
      return { problems };
    }
    if (!(pixelWidth > 0) || !(pixelHeight > 0) || !Number.isFinite(west) || !Number.isFinite(north)) {
      error(`georeference is not north-up with positive pixel size (pixel ${pixelWidth} × ${pixelHeight})`, "ModelPixelScale", `${pixelWidth} ${pixelHeight}`);
      return { problems };
    }

    let keys: Record<string, unknown> = {};
    try {
      keys = (image.getGeoKeys() as Record<string, unknown> | null) ?? {};
    } catch (e) {
      warn(`unreadable GeoKeyDirectory (${(e as Error).message}); no coordinate system assumed`, "GeoKeyDirectory");
    }
    // PixelIsPoint: the tiepoint names the centre of the pixel, so the edge is half a pixel out.
    if (keys.GTRasterTypeGeoKey === 2) {
      west -= pixelWidth / 2;
      north += pixelHeight / 2;
    }
    const projected = typeof keys.ProjectedCSTypeGeoKey === "number" ? keys.ProjectedCSTypeGeoKey : undefined;
    const geographic = typeof keys.GeographicTypeGeoKey === "number" ? keys.GeographicTypeGeoKey : undefined;
    let crs: RasterCrs;
    if (projected !== undefined && projected !== USER_DEFINED) {
      const utm = utmOfEpsg(projected);
      crs = utm ? { kind: "utm", epsg: projected, ...utm } : { kind: "unsupported", epsg: projected };
    } else if (keys.GTModelTypeGeoKey !== 1 && geographic !== undefined && geographic !== USER_DEFINED) {
      crs = geographic === 4326 ? { kind: "geographic", epsg: 4326 } : { kind: "unsupported", epsg: geographic };
    } else {
      crs = { kind: "unspecified" };
    }

    const samples = image.getSamplesPerPixel();
    if (samples > 1) warn(`${samples} bands; only band 1 is used`);
    const rasters = await image.readRasters({ samples: [0] });
    const band = (rasters as unknown as ArrayLike<number>[])[0];
    const values = band instanceof Float32Array ? band : Float32Array.from(band);
    const nodata = image.getGDALNoData();
    return {
      value: { width, height, values, west, north, pixelWidth, pixelHeight, crs, ...(nodata !== null && Number.isFinite(nodata) ? { nodata } : {}) },
      problems,
    };
  } catch (e) {
    error(`not a readable GeoTIFF: ${(e as Error).message}`);
    return { problems };
  }
}

// ---------------------------------------------------------------------------
// Writer (TIFF 6.0, little-endian, one uncompressed Float32 strip)

export interface GeoTiffGeoreference {
  /** x (or lon) of the western edge and y (or lat) of the northern edge. */
  west: number;
  north: number;
  pixelWidth: number;
  pixelHeight: number;
  /** 4326 for lon/lat, 326zz / 327zz for WGS84 UTM; omitted = no GeoKeyDirectory at all. */
  epsg?: number;
}

const SHORT = 3;
const LONG = 4;
const ASCII = 2;
const DOUBLE = 12;
const TYPE_SIZE: Record<number, number> = { [ASCII]: 1, [SHORT]: 2, [LONG]: 4, [DOUBLE]: 8 };

/**
 * Encodes a Float32 raster (row 0 = north) as a GeoTIFF. Without `geo` the file is a plain
 * TIFF with no georeference at all.
 */
export function encodeGeoTiff(
  values: Float32Array,
  width: number,
  height: number,
  geo?: GeoTiffGeoreference,
  nodata?: number,
): Uint8Array {
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 1 || height < 1 || values.length !== width * height) {
    throw new RangeError(`encodeGeoTiff: shape ${String(width)} × ${String(height)} does not match ${values.length} values`);
  }
  const tags: { tag: number; type: number; values: number[] | string }[] = [
    { tag: 256, type: LONG, values: [width] },
    { tag: 257, type: LONG, values: [height] },
    { tag: 258, type: SHORT, values: [32] },
    { tag: 259, type: SHORT, values: [1] },
    { tag: 262, type: SHORT, values: [1] },
    { tag: 273, type: LONG, values: [0] }, // strip offset, patched below
    { tag: 277, type: SHORT, values: [1] },
    { tag: 278, type: LONG, values: [height] },
    { tag: 279, type: LONG, values: [values.length * 4] },
    { tag: 284, type: SHORT, values: [1] },
    { tag: 339, type: SHORT, values: [3] },
  ];
  if (geo) {
    tags.push({ tag: 33550, type: DOUBLE, values: [geo.pixelWidth, geo.pixelHeight, 0] });
    tags.push({ tag: 33922, type: DOUBLE, values: [0, 0, 0, geo.west, geo.north, 0] });
    if (geo.epsg !== undefined) {
      const geographic = geo.epsg === 4326;
      // Header (version 1, revision 1.0, n keys), then (key, location 0, count 1, value) per key.
      const keys = [
        [1024, geographic ? 2 : 1],
        [1025, 1],
        [geographic ? 2048 : 3072, geo.epsg],
      ];
      tags.push({ tag: 34735, type: SHORT, values: [1, 1, 0, keys.length, ...keys.flatMap(([k, v]) => [k, 0, 1, v])] });
    }
  }
  if (nodata !== undefined) tags.push({ tag: 42113, type: ASCII, values: `${nodata}\u0000` });
  tags.sort((a, b) => a.tag - b.tag);

  const ifdSize = 2 + tags.length * 12 + 4;
  let extra = 8 + ifdSize;
  const placed = tags.map((t) => {
    const count = typeof t.values === "string" ? t.values.length : t.values.length;
    const size = count * TYPE_SIZE[t.type];
    let offset = -1;
    if (size > 4) {
      extra += extra % 2; // word alignment
      offset = extra;
      extra += size;
    }
    return { ...t, count, size, offset };
  });
  const stripOffset = extra + ((8 - (extra % 8)) % 8);
  const total = stripOffset + values.length * 4;
  const out = new Uint8Array(total);
  const view = new DataView(out.buffer);
  out[0] = 0x49;
  out[1] = 0x49;
  view.setUint16(2, 42, true);
  view.setUint32(4, 8, true);
  view.setUint16(8, tags.length, true);
  const writeValues = (p: number, t: (typeof placed)[number]): void => {
    if (typeof t.values === "string") {
      for (let i = 0; i < t.values.length; i++) out[p + i] = t.values.charCodeAt(i);
      return;
    }
    t.values.forEach((v, i) => {
      if (t.type === SHORT) view.setUint16(p + i * 2, v, true);
      else if (t.type === LONG) view.setUint32(p + i * 4, t.tag === 273 ? stripOffset : v, true);
      else view.setFloat64(p + i * 8, v, true);
    });
  };
  placed.forEach((t, k) => {
    const p = 10 + k * 12;
    view.setUint16(p, t.tag, true);
    view.setUint16(p + 2, t.type, true);
    view.setUint32(p + 4, t.count, true);
    if (t.offset < 0) writeValues(p + 8, t);
    else {
      view.setUint32(p + 8, t.offset, true);
      writeValues(t.offset, t);
    }
  });
  view.setUint32(10 + tags.length * 12, 0, true);
  for (let i = 0; i < values.length; i++) view.setFloat32(stripOffset + i * 4, values[i], true);
  return out;
}
