// Colour scales of the grid map and the one loop that turns a raster into RGBA pixels. Pure (no DOM), so the
// pixel layout — north up, noData transparent — is unit-tested.
import { interpolateCividis, interpolateRdBu, interpolateViridis, schemeTableau10 } from "d3-scale-chromatic";
import { MAP_RASTER_NO_DATA } from "@/lib/io/mapRaster";

export type MapLayerKind = "rsrp" | "sinr" | "cell" | "delta";

export const LAYER_LABELS: Record<MapLayerKind, string> = {
  rsrp: "Best RSRP",
  sinr: "SINR",
  cell: "Serving cell",
  delta: "RSRP change (after − before)",
};

export interface ContinuousScale {
  kind: "continuous";
  /** Display range in the layer's unit; values outside are drawn in the end colour. */
  lo: number;
  hi: number;
  unit: "dBm" | "dB";
  interpolate: (t: number) => string;
  /** 256 RGB triples sampled from interpolate. */
  lut: Uint8Array;
}

export interface CategoricalScale {
  kind: "categorical";
  colours: readonly string[];
  /** colours as RGB triples. */
  lut: Uint8Array;
}

export type MapScale = ContinuousScale | CategoricalScale;

/** Display ranges (common practice for LTE/NR drive-test style maps, not a standard); pages may override. */
export const DEFAULT_RSRP_DOMAIN_DBM: [number, number] = [-130, -60];
export const DEFAULT_SINR_DOMAIN_DB: [number, number] = [-10, 30];

/** "#rrggbb" or "rgb(r, g, b)" (the two forms d3-scale-chromatic returns) to [r, g, b]. */
export function parseColour(colour: string): [number, number, number] {
  const hex = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(colour);
  if (hex) return [parseInt(hex[1], 16), parseInt(hex[2], 16), parseInt(hex[3], 16)];
  const rgb = /^rgb\(\s*(\d+),\s*(\d+),\s*(\d+)\s*\)$/.exec(colour);
  if (rgb) return [Number(rgb[1]), Number(rgb[2]), Number(rgb[3])];
  throw new RangeError(`parseColour: cannot read colour ${JSON.stringify(colour)}`);
}

function sampleLut(interpolate: (t: number) => string): Uint8Array {
  const lut = new Uint8Array(256 * 3);
  for (let i = 0; i < 256; i++) lut.set(parseColour(interpolate(i / 255)), i * 3);
  return lut;
}

const lutCache = new Map<(t: number) => string, Uint8Array>();
function lutOf(interpolate: (t: number) => string): Uint8Array {
  let lut = lutCache.get(interpolate);
  if (!lut) lutCache.set(interpolate, (lut = sampleLut(interpolate)));
  return lut;
}

const DATA_DOMAIN_STEP_DB = 10;

/**
 * Colour range of an RSRP layer from its own values: the 2nd and 98th percentiles (centi-dB values), widened to
 * whole 10 dB steps; undefined when the layer has too few values to judge (the default range then). Keeps a
 * network whose signal sits above or below the usual display range from showing as one saturated colour.
 */
export function rsrpDomainOf(values: Int16Array): [number, number] | undefined {
  // a count per centi-dB value instead of a sort: one pass, whatever the size of the layer
  const counts = new Uint32Array(65536);
  let present = 0;
  for (let i = 0; i < values.length; i++) {
    if (values[i] === MAP_RASTER_NO_DATA) continue;
    counts[values[i] + 32768]++;
    present++;
  }
  if (present < 100) return undefined;
  /** The value at rank floor(p · present) of the sorted present values, dB. */
  const at = (p: number) => {
    const rank = Math.min(present - 1, Math.floor(p * present));
    let seen = 0;
    for (let k = 0; k < counts.length; k++) {
      seen += counts[k];
      if (seen > rank) return (k - 32768) / 100;
    }
    return NaN;
  };
  const lo = Math.floor(at(0.02) / DATA_DOMAIN_STEP_DB) * DATA_DOMAIN_STEP_DB;
  const hi = Math.ceil(at(0.98) / DATA_DOMAIN_STEP_DB) * DATA_DOMAIN_STEP_DB;
  return hi > lo ? [lo, hi] : undefined;
}

// RdBu runs red (t = 0) → near-white (0.5) → blue (1): a loss of signal is red, a gain blue, no change pale.
// Chosen over the red–green diverging schemes because red and blue stay apart for the common red–green
// colour-vision deficiencies (ColorBrewer marks RdBu colour-blind safe — recalled from memory), and red
// matches the "worse" colour of the tables. The pale centre is told apart from "no grid" by the hatched
// map background.
const DELTA_STEPS_DB = [1, 2, 3, 5, 10, 15, 20, 30];

