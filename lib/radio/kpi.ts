// The KPI pass (DESIGN.md §2 "KPIs per grid, then per cluster and network").
//
// Per grid g, over the cells c that reach it:
//   best(g)   = max_c RSRP(c, g), dBm; the best server is the lowest cell index among equals
//   coverage  : best ≥ coverageThresholdDbm
//   overlap   : others(g) = #{c ≠ best : RSRP(c, g) ≥ overlapFloorDbm and RSRP(c, g) ≥ best − overlapDeltaDb};
//               passes when others ≤ overlapMaxOthers (a grid without usable signal has none and passes).
//               others is counted up to cap = max(7, N + 1) (serverLists.ts): more counts as cap.
//   SINR      = best_mW / (Σ_{c ≠ best} RSRP_mW + N_RE(best)), N_RE the noise of one subcarrier of the best cell
//   interference : SINR ≥ interferenceThresholdDb
// Thresholds are inclusive. Ratios divide by all grids of the area (or their total traffic weight).
// Means are over dB values (common practice). Means and percentiles skip grids that no cell reaches
// (best = −Infinity, possible only with sparse footprints). Percentiles are unweighted (R-7 interpolation).
// Best-server area counts the lowest layer of each position (outdoor or ground floor) × grid area, so the
// areas of all cells add up to the mapped ground area; bestServerGridCount counts every layer.
//
// The pass reads two aggregates of the cells, each exact and independent of the order cells were added in, so
// a run from scratch, an incremental run, a threaded run and a merged multi-process run give the same bits:
// the server lists (serverLists.ts: best server and overlap window per grid) and the power sums (powerSums.ts:
// Σ mW per grid, in exact fixed point). Σ_{c ≠ best} = total − best_mW. Accumulators are Float64.
import type { Grid } from "./grid";
import type { CellRsrp } from "./cellRsrp";
import type { ModelSettings } from "./scenario";
import { createQuantileHistogram, planQuantiles, quantilesFromHistogram, QUANTILE_BINS, QUANTILE_BINS_PER_DB, QUANTILE_LOWEST_DB, type QuantilePlan } from "./quantile";
import { HI_MW, LO_MW, sumCellPowers, type PowerSums } from "./powerSums";
import { buildServerLists, overlapCountCap, summarizeServerLists, type ServerLists, type ServerSummary } from "./serverLists";

/** dB per neper of power ratio: 10 / ln 10. */
const DB_PER_NEPER = 10 / Math.LN10;

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
  /** Per-resource-element noise of each cell, mW, in cell order (its length is the number of cells). */
  noiseMw: Float64Array;
  clusters: readonly { id: string; name: string }[];
  thresholds: KpiThresholds;
  /**
   * What the KPIs read of the server lists (serverLists.ts; its arrays become the result's perGrid arrays), else
   * the lists themselves, else built from `cells`; and the power sums (powerSums.ts), else built from `cells`.
   */
  servers?: ServerSummary;
  serverLists?: ServerLists;
  powerSums?: PowerSums;
  /** Every cell's RSRP, in cell order; needed only when an aggregate is absent. */
  cells?: readonly CellRsrp[];
  /** Cell ids in cell order (default: those of `cells`). */
  cellIds?: readonly string[];
}

function requireCells(input: KpiInput): readonly CellRsrp[] {
  if (!input.cells) throw new RangeError("computeKpis: give the cells, or both the server lists and the power sums");
  return input.cells;
}

// Indices of the per-group Float64 accumulators.
const N_GRIDS = 0, N_COV = 1, N_OVL = 2, N_INT = 3, S_BEST = 4, N_BEST = 5, S_SINR = 6, N_SINR = 7;
const W_ALL = 8, W_COV = 9, W_OVL = 10, W_INT = 11, WS_BEST = 12, W_BEST = 13, WS_SINR = 14, W_SINR = 15;
const STATS = 16;

