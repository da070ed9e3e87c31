// The KPI pass (DESIGN.md §2 "KPIs per grid, then per cluster and network").
//
// Per grid g, over the cells c that reach it:
//   best(g)   = max_c RSRP(c, g), dBm; the best server is the lowest cell index among equals
//   coverage  : best ≥ coverageThresholdDbm
//   overlap   : others(g) = #{c ≠ best : RSRP(c, g) ≥ overlapFloorDbm and RSRP(c, g) ≥ best − overlapDeltaDb};
//               passes when others ≤ overlapMaxOthers (a grid without usable signal has none and passes)
//   SINR      = best_mW / (Σ_{c ≠ best} RSRP_mW + N_RE(best)), N_RE the noise of one subcarrier of the best cell
//   interference : SINR ≥ interferenceThresholdDb
// Thresholds are inclusive. Ratios divide by all grids of the area (or their total traffic weight).
// Means are over dB values (common practice). Means and percentiles skip grids that no cell reaches
// (best = −Infinity, possible only with sparse footprints). Percentiles are unweighted (R-7 interpolation).
// Best-server area counts the lowest layer of each position (outdoor or ground floor) × grid area, so the
// areas of all cells add up to the mapped ground area; bestServerGridCount counts every layer.
//
// The pass runs tile by tile (grid.ts stores grids tile-major), cell-major inside a tile over contiguous
// Float32Arrays, with the tile's per-grid accumulators in cache. Every cell enters the linear power sum
// (powerSums.ts, a fixed tree an incremental run can partly reuse); only cells whose tile maximum can reach
// the tile's best (or overlap window) are scanned for those tests, and inside a tile only the segments (runs of
// ≤ 64 grids) where their segment maximum can reach; both skips are exact. Sums are Float64.
import type { Grid } from "./grid";
import type { CellRsrp } from "./cellRsrp";
import type { ModelSettings } from "./scenario";
import { groupQuantiles } from "./quantile";
import { computePowerSums, type PowerSums } from "./powerSums";

/** Per-grid flag bits in PerGridResult.flags. */
export const GRID_COVERED = 1;
export const GRID_OVERLAP_OK = 2;
export const GRID_INTERFERENCE_OK = 4;

export type KpiThresholds = Pick<
  ModelSettings,
  "coverageThresholdDbm" | "overlapDeltaDb" | "overlapMaxOthers" | "overlapFloorDbm" | "interferenceThresholdDb"
>;

export interface WeightedKpis {
  totalWeight: number;
  coverageRatio: number | null;
  overlapRatio: number | null;
  interferenceRatio: number | null;
  meanBestRsrpDbm: number | null;
  meanSinrDb: number | null;
}

export interface KpiSummary {
  gridCount: number;
  coverageRatio: number | null;
  overlapRatio: number | null;
  interferenceRatio: number | null;
  meanBestRsrpDbm: number | null;
  p5BestRsrpDbm: number | null;
  p50BestRsrpDbm: number | null;
  p95BestRsrpDbm: number | null;
  meanSinrDb: number | null;
  p5SinrDb: number | null;
  p50SinrDb: number | null;
  p95SinrDb: number | null;
  /** Traffic-weighted variants; null when the scenario has no traffic raster. */
  weighted: WeightedKpis | null;
}

export interface ClusterKpis extends KpiSummary {
  clusterId: string;
  clusterName: string;
}

export interface CellServingArea {
  cellId: string;
  /** Lowest-layer grids served × grid area, m². */
  bestServerAreaM2: number;
  /** Grids served, every layer. */
  bestServerGridCount: number;
}

export interface PerGridResult {
  /** Best-server RSRP, dBm (−Infinity where no cell reaches). */
  bestRsrpDbm: Float32Array;
  /** Best-server cell index into the cell list, −1 where none. */
  bestCell: Int32Array;
  /** SINR of the best server, dB (−Infinity where none). */
  sinrDb: Float32Array;
  /** Other cells counted by the overlap test. */
  overlapOthers: Uint16Array;
  /** GRID_COVERED | GRID_OVERLAP_OK | GRID_INTERFERENCE_OK. */
  flags: Uint8Array;
}

export interface KpiResult {
  network: KpiSummary;
  clusters: ClusterKpis[];
  cells: CellServingArea[];
  perGrid: PerGridResult;
}

