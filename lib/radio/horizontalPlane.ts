// The horizontal raster of grid positions over scenario.bounds, with what stands on each position:
// ground height, building (and so the building-height map used for line-of-sight tracing), cluster, traffic.
import type { Scenario } from "./scenario";
import { assertRing, pointInPolygon, polygonBounds } from "./polygon";
import { assertRaster, sampleBilinear, sampleNearest } from "./raster";

export interface HorizontalPlane {
  /** South-west corner of position (0, 0), metres; position (col, row) is centred at origin + (i + 0.5) · cellSize. */
  originX: number;
  originY: number;
  cellSize: number;
  width: number;
  height: number;
  /** Terrain height above sea level at each position centre (bilinear), metres. */
  groundHeight: Float32Array;
  /** Ground + roof height where a building stands, else ground: the building-height map for LOS, metres ASL. */
  surfaceHeight: Float32Array;
  /** Index into scenario.buildings whose footprint holds the position centre, −1 when none (first listed wins). */
  buildingIndex: Int32Array;
  /** Index into scenario.clusters whose polygon holds the position centre, −1 when none (first listed wins). */
  clusterIndex: Int32Array;
  /** Traffic raster sampled (nearest cell) at the position centre, null without scenario.traffic. */
  traffic: Float32Array | null;
}

/** Writes `value` into `target` at every position whose centre lies in `ring` and still holds −1. */
function rasterisePolygon(plane: HorizontalPlane, ring: Scenario["clusters"][number]["polygon"], target: Int32Array, value: number): void {
  const box = polygonBounds(ring);
  const { originX, originY, cellSize, width, height } = plane;
  const c0 = Math.max(0, Math.floor((box.minX - originX) / cellSize - 0.5));
  const c1 = Math.min(width - 1, Math.ceil((box.maxX - originX) / cellSize - 0.5));
  const r0 = Math.max(0, Math.floor((box.minY - originY) / cellSize - 0.5));
  const r1 = Math.min(height - 1, Math.ceil((box.maxY - originY) / cellSize - 0.5));
  for (let row = r0; row <= r1; row++) {
    const y = originY + (row + 0.5) * cellSize;
    for (let col = c0; col <= c1; col++) {
      const p = row * width + col;
      if (target[p] !== -1) continue;
      if (pointInPolygon(ring, originX + (col + 0.5) * cellSize, y)) target[p] = value;
    }
  }
}

export function buildHorizontalPlane(scenario: Scenario): HorizontalPlane {
  const { bounds, settings } = scenario;
  const size = settings.gridSizeM;
  if (!(size > 0)) throw new RangeError(`settings.gridSizeM must be > 0, got ${size}`);
  if (![bounds.minX, bounds.minY, bounds.maxX, bounds.maxY].every(Number.isFinite) || !(bounds.maxX > bounds.minX) || !(bounds.maxY > bounds.minY)) {
    throw new RangeError(`bounds must be finite with max > min, got ${JSON.stringify(bounds)}`);
  }
  assertRaster(scenario.terrain, "terrain");
  if (scenario.traffic) assertRaster(scenario.traffic, "traffic");
  // The small epsilon keeps an exact multiple of the grid size from adding an empty column.
  const width = Math.max(1, Math.ceil((bounds.maxX - bounds.minX) / size - 1e-9));
  const height = Math.max(1, Math.ceil((bounds.maxY - bounds.minY) / size - 1e-9));
  const n = width * height;
  const plane: HorizontalPlane = {
    originX: bounds.minX,
    originY: bounds.minY,
    cellSize: size,
    width,
    height,
    groundHeight: new Float32Array(n),
    surfaceHeight: new Float32Array(n),
    buildingIndex: new Int32Array(n).fill(-1),
    clusterIndex: new Int32Array(n).fill(-1),
    traffic: scenario.traffic ? new Float32Array(n) : null,
  };
  for (let row = 0; row < height; row++) {
    const y = bounds.minY + (row + 0.5) * size;
    for (let col = 0; col < width; col++) {
      const x = bounds.minX + (col + 0.5) * size;
      const p = row * width + col;
      plane.groundHeight[p] = sampleBilinear(scenario.terrain, x, y);
      if (plane.traffic && scenario.traffic) {
        const w = sampleNearest(scenario.traffic, x, y, 0);
        if (!(w >= 0)) throw new RangeError(`traffic: value at (${x}, ${y}) must be a non-negative number, got ${w}`);
        plane.traffic[p] = w;
      }
    }
  }
  scenario.buildings.forEach((b, i) => {
    assertRing(b.footprint, `building "${b.id}" footprint`);
    if (!(b.heightM > 0)) throw new RangeError(`building "${b.id}": heightM must be > 0, got ${b.heightM}`);
    if (!Number.isInteger(b.floors) || b.floors < 1) throw new RangeError(`building "${b.id}": floors must be an integer ≥ 1, got ${b.floors}`);
    rasterisePolygon(plane, b.footprint, plane.buildingIndex, i);
  });
  scenario.clusters.forEach((c, i) => {
    assertRing(c.polygon, `cluster "${c.id}" polygon`);
    rasterisePolygon(plane, c.polygon, plane.clusterIndex, i);
  });
  for (let p = 0; p < n; p++) {
    const b = plane.buildingIndex[p];
    plane.surfaceHeight[p] = plane.groundHeight[p] + (b >= 0 ? scenario.buildings[b].heightM : 0);
  }
  return plane;
}

/** Plane position index holding (x, y), clamped to the plane (sites on the bounds edge map to the edge row/column). */
export function planePositionAt(plane: HorizontalPlane, x: number, y: number): number {
  const col = Math.min(plane.width - 1, Math.max(0, Math.floor((x - plane.originX) / plane.cellSize)));
  const row = Math.min(plane.height - 1, Math.max(0, Math.floor((y - plane.originY) / plane.cellSize)));
  return row * plane.width + col;
}