export function computeKpis(input: KpiInput): KpiResult {
  const { grid, noiseMw, clusters, thresholds } = input;
  const N = grid.count;
  const cellIds = input.cellIds ?? requireCells(input).map((cell) => cell.cellId);
  const C = cellIds.length;
  if (noiseMw.length !== C) throw new RangeError(`computeKpis: noiseMw has ${noiseMw.length} entries for ${C} cells`);
  if (input.cells && input.cells.length !== C) throw new RangeError(`computeKpis: ${input.cells.length} RSRP sets for ${C} cells`);
  const powerSums = input.powerSums ?? sumCellPowers(requireCells(input), N);
  let servers = input.servers;
  if (!servers) {
    const lists = input.serverLists ?? buildServerLists(grid, requireCells(input), thresholds);
    if (lists.slots !== overlapCountCap(thresholds.overlapMaxOthers) + 1 || lists.floorDbm !== thresholds.overlapFloorDbm || lists.deltaDb !== thresholds.overlapDeltaDb) {
      throw new RangeError("computeKpis: the server lists were built with other overlap thresholds");
    }
    if (lists.gridCount !== N) throw new RangeError(`computeKpis: the server lists cover ${lists.gridCount} grids, the grid has ${N}`);
    servers = summarizeServerLists(lists);
  }
  const out = allocateKpiGrids(N);
  const part = kpiGridPass({ grid, servers, powerSums, noiseMw, thresholds, clusterCount: clusters.length }, out, 0, grid.tileCount);
  return finishKpis(grid, servers, out, [part], clusters, cellIds);
}

/** Everything the per-grid pass reads. */
export interface KpiGridInputs {
  grid: Grid;
  servers: ServerSummary;
  powerSums: PowerSums;
  noiseMw: Float64Array;
  thresholds: KpiThresholds;
  clusterCount: number;
}

/** The per-grid outputs of the pass besides the server summary. */
export interface KpiGrids {
  sinrDb: Float32Array;
  flags: Uint8Array;
}

export function allocateKpiGrids(gridCount: number, allocate: (bytes: number) => ArrayBufferLike = (b) => new ArrayBuffer(b)): KpiGrids {
  return { sinrDb: new Float32Array(allocate(4 * gridCount)), flags: new Uint8Array(allocate(gridCount)) };
}

/**
 * The pass's accumulators for a set of tiles (a range, or every other block of tiles when threads take turns): one
 * row of STATS per cluster (and one for no cluster) per tile, rows in the order of `tiles`.
 */
export interface KpiTiles {
  /** The tiles filled so far, ascending (kpiGridPass appends); room for tiles.length. */
  tiles: Int32Array;
  held: number;
  /** tiles.length · (clusterCount + 1) · STATS values. */
  stats: Float64Array;
  /** Grids served per cell, every layer, and lowest layer only (whole numbers, so any split adds up exactly). */
  servedGrids: Float64Array;
  servedGround: Float64Array;
  /** Histograms of best RSRP and SINR over the tiles' grids, by cluster (quantile.ts), for the percentiles. */
  rsrpHistogram: Int32Array;
  sinrHistogram: Int32Array;
}

/** kpiGridPass's per-grid scratch, kept between calls (the pass runs in blocks of a few tiles; each thread has its own). */
let ratioScratch = new Float64Array(0);

/** Empty accumulators with room for `tileCount` tiles. */
export function createKpiTiles(tileCount: number, clusterCount: number, cellCount: number): KpiTiles {
  return {
    tiles: new Int32Array(tileCount),
    held: 0,
    stats: new Float64Array(tileCount * (clusterCount + 1) * STATS),
    servedGrids: new Float64Array(cellCount),
    servedGround: new Float64Array(cellCount),
    rsrpHistogram: createQuantileHistogram(clusterCount),
    sinrHistogram: createQuantileHistogram(clusterCount),
  };
}

/**
 * The per-grid pass over the grids of tiles [tileFrom, tileTo): SINR and flags into `out`, the accumulators per
 * tile appended to `into` (made when not given; its last tile must come before tileFrom). Tiles are independent, so
 * threads may take any tiles each; finishKpis adds the tiles up in tile order, which makes the result the same
 * however they were split.
 */