export interface KpiInput {
  grid: Grid;
  /** One entry per cell, in cell order. */
  cells: readonly CellRsrp[];
  /** Per-resource-element noise of each cell, mW (same order). */
  noiseMw: Float64Array;
  clusters: readonly { id: string; name: string }[];
  thresholds: KpiThresholds;
  /** Linear power sums of these cells (powerSums.ts); computed here when absent. */
  powerSums?: PowerSums;
}

// Indices of the per-group Float64 accumulators.
const N_GRIDS = 0, N_COV = 1, N_OVL = 2, N_INT = 3, S_BEST = 4, N_BEST = 5, S_SINR = 6, N_SINR = 7;
const W_ALL = 8, W_COV = 9, W_OVL = 10, W_INT = 11, WS_BEST = 12, W_BEST = 13, WS_SINR = 14, W_SINR = 15;
const STATS = 16;

export function computeKpis(input: KpiInput): KpiResult {
  const { grid, cells, noiseMw, clusters, thresholds } = input;
  const N = grid.count;
  const C = cells.length;
  if (noiseMw.length !== C) throw new RangeError(`computeKpis: noiseMw has ${noiseMw.length} entries for ${C} cells`);
  cells.forEach((cell) => {
    const expected = cell.footprint ? cell.footprint.length : N;
    if (
      cell.rsrpDbm.length !== expected ||
      cell.rsrpMw.length !== expected ||
      cell.tileMaxDbm.length !== grid.tileCount ||
      (cell.footprint === null && (!cell.segmentMaxDbm || cell.segmentMaxDbm.length !== grid.segmentCount))
    ) {
      throw new RangeError(`computeKpis: cell "${cell.cellId}" has ${cell.rsrpDbm.length} values for ${expected} grids`);
    }
  });
  const covThr = thresholds.coverageThresholdDbm;
  const floorDbm = thresholds.overlapFloorDbm;
  const delta = thresholds.overlapDeltaDb;
  const maxOthers = thresholds.overlapMaxOthers;
  const intThr = thresholds.interferenceThresholdDb;

  const bestRsrp = new Float32Array(N).fill(-Infinity);
  const bestCell = new Int32Array(N).fill(-1);
  const sinrDb = new Float32Array(N);
  const overlapOthers = new Uint16Array(N);
  const flags = new Uint8Array(N);

  const L = grid.maxTileGrids;
  const bestMw = new Float64Array(L);
  const sumMw = (input.powerSums ?? computePowerSums(cells, N)).total;
  if (sumMw.length !== N) throw new RangeError(`computeKpis: powerSums cover ${sumMw.length} grids, the grid has ${N}`);
  const threshold = new Float64Array(L);
  const counts = new Int32Array(L);
  const order = new Int32Array(C);
  const orderKey = new Float64Array(C);

  const K = clusters.length;
  const stats = new Float64Array((K + 1) * STATS);
  const weight = grid.weight;
  const cellArea = new Float64Array(C);
  const cellGrids = new Float64Array(C);
  const gridArea = grid.gridSizeM * grid.gridSizeM;
  const gridFloor = grid.floor, gridCluster = grid.clusterIndex, tileStart = grid.tileStart;
  const segmentStart = grid.segmentStart, tileSegmentStart = grid.tileSegmentStart;
  let maxTileSegments = 0;
  for (let t = 0; t < grid.tileCount; t++) maxTileSegments = Math.max(maxTileSegments, tileSegmentStart[t + 1] - tileSegmentStart[t]);
  const segLow = new Float64Array(maxTileSegments);

  for (let tile = 0; tile < grid.tileCount; tile++) {
    const base = tileStart[tile], end = tileStart[tile + 1];
    const len = end - base;
    if (len === 0) continue;
    counts.fill(0, 0, len);

    // ---- best server: cells by decreasing tile maximum; stop once no cell left can reach the tile's lowest best
    for (let c = 0; c < C; c++) {
      const key = cells[c].tileMaxDbm[tile];
      let i = c;
      // insertion sort, descending key, ascending index among equals
      while (i > 0 && orderKey[i - 1] < key) {
        order[i] = order[i - 1];
        orderKey[i] = orderKey[i - 1];
        i--;
      }
      order[i] = c;
      orderKey[i] = key;
    }
    const seg0 = tileSegmentStart[tile], seg1 = tileSegmentStart[tile + 1];
    segLow.fill(-Infinity, 0, seg1 - seg0);
    let minBest = -Infinity;
    for (let o = 0; o < C; o++) {
      const c = order[o];
      if (orderKey[o] < minBest || orderKey[o] === -Infinity) break;
      const cell = cells[c], d = cell.rsrpDbm, m = cell.rsrpMw, fp = cell.footprint;
      if (fp === null) {
        const segMax = cell.segmentMaxDbm!;
        for (let seg = seg0; seg < seg1; seg++) {
          // a cell whose segment maximum is below the segment's lowest best cannot change it (ties are scanned)
          if (segMax[seg] < segLow[seg - seg0]) continue;
          let low = Infinity;
          for (let g = segmentStart[seg], stop = segmentStart[seg + 1]; g < stop; g++) {
            const v = d[g];
            const b = bestRsrp[g];
            if (v > b || (v === b && c < bestCell[g])) {
              bestRsrp[g] = v;
              bestCell[g] = c;
              bestMw[g - base] = m[g];
              if (v < low) low = v;
            } else if (b < low) low = b;
          }
          segLow[seg - seg0] = low;
        }
      } else {
        for (let j = cell.tileOffsets![tile], stop = cell.tileOffsets![tile + 1]; j < stop; j++) {
          const g = fp[j], v = d[j], b = bestRsrp[g];
          if (v > b || (v === b && c < bestCell[g])) {
            bestRsrp[g] = v;
            bestCell[g] = c;
            bestMw[g - base] = m[j];
          }
        }
        for (let seg = seg0; seg < seg1; seg++) {
          let low = Infinity;
          for (let g = segmentStart[seg], stop = segmentStart[seg + 1]; g < stop; g++) if (bestRsrp[g] < low) low = bestRsrp[g];
          segLow[seg - seg0] = low;
        }
      }
      let low = Infinity;
      for (let k = 0; k < seg1 - seg0; k++) if (segLow[k] < low) low = segLow[k];
      minBest = low;
    }

    // ---- overlap window max(floor, best − Δ) and its lowest value per segment and in the tile
    let minThreshold = Infinity;
    for (let seg = seg0; seg < seg1; seg++) {
      let low = Infinity;
      for (let g = segmentStart[seg], stop = segmentStart[seg + 1]; g < stop; g++) {
        const t = bestRsrp[g] - delta;
        const w = t > floorDbm ? t : floorDbm;
        threshold[g - base] = w;
        if (w < low) low = w;
      }
      segLow[seg - seg0] = low;
      if (low < minThreshold) minThreshold = low;
    }
    // ---- cells inside the window (the best server included, removed below); others cannot reach it
    for (let c = 0; c < C; c++) {
      const cell = cells[c];
      if (cell.tileMaxDbm[tile] < minThreshold) continue;
      const d = cell.rsrpDbm, fp = cell.footprint;
      if (fp === null) {
        const segMax = cell.segmentMaxDbm!;
        for (let seg = seg0; seg < seg1; seg++) {
          if (segMax[seg] < segLow[seg - seg0]) continue;
          for (let g = segmentStart[seg], stop = segmentStart[seg + 1]; g < stop; g++) if (d[g] >= threshold[g - base]) counts[g - base]++;
        }
      } else {
        for (let j = cell.tileOffsets![tile], stop = cell.tileOffsets![tile + 1]; j < stop; j++) {
          const k = fp[j] - base;
          if (d[j] >= threshold[k]) counts[k]++;
        }
      }
    }

    // ---- per grid: flags, SINR, accumulation
    for (let g = base, k = 0; g < end; g++, k++) {
      const b = bestRsrp[g];
      const c = bestCell[g];
      const others = counts[k] - (b >= floorDbm ? 1 : 0);
      overlapOthers[g] = others > 65535 ? 65535 : others;
      let sinr = -Infinity;
      if (c >= 0) {
        let interference = sumMw[g] - bestMw[k];
        if (interference < 0) interference = 0;
        sinr = 10 * Math.log10(bestMw[k] / (interference + noiseMw[c]));
      }
      sinrDb[g] = sinr;
      const covered = b >= covThr ? 1 : 0;
      const overlapOk = others <= maxOthers ? 1 : 0;
      const interferenceOk = sinr >= intThr ? 1 : 0;
      flags[g] = covered * GRID_COVERED + overlapOk * GRID_OVERLAP_OK + interferenceOk * GRID_INTERFERENCE_OK;
      if (c >= 0) {
        cellGrids[c]++;
        if (gridFloor[g] <= 1) cellArea[c] += gridArea;
      }
      // One accumulator row per cluster plus one for grids outside every cluster; the network row is their sum.
      const cl = gridCluster[g];
      const at = (cl >= 0 ? cl : K) * STATS;
      stats[at + N_GRIDS]++;
      stats[at + N_COV] += covered;
      stats[at + N_OVL] += overlapOk;
      stats[at + N_INT] += interferenceOk;
      if (b > -Infinity) {
        stats[at + S_BEST] += b;
        stats[at + N_BEST]++;
      }
      if (sinr > -Infinity) {
        stats[at + S_SINR] += sinr;
        stats[at + N_SINR]++;
      }
      if (weight !== null) {
        const w = weight[g];
        stats[at + W_ALL] += w;
        stats[at + W_COV] += covered * w;
        stats[at + W_OVL] += overlapOk * w;
        stats[at + W_INT] += interferenceOk * w;
        if (b > -Infinity) {
          stats[at + WS_BEST] += b * w;
          stats[at + W_BEST] += w;
        }
        if (sinr > -Infinity) {
          stats[at + WS_SINR] += sinr * w;
          stats[at + W_SINR] += w;
        }
      }
    }
  }
  const network = new Float64Array(STATS);
  for (let r = 0; r <= K; r++) for (let i = 0; i < STATS; i++) network[i] += stats[r * STATS + i];

  // ---- percentiles: values partitioned by group into one scratch array (network first, then clusters)
  const percentiles = groupPercentiles(grid, bestRsrp, sinrDb, K);
  // group 0 = network, k + 1 = cluster k
  const summary = (group: number): KpiSummary => {
    const s = (i: number) => (group === 0 ? network[i] : stats[(group - 1) * STATS + i]);
    const ratio = (a: number, n: number) => (n > 0 ? a / n : null);
    const q = percentiles[group];
    return {
      gridCount: s(N_GRIDS),
      coverageRatio: ratio(s(N_COV), s(N_GRIDS)),
      overlapRatio: ratio(s(N_OVL), s(N_GRIDS)),
      interferenceRatio: ratio(s(N_INT), s(N_GRIDS)),
      meanBestRsrpDbm: ratio(s(S_BEST), s(N_BEST)),
      p5BestRsrpDbm: q[0],
      p50BestRsrpDbm: q[1],
      p95BestRsrpDbm: q[2],
      meanSinrDb: ratio(s(S_SINR), s(N_SINR)),
      p5SinrDb: q[3],
      p50SinrDb: q[4],
      p95SinrDb: q[5],
      weighted:
        weight === null
          ? null
          : {
              totalWeight: s(W_ALL),
              coverageRatio: ratio(s(W_COV), s(W_ALL)),
              overlapRatio: ratio(s(W_OVL), s(W_ALL)),
              interferenceRatio: ratio(s(W_INT), s(W_ALL)),
              meanBestRsrpDbm: ratio(s(WS_BEST), s(W_BEST)),
              meanSinrDb: ratio(s(WS_SINR), s(W_SINR)),
            },
    };
  };
  return {
    network: summary(0),
    clusters: clusters.map((cl, i) => ({ clusterId: cl.id, clusterName: cl.name, ...summary(i + 1) })),
    cells: cells.map((cell, c) => ({ cellId: cell.cellId, bestServerAreaM2: cellArea[c], bestServerGridCount: cellGrids[c] })),
    perGrid: { bestRsrpDbm: bestRsrp, bestCell, sinrDb, overlapOthers, flags },
  };
}

/** [p5, p50, p95 of best RSRP, p5, p50, p95 of SINR] per group (0 = network, k + 1 = cluster k), finite values only. */
function groupPercentiles(grid: Grid, bestRsrp: Float32Array, sinrDb: Float32Array, K: number): (number | null)[][] {
  const probabilities = [0.05, 0.5, 0.95];
  const rsrp = groupQuantiles(bestRsrp, grid.clusterIndex, K, probabilities);
  const sinr = groupQuantiles(sinrDb, grid.clusterIndex, K, probabilities);
  return rsrp.map((row, i) => row.concat(sinr[i]));
}
