import { describe, expect, it } from "vitest";
import { breakpointDistanceM } from "../../../lib/radio/breakpoint";

describe("breakpointDistanceM", () => {
  it("breakpointDistanceM(fc, hBS, hUT) scales linearly with fc and with each effective height", () => {
    const base = breakpointDistanceM(2, 25, 1.5);
    expect(breakpointDistanceM(4, 25, 1.5)).toBeCloseTo(2 * base, 9);
    expect(breakpointDistanceM(2, 49, 1.5)).toBeCloseTo(2 * base, 9);
    expect(breakpointDistanceM(2, 25, 2)).toBeCloseTo(2 * base, 9);
  });
});
