// What the impact page needs about a simulation's grid and distributions, computed once when the job stores
// its result and kept in the simulation summary (JSON): the floors and plane geometry for the map controls,
// and the CDF points of best RSRP and SINR before and after. Without it the page had to rebuild the grid
// (load the scenario, rasterise the buildings) and read and sort four 300 000-value layers on every view.
import type { Grid } from "../radio/grid";
import { cdfPoints, type CdfPoint } from "../io/cdf";
import { floorsOf } from "../io/mapRaster";

export interface SimulationCdfs {
  bestRsrp: { before: CdfPoint[]; after: CdfPoint[] };
  sinr: { before: CdfPoint[]; after: CdfPoint[] };
}

export interface MapPlaneGeometry {
  originX: number;
  originY: number;
  cellSize: number;
  width: number;
  height: number;
}

/** Kept under summary.map of a simulation. */
export interface MapSummary {
  /** Floors with grids, 0 = outdoor (floorsOf). */
  floors: number[];
  plane: MapPlaneGeometry;
  cdfs: SimulationCdfs;
}

/** The stored centi-dB layers the CDFs are drawn from (the same values the page used to read back). */
export interface CdfLayers {
  bestRsrpBefore: Int16Array;
  bestRsrpAfter: Int16Array;
  sinrBefore: Int16Array;
  sinrAfter: Int16Array;
}

export function cdfsOf(layers: CdfLayers): SimulationCdfs {
  return {
    bestRsrp: { before: cdfPoints(layers.bestRsrpBefore), after: cdfPoints(layers.bestRsrpAfter) },
    sinr: { before: cdfPoints(layers.sinrBefore), after: cdfPoints(layers.sinrAfter) },
  };
}

export function mapSummaryOf(grid: Grid, layers: CdfLayers): MapSummary {
  const { originX, originY, cellSize, width, height } = grid.plane;
  return { floors: floorsOf(grid), plane: { originX, originY, cellSize, width, height }, cdfs: cdfsOf(layers) };
}

const isFiniteNumber = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);
const isCdf = (v: unknown): v is CdfPoint[] =>
  Array.isArray(v) && v.every((p) => p !== null && typeof p === "object" && isFiniteNumber((p as CdfPoint).value) && isFiniteNumber((p as CdfPoint).fraction));
const isPair = (v: unknown): v is { before: CdfPoint[]; after: CdfPoint[] } =>
  v !== null && typeof v === "object" && isCdf((v as { before: unknown }).before) && isCdf((v as { after: unknown }).after);

/**
 * summary.map of a stored summary, or null when it is missing or not of this shape (simulations stored before
 * it existed): callers then compute the same from the grid and the layers.
 */
export function readMapSummary(summary: unknown): MapSummary | null {
  if (summary === null || typeof summary !== "object") return null;
  const map = (summary as { map?: unknown }).map;
  if (map === null || typeof map !== "object") return null;
  const { floors, plane, cdfs } = map as Partial<Record<keyof MapSummary, unknown>>;
  if (!Array.isArray(floors) || !floors.every((f) => Number.isInteger(f) && f >= 0)) return null;
  if (plane === null || typeof plane !== "object") return null;
  const p = plane as Record<string, unknown>;
  if (![p.originX, p.originY, p.cellSize, p.width, p.height].every(isFiniteNumber)) return null;
  if (cdfs === null || typeof cdfs !== "object" || !isPair((cdfs as SimulationCdfs).bestRsrp) || !isPair((cdfs as SimulationCdfs).sinr)) return null;
  return map as MapSummary;
}