export function kpiGridPass(
  inputs: KpiGridInputs,
  out: KpiGrids,
  tileFrom: number,
  tileTo: number,
  into: KpiTiles = createKpiTiles(tileTo - tileFrom, inputs.clusterCount, inputs.noiseMw.length),
): KpiTiles {
  const { grid, servers, powerSums: sums, noiseMw } = inputs;
  const N = grid.count, C = noiseMw.length;
  if (servers.bestCell.length !== N || sums.hi.length !== N || out.sinrDb.length !== N) throw new RangeError(`kpiGridPass: the aggregates cover ${servers.bestCell.length} grids, the grid has ${N}`);
  if (into.held + tileTo - tileFrom > into.tiles.length || (into.held > 0 && into.tiles[into.held - 1] >= tileFrom) || into.servedGrids.length !== C) {
    throw new RangeError(`kpiGridPass: accumulators holding ${into.held} of ${into.tiles.length} tiles cannot take tiles ${tileFrom}…${tileTo - 1}`);
  }
  const gridFrom = grid.tileStart[tileFrom], gridTo = grid.tileStart[tileTo];
  // One loop per function: V8 optimizes each loop with its own feedback (one function with all of them was
  // entered half-optimized at its first loop and fell back to the interpreter at the next, call after call).
  if (ratioScratch.length < gridTo - gridFrom) ratioScratch = new Float64Array(gridTo - gridFrom);
  sinrRatioInto(servers, sums, noiseMw, ratioScratch, gridFrom, gridTo);
  sinrDbInto(ratioScratch, out.sinrDb, gridFrom, gridTo);
  tileStatsInto(inputs, out, tileFrom, tileTo, into);
  for (let tile = tileFrom; tile < tileTo; tile++) into.tiles[into.held++] = tile;
  return into;
}

/**
 * SINR as a linear ratio into ratio[g − gridFrom], g in [gridFrom, gridTo) (0 where no cell reaches): the best
 * server's mW as the gain pass has it (the summary keeps it) over the rest of the power sum (powerTotalMw) plus
 * the best server's noise. In dB in a loop of its own (sinrDbInto): Math.log is a call that spills every live
 * register, and measured 3× dearer inside this loop than alone.
 */
function sinrRatioInto(servers: ServerSummary, sums: PowerSums, noiseMw: Float64Array, ratio: Float64Array, gridFrom: number, gridTo: number): void {
  const bestMwOf = servers.bestMw, bestCell = servers.bestCell, hi = sums.hi, lo = sums.lo, C = noiseMw.length;
  // local constants: see decibel.ts
  const hiMw = HI_MW, loMw = LO_MW;
  for (let g = gridFrom; g < gridTo; g++) {
    const c = bestCell[g];
    if (c < 0) {
      ratio[g - gridFrom] = 0; // no cell: −Infinity dB (the scratch holds an earlier call's values)
      continue;
    }
    if (c >= C) throw new RangeError(`kpiGridPass: grid ${g}'s best server is cell ${c}, there are ${C}`);
    const bestMw = bestMwOf[g];
    let interference = hi[g] * hiMw + lo[g] * loMw - bestMw;
    if (interference < 0) interference = 0;
    ratio[g - gridFrom] = bestMw / (interference + noiseMw[c]);
  }
}

/** sinrDb[g] = 10 log10 ratio[g − gridFrom], as (10 / ln 10) ln x: Math.log measured twice as fast as Math.log10 here. */
function sinrDbInto(ratio: Float64Array, sinrDb: Float32Array, gridFrom: number, gridTo: number): void {
  const toDb = DB_PER_NEPER;
  for (let g = gridFrom; g < gridTo; g++) sinrDb[g] = toDb * Math.log(ratio[g - gridFrom]);
}

/**
 * Flags, the accumulators and the histograms of tiles [tileFrom, tileTo), appended to `into` (kpiGridPass checks
 * the shapes). Grids of one cluster come in runs (a tile is a compact patch of ground); a run is summed in registers
 * and added to its tile's row once (the whole pass measured ~13 % faster than adding every grid to the row in
 * memory). The runs depend on the grid alone, so every split of the tiles (threads, incremental runs) sums the
 * same numbers in the same order.
 */