/** Symmetric delta range ±D, D the first step ≥ the largest |delta| present (so colours stay readable). */
export function deltaDomain(minDb: number | null, maxDb: number | null): [number, number] {
  const extent = Math.max(Math.abs(minDb ?? 0), Math.abs(maxDb ?? 0));
  const d = DELTA_STEPS_DB.find((s) => s >= extent) ?? DELTA_STEPS_DB[DELTA_STEPS_DB.length - 1];
  return [-d, d];
}

export function continuousScale(kind: "rsrp" | "sinr" | "delta", domain: [number, number]): ContinuousScale {
  const [lo, hi] = domain;
  if (!(Number.isFinite(lo) && Number.isFinite(hi) && hi > lo)) throw new RangeError(`continuousScale: domain must be finite with hi > lo, got [${lo}, ${hi}]`);
  // viridis for RSRP and cividis for SINR: perceptually uniform and readable with colour-vision deficiencies;
  // two different ramps so the two maps are never mistaken for each other.
  const interpolate = kind === "rsrp" ? interpolateViridis : kind === "sinr" ? interpolateCividis : interpolateRdBu;
  return { kind: "continuous", lo, hi, unit: kind === "rsrp" ? "dBm" : "dB", interpolate, lut: lutOf(interpolate) };
}

let cellLut: Uint8Array | null = null;
export function cellScale(): CategoricalScale {
  if (!cellLut) {
    cellLut = new Uint8Array(schemeTableau10.length * 3);
    schemeTableau10.forEach((c, i) => cellLut!.set(parseColour(c), i * 3));
  }
  return { kind: "categorical", colours: schemeTableau10, lut: cellLut };
}

/** Colour of serving-cell index i: Tableau10, cycling. */
export function cellColour(index: number): string {
  return schemeTableau10[index % schemeTableau10.length];
}

/**
 * RGBA pixels (width × height × 4) of a raster whose row 0 is the south row: the image's top row is the
 * raster's last (north) row, so the picture has north up. noData is transparent. "continuous" values are
 * centi-dB; "categorical" values are indices.
 */
export function rasterPixels(values: Int16Array, width: number, height: number, scale: MapScale, out?: Uint8ClampedArray): Uint8ClampedArray {
  if (values.length !== width * height) throw new RangeError(`rasterPixels: ${values.length} values for ${width} × ${height}`);
  const pixels = out ?? new Uint8ClampedArray(width * height * 4);
  if (pixels.length !== width * height * 4) throw new RangeError(`rasterPixels: output holds ${pixels.length} bytes, needs ${width * height * 4}`);
  const lut = scale.lut;
  const continuous = scale.kind === "continuous";
  // centi-dB → LUT index: (v / 100 − lo) / (hi − lo) · 255
  const offset = continuous ? scale.lo * 100 : 0;
  const factor = continuous ? 255 / ((scale.hi - scale.lo) * 100) : 0;
  const categories = lut.length / 3;
  for (let row = 0; row < height; row++) {
    const src = row * width;
    let dst = (height - 1 - row) * width * 4;
    for (let col = 0; col < width; col++, dst += 4) {
      const v = values[src + col];
      if (v === MAP_RASTER_NO_DATA) {
        pixels[dst + 3] = 0;
        continue;
      }
      let k: number;
      if (continuous) {
        k = Math.round((v - offset) * factor);
        k = k < 0 ? 0 : k > 255 ? 255 : k;
      } else {
        k = v % categories;
      }
      k *= 3;
      pixels[dst] = lut[k];
      pixels[dst + 1] = lut[k + 1];
      pixels[dst + 2] = lut[k + 2];
      pixels[dst + 3] = 255;
    }
  }
  return pixels;
}

/** Value under a point of the raster in display form, or null outside / on noData. */
export function rasterValueAt(
  raster: { header: { originX: number; originY: number; cellSize: number; width: number; height: number; cellCodes?: string[] }; values: Int16Array },
  x: number,
  y: number,
): number | null {
  const { originX, originY, cellSize, width, height } = raster.header;
  const col = Math.floor((x - originX) / cellSize);
  const row = Math.floor((y - originY) / cellSize);
  if (col < 0 || row < 0 || col >= width || row >= height) return null;
  const v = raster.values[row * width + col];
  return v === MAP_RASTER_NO_DATA ? null : v;
}
