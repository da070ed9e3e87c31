// The map raster wire format: one layer of one floor laid out on the horizontal plane, sent to the
// browser as compact binary rather than JSON of objects (300,000 grids are 600 kB here, megabytes as JSON).
//
// Layout (all integers little-endian):
//   bytes 0..3    magic "BGMR"
//   bytes 4..5    format version, uint16 (MAP_RASTER_VERSION)
//   bytes 6..7    reserved, 0
//   bytes 8..11   JSON header length in bytes, uint32
//   bytes 12..    JSON header, UTF-8 (MapRasterHeader)
//   padding       zero bytes up to the next multiple of 8, so the payload can be viewed as an Int16Array in place
//   payload       width × height int16 values, row-major, row 0 = the SOUTH row (as HorizontalPlane)
//
// Encodings: "centi-db" stores round(value × 100) of a dBm / dB quantity; "index" stores an index into
// header.cellCodes (the serving cell). Both use noData (−32768) where a position has no grid or no value.
// Pure: no Node imports, runs in the browser.
import type { Grid } from "../radio/grid";

export const MAP_RASTER_MAGIC = "BGMR";
export const MAP_RASTER_VERSION = 1;
export const MAP_RASTER_NO_DATA = -32768;
const PREFIX_BYTES = 12;
const PAYLOAD_ALIGN = 8;
const INT16_MAX = 32767;

/** The layers a page serves; the before → after delta of RSRP is computed in the browser from the two RSRP layers. */
export type MapRasterLayer = "rsrp-before" | "rsrp-after" | "sinr-before" | "sinr-after" | "cell-before" | "cell-after";
/** A header may also carry a precomputed delta. */
export type MapRasterHeaderLayer = MapRasterLayer | "rsrp-delta";
export const MAP_RASTER_LAYERS: readonly MapRasterHeaderLayer[] = [
  "rsrp-before", "rsrp-after", "sinr-before", "sinr-after", "cell-before", "cell-after", "rsrp-delta",
];

export type MapRasterEncoding = "centi-db" | "index";

export interface MapRasterHeader {
  layer: MapRasterHeaderLayer;
  /** 0 = outdoor, 1.. = building floor. */
  floor: number;
  width: number;
  height: number;
  /** South-west corner of position (0, 0), local metres. */
  originX: number;
  originY: number;
  cellSize: number;
  encoding: MapRasterEncoding;
  noData: number;
  /** Smallest and largest value present, in display units (dBm / dB for "centi-db", the index for "index"); null when every value is noData. */
  min: number | null;
  max: number | null;
  /** Cell codes that "index" values point into. */
  cellCodes?: string[];
}

/** What the caller of encodeMapRaster must say; min, max and noData are filled in when omitted. */
export type MapRasterHeaderInput = Omit<MapRasterHeader, "min" | "max" | "noData"> & Partial<Pick<MapRasterHeader, "min" | "max" | "noData">>;

export interface DecodedMapRaster {
  header: MapRasterHeader;
  values: Int16Array;
}

const align = (n: number, to: number) => Math.ceil(n / to) * to;
const isLittleEndian = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

function fail(field: string, message: string): never {
  throw new RangeError(`map raster: ${field} ${message}`);
}

/** Checks every header field; throws a RangeError naming the first bad one. */
function checkHeader(h: Record<string, unknown>): MapRasterHeader {
  const int = (field: string, min: number) => {
    const v = h[field];
    if (typeof v !== "number" || !Number.isInteger(v) || v < min) fail(field, `must be an integer ≥ ${min}, got ${JSON.stringify(v)}`);
    return v;
  };
  const finite = (field: string) => {
    const v = h[field];
    if (typeof v !== "number" || !Number.isFinite(v)) fail(field, `must be a finite number, got ${JSON.stringify(v)}`);
    return v;
  };
  const nullableFinite = (field: string) => {
    const v = h[field];
    if (v === null) return null;
    return finite(field);
  };
  if (typeof h.layer !== "string" || !MAP_RASTER_LAYERS.includes(h.layer as MapRasterHeaderLayer)) {
    fail("layer", `must be one of ${MAP_RASTER_LAYERS.join(", ")}, got ${JSON.stringify(h.layer)}`);
  }
  const floor = int("floor", 0);
  const width = int("width", 1);
  const height = int("height", 1);
  const originX = finite("originX");
  const originY = finite("originY");
  const cellSize = finite("cellSize");
  if (!(cellSize > 0)) fail("cellSize", `must be > 0, got ${cellSize}`);
  if (h.encoding !== "centi-db" && h.encoding !== "index") fail("encoding", `must be "centi-db" or "index", got ${JSON.stringify(h.encoding)}`);
  if (h.noData !== MAP_RASTER_NO_DATA) fail("noData", `must be ${MAP_RASTER_NO_DATA}, got ${JSON.stringify(h.noData)}`);
  const min = nullableFinite("min");
  const max = nullableFinite("max");
  if ((min === null) !== (max === null)) fail("min", `and max must both be null or both numbers, got ${min} and ${max}`);
  if (min !== null && max !== null && min > max) fail("min", `must be ≤ max, got ${min} > ${max}`);
  const header: MapRasterHeader = {
    layer: h.layer as MapRasterHeaderLayer,
    floor, width, height, originX, originY, cellSize,
    encoding: h.encoding,
    noData: MAP_RASTER_NO_DATA,
    min, max,
  };
  if (h.encoding === "index" || h.cellCodes !== undefined) {
    const codes = h.cellCodes;
    if (!Array.isArray(codes) || !codes.every((c) => typeof c === "string")) {
      fail("cellCodes", `must be an array of strings${h.encoding === "index" ? ' with encoding "index"' : ""}, got ${JSON.stringify(codes)}`);
    }
    header.cellCodes = codes as string[];
  }
  return header;
}

