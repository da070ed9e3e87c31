// The queue's pure parts: settings from the environment, cell groups, stage keys, the split radius.
import { describe, expect, it } from "vitest";
import { cellGroups, queueSettings, splitRadiusM, stageKeyOf } from "../../../lib/jobs/queue";
import { linkBudgetRadius } from "../../../lib/jobs/computationRadius";
import { tinyScenario } from "../../support/tinyScenario";

describe("queueSettings(env)", () => {
  it("gives the documented defaults and reads each variable", () => {
    const d = queueSettings({});
    expect(d).toMatchObject({ retryLimit: 3, retryDelaySeconds: 5, expireInSeconds: 1800, cellGroupSize: 100, marginDb: 10, radiusM: undefined, faultDelayMs: 0 });
    expect(queueSettings({ BEAMGATE_QUEUE_RETRY_LIMIT: "0", BEAMGATE_CELL_RADIUS_M: "2500" })).toMatchObject({ retryLimit: 0, radiusM: 2500 });
  });

  it("throws a RangeError naming the variable and the problem", () => {
    expect(() => queueSettings({ BEAMGATE_QUEUE_EXPIRE_S: "0" })).toThrow(/BEAMGATE_QUEUE_EXPIRE_S/);
    expect(() => queueSettings({ BEAMGATE_CELL_GROUP_SIZE: "many" })).toThrow(RangeError);
  });
});

describe("cellGroups(ids, size), stageKeyOf(...), splitRadiusM(...)", () => {
  it("cuts cells in order into groups of size, the last 2 × size cells into quarter-size groups, covering each once", () => {
    const ids = Array.from({ length: 11 }, (_, i) => `C${i}`);
    // 11 cells, size 4: the first 3 in one group, the last 8 in groups of 1
    expect(cellGroups(ids, 4)).toEqual([["C0", "C1", "C2"], ...ids.slice(3).map((id) => [id])]);
    const many = Array.from({ length: 1500 }, (_, i) => `C${i}`);
    const groups = cellGroups(many, 100);
    expect(groups.flat()).toEqual(many);
    expect(groups.map((g) => g.length)).toEqual([...new Array(13).fill(100), ...new Array(8).fill(25)]);
    expect(cellGroups([], 3)).toEqual([]);
  });

  it("keys stages by version, settings and radius", () => {
    const s = tinyScenario();
    const key = stageKeyOf("n1", 2, s, 500);
    expect(key).toMatch(/^n1@2#[0-9a-f]{16}$/);
    expect(stageKeyOf("n1", 2, s, 500)).toBe(key);
    expect(stageKeyOf("n1", 3, s, 500)).not.toBe(key);
    expect(stageKeyOf("n1", 2, s, 501)).not.toBe(key);
    expect(stageKeyOf("n1", 2, { ...s, settings: { ...s.settings, noiseFigureDb: 9 } }, 500)).not.toBe(key);
  });

  it("takes the fixed radius when set, else the link budget's capped at the area's diagonal", () => {
    const s = tinyScenario();
    expect(splitRadiusM(s, { ...queueSettings({}), radiusM: 123 })).toBe(123);
    const diagonal = Math.ceil(Math.hypot(200, 100)) + 1;
    expect(linkBudgetRadius(s).radiusM).toBeGreaterThan(diagonal);
    expect(splitRadiusM(s, queueSettings({}))).toBe(diagonal);
  });
});
