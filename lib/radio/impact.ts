// Impact of a change: KPI deltas (after − before) per cluster and network, and the worst grids.
//
// A grid is a worst grid when, from before to after, it
//   - loses coverage ("coverage-lost"), - loses the overlap condition ("overlap-lost"),
//   - falls below the interference threshold ("interference-lost"), or
//   - loses more than worstGridDropDb of best-server RSRP ("rsrp-drop").
// Ranking key (most severe first): number of conditions lost, then best-RSRP drop in dB, then SINR drop in dB,
// then grid index (so the order is total and repeatable).
import type { Grid } from "./grid";
import type { ClusterKpis, KpiResult, KpiSummary, WeightedKpis } from "./kpi";
import { GRID_COVERED, GRID_INTERFERENCE_OK, GRID_OVERLAP_OK } from "./kpi";

export type WorstGridReason = "coverage-lost" | "overlap-lost" | "interference-lost" | "rsrp-drop";

export interface WorstGrid {
  gridIndex: number;
  x: number;
  y: number;
  floor: number;
  clusterId: string | null;
  servingCellBefore: string | null;
  servingCellAfter: string | null;
  /** null stands for "no cell reaches the grid". */
  bestRsrpBeforeDbm: number | null;
  bestRsrpAfterDbm: number | null;
  sinrBeforeDb: number | null;
  sinrAfterDb: number | null;
  overlapOthersBefore: number;
  overlapOthersAfter: number;
  reasons: WorstGridReason[];
}

type NumericKeys<T> = { [K in keyof T]: T[K] extends number | null ? K : never }[keyof T];
export type KpiDelta = { [K in NumericKeys<KpiSummary>]: number | null } & {
  weighted: { [K in keyof WeightedKpis]: number | null } | null;
};

export interface KpiComparison {
  before: KpiSummary;
  after: KpiSummary;
  /** after − before, null where either side is null. */
  delta: KpiDelta;
}

export interface ImpactReport {
  network: KpiComparison;
  clusters: (KpiComparison & { clusterId: string; clusterName: string })[];
  cells: { cellId: string; bestServerAreaBeforeM2: number; bestServerAreaAfterM2: number; deltaM2: number }[];
  /** Grids that got worse, most severe first, at most `limit`. */
  worstGrids: WorstGrid[];
  /** How many grids qualified before the limit was applied. */
  worstGridTotal: number;
}

export interface CompareOptions {
  worstGridDropDb: number;
  /** Maximum worst grids returned (default 200). */
  limit?: number;
}

export const DEFAULT_WORST_GRID_LIMIT = 200;

const SUMMARY_KEYS = [
  "gridCount", "coverageRatio", "overlapRatio", "interferenceRatio",
  "meanBestRsrpDbm", "p5BestRsrpDbm", "p50BestRsrpDbm", "p95BestRsrpDbm",
  "meanSinrDb", "p5SinrDb", "p50SinrDb", "p95SinrDb",
] as const;
const WEIGHTED_KEYS = ["totalWeight", "coverageRatio", "overlapRatio", "interferenceRatio", "meanBestRsrpDbm", "meanSinrDb"] as const;

const minus = (a: number | null, b: number | null): number | null => (a === null || b === null ? null : a - b);

export function compareSummaries(before: KpiSummary, after: KpiSummary): KpiComparison {
  const delta = {} as Record<string, number | null>;
  for (const k of SUMMARY_KEYS) delta[k] = minus(after[k], before[k]);
  let weighted: Record<string, number | null> | null = null;
  if (before.weighted && after.weighted) {
    weighted = {};
    for (const k of WEIGHTED_KEYS) weighted[k] = minus(after.weighted[k], before.weighted[k]);
  }
  return { before, after, delta: { ...delta, weighted } as unknown as KpiDelta };
}

const finiteOrNull = (v: number): number | null => (Number.isFinite(v) ? v : null);

/**
 * Compares two KPI results of the same grid and cell list. `cellIds` and `clusterIds` name the indices
 * stored per grid.
 */
