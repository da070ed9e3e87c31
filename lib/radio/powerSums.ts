// Exact per-grid sums of linear received power (the Σ of the SINR denominator, DESIGN.md §2).
//
// An incremental run changes a few cells and must give the very same bits as a run from scratch; a cold run
// spreads cells over threads, a city-scale run over processes. Floating-point addition is not associative, so
// the sum is kept EXACTLY, in fixed point. Every cell's power p at a grid (mW, the Float32 of the gain pass,
// below 2^10 mW ≈ +30 dBm) is held as two whole numbers of units 2^−26 and 2^−62 mW:
//     hi = round(p / 2^−26),  lo = round((p − hi · 2^−26) / 2^−62)       (round: to nearest, ties to even)
//     p = hi · 2^−26 + lo · 2^−62 + r,  |r| ≤ 2^−63 mW (≈ −189 dBm, dropped: 66 dB below the noise of one
//     resource element, ≈ −123 dBm)
// (below 2^−27 mW, −81 dBm, most pairs, hi is 0 and lo = round(p / 2^−62)). One expression for every p, without a
// branch: a branch on the size of p measured ~20 % slower (likely mispredicted: indoor losses make a cell's power
// cross −78 dBm often from one grid to the next).
// Each part is summed in its own Float64Array. Each part is a whole number of magnitude ≤ 2^36, so the sums
// of up to 2^17 cells stay below 2^53, where Float64 adds and subtracts whole numbers exactly: adding, removing
// and merging partial sums in any order gives identical bits. The total is read with one fixed expression
// (powerTotalMw). The cut is exact too: scaling by a power of two, rounding to a whole number (x + R − R) and
// subtracting that whole number from a value within ½ of it lose no bit.
import type { CellRsrp } from "./cellRsrp";
import { ROUNDING_SHIFT } from "./decibel";
import { lowerBound } from "./lowerBound";

const TO_HI = 2 ** 26, HI_TO_LO = 2 ** 36;
/** mW of one unit of each part. */
export const HI_MW = 2 ** -26, LO_MW = 2 ** -62;
/** Largest power one cell may bring to one grid: 2^10 mW ≈ +30.1 dBm per resource element; refused from +30 dBm. */
export const MAX_CELL_POWER_DBM = 30;
/** Most cells one sum can hold exactly. */
export const MAX_SUMMED_CELLS = 2 ** 17;

export interface PowerSums {
  /** Whole units of 2^−26 and 2^−62 mW per grid. */
  hi: Float64Array;
  lo: Float64Array;
}

/** Zero sums; `allocate` gives their memory (e.g. shared memory for threads). */
export function createPowerSums(gridCount: number, allocate: (bytes: number) => ArrayBufferLike = (b) => new ArrayBuffer(b)): PowerSums {
  return { hi: new Float64Array(allocate(8 * gridCount)), lo: new Float64Array(allocate(8 * gridCount)) };
}

export function clonePowerSums(sums: PowerSums): PowerSums {
  return { hi: sums.hi.slice(), lo: sums.lo.slice() };
}

/**
 * Adds (sign = 1) or removes (sign = −1) one cell's power (its rsrpMw) at the grids of its footprint in
 * [gridFrom, gridTo) (default all). Removing a cell that was added gives back the sums exactly as they were.
 */
export function addCellPower(sums: PowerSums, cell: CellRsrp, sign: 1 | -1, gridFrom = 0, gridTo = sums.hi.length): void {
  checkCellPower(cell, sums.hi.length, "addCellPower");
  const fp = cell.footprint;
  if (fp === null) accumulate(sums.hi, sums.lo, cell.rsrpMw, null, gridFrom, gridTo, sign);
  else accumulate(sums.hi, sums.lo, cell.rsrpMw, fp, lowerBound(fp, gridFrom), lowerBound(fp, gridTo), sign);
}

/** A dense cell has a value for every grid, and no cell brings more power than the sums hold. */
function checkCellPower(cell: CellRsrp, gridCount: number, caller: string): void {
  if (cell.footprint === null && cell.rsrpMw.length !== gridCount) throw new RangeError(`${caller}: cell "${cell.cellId}" has ${cell.rsrpMw.length} values for ${gridCount} grids`);
  let max = -Infinity;
  for (let t = 0; t < cell.tileMaxDbm.length; t++) if (cell.tileMaxDbm[t] > max) max = cell.tileMaxDbm[t];
  if (max >= MAX_CELL_POWER_DBM) throw new RangeError(`cell "${cell.cellId}": ${max} dBm is above the +30 dBm per resource element the power sums hold`);
}

