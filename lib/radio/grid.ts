// The grids the model evaluates: one outdoor layer per horizontal position, or one layer per floor
// where a building stands. Flat structure-of-arrays. Grids are stored tile by tile (square tiles of
// GRID_TILE × GRID_TILE positions, tiles row-major, positions row-major inside a tile, the layers of one
// position consecutive, lowest first), so that a run of grid indices is also a compact patch of ground:
// the KPI pass uses per-tile maxima to skip cells that cannot matter there.
import type { Scenario } from "./scenario";
import { buildHorizontalPlane, type HorizontalPlane } from "./horizontalPlane";

/** Tile side, in positions. */
export const GRID_TILE = 32;
/** Most grids of one segment: tiles are cut into runs of consecutive grids for finer KPI pruning. */
export const GRID_SEGMENT = 64;

export interface Grid {
  count: number;
  gridSizeM: number;
  /** Grid centre, local metres. */
  x: Float64Array;
  y: Float64Array;
  /** Absolute height above sea level: terrain + height above ground, metres. */
  z: Float64Array;
  /** Height above local ground: userHeightM outdoors, userHeightM + k · floorHeightM on floor k + 1. */
  heightAboveGround: Float32Array;
  /** 0 = outdoor, 1.. = floor number inside a building. */
  floor: Uint16Array;
  /** Index into scenario.buildings, −1 outdoors. */
  buildingIndex: Int32Array;
  /** Index into scenario.clusters, −1 when none. */
  clusterIndex: Int32Array;
  /**
   * Traffic weight, null without a traffic raster. Indoor floors DIVIDE the position's weight equally,
   * so a raster in "traffic per horizontal cell" keeps its total whatever the number of floors.
   */
  weight: Float64Array | null;
  /** Plane position (row-major index into grid.plane) of each grid. */
  positionIndex: Int32Array;
  /** First grid of each plane position. */
  positionStart: Int32Array;
  /** Number of layers of each plane position (1 outdoors, floors in a building). */
  positionLayers: Uint16Array;
  /** Tiles: grids tileStart[t] .. tileStart[t + 1] − 1 belong to tile t. */
  tileCount: number;
  tileStart: Int32Array;
  /** Largest number of grids in one tile. */
  maxTileGrids: number;
  /** Segments (runs of ≤ GRID_SEGMENT grids inside one tile): grids segmentStart[s] .. segmentStart[s + 1] − 1. */
  segmentCount: number;
  segmentStart: Int32Array;
  /** Segments of tile t: tileSegmentStart[t] .. tileSegmentStart[t + 1] − 1. */
  tileSegmentStart: Int32Array;
  plane: HorizontalPlane;
}

export function buildGrid(scenario: Scenario, plane: HorizontalPlane = buildHorizontalPlane(scenario)): Grid {
  const { userHeightM, floorHeightM, gridSizeM } = scenario.settings;
  if (!(userHeightM > 0)) throw new RangeError(`settings.userHeightM must be > 0, got ${userHeightM}`);
  if (!(floorHeightM > 0)) throw new RangeError(`settings.floorHeightM must be > 0, got ${floorHeightM}`);
  const W = plane.width, H = plane.height;
  const positions = W * H;
  const positionLayers = new Uint16Array(positions);
  let count = 0;
  for (let p = 0; p < positions; p++) {
    const b = plane.buildingIndex[p];
    positionLayers[p] = b >= 0 ? scenario.buildings[b].floors : 1;
    count += positionLayers[p];
  }
  const tilesX = Math.ceil(W / GRID_TILE), tilesY = Math.ceil(H / GRID_TILE);
  const tileCount = tilesX * tilesY;
  const grid: Grid = {
    count,
    gridSizeM,
    x: new Float64Array(count),
    y: new Float64Array(count),
    z: new Float64Array(count),
    heightAboveGround: new Float32Array(count),
    floor: new Uint16Array(count),
    buildingIndex: new Int32Array(count),
    clusterIndex: new Int32Array(count),
    weight: plane.traffic ? new Float64Array(count) : null,
    positionIndex: new Int32Array(count),
    positionStart: new Int32Array(positions),
    positionLayers,
    tileCount,
    tileStart: new Int32Array(tileCount + 1),
    maxTileGrids: 0,
    segmentCount: 0,
    segmentStart: new Int32Array(0),
    tileSegmentStart: new Int32Array(tileCount + 1),
    plane,
  };
  let g = 0;
  for (let ty = 0; ty < tilesY; ty++) {
    for (let tx = 0; tx < tilesX; tx++) {
      const t = ty * tilesX + tx;
      grid.tileStart[t] = g;
      for (let row = ty * GRID_TILE; row < Math.min(H, (ty + 1) * GRID_TILE); row++) {
        const y = plane.originY + (row + 0.5) * plane.cellSize;
        for (let col = tx * GRID_TILE; col < Math.min(W, (tx + 1) * GRID_TILE); col++) {
          const p = row * W + col;
          const x = plane.originX + (col + 0.5) * plane.cellSize;
          const b = plane.buildingIndex[p];
          const layers = positionLayers[p];
          grid.positionStart[p] = g;
          for (let k = 0; k < layers; k++, g++) {
            const h = userHeightM + k * floorHeightM;
            grid.x[g] = x;
            grid.y[g] = y;
            grid.heightAboveGround[g] = h;
            grid.z[g] = plane.groundHeight[p] + h;
            grid.floor[g] = b >= 0 ? k + 1 : 0;
            grid.buildingIndex[g] = b;
            grid.clusterIndex[g] = plane.clusterIndex[p];
            grid.positionIndex[g] = p;
            if (grid.weight && plane.traffic) grid.weight[g] = plane.traffic[p] / layers;
          }
        }
      }
      grid.maxTileGrids = Math.max(grid.maxTileGrids, g - grid.tileStart[t]);
    }
  }
  grid.tileStart[tileCount] = g;
  // ---- segments
  const segments: number[] = [];
  for (let t = 0; t < tileCount; t++) {
    grid.tileSegmentStart[t] = segments.length;
    for (let s = grid.tileStart[t]; s < grid.tileStart[t + 1]; s += GRID_SEGMENT) segments.push(s);
  }
  grid.tileSegmentStart[tileCount] = segments.length;
  grid.segmentCount = segments.length;
  segments.push(count);
  grid.segmentStart = Int32Array.from(segments);
  return grid;
}
