import { writeArrayBuffer } from "geotiff";
import { describe, expect, it } from "vitest";
import { encodeGeoTiff, readGeoTiff } from "../../../lib/io/geoTiff";

const ramp = (n: number): Float32Array => Float32Array.from({ length: n }, (_, i) => i * 0.25 - 3);

describe("readGeoTiff(bytes, file)", () => {
  it("reads a file written by the geotiff package: values in file order, edges, CRS", async () => {
    const values = ramp(6 * 4);
    const buffer = writeArrayBuffer(values, {
      width: 6,
      height: 4,
      ModelPixelScale: [0.001, 0.002, 0],
      ModelTiepoint: [0, 0, 0, -135.01, -34.99, 0],
      GeographicTypeGeoKey: 4326,
      GTModelTypeGeoKey: 2,
    });
    const { value, problems } = await readGeoTiff(new Uint8Array(buffer), "dem.tif");
    expect(problems.filter((p) => p.severity === "error")).toEqual([]);
    expect(value).toMatchObject({ width: 6, height: 4, west: -135.01, north: -34.99, pixelWidth: 0.001, pixelHeight: 0.002, crs: { kind: "geographic", epsg: 4326 } });
    expect(Array.from(value!.values)).toEqual(Array.from(values));
  });

  it("reads our own writer's UTM file with its NODATA value", async () => {
    const values = ramp(9);
    values[4] = -9999;
    const bytes = encodeGeoTiff(values, 3, 3, { west: 500_000, north: 6_100_000, pixelWidth: 5, pixelHeight: 5, epsg: 32708 }, -9999);
    const { value } = await readGeoTiff(bytes, "t.tif");
    expect(value).toMatchObject({ west: 500_000, north: 6_100_000, pixelWidth: 5, crs: { kind: "utm", zone: 8, hemisphere: "south", epsg: 32708 }, nodata: -9999 });
    expect(Array.from(value!.values)).toEqual(Array.from(values));
  });

  it("reports a TIFF without georeference as an error naming the file", async () => {
    const { value, problems } = await readGeoTiff(encodeGeoTiff(ramp(4), 2, 2), "terrain.tif");
    expect(value).toBeUndefined();
    expect(problems).toEqual([expect.objectContaining({ severity: "error", file: "terrain.tif", reason: expect.stringMatching(/no georeference/) })]);
  });

  it("reads a georeferenced file without GeoKeys as having no coordinate system", async () => {
    const { value } = await readGeoTiff(encodeGeoTiff(ramp(4), 2, 2, { west: 0, north: 20, pixelWidth: 10, pixelHeight: 10 }), "t.tif");
    expect(value!.crs).toEqual({ kind: "unspecified" });
  });

  it("reports bytes that are not a TIFF", async () => {
    const { problems } = await readGeoTiff(new TextEncoder().encode("ncols 2\nnrows 2\n"), "terrain.tif");
    expect(problems[0]).toMatchObject({ severity: "error", file: "terrain.tif", reason: expect.stringMatching(/not a readable GeoTIFF/) });
  });
});

describe("encodeGeoTiff(values, width, height)", () => {
  it("refuses a shape that does not match the values", () => {
    expect(() => encodeGeoTiff(ramp(5), 2, 2)).toThrow(RangeError);
  });
});
