import { describe, expect, it } from "vitest";
import { addCellPower, addPowerSums, clonePowerSums, createPowerSums, powerTotalMw, samePowerSums, sumCellPowers } from "../../../lib/radio/powerSums";
import { dbToLinear } from "../../../lib/radio/decibel";
import { cellFromDbm } from "./kpiFixtures";
import { seededRandom } from "../../bench/benchScenario";

describe("power sums", () => {
  const rnd = seededRandom(8);
  const n = 50;
  const make = (k: number) => cellFromDbm(`c${k}`, Array.from({ length: n }, () => -180 + 170 * rnd()));
  const cells = Array.from({ length: 19 }, (_, k) => make(k));

  it("powerTotalMw(sumCellPowers(cells), g) equals the plain sum of every cell's mW (to 1e-12), and of 10^(dBm/10) to 1e-7", () => {
    const sums = sumCellPowers(cells, n);
    for (let g = 0; g < n; g++) {
      let s = 0, exact = 0;
      for (const c of cells) {
        s += c.rsrpMw[g];
        exact += Math.pow(10, c.rsrpDbm[g] / 10);
      }
      expect(Math.abs(powerTotalMw(sums, g) / s - 1)).toBeLessThan(1e-12);
      expect(Math.abs(powerTotalMw(sums, g) / exact - 1)).toBeLessThan(1e-7);
    }
  });

  it("sums are exact: any order of adding gives the same bits, and removing a cell restores the bits", () => {
    const forward = sumCellPowers(cells, n);
    const backward = sumCellPowers([...cells].reverse(), n);
    expect(samePowerSums(forward, backward)).toBe(true);
    const removed = clonePowerSums(forward);
    addCellPower(removed, cells[7], -1);
    expect(samePowerSums(removed, sumCellPowers(cells.filter((_, i) => i !== 7), n))).toBe(true);
    expect(samePowerSums(removed, forward)).toBe(false);
  });

  it("partial sums of a split merge into exactly the sums of the whole", () => {
    const a = sumCellPowers(cells.slice(0, 6), n), b = sumCellPowers(cells.slice(6, 13), n), c = sumCellPowers(cells.slice(13), n);
    const merged = createPowerSums(n);
    for (const part of [c, a, b]) addPowerSums(merged, part);
    expect(samePowerSums(merged, sumCellPowers(cells, n))).toBe(true);
  });

  it("holds one cell's power to its fixed-point resolution (at most 2^−63 mW is dropped), either side of 2^−26 mW", () => {
    for (const dbm of [-20, -77, -79, -95.5, -141.3, -250]) {
      const cell = cellFromDbm("x", [dbm]);
      const sums = sumCellPowers([cell], 1);
      const p = cell.rsrpMw[0];
      expect(p).toBe(Math.fround(dbToLinear(Math.fround(dbm))));
      // the two parts are exact; reading the total rounds once (a relative 2^−53 at most)
      expect(Math.abs(powerTotalMw(sums, 0) - p)).toBeLessThanOrEqual(p * 2 ** -52 + 2 ** -63);
    }
  });

  it("refuses a power above +30 dBm per resource element, naming the cell", () => {
    expect(() => sumCellPowers([cellFromDbm("hot", [-50, 31])], 2)).toThrow(/cell "hot": 31 dBm/);
    expect(() => sumCellPowers([cellFromDbm("ok", [29.9])], 1)).not.toThrow();
  });
});
