// linkBudgetRadius: at the radius the strongest possible cell arrives exactly margin dB under the
// noise of one resource element, and the radius moves the way the budget says.
import { describe, expect, it } from "vitest";
import { linkBudgetRadius } from "../../../lib/jobs/computationRadius";
import { umaNlosDb } from "../../../lib/radio/uma";
import { tinyScenario } from "../../support/tinyScenario";

describe("linkBudgetRadius(scenario, options)", () => {
  it("puts P_RS,max + G_max − PL(r) at N_RE − margin for an area without buildings", () => {
    const scenario = { ...tinyScenario(), buildings: [] };
    const budget = linkBudgetRadius(scenario, { marginDb: 10 });
    // tinyScenario: 8×4 panel, GE,max 8 dBi → 8 + 10 log10(32) dBi; rsPowerMaxDbm 24; 15 kHz SCS, NF 7 dB.
    expect(budget.maxGainDbi).toBeCloseTo(8 + 10 * Math.log10(32), 9);
    expect(budget.maxRsPowerDbm).toBe(24);
    expect(budget.noisePerResourceElementDbm).toBeCloseTo(-174 + 10 * Math.log10(15e3) + 7, 9);
    const r = budget.radiusM;
    // Lowest carrier 1.8 GHz, highest antenna 30 m, UT 1.5 m.
    const pl = (d: number) => umaNlosDb(d, Math.hypot(d, 28.5), 1.8, 30, 1.5);
    const received = (d: number) => budget.maxRsPowerDbm + budget.maxGainDbi - pl(d);
    expect(received(r)).toBeLessThanOrEqual(budget.noisePerResourceElementDbm - 10 + 1e-9);
    expect(received(r - 1)).toBeGreaterThan(budget.noisePerResourceElementDbm - 10);
  });

  it("grows with a smaller margin and with the LOS formula, and refuses a non-finite margin", () => {
    const scenario = tinyScenario();
    const r10 = linkBudgetRadius(scenario, { marginDb: 10 }).radiusM;
    expect(linkBudgetRadius(scenario, { marginDb: 0 }).radiusM).toBeLessThan(r10);
    expect(linkBudgetRadius(scenario, { marginDb: 20 }).radiusM).toBeGreaterThan(r10);
    expect(linkBudgetRadius(scenario, { marginDb: 10, pathLossCase: "los" }).radiusM).toBeGreaterThan(r10);
    expect(() => linkBudgetRadius(scenario, { marginDb: Number.NaN })).toThrow(RangeError);
  });
});