export function compareRuns(
  grid: Grid,
  cellIds: readonly string[],
  clusterIds: readonly string[],
  before: KpiResult,
  after: KpiResult,
  options: CompareOptions,
): ImpactReport {
  const limit = options.limit ?? DEFAULT_WORST_GRID_LIMIT;
  if (!(limit >= 0)) throw new RangeError(`compareRuns: limit must be ≥ 0, got ${limit}`);
  const drop = options.worstGridDropDb;
  const a = before.perGrid, b = after.perGrid;
  if (a.bestRsrpDbm.length !== grid.count || b.bestRsrpDbm.length !== grid.count) {
    throw new RangeError(`compareRuns: per-grid results do not match the grid (${grid.count} grids)`);
  }
  // ---- candidates and their ranking keys
  const candidates: number[] = [];
  const lost = new Uint8Array(grid.count);
  const reasonBits = new Uint8Array(grid.count);
  for (let g = 0; g < grid.count; g++) {
    const fa = a.flags[g], fb = b.flags[g];
    let bits = 0;
    if (fa & GRID_COVERED && !(fb & GRID_COVERED)) bits |= 1;
    if (fa & GRID_OVERLAP_OK && !(fb & GRID_OVERLAP_OK)) bits |= 2;
    if (fa & GRID_INTERFERENCE_OK && !(fb & GRID_INTERFERENCE_OK)) bits |= 4;
    if (a.bestRsrpDbm[g] - b.bestRsrpDbm[g] > drop) bits |= 8;
    if (bits !== 0) {
      candidates.push(g);
      reasonBits[g] = bits;
      lost[g] = (bits & 1) + ((bits >> 1) & 1) + ((bits >> 2) & 1);
    }
  }
  const rsrpDrop = (g: number) => {
    const d = a.bestRsrpDbm[g] - b.bestRsrpDbm[g];
    return Number.isNaN(d) ? 0 : d;
  };
  const sinrDrop = (g: number) => {
    const d = a.sinrDb[g] - b.sinrDb[g];
    return Number.isNaN(d) ? 0 : d;
  };
  candidates.sort((g, h) => lost[h] - lost[g] || rsrpDrop(h) - rsrpDrop(g) || sinrDrop(h) - sinrDrop(g) || g - h);
  const worstGrids: WorstGrid[] = candidates.slice(0, limit).map((g) => {
    const bits = reasonBits[g];
    const reasons: WorstGridReason[] = [];
    if (bits & 1) reasons.push("coverage-lost");
    if (bits & 2) reasons.push("overlap-lost");
    if (bits & 4) reasons.push("interference-lost");
    if (bits & 8) reasons.push("rsrp-drop");
    const cl = grid.clusterIndex[g];
    return {
      gridIndex: g,
      x: grid.x[g],
      y: grid.y[g],
      floor: grid.floor[g],
      clusterId: cl >= 0 ? clusterIds[cl] : null,
      servingCellBefore: a.bestCell[g] >= 0 ? cellIds[a.bestCell[g]] : null,
      servingCellAfter: b.bestCell[g] >= 0 ? cellIds[b.bestCell[g]] : null,
      bestRsrpBeforeDbm: finiteOrNull(a.bestRsrpDbm[g]),
      bestRsrpAfterDbm: finiteOrNull(b.bestRsrpDbm[g]),
      sinrBeforeDb: finiteOrNull(a.sinrDb[g]),
      sinrAfterDb: finiteOrNull(b.sinrDb[g]),
      overlapOthersBefore: a.overlapOthers[g],
      overlapOthersAfter: b.overlapOthers[g],
      reasons,
    };
  });
  const clusterPair = (x: ClusterKpis, i: number) => ({ clusterId: x.clusterId, clusterName: x.clusterName, ...compareSummaries(x, after.clusters[i]) });
  return {
    network: compareSummaries(before.network, after.network),
    clusters: before.clusters.map(clusterPair),
    cells: before.cells.map((c, i) => ({
      cellId: c.cellId,
      bestServerAreaBeforeM2: c.bestServerAreaM2,
      bestServerAreaAfterM2: after.cells[i].bestServerAreaM2,
      deltaM2: after.cells[i].bestServerAreaM2 - c.bestServerAreaM2,
    })),
    worstGrids,
    worstGridTotal: candidates.length,
  };
}
