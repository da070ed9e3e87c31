import { describe, expect, it } from "vitest";
import { buildHorizontalPlane } from "../../../lib/radio/horizontalPlane";
import { createHorizonResult, traceHorizon } from "../../../lib/radio/lineOfSight";
import { tinyScenario } from "./scenarioFixtures";

describe("traceHorizon", () => {
  const plane = buildHorizontalPlane(tinyScenario());
  const out = createHorizonResult();
  it("traceHorizon finds the building between a grid and the antenna as the highest sample", () => {
    // grid at x = 87.5 behind the building (x 40..60), antenna at x = 5, 22 m ASL
    traceHorizon(plane, 87.5, 32.5, 5, 32.5, 22, -2, -2, Infinity, out);
    expect(out[2]).toBe(20); // roof: ground 10 + 10 m
    expect(out[1]).toBeGreaterThan(35);
    expect(out[1]).toBeLessThan(55);
    // the 1.5 m user (11.5 m ASL) is below the line over the roof, so obstructed
    expect(out[0]).toBeGreaterThan((11.5 - 22) / 82.5);
  });
  it("traceHorizon skips the buildings it is told to (the grid's own building)", () => {
    traceHorizon(plane, 57.5, 32.5, 5, 32.5, 22, 0, -2, Infinity, out);
    expect(out[2]).toBe(10);
  });
  it("traceHorizon over open ground sees only terrain, a clear path for a user below the antenna", () => {
    traceHorizon(plane, 87.5, 7.5, 5, 7.5, 22, -2, -2, Infinity, out);
    expect(out[2]).toBe(10);
    expect(out[0]).toBeLessThan((11.5 - 22) / 82.5);
  });
});
