import { describe, expect, it } from "vitest";
import {
  MAP_RASTER_NO_DATA,
  decodeMapRaster,
  deltaLayer,
  encodeMapRaster,
  floorLayer,
  floorsOf,
  quantiseCellIndex,
  quantiseCentiDb,
  type MapRasterHeaderInput,
} from "../../../lib/io/mapRaster";

const ND = MAP_RASTER_NO_DATA;
const base: MapRasterHeaderInput = {
  layer: "rsrp-after", floor: 0, width: 3, height: 2, originX: -100, originY: 250, cellSize: 5, encoding: "centi-db",
};

/** Rewrites the JSON header of an encoded raster (keeping the payload), to build malformed buffers. */
function withHeader(encoded: Uint8Array, edit: (h: Record<string, unknown>) => unknown): ArrayBuffer {
  const view = new DataView(encoded.buffer, encoded.byteOffset);
  const length = view.getUint32(8, true);
  const header = JSON.parse(new TextDecoder().decode(encoded.subarray(12, 12 + length)));
  const json = new TextEncoder().encode(JSON.stringify(edit(header) ?? header));
  const payload = encoded.subarray(Math.ceil((12 + length) / 8) * 8);
  const offset = Math.ceil((12 + json.length) / 8) * 8;
  const out = new Uint8Array(offset + payload.length);
  out.set(encoded.subarray(0, 12));
  new DataView(out.buffer).setUint32(8, json.length, true);
  out.set(json, 12);
  out.set(payload, offset);
  return out.buffer;
}

