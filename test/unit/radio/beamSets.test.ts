import { describe, expect, it } from "vitest";
import { ANTENNA_MODEL_CATALOGUE, BEAM_SET_CATALOGUE } from "../../../lib/radio/beamSets";

describe("beam-set and antenna-model catalogues", () => {
  it("BEAM_SET_CATALOGUE holds at least five sets with unique ids and at least one valid beam each", () => {
    expect(BEAM_SET_CATALOGUE.length).toBeGreaterThanOrEqual(5);
    expect(new Set(BEAM_SET_CATALOGUE.map((s) => s.id)).size).toBe(BEAM_SET_CATALOGUE.length);
    for (const s of BEAM_SET_CATALOGUE) {
      expect(s.beams.length).toBeGreaterThan(0);
      for (const b of s.beams) expect(b.widthDeg).toBeGreaterThan(0);
    }
  });
  it("ANTENNA_MODEL_CATALOGUE holds 2–3 models whose ranges are ordered and whose beam sets exist", () => {
    expect(ANTENNA_MODEL_CATALOGUE.length).toBeGreaterThanOrEqual(2);
    const ids = new Set(BEAM_SET_CATALOGUE.map((s) => s.id));
    for (const m of ANTENNA_MODEL_CATALOGUE) {
      expect(m.electricalTiltMinDeg).toBeLessThan(m.electricalTiltMaxDeg);
      expect(m.mechanicalTiltMinDeg).toBeLessThan(m.mechanicalTiltMaxDeg);
      expect(m.rsPowerMinDbm).toBeLessThan(m.rsPowerMaxDbm);
      for (const id of m.beamSetIds) expect(ids.has(id)).toBe(true);
    }
  });
});
