import { describe, expect, it } from "vitest";
import { lineArrayFactor } from "../../lib/radio/arrayFactor";

// Textbook approximation, recalled from memory (antenna-theory texts): a broadside uniform linear array of N
// elements spaced d wavelengths has half-power beamwidth ≈ 0.886 / (N d) radians; N = 8, d = 0.5 → 12.7°.
describe("lineArrayFactor half-power beamwidth vs the textbook approximation", () => {
  it("lineArrayFactor(8, 0.5λ) falls by 3 dB at ±6.35° off broadside (within 0.1° of the approximation)", () => {
    const peak = lineArrayFactor(8, 0.5, 0);
    expect(10 * Math.log10(peak)).toBeCloseTo(10 * Math.log10(8), 9);
    // find the −3.0103 dB point by bisection in the angle off broadside (u = sin ψ)
    let lo = 0, hi = 20;
    for (let i = 0; i < 60; i++) {
      const mid = (lo + hi) / 2;
      const f = lineArrayFactor(8, 0.5, Math.sin((mid * Math.PI) / 180));
      if (10 * Math.log10(f / peak) > -3.0103) lo = mid;
      else hi = mid;
    }
    const hpbw = 2 * lo;
    expect(Math.abs(hpbw - 12.69)).toBeLessThan(0.2);
  });
});