/** Smallest and largest non-noData value of `values`, converted to display units. */
function valueRange(values: Int16Array, encoding: MapRasterEncoding, noData: number): { min: number | null; max: number | null } {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v === noData) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (lo === Infinity) return { min: null, max: null };
  const scale = encoding === "centi-db" ? 100 : 1;
  return { min: lo / scale, max: hi / scale };
}

export function encodeMapRaster(input: MapRasterHeaderInput, values: Int16Array): Uint8Array {
  const noData = input.noData ?? MAP_RASTER_NO_DATA;
  const range = input.min === undefined || input.max === undefined ? valueRange(values, input.encoding, noData) : null;
  const header = checkHeader({ ...input, noData, min: input.min ?? range!.min, max: input.max ?? range!.max });
  const n = header.width * header.height;
  if (values.length !== n) fail("values", `must hold width × height = ${n} values, got ${values.length}`);
  if (header.encoding === "index") {
    const codes = header.cellCodes!.length;
    for (let i = 0; i < n; i++) {
      const v = values[i];
      if (v !== noData && (v < 0 || v >= codes)) fail("values", `[${i}] = ${v} is not an index into ${codes} cellCodes`);
    }
  }
  const json = new TextEncoder().encode(JSON.stringify(header));
  const payloadOffset = align(PREFIX_BYTES + json.length, PAYLOAD_ALIGN);
  const out = new Uint8Array(payloadOffset + n * 2);
  for (let i = 0; i < 4; i++) out[i] = MAP_RASTER_MAGIC.charCodeAt(i);
  const view = new DataView(out.buffer);
  view.setUint16(4, MAP_RASTER_VERSION, true);
  view.setUint16(6, 0, true);
  view.setUint32(8, json.length, true);
  out.set(json, PREFIX_BYTES);
  if (isLittleEndian) {
    out.set(new Uint8Array(values.buffer, values.byteOffset, n * 2), payloadOffset);
  } else {
    for (let i = 0; i < n; i++) view.setInt16(payloadOffset + 2 * i, values[i], true);
  }
  return out;
}

/** Reads a map raster; throws a RangeError naming the bad field when the buffer is malformed. */
export function decodeMapRaster(buffer: ArrayBuffer | ArrayBufferView): DecodedMapRaster {
  // isView rather than instanceof: buffers from another realm (a worker, a test runner) fail instanceof.
  const bytes = ArrayBuffer.isView(buffer)
    ? new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.byteLength)
    : new Uint8Array(buffer);
  if (bytes.length < PREFIX_BYTES) fail("length", `must be at least ${PREFIX_BYTES} bytes, got ${bytes.length}`);
  const magic = String.fromCharCode(bytes[0], bytes[1], bytes[2], bytes[3]);
  if (magic !== MAP_RASTER_MAGIC) fail("magic", `must be "${MAP_RASTER_MAGIC}", got ${JSON.stringify(magic)}`);
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const version = view.getUint16(4, true);
  if (version !== MAP_RASTER_VERSION) fail("version", `must be ${MAP_RASTER_VERSION}, got ${version}`);
  const jsonLength = view.getUint32(8, true);
  if (PREFIX_BYTES + jsonLength > bytes.length) fail("header length", `${jsonLength} runs past the end of the ${bytes.length}-byte buffer`);
  let parsed: unknown;
  try {
    parsed = JSON.parse(new TextDecoder("utf-8", { fatal: true }).decode(bytes.subarray(PREFIX_BYTES, PREFIX_BYTES + jsonLength)));
  } catch (e) {
    fail("header", `is not valid UTF-8 JSON (${(e as Error).message})`);
  }
  if (typeof parsed !== "object" || parsed === null || Array.isArray(parsed)) fail("header", `must be a JSON object, got ${JSON.stringify(parsed)}`);
  const header = checkHeader(parsed as Record<string, unknown>);
  const n = header.width * header.height;
  const payloadOffset = align(PREFIX_BYTES + jsonLength, PAYLOAD_ALIGN);
  const expected = payloadOffset + n * 2;
  if (bytes.length !== expected) fail("length", `must be ${expected} bytes for a ${header.width} × ${header.height} raster, got ${bytes.length}`);
  let values: Int16Array;
  const start = bytes.byteOffset + payloadOffset;
  if (isLittleEndian && start % 2 === 0) {
    values = new Int16Array(bytes.buffer, start, n);
  } else {
    values = new Int16Array(n);
    for (let i = 0; i < n; i++) values[i] = view.getInt16(payloadOffset + 2 * i, true);
  }
  return { header, values };
}

