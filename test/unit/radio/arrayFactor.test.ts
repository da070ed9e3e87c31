import { describe, expect, it } from "vitest";
import { activeColumnsForWidth, beamGainDbi, beamSetGainDbi, lineArrayFactor, ARRAY_FACTOR_NULL_FILL } from "../../../lib/radio/arrayFactor";
import { ANTENNA_MODEL_CATALOGUE } from "../../../lib/radio/beamSets";

const model = ANTENNA_MODEL_CATALOGUE.find((m) => m.id === "panel-8x4")!;

describe("arrayFactor", () => {
  it("lineArrayFactor peaks at K and never falls below the null fill K · 0.01", () => {
    expect(lineArrayFactor(8, 0.5, 0)).toBe(8);
    for (let x = -2; x <= 2; x += 0.001) expect(lineArrayFactor(8, 0.5, x)).toBeGreaterThanOrEqual(8 * ARRAY_FACTOR_NULL_FILL);
  });
  it("activeColumnsForWidth: narrower beams switch on more columns, bounded by 1..columns", () => {
    expect(activeColumnsForWidth(65, 4, 0.5)).toBe(2);
    expect(activeColumnsForWidth(12.7, 8, 0.5)).toBe(8);
    expect(activeColumnsForWidth(1, 4, 0.5)).toBe(4);
    expect(activeColumnsForWidth(170, 4, 0.5)).toBe(1);
  });
  it("beamGainDbi peaks at its steering direction with element gain + 10 log10(rows × active columns)", () => {
    const beam = { azimuthOffsetDeg: 0, elevationOffsetDeg: 0, widthDeg: 15 };
    const peak = beamGainDbi(model, beam, 0, 90, 0);
    expect(peak).toBeCloseTo(8 + 10 * Math.log10(8 * 4), 9);
    expect(beamGainDbi(model, beam, 0, 93, 0)).toBeLessThan(peak);
    // electrical tilt moves the peak down: at 6° tilt, 96° beats 90°
    expect(beamGainDbi(model, beam, 6, 96, 0)).toBeGreaterThan(beamGainDbi(model, beam, 6, 90, 0));
  });
  it("beamSetGainDbi is the best of its beams; a positive azimuth offset steers clockwise (toward negative φ')", () => {
    const left = { azimuthOffsetDeg: -30, elevationOffsetDeg: 0, widthDeg: 15 };
    const right = { azimuthOffsetDeg: 30, elevationOffsetDeg: 0, widthDeg: 15 };
    expect(beamGainDbi(model, right, 0, 90, -30)).toBeGreaterThan(beamGainDbi(model, right, 0, 90, 30));
    const set = beamSetGainDbi(model, [left, right], 0, 90, 30);
    expect(set).toBe(Math.max(beamGainDbi(model, left, 0, 90, 30), beamGainDbi(model, right, 0, 90, 30)));
  });
});
