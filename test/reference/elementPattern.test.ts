import { describe, expect, it } from "vitest";
import { elementGainDbi, elementHorizontalCutDb, elementVerticalCutDb } from "../../lib/radio/elementPattern";
import { globalToLocal, compassToTrAzimuthDeg } from "../../lib/radio/orientation";

// Source: 3GPP TR 38.901 Table 7.3-1 (θ3dB = φ3dB = 65°, SLA_V = A_max = 30 dB, G_E,max = 8 dBi).
const element = { elementHBeamwidthDeg: 65, elementVBeamwidthDeg: 65, elementGainDbi: 8, frontToBackDb: 30, sideLobeLevelDb: 30 };

describe("TR 38.901 Table 7.3-1 element pattern", () => {
  it("elementGainDbi at boresight (θ = 90°, φ = 0°) = G_E,max = 8 dBi", () => {
    expect(elementGainDbi(element, 90, 0)).toBe(8);
  });
  it("elementHorizontalCutDb(φ = 32.5°) = −12 (32.5/65)² = −3 dB at half the beamwidth", () => {
    expect(elementHorizontalCutDb(element, 32.5)).toBeCloseTo(-3, 12);
    expect(elementVerticalCutDb(element, 90 + 32.5)).toBeCloseTo(-3, 12);
    expect(elementGainDbi(element, 90, -32.5)).toBeCloseTo(5, 12);
  });
  it("elementGainDbi never falls below G_E,max − 30 dB (the A_max floor)", () => {
    expect(elementGainDbi(element, 90, 180)).toBe(8 - 30);
    expect(elementGainDbi(element, 10, 150)).toBe(8 - 30);
    expect(elementHorizontalCutDb(element, 120)).toBe(-30);
  });
});

// Source: 3GPP TR 38.901 §7.1, eq. (7.1-7) and (7.1-8).
describe("TR 38.901 §7.1 global-to-local rotation", () => {
  it("globalToLocal: a rotated antenna sees its own boresight at θ' = 90°, φ' = 0° (zero off-axis angle)", () => {
    for (const [alpha, beta] of [[30, 0], [-120, 6], [75, 12]]) {
      // the boresight direction in global angles: azimuth α, zenith 90° + β (downtilt)
      const local = globalToLocal(90 + beta, alpha, alpha, beta);
      expect(local.thetaDeg).toBeCloseTo(90, 9);
      expect(local.phiDeg).toBeCloseTo(0, 9);
    }
  });
  it("globalToLocal with β = 0 only shifts the azimuth: φ' = φ − α, θ' = θ", () => {
    const local = globalToLocal(80, 50, 20, 0);
    expect(local.thetaDeg).toBeCloseTo(80, 9);
    expect(local.phiDeg).toBeCloseTo(30, 9);
  });
  it("compassToTrAzimuthDeg: a compass bearing of 90° (east) is α = 0° (the x axis)", () => {
    expect(compassToTrAzimuthDeg(90)).toBe(0);
    expect(compassToTrAzimuthDeg(0)).toBe(90);
  });
});