/**
 * The values of one floor laid out on the horizontal plane: position p gets the value of the grid at p on
 * `floor` (0 = outdoor, 1.. = building floor), noData where the position has no grid on that floor.
 */
export function floorLayer(
  grid: Pick<Grid, "count" | "floor" | "positionIndex">,
  planeSize: number,
  perGrid: Int16Array,
  floor: number,
  noData = MAP_RASTER_NO_DATA,
): Int16Array {
  if (!Number.isInteger(planeSize) || planeSize < 1) throw new RangeError(`floorLayer: planeSize must be an integer ≥ 1, got ${planeSize}`);
  if (perGrid.length !== grid.count) throw new RangeError(`floorLayer: perGrid has ${perGrid.length} values for ${grid.count} grids`);
  if (!Number.isInteger(floor) || floor < 0) throw new RangeError(`floorLayer: floor must be an integer ≥ 0, got ${floor}`);
  const out = new Int16Array(planeSize).fill(noData);
  const floors = grid.floor, positions = grid.positionIndex;
  for (let g = 0; g < grid.count; g++) {
    if (floors[g] !== floor) continue;
    const p = positions[g];
    if (p < 0 || p >= planeSize) throw new RangeError(`floorLayer: grid ${g} has positionIndex ${p} outside the plane of ${planeSize} positions`);
    out[p] = perGrid[g];
  }
  return out;
}

/** after − before in centi-dB (clamped to ±32767), noData where either side is missing. */
export function deltaLayer(before: Int16Array, after: Int16Array, noData = MAP_RASTER_NO_DATA): Int16Array {
  if (before.length !== after.length) throw new RangeError(`deltaLayer: before has ${before.length} values, after has ${after.length}`);
  const out = new Int16Array(before.length);
  for (let i = 0; i < before.length; i++) {
    const a = before[i], b = after[i];
    if (a === noData || b === noData) {
      out[i] = noData;
      continue;
    }
    const d = b - a;
    out[i] = d > INT16_MAX ? INT16_MAX : d < -INT16_MAX ? -INT16_MAX : d;
  }
  return out;
}

/**
 * dB or dBm values to centi-dB: round(v × 100) (half up, as Math.round), clamped to ±32767 (±327.67 dB);
 * −Infinity and NaN ("no cell reaches") become noData (−32768).
 */
export function quantiseCentiDb(values: ArrayLike<number>): Int16Array {
  const out = new Int16Array(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (Number.isNaN(v) || v === -Infinity) {
      out[i] = MAP_RASTER_NO_DATA;
      continue;
    }
    const c = Math.round(v * 100);
    out[i] = c > INT16_MAX ? INT16_MAX : c < -INT16_MAX ? -INT16_MAX : c;
  }
  return out;
}

/** Serving-cell indices (−1 = none, as PerGridResult.bestCell) to the "index" encoding. */
export function quantiseCellIndex(bestCell: ArrayLike<number>): Int16Array {
  const out = new Int16Array(bestCell.length);
  for (let i = 0; i < bestCell.length; i++) {
    const c = bestCell[i];
    if (c === -1) out[i] = MAP_RASTER_NO_DATA;
    else if (Number.isInteger(c) && c >= 0 && c <= INT16_MAX) out[i] = c;
    else throw new RangeError(`quantiseCellIndex: bestCell[${i}] = ${c} is not −1 or an index 0..${INT16_MAX}`);
  }
  return out;
}

/** Distinct floors present in the grid, ascending (0 = outdoor first when present). */
export function floorsOf(grid: Pick<Grid, "count" | "floor">): number[] {
  const seen = new Set<number>();
  for (let g = 0; g < grid.count; g++) seen.add(grid.floor[g]);
  return [...seen].sort((a, b) => a - b);
}