function tileStatsInto(inputs: KpiGridInputs, out: KpiGrids, tileFrom: number, tileTo: number, into: KpiTiles): void {
  const { grid, servers, thresholds } = inputs;
  const K = inputs.clusterCount;
  const covThr = thresholds.coverageThresholdDbm;
  const maxOthers = thresholds.overlapMaxOthers;
  const intThr = thresholds.interferenceThresholdDb;
  const bestRsrp = servers.bestDbm, bestCell = servers.bestCell, overlapOthers = servers.others;
  const sinrDb = out.sinrDb, flags = out.flags;
  const row = (K + 1) * STATS;
  const { stats, servedGrids, servedGround } = into;
  const weight = grid.weight;
  const gridFloor = grid.floor, gridCluster = grid.clusterIndex;
  const rsrpHistogram = into.rsrpHistogram, sinrHistogram = into.sinrHistogram;
  const bins = QUANTILE_BINS, lowestDb = QUANTILE_LOWEST_DB, perDb = QUANTILE_BINS_PER_DB;
  for (let tile = tileFrom; tile < tileTo; tile++) {
    const tileRow = (into.held + tile - tileFrom) * row;
    const end = grid.tileStart[tile + 1];
    let g = grid.tileStart[tile];
    while (g < end) {
      const cl = gridCluster[g];
      const group = cl >= 0 ? cl : K;
      const histogramRow = group * bins;
      let nGrids = 0, nCov = 0, nOvl = 0, nInt = 0, sBest = 0, nBest = 0, sSinr = 0, nSinr = 0;
      let wAll = 0, wCov = 0, wOvl = 0, wInt = 0, wsBest = 0, wBest = 0, wsSinr = 0, wSinr = 0;
      for (; g < end && gridCluster[g] === cl; g++) {
        const c = bestCell[g];
        const b = bestRsrp[g];
        const sinr = sinrDb[g];
        const covered = b >= covThr ? 1 : 0;
        const overlapOk = overlapOthers[g] <= maxOthers ? 1 : 0;
        const interferenceOk = sinr >= intThr ? 1 : 0;
        flags[g] = covered * GRID_COVERED + overlapOk * GRID_OVERLAP_OK + interferenceOk * GRID_INTERFERENCE_OK;
        if (c >= 0) {
          servedGrids[c]++;
          if (gridFloor[g] <= 1) servedGround[c]++;
        }
        nGrids++;
        nCov += covered;
        nOvl += overlapOk;
        nInt += interferenceOk;
        if (b > -Infinity) {
          sBest += b;
          nBest++;
          if (b < Infinity) {
            const t = (b - lowestDb) * perDb;
            rsrpHistogram[histogramRow + (t < 0 ? 0 : t >= bins ? bins - 1 : t | 0)]++; // the bin of b (quantile.ts)
          }
        }
        if (sinr > -Infinity) {
          sSinr += sinr;
          nSinr++;
          if (sinr < Infinity) {
            const t = (sinr - lowestDb) * perDb;
            sinrHistogram[histogramRow + (t < 0 ? 0 : t >= bins ? bins - 1 : t | 0)]++;
          }
        }
        if (weight !== null) {
          const w = weight[g];
          wAll += w;
          wCov += covered * w;
          wOvl += overlapOk * w;
          wInt += interferenceOk * w;
          if (b > -Infinity) {
            wsBest += b * w;
            wBest += w;
          }
          if (sinr > -Infinity) {
            wsSinr += sinr * w;
            wSinr += w;
          }
        }
      }
      // One accumulator row per cluster plus one for grids outside every cluster; the network row is their sum.
      const at = tileRow + group * STATS;
      stats[at + N_GRIDS] += nGrids;
      stats[at + N_COV] += nCov;
      stats[at + N_OVL] += nOvl;
      stats[at + N_INT] += nInt;
      stats[at + S_BEST] += sBest;
      stats[at + N_BEST] += nBest;
      stats[at + S_SINR] += sSinr;
      stats[at + N_SINR] += nSinr;
      if (weight !== null) {
        stats[at + W_ALL] += wAll;
        stats[at + W_COV] += wCov;
        stats[at + W_OVL] += wOvl;
        stats[at + W_INT] += wInt;
        stats[at + WS_BEST] += wsBest;
        stats[at + W_BEST] += wBest;
        stats[at + WS_SINR] += wsSinr;
        stats[at + W_SINR] += wSinr;
      }
    }
  }
}

/** The percentiles the KPIs report: 5th, 50th and 95th. */
export const KPI_PROBABILITIES: readonly number[] = [0.05, 0.5, 0.95];

/** Best-RSRP and SINR quantiles at KPI_PROBABILITIES, per group (0 = network, k + 1 = cluster k). */
export interface KpiPercentiles {
  rsrp: (number | null)[][];
  sinr: (number | null)[][];
}

/**
 * The quantile plans (quantile.ts) of the parts' histograms added up, for callers that gather the values where
 * the parts were made (each part its own grids) and hand finishKpis the percentiles.
 */