/** Entries [from, to) of mw (at grid fp[j], or j when dense) into the two parts. */
function accumulate(hi: Float64Array, lo: Float64Array, mw: Float32Array, fp: Int32Array | null, from: number, to: number, sign: number): void {
  if (fp === null) accumulateAt(hi, lo, mw, 0, from, to, sign);
  else {
    // gathered onto a dense run first: one loop serves both (a per-entry branch on the footprint measured slower)
    const part = new Float64Array(2 * (to - from));
    for (let j = from; j < to; j++) {
      const g = fp[j];
      part[j - from] = hi[g];
      part[to - from + j - from] = lo[g];
    }
    const partHi = part.subarray(0, to - from), partLo = part.subarray(to - from);
    accumulateAt(partHi, partLo, mw, from, from, to, sign);
    for (let j = from; j < to; j++) {
      const g = fp[j];
      hi[g] = partHi[j - from];
      lo[g] = partLo[j - from];
    }
  }
}

/** Entries [from, to) of mw into hi and lo at j − shift. */
function accumulateAt(hi: Float64Array, lo: Float64Array, mw: Float32Array, shift: number, from: number, to: number, sign: number): void {
  // local constants: a bundler turns module constants into `var`s that V8 re-checks on every use (decibel.ts)
  const R = ROUNDING_SHIFT, toHi = TO_HI, hiToLo = HI_TO_LO;
  for (let j = from; j < to; j++) {
    const g = j - shift;
    const a = mw[j] * toHi;
    const h = a + R - R;
    hi[g] += sign * h;
    lo[g] += sign * ((a - h) * hiToLo + R - R);
  }
}

/**
 * out ← base with the changed cells' old powers taken out and their new powers put in, on grids [gridFrom, gridTo)
 * only (other grids of `out` are left as they are). oldCells[k] and newCells[k] are one cell.
 */
export function applyPowerChanges(
  base: PowerSums,
  out: PowerSums,
  gridFrom: number,
  gridTo: number,
  oldCells: readonly CellRsrp[],
  newCells: readonly CellRsrp[],
): void {
  if (oldCells.length !== newCells.length) throw new RangeError(`applyPowerChanges: ${oldCells.length} old and ${newCells.length} new cells`);
  const G = base.hi.length;
  if (out.hi.length !== G) throw new RangeError(`applyPowerChanges: sums of ${out.hi.length} grids from sums of ${G}`);
  // Dense cells in one pass over the grids (each sum read and written once); sparse ones after it, one by one.
  const denseOld: Float32Array[] = [], denseNew: Float32Array[] = [], sparse: [CellRsrp, 1 | -1][] = [];
  for (let k = 0; k < oldCells.length; k++) {
    for (const [cell, sign, dense] of [[oldCells[k], -1, denseOld], [newCells[k], 1, denseNew]] as const) {
      checkCellPower(cell, G, "applyPowerChanges");
      if (cell.footprint === null) dense.push(cell.rsrpMw);
      else sparse.push([cell, sign]);
    }
  }
  exchangeDense(base.hi, base.lo, out.hi, out.lo, denseOld, denseNew, gridFrom, gridTo);
  for (const [cell, sign] of sparse) addCellPower(out, cell, sign, gridFrom, gridTo);
}

/**
 * out ← base − Σ removed + Σ added over grids [from, to), for dense mW arrays (the cut of accumulateAt): one pass per
 * (removed, added) pair, the first from base (a pass with a loop over the arrays inside measured slower).
 */
function exchangeDense(baseHi: Float64Array, baseLo: Float64Array, hi: Float64Array, lo: Float64Array, removed: Float32Array[], added: Float32Array[], from: number, to: number): void {
  const pairs = Math.max(removed.length, added.length);
  if (pairs === 0) {
    hi.set(baseHi.subarray(from, to), from);
    lo.set(baseLo.subarray(from, to), from);
  }
  for (let k = 0; k < pairs; k++) {
    const first = k === 0;
    exchangePair(first ? baseHi : hi, first ? baseLo : lo, hi, lo, removed[k], added[k], from, to);
  }
}

