import { describe, expect, it } from "vitest";
import { cellNoise, thermalNoiseDbm } from "../../../lib/radio/noise";

describe("thermalNoiseDbm / cellNoise", () => {
  it("thermalNoiseDbm refuses a non-positive bandwidth", () => {
    expect(() => thermalNoiseDbm(0, 7)).toThrow(RangeError);
  });
  it("cellNoise: the per-resource-element noise is 10 log10(B / SCS) below the channel noise", () => {
    const n = cellNoise({ bandwidthMHz: 40, subcarrierSpacingKHz: 30 }, 9);
    expect(n.channelDbm - n.resourceElementDbm).toBeCloseTo(10 * Math.log10(40e6 / 30e3), 9);
  });
});
