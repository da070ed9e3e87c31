import { describe, expect, it } from "vitest";
import { buildBeamSetGainTable, diamondAngle, diamondToDeg, tableGainDbi } from "../../../lib/radio/beamGainTable";
import { beamSetGainDbi } from "../../../lib/radio/arrayFactor";
import { ANTENNA_MODEL_CATALOGUE, BEAM_SET_CATALOGUE } from "../../../lib/radio/beamSets";
import { seededRandom } from "../../bench/benchScenario";

describe("beamGainTable", () => {
  it("diamondToDeg inverts diamondAngle over the whole circle", () => {
    for (let a = -179.5; a <= 180; a += 7.3) {
      const p = diamondAngle(Math.cos((a * Math.PI) / 180), Math.sin((a * Math.PI) / 180));
      expect(diamondToDeg(p)).toBeCloseTo(a, 9);
    }
  });
  it("tableGainDbi matches the direct pattern: p95 error < 0.1 dB, p99 < 0.3 dB, max < 1.2 dB (every catalogue combination, random directions)", () => {
    const rnd = seededRandom(11);
    const errors: number[] = [];
    for (const model of ANTENNA_MODEL_CATALOGUE) {
      for (const set of BEAM_SET_CATALOGUE.filter((s) => model.beamSetIds.includes(s.id))) {
        const tilt = Math.round(rnd() * 10);
        const table = buildBeamSetGainTable(model, set.beams, tilt);
        for (let k = 0; k < 1500; k++) {
          const z = 2 * rnd() - 1, ph = 2 * Math.PI * rnd(), r = Math.sqrt(1 - z * z);
          const x = r * Math.cos(ph), y = r * Math.sin(ph);
          const direct = beamSetGainDbi(model, set.beams, tilt, (Math.acos(z) * 180) / Math.PI, (Math.atan2(y, x) * 180) / Math.PI);
          errors.push(Math.abs(direct - tableGainDbi(table, x, y, z)));
        }
      }
    }
    errors.sort((a, b) => a - b);
    expect(errors[Math.floor(errors.length * 0.95)]).toBeLessThan(0.1);
    expect(errors[Math.floor(errors.length * 0.99)]).toBeLessThan(0.3);
    expect(errors[errors.length - 1]).toBeLessThan(1.2);
  });
  it("buildBeamSetGainTable refuses an empty beam list", () => {
    expect(() => buildBeamSetGainTable(ANTENNA_MODEL_CATALOGUE[0], [], 0)).toThrow(RangeError);
  });
});