export function kpiQuantilePlans(parts: readonly KpiTiles[], clusterCount: number): { rsrp: QuantilePlan; sinr: QuantilePlan } {
  const rsrp = createQuantileHistogram(clusterCount), sinr = createQuantileHistogram(clusterCount);
  for (const part of parts) {
    if (part.rsrpHistogram.length !== rsrp.length) throw new RangeError(`kpiQuantilePlans: a part is not for ${clusterCount} clusters`);
    for (let b = 0; b < rsrp.length; b++) {
      rsrp[b] += part.rsrpHistogram[b];
      sinr[b] += part.sinrHistogram[b];
    }
  }
  return { rsrp: planQuantiles(rsrp, clusterCount, KPI_PROBABILITIES), sinr: planQuantiles(sinr, clusterCount, KPI_PROBABILITIES) };
}

/**
 * The KPIs from the per-grid pass: `parts` hold every tile once, in any split. Accumulators are added tile by tile
 * in tile order (then the network row is the sum of the cluster rows), percentiles read the whole grid.
 */
export function finishKpis(
  grid: Grid,
  servers: ServerSummary,
  grids: KpiGrids,
  parts: readonly KpiTiles[],
  clusters: readonly { id: string; name: string }[],
  cellIds: readonly string[],
  percentiles?: KpiPercentiles,
): KpiResult {
  const K = clusters.length, C = cellIds.length, row = (K + 1) * STATS;
  const stats = new Float64Array(row);
  const servedGrids = new Float64Array(C), servedGround = new Float64Array(C);
  const rsrpHistogram = createQuantileHistogram(K), sinrHistogram = createQuantileHistogram(K);
  // ---- which part holds each tile (exactly one must), then the tiles' rows added in tile order
  const partOf = new Int32Array(grid.tileCount).fill(-1), rowOf = new Int32Array(grid.tileCount);
  parts.forEach((part, p) => {
    if (part.stats.length !== part.tiles.length * row || part.servedGrids.length !== C) throw new RangeError(`finishKpis: part ${p} is not for ${K} clusters and ${C} cells`);
    for (let i = 0; i < part.held; i++) {
      const t = part.tiles[i];
      if (!(t >= 0 && t < grid.tileCount) || partOf[t] >= 0) throw new RangeError(`finishKpis: tile ${t} is ${partOf[t] >= 0 ? "held twice" : "not a tile of the grid"}`);
      partOf[t] = p;
      rowOf[t] = i;
    }
    for (let c = 0; c < C; c++) {
      servedGrids[c] += part.servedGrids[c];
      servedGround[c] += part.servedGround[c];
    }
    for (let b = 0; b < rsrpHistogram.length; b++) {
      rsrpHistogram[b] += part.rsrpHistogram[b];
      sinrHistogram[b] += part.sinrHistogram[b];
    }
  });
  for (let t = 0; t < grid.tileCount; t++) {
    if (partOf[t] < 0) throw new RangeError(`finishKpis: no part holds tile ${t} of ${grid.tileCount}`);
    const from = parts[partOf[t]].stats, at = rowOf[t] * row;
    for (let i = 0; i < row; i++) stats[i] += from[at + i];
  }
  const network = new Float64Array(STATS);
  for (let r = 0; r <= K; r++) for (let i = 0; i < STATS; i++) network[i] += stats[r * STATS + i];
  const weight = grid.weight;
  const gridArea = grid.gridSizeM * grid.gridSizeM;

  // ---- percentiles of every group (network first, then clusters): gathered here unless the callers gathered them
  const { rsrp: rsrpQ, sinr: sinrQ } = percentiles ?? {
    rsrp: quantilesFromHistogram(servers.bestDbm, grid.clusterIndex, K, rsrpHistogram, KPI_PROBABILITIES),
    sinr: quantilesFromHistogram(grids.sinrDb, grid.clusterIndex, K, sinrHistogram, KPI_PROBABILITIES),
  };
  const percentiles5to95 = rsrpQ.map((r, i) => r.concat(sinrQ[i]));
  // group 0 = network, k + 1 = cluster k
  const summary = (group: number): KpiSummary => {
    const s = (i: number) => (group === 0 ? network[i] : stats[(group - 1) * STATS + i]);
    const ratio = (a: number, n: number) => (n > 0 ? a / n : null);
    const q = percentiles5to95[group];
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
    cells: cellIds.map((cellId, c) => ({ cellId, bestServerAreaM2: servedGround[c] * gridArea, bestServerGridCount: servedGrids[c] })),
    perGrid: { bestRsrpDbm: servers.bestDbm, bestCell: servers.bestCell, sinrDb: grids.sinrDb, overlapOthers: servers.others, flags: grids.flags },
  };
}