describe("encodeMapRaster(header, values) / decodeMapRaster(buffer)", () => {
  const values = new Int16Array([-9712, ND, -10500, 3, 32767, -32767]);

  it("decodeMapRaster(encodeMapRaster(h, v)) gives back the header and every value", () => {
    const encoded = encodeMapRaster(base, values);
    const { header, values: back } = decodeMapRaster(encoded.slice().buffer);
    expect(header).toEqual({ ...base, noData: ND, min: -327.67, max: 327.67 });
    expect(Array.from(back)).toEqual(Array.from(values));
  });

  it("encodeMapRaster starts with magic BGMR, version 1, and pads the payload to a multiple of 8", () => {
    const encoded = encodeMapRaster(base, values);
    expect(String.fromCharCode(...encoded.subarray(0, 4))).toBe("BGMR");
    const view = new DataView(encoded.buffer);
    expect(view.getUint16(4, true)).toBe(1);
    const jsonLength = view.getUint32(8, true);
    const payloadOffset = encoded.length - values.length * 2;
    expect(payloadOffset % 8).toBe(0);
    expect(payloadOffset).toBeGreaterThanOrEqual(12 + jsonLength);
    expect(payloadOffset - (12 + jsonLength)).toBeLessThan(8);
    // the first payload value, little-endian
    expect(view.getInt16(payloadOffset, true)).toBe(-9712);
  });

  it("encodeMapRaster fills min and max in display units and null when every value is noData", () => {
    const small = { ...base, width: 2, height: 1 };
    expect(decodeMapRaster(encodeMapRaster(small, new Int16Array([-9000, -11050]))).header).toMatchObject({ min: -110.5, max: -90 });
    expect(decodeMapRaster(encodeMapRaster(small, new Int16Array([ND, ND]))).header).toMatchObject({ min: null, max: null });
    const cells = { ...small, layer: "cell-before" as const, encoding: "index" as const, cellCodes: ["A1", "A2", "B1"] };
    expect(decodeMapRaster(encodeMapRaster(cells, new Int16Array([2, 0]))).header).toMatchObject({ min: 0, max: 2, cellCodes: ["A1", "A2", "B1"] });
  });

  it("decodeMapRaster reads a buffer whose payload sits at an odd byte offset", () => {
    const encoded = encodeMapRaster(base, values);
    const shifted = new Uint8Array(encoded.length + 1);
    shifted.set(encoded, 1);
    expect(Array.from(decodeMapRaster(shifted.subarray(1)).values)).toEqual(Array.from(values));
  });

  it("encodeMapRaster refuses a value count other than width × height and indices past cellCodes", () => {
    expect(() => encodeMapRaster(base, new Int16Array(5))).toThrow(/values must hold width × height = 6 values, got 5/);
    const cells = { ...base, layer: "cell-after" as const, encoding: "index" as const, cellCodes: ["A1"] };
    expect(() => encodeMapRaster(cells, new Int16Array([0, 0, 1, 0, 0, 0]))).toThrow(/values \[2\] = 1/);
    expect(() => encodeMapRaster({ ...cells, cellCodes: undefined }, new Int16Array(6))).toThrow(/cellCodes/);
  });

  it("decodeMapRaster throws a RangeError naming the bad field of a malformed buffer", () => {
    const good = encodeMapRaster(base, values);
    const bad = (edit: (b: Uint8Array) => void) => {
      const copy = good.slice();
      edit(copy);
      return copy.buffer;
    };
    expect(() => decodeMapRaster(new ArrayBuffer(5))).toThrow(RangeError);
    expect(() => decodeMapRaster(new ArrayBuffer(5))).toThrow(/length/);
    expect(() => decodeMapRaster(bad((b) => (b[0] = 0x58)))).toThrow(/magic must be "BGMR", got "XGMR"/);
    expect(() => decodeMapRaster(bad((b) => new DataView(b.buffer).setUint16(4, 9, true)))).toThrow(/version must be 1, got 9/);
    expect(() => decodeMapRaster(bad((b) => new DataView(b.buffer).setUint32(8, 1e6, true)))).toThrow(/header length/);
    expect(() => decodeMapRaster(bad((b) => (b[12] = 0x7a)))).toThrow(/header is not valid UTF-8 JSON/);
    expect(() => decodeMapRaster(good.slice(0, good.length - 2).buffer)).toThrow(/length must be \d+ bytes for a 3 × 2 raster/);
    expect(() => decodeMapRaster(withHeader(good, (h) => void (h.width = 2.5)))).toThrow(/width must be an integer ≥ 1, got 2.5/);
    expect(() => decodeMapRaster(withHeader(good, (h) => void delete h.height))).toThrow(/height/);
    expect(() => decodeMapRaster(withHeader(good, (h) => void (h.cellSize = 0)))).toThrow(/cellSize must be > 0/);
    expect(() => decodeMapRaster(withHeader(good, (h) => void (h.layer = "rsrp")))).toThrow(/layer must be one of/);
    expect(() => decodeMapRaster(withHeader(good, (h) => void (h.encoding = "float")))).toThrow(/encoding/);
    expect(() => decodeMapRaster(withHeader(good, (h) => void (h.noData = 0)))).toThrow(/noData must be -32768, got 0/);
    expect(() => decodeMapRaster(withHeader(good, (h) => void (h.min = 400)))).toThrow(/min must be ≤ max/);
    expect(() => decodeMapRaster(withHeader(good, (h) => void (h.originY = "north")))).toThrow(/originY must be a finite number/);
    expect(() => decodeMapRaster(withHeader(good, (h) => void (h.encoding = "index")))).toThrow(/cellCodes must be an array of strings/);
    expect(() => decodeMapRaster(withHeader(good, () => [1, 2]))).toThrow(/header must be a JSON object/);
    // the helper itself keeps a good buffer good
    expect(decodeMapRaster(withHeader(good, () => undefined)).header.width).toBe(3);
  });
});

