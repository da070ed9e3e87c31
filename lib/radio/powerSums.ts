// Per-grid sums of linear received power over all cells, as a fixed two-level tree so an incremental run can
// reuse the baseline's partial sums and still produce the very same bits as a run from scratch:
//   group k = cells k·POWER_SUM_GROUP .. (k + 1)·POWER_SUM_GROUP − 1, summed in cell order (dense cells four at
//   a time, sparse cells scattered); total(g) = Σ_k group_k(g) in group order. Float64 throughout.
import type { CellRsrp } from "./cellRsrp";

/** Cells per partial sum. */
export const POWER_SUM_GROUP = 8;

export interface PowerSums {
  /** One Float64Array per group of cells, mW per grid. */
  groups: Float64Array[];
  /** Σ of all groups, mW per grid. */
  total: Float64Array;
}

function groupSum(cells: readonly CellRsrp[], from: number, to: number, n: number): Float64Array {
  const sum = new Float64Array(n);
  const dense: Float32Array[] = [];
  for (let c = from; c < to; c++) if (cells[c].footprint === null) dense.push(cells[c].rsrpMw);
  let q = 0;
  for (; q + 3 < dense.length; q += 4) {
    const m0 = dense[q], m1 = dense[q + 1], m2 = dense[q + 2], m3 = dense[q + 3];
    for (let g = 0; g < n; g++) sum[g] += m0[g] + m1[g] + (m2[g] + m3[g]);
  }
  for (; q < dense.length; q++) {
    const m0 = dense[q];
    for (let g = 0; g < n; g++) sum[g] += m0[g];
  }
  for (let c = from; c < to; c++) {
    const fp = cells[c].footprint;
    if (fp === null) continue;
    const m = cells[c].rsrpMw;
    for (let j = 0; j < fp.length; j++) sum[fp[j]] += m[j];
  }
  return sum;
}

/**
 * Sums of `cells` over `gridCount` grids. With `previous` (the sums of another run over the same cell list)
 * and `unchanged[c]` true for cells whose arrays are the same, groups without a changed cell are reused.
 */
export function computePowerSums(cells: readonly CellRsrp[], gridCount: number, previous?: PowerSums, unchanged?: readonly boolean[]): PowerSums {
  const groupCount = Math.ceil(cells.length / POWER_SUM_GROUP);
  const groups: Float64Array[] = [];
  for (let k = 0; k < groupCount; k++) {
    const from = k * POWER_SUM_GROUP, to = Math.min(cells.length, from + POWER_SUM_GROUP);
    let reuse = previous !== undefined && unchanged !== undefined && previous.groups.length === groupCount;
    for (let c = from; reuse && c < to; c++) reuse = unchanged![c] === true;
    groups.push(reuse ? previous!.groups[k] : groupSum(cells, from, to, gridCount));
  }
  const total = new Float64Array(gridCount);
  for (const s of groups) for (let g = 0; g < gridCount; g++) total[g] += s[g];
  return { groups, total };
}