function exchangePair(
  inHi: Float64Array,
  inLo: Float64Array,
  hi: Float64Array,
  lo: Float64Array,
  removed: Float32Array | undefined,
  added: Float32Array | undefined,
  from: number,
  to: number,
): void {
  const R = ROUNDING_SHIFT, toHi = TO_HI, hiToLo = HI_TO_LO;
  // a missing array reads the zero of ZERO_POWER: index multiplier 0, so the loop has one shape
  const removedAt = removed ? 1 : 0, addedAt = added ? 1 : 0;
  const r = removed ?? ZERO_POWER, a = added ?? ZERO_POWER;
  for (let g = from; g < to; g++) {
    const x = r[g * removedAt] * toHi, y = a[g * addedAt] * toHi;
    const wx = x + R - R, wy = y + R - R;
    hi[g] = inHi[g] - wx + wy;
    lo[g] = inLo[g] - ((x - wx) * hiToLo + R - R) + ((y - wy) * hiToLo + R - R);
  }
}

/** One zero power, read in place of a missing array by exchangePair. */
const ZERO_POWER = new Float32Array(1);

/** target += source (exact). */
export function addPowerSums(target: PowerSums, source: PowerSums): void {
  if (source.hi.length !== target.hi.length) throw new RangeError(`addPowerSums: ${source.hi.length} grids added to ${target.hi.length}`);
  const { hi, lo } = target;
  for (let g = 0; g < hi.length; g++) {
    hi[g] += source.hi[g];
    lo[g] += source.lo[g];
  }
}

/** Sums of every cell of `cells` (cells.length ≤ MAX_SUMMED_CELLS). */
export function sumCellPowers(cells: readonly CellRsrp[], gridCount: number, allocate?: (bytes: number) => ArrayBufferLike): PowerSums {
  if (cells.length > MAX_SUMMED_CELLS) throw new RangeError(`sumCellPowers: ${cells.length} cells, at most ${MAX_SUMMED_CELLS} sum exactly`);
  const sums = createPowerSums(gridCount, allocate);
  // Dense cells four at a time: one read and write of the sums per four cells (whole numbers: any grouping gives
  // the same bits); sparse cells one by one.
  const dense = cells.filter((c) => c.footprint === null);
  let q = 0;
  for (; q + 3 < dense.length; q += 4) {
    for (const cell of dense.slice(q, q + 4)) checkCellPower(cell, gridCount, "sumCellPowers");
    accumulateFour(sums.hi, sums.lo, dense[q].rsrpMw, dense[q + 1].rsrpMw, dense[q + 2].rsrpMw, dense[q + 3].rsrpMw);
  }
  for (; q < dense.length; q++) addCellPower(sums, dense[q], 1);
  for (const cell of cells) if (cell.footprint !== null) addCellPower(sums, cell, 1);
  return sums;
}

/** Four dense cells' mW into the two parts at once (the cut of accumulateAt, written out four times). */
function accumulateFour(hi: Float64Array, lo: Float64Array, m0: Float32Array, m1: Float32Array, m2: Float32Array, m3: Float32Array): void {
  const R = ROUNDING_SHIFT, toHi = TO_HI, hiToLo = HI_TO_LO;
  for (let g = 0; g < hi.length; g++) {
    const a0 = m0[g] * toHi, a1 = m1[g] * toHi, a2 = m2[g] * toHi, a3 = m3[g] * toHi;
    const w0 = a0 + R - R, w1 = a1 + R - R, w2 = a2 + R - R, w3 = a3 + R - R;
    hi[g] += w0 + w1 + w2 + w3;
    lo[g] += (a0 - w0) * hiToLo + R - R + ((a1 - w1) * hiToLo + R - R) + ((a2 - w2) * hiToLo + R - R) + ((a3 - w3) * hiToLo + R - R);
  }
}

/** Total received power at grid g, mW (kpi.ts inlines the same expression). */
export function powerTotalMw(sums: PowerSums, g: number): number {
  return sums.hi[g] * HI_MW + sums.lo[g] * LO_MW;
}

/** True when both hold the same sums, bit for bit. */
export function samePowerSums(a: PowerSums, b: PowerSums): boolean {
  const same = (x: Float64Array, y: Float64Array) => x.length === y.length && x.every((v, i) => Object.is(v, y[i]));
  return same(a.hi, b.hi) && same(a.lo, b.lo);
}
