import { describe, expect, it } from "vitest";
import { cellNoise, thermalNoiseDbm } from "../../lib/radio/noise";

// Source: thermal noise kT = −174 dBm/Hz at 290 K (standard engineering value, e.g. 3GPP TS 38.101 derivations);
// N = −174 + 10 log10(B) + NF.
describe("thermalNoiseDbm", () => {
  it("thermalNoiseDbm(20 MHz, NF 7 dB) = −174 + 73.01 + 7 = −93.99 dBm", () => {
    expect(thermalNoiseDbm(20e6, 7)).toBeCloseTo(-93.9897, 3);
  });
  it("cellNoise gives the channel noise and the one-subcarrier noise used for SINR against RSRP", () => {
    const n = cellNoise({ bandwidthMHz: 20, subcarrierSpacingKHz: 30 }, 7);
    expect(n.channelDbm).toBeCloseTo(-93.9897, 3);
    // −174 + 10 log10(30 000) + 7 = −174 + 44.77 + 7 = −122.23 dBm
    expect(n.resourceElementDbm).toBeCloseTo(-122.2288, 3);
  });
});
