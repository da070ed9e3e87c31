// Helpers for KPI tests: a hand-made grid and per-cell RSRP arrays built directly from dBm values.
import { GRID_SEGMENT, type Grid } from "../../../lib/radio/grid";
import type { CellRsrp } from "../../../lib/radio/cellRsrp";
import { dbToLinear } from "../../../lib/radio/decibel";

/** mW as the gain pass keeps it: Math.fround(dbToLinear(dBm)). */
const milliwatts = (dbm: Float32Array) => dbm.map((v) => Math.fround(dbToLinear(v)));

/** Re-tiles a grid: tiles start at tileStart (ending with count), segments of GRID_SEGMENT inside each. */
export function withTiles(grid: Grid, tileStart: Int32Array): Grid {
  const segments: number[] = [];
  const tileSegmentStart = new Int32Array(tileStart.length);
  let maxTileGrids = 0;
  for (let t = 0; t + 1 < tileStart.length; t++) {
    tileSegmentStart[t] = segments.length;
    for (let s = tileStart[t]; s < tileStart[t + 1]; s += GRID_SEGMENT) segments.push(s);
    maxTileGrids = Math.max(maxTileGrids, tileStart[t + 1] - tileStart[t]);
  }
  tileSegmentStart[tileStart.length - 1] = segments.length;
  const segmentCount = segments.length;
  segments.push(grid.count);
  return { ...grid, tileCount: tileStart.length - 1, tileStart, maxTileGrids, segmentCount, segmentStart: Int32Array.from(segments), tileSegmentStart };
}

/** A grid of n grids in one tile, 5 m apart on a line, outdoor, with the given clusters and optional weights. */
export function handGrid(clusterIndex: number[], weight: number[] | null = null, floor?: number[]): Grid {
  const n = clusterIndex.length;
  return withTiles(lineGrid(clusterIndex, weight, floor), new Int32Array([0, n]));
}

function lineGrid(clusterIndex: number[], weight: number[] | null, floor?: number[]): Grid {
  const n = clusterIndex.length;
  const x = new Float64Array(n).map((_, i) => 2.5 + 5 * i);
  return {
    count: n,
    gridSizeM: 5,
    x,
    y: new Float64Array(n).fill(2.5),
    z: new Float64Array(n).fill(1.5),
    heightAboveGround: new Float32Array(n).fill(1.5),
    floor: new Uint16Array(floor ?? new Array(n).fill(0)),
    buildingIndex: new Int32Array(n).fill(-1),
    clusterIndex: new Int32Array(clusterIndex),
    weight: weight ? new Float64Array(weight) : null,
    positionIndex: new Int32Array(n).map((_, i) => i),
    positionStart: new Int32Array(n).map((_, i) => i),
    positionLayers: new Uint16Array(n).fill(1),
    tileCount: 1,
    tileStart: new Int32Array([0, n]),
    maxTileGrids: n,
    segmentCount: 0,
    segmentStart: new Int32Array(0),
    tileSegmentStart: new Int32Array(0),
    plane: {
      originX: 0, originY: 0, cellSize: 5, width: n, height: 1,
      groundHeight: new Float32Array(n), surfaceHeight: new Float32Array(n),
      buildingIndex: new Int32Array(n).fill(-1), clusterIndex: new Int32Array(clusterIndex), traffic: null,
    },
  };
}

/** A dense CellRsrp from dBm values, with the tile and segment maxima of `grid` (computed here, not by segmentMaximaInto). */
export function cellFromDbm(cellId: string, dbm: number[], grid: Grid = handGrid(new Array(dbm.length).fill(-1))): CellRsrp {
  const rsrpDbm = new Float32Array(dbm);
  const tileMaxDbm = new Float32Array(grid.tileCount).fill(-Infinity);
  for (let t = 0; t < grid.tileCount; t++) for (let g = grid.tileStart[t]; g < grid.tileStart[t + 1]; g++) tileMaxDbm[t] = Math.max(tileMaxDbm[t], rsrpDbm[g]);
  const segmentMaxDbm = new Float32Array(grid.segmentCount).fill(-Infinity);
  for (let s = 0; s < grid.segmentCount; s++) for (let g = grid.segmentStart[s]; g < grid.segmentStart[s + 1]; g++) segmentMaxDbm[s] = Math.max(segmentMaxDbm[s], rsrpDbm[g]);
  return { cellId, footprint: null, rsrpDbm, linkDb: null, rsrpMw: milliwatts(rsrpDbm), tileMaxDbm, segmentMaxDbm, segmentOffsets: null };
}

/** A sparse CellRsrp reaching only `grids` (ascending) with the given dBm values, on `grid`. */
export function sparseCellFromDbm(cellId: string, grids: number[], dbm: number[], grid: Grid): CellRsrp {
  const footprint = new Int32Array(grids);
  const rsrpDbm = new Float32Array(dbm);
  const segmentOffsets = new Int32Array(grid.segmentCount + 1);
  const segmentMaxDbm = new Float32Array(grid.segmentCount).fill(-Infinity);
  let j = 0;
  for (let s = 0; s < grid.segmentCount; s++) {
    segmentOffsets[s] = j;
    for (; j < grids.length && grids[j] < grid.segmentStart[s + 1]; j++) segmentMaxDbm[s] = Math.max(segmentMaxDbm[s], rsrpDbm[j]);
  }
  segmentOffsets[grid.segmentCount] = grids.length;
  const tileMaxDbm = new Float32Array(grid.tileCount).fill(-Infinity);
  for (let t = 0; t < grid.tileCount; t++) for (let s = grid.tileSegmentStart[t]; s < grid.tileSegmentStart[t + 1]; s++) tileMaxDbm[t] = Math.max(tileMaxDbm[t], segmentMaxDbm[s]);
  return { cellId, footprint, rsrpDbm, linkDb: null, rsrpMw: milliwatts(rsrpDbm), tileMaxDbm, segmentMaxDbm, segmentOffsets };
}
