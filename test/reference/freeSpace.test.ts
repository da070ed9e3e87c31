import { describe, expect, it } from "vitest";
import { freeSpaceLossDb } from "../../lib/radio/freeSpace";

// Source: ITU-R P.525-4, eq. (4): Lbf = 32.4 + 20 log10 f(MHz) + 20 log10 d(km).
describe("freeSpaceLossDb (ITU-R P.525-4 eq. 4)", () => {
  it("freeSpaceLossDb(2000 MHz, 1 km) = 32.4 + 66.02 = 98.42 dB", () => {
    // 20 log10(2000) = 66.0206; the often quoted 98.45 dB uses the rounded constant 32.45 (20 log10(4π/c) in MHz/km).
    expect(freeSpaceLossDb(2000, 1)).toBeCloseTo(98.4206, 3);
    expect(Math.abs(freeSpaceLossDb(2000, 1) - 98.45)).toBeLessThan(0.05);
  });
  it("freeSpaceLossDb(f, d) grows 6.02 dB per doubling of distance and of frequency", () => {
    expect(freeSpaceLossDb(900, 2) - freeSpaceLossDb(900, 1)).toBeCloseTo(6.0206, 3);
    expect(freeSpaceLossDb(1800, 1) - freeSpaceLossDb(900, 1)).toBeCloseTo(6.0206, 3);
  });
  it("freeSpaceLossDb(1 MHz, 1 km) = 32.4 dB, the equation's constant", () => {
    expect(freeSpaceLossDb(1, 1)).toBeCloseTo(32.4, 10);
  });
});