describe("floorLayer(grid, planeSize, perGrid, floor)", () => {
  // A 3 × 2 plane (row 0 south): positions 0, 1, 2, 4 open ground; position 3 a two-floor building,
  // position 5 a three-floor building. Grids of one position are stored consecutively, lowest first.
  const grid = {
    count: 9,
    floor: new Uint16Array([0, 0, 0, 1, 2, 0, 1, 2, 3]),
    positionIndex: new Int32Array([0, 1, 2, 3, 3, 4, 5, 5, 5]),
  };
  const perGrid = new Int16Array([10, 11, 12, 30, 31, 14, 50, 51, 52]);

  it("floorLayer(…, 0) puts outdoor grids on their positions and noData under buildings", () => {
    expect(Array.from(floorLayer(grid, 6, perGrid, 0))).toEqual([10, 11, 12, ND, 14, ND]);
  });

  it("floorLayer(…, k) keeps floor k of every building tall enough, noData elsewhere", () => {
    expect(Array.from(floorLayer(grid, 6, perGrid, 1))).toEqual([ND, ND, ND, 30, ND, 50]);
    expect(Array.from(floorLayer(grid, 6, perGrid, 2))).toEqual([ND, ND, ND, 31, ND, 51]);
    expect(Array.from(floorLayer(grid, 6, perGrid, 3))).toEqual([ND, ND, ND, ND, ND, 52]);
    expect(Array.from(floorLayer(grid, 6, perGrid, 4, -1))).toEqual([-1, -1, -1, -1, -1, -1]);
  });

  it("floorLayer over floorsOf(grid) places every grid exactly once", () => {
    let placed = 0;
    for (const f of floorsOf(grid)) placed += floorLayer(grid, 6, perGrid, f).filter((v) => v !== ND).length;
    expect(placed).toBe(grid.count);
  });

  it("floorLayer refuses a perGrid of the wrong length, a bad floor and positions off the plane", () => {
    expect(() => floorLayer(grid, 6, new Int16Array(8), 0)).toThrow(/perGrid has 8 values for 9 grids/);
    expect(() => floorLayer(grid, 6, perGrid, -1)).toThrow(RangeError);
    expect(() => floorLayer(grid, 5, perGrid, 1)).toThrow(/positionIndex 5 outside the plane of 5 positions/);
  });
});

describe("deltaLayer(before, after)", () => {
  it("deltaLayer gives after − before, noData where either side is missing, clamped to ±32767", () => {
    const before = new Int16Array([-9000, ND, -8000, -32767, 32767, 0]);
    const after = new Int16Array([-9350, -7000, ND, 32767, -32767, 0]);
    expect(Array.from(deltaLayer(before, after))).toEqual([-350, ND, ND, 32767, -32767, 0]);
  });

  it("deltaLayer refuses layers of different lengths", () => {
    expect(() => deltaLayer(new Int16Array(3), new Int16Array(4))).toThrow(/before has 3 values, after has 4/);
  });
});

describe("quantiseCentiDb(values)", () => {
  it("quantiseCentiDb rounds to centi-dB, maps −Infinity and NaN to −32768 and clamps to ±32767", () => {
    const v = new Float32Array([-97.123, -97.126, 0, -0.004, 12.5, 327.67, 400, -400, -Infinity, NaN, Infinity]);
    expect(Array.from(quantiseCentiDb(v))).toEqual([-9712, -9713, 0, 0, 1250, 32767, 32767, -32767, ND, ND, 32767]);
  });

  it("quantiseCentiDb never produces noData from a finite value", () => {
    expect(quantiseCentiDb([-327.68, -1e9])[0]).toBe(-32767);
    expect(quantiseCentiDb([-327.68, -1e9])[1]).toBe(-32767);
  });
});

describe("quantiseCellIndex(bestCell)", () => {
  it("quantiseCellIndex maps −1 to noData and keeps indices", () => {
    expect(Array.from(quantiseCellIndex(new Int32Array([-1, 0, 7, 32767])))).toEqual([ND, 0, 7, 32767]);
  });
  it("quantiseCellIndex refuses indices that do not fit", () => {
    expect(() => quantiseCellIndex(new Int32Array([0, 40000]))).toThrow(/bestCell\[1\] = 40000/);
    expect(() => quantiseCellIndex([-2])).toThrow(RangeError);
  });
});

describe("floorsOf(grid)", () => {
  it("floorsOf lists the distinct floors ascending", () => {
    expect(floorsOf({ count: 6, floor: new Uint16Array([2, 0, 1, 0, 3, 1]) })).toEqual([0, 1, 2, 3]);
    expect(floorsOf({ count: 2, floor: new Uint16Array([1, 1]) })).toEqual([1]);
    expect(floorsOf({ count: 0, floor: new Uint16Array(0) })).toEqual([]);
  });
});
