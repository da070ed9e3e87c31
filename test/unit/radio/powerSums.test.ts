import { describe, expect, it } from "vitest";
import { computePowerSums, POWER_SUM_GROUP } from "../../../lib/radio/powerSums";
import { cellFromDbm } from "./kpiFixtures";
import { seededRandom } from "../../bench/benchScenario";

describe("computePowerSums", () => {
  const rnd = seededRandom(8);
  const n = 50;
  const make = (k: number) => cellFromDbm(`c${k}`, Array.from({ length: n }, () => -130 + 80 * rnd()));
  const cells = Array.from({ length: 2 * POWER_SUM_GROUP + 3 }, (_, k) => make(k));

  it("computePowerSums(cells).total equals the plain sum of every cell's mW (to rounding)", () => {
    const sums = computePowerSums(cells, n);
    for (let g = 0; g < n; g++) {
      let s = 0;
      for (const c of cells) s += c.rsrpMw[g];
      expect(sums.total[g] / s).toBeCloseTo(1, 12);
    }
    expect(sums.groups.length).toBe(3);
  });
  it("reusing unchanged groups of a previous run gives the same bits as summing from scratch", () => {
    const before = computePowerSums(cells, n);
    const changed = cells.slice();
    changed[POWER_SUM_GROUP + 2] = make(99);
    const unchanged = changed.map((c, i) => c === cells[i]);
    const reused = computePowerSums(changed, n, before, unchanged);
    const fresh = computePowerSums(changed, n);
    expect(reused.groups[0]).toBe(before.groups[0]);
    expect(reused.groups[1]).not.toBe(before.groups[1]);
    expect(Array.from(reused.total)).toEqual(Array.from(fresh.total));
  });
});
