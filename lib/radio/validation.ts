// Input checks run before anything is computed. Each failure is a RangeError naming the cell, field and value.
import type { AntennaModel, BeamSet, Cell, ParameterChange, Scenario } from "./scenario";
import { CELL_PARAMETERS } from "./scenario";

function fail(cell: Cell, field: string, value: unknown, why: string): never {
  throw new RangeError(`cell "${cell.id}": ${field} = ${JSON.stringify(value)} ${why}`);
}

function checkRange(cell: Cell, field: keyof Cell, min: number, max: number): void {
  const v = cell[field] as number;
  if (typeof v !== "number" || !Number.isFinite(v) || v < min || v > max) fail(cell, field, v, `is outside the antenna model's range [${min}, ${max}]`);
}

/** Checks one cell against the scenario's catalogues, its hardware ranges and the bounds. */
export function validateCell(scenario: Scenario, cell: Cell, models: Map<string, AntennaModel>, beamSets: Map<string, BeamSet>): void {
  const model = models.get(cell.antennaModelId);
  if (!model) fail(cell, "antennaModelId", cell.antennaModelId, "names no antenna model of the scenario");
  if (!beamSets.has(cell.beamSetId)) fail(cell, "beamSetId", cell.beamSetId, "names no beam set of the scenario");
  if (!model.beamSetIds.includes(cell.beamSetId)) fail(cell, "beamSetId", cell.beamSetId, `is not supported by antenna model "${model.id}"`);
  const az = cell.azimuthDeg;
  if (typeof az !== "number" || !Number.isFinite(az) || az < 0 || az >= 360) fail(cell, "azimuthDeg", az, "is outside [0, 360)");
  checkRange(cell, "mechanicalTiltDeg", model.mechanicalTiltMinDeg, model.mechanicalTiltMaxDeg);
  checkRange(cell, "electricalTiltDeg", model.electricalTiltMinDeg, model.electricalTiltMaxDeg);
  checkRange(cell, "rsPowerDbm", model.rsPowerMinDbm, model.rsPowerMaxDbm);
  if (!(cell.antennaHeightM > 1)) fail(cell, "antennaHeightM", cell.antennaHeightM, "must be > 1 m (TR 38.901 h'BS = hBS − 1 m > 0)");
  if (!(cell.frequencyMHz > 0)) fail(cell, "frequencyMHz", cell.frequencyMHz, "must be > 0");
  if (!(cell.bandwidthMHz > 0)) fail(cell, "bandwidthMHz", cell.bandwidthMHz, "must be > 0");
  if (!(cell.subcarrierSpacingKHz > 0)) fail(cell, "subcarrierSpacingKHz", cell.subcarrierSpacingKHz, "must be > 0");
  const site = scenario.sites.find((s) => s.id === cell.siteId);
  if (!site) fail(cell, "siteId", cell.siteId, "names no site of the scenario");
  const b = scenario.bounds;
  if (!(site.x >= b.minX && site.x <= b.maxX && site.y >= b.minY && site.y <= b.maxY)) {
    fail(cell, "siteId", cell.siteId, `site at (${site.x}, ${site.y}) lies outside the bounds [${b.minX}, ${b.maxX}] × [${b.minY}, ${b.maxY}]`);
  }
  if (!Number.isFinite(site.groundHeightM)) fail(cell, "siteId", cell.siteId, `site groundHeightM ${site.groundHeightM} is not finite`);
}

/** Checks catalogues, settings and every cell; throws the first problem found. */
export function validateScenario(scenario: Scenario): void {
  const models = new Map(scenario.antennaModels.map((m) => [m.id, m]));
  const beamSets = new Map(scenario.beamSets.map((s) => [s.id, s]));
  for (const m of scenario.antennaModels) {
    for (const f of ["rows", "columns"] as const) {
      if (!Number.isInteger(m[f]) || m[f] < 1) throw new RangeError(`antenna model "${m.id}": ${f} = ${m[f]} must be an integer ≥ 1`);
    }
    for (const f of ["elementHBeamwidthDeg", "elementVBeamwidthDeg", "verticalSpacingWl", "horizontalSpacingWl"] as const) {
      if (!(m[f] > 0)) throw new RangeError(`antenna model "${m.id}": ${f} = ${m[f]} must be > 0`);
    }
  }
  for (const s of scenario.beamSets) {
    if (!Array.isArray(s.beams) || s.beams.length === 0) throw new RangeError(`beam set "${s.id}": beams must hold at least one beam`);
    s.beams.forEach((beam, i) => {
      if (!(beam.widthDeg > 0) || !Number.isFinite(beam.azimuthOffsetDeg) || !Number.isFinite(beam.elevationOffsetDeg)) {
        throw new RangeError(`beam set "${s.id}": beam ${i} = ${JSON.stringify(beam)} needs finite offsets and widthDeg > 0`);
      }
    });
  }
  const st = scenario.settings;
  for (const f of ["gridSizeM", "userHeightM", "floorHeightM"] as const) {
    if (!(st[f] > 0)) throw new RangeError(`settings.${f} = ${st[f]} must be > 0`);
  }
  if (st.environment !== "UMa" && st.environment !== "UMi") throw new RangeError(`settings.environment = ${JSON.stringify(st.environment)} must be "UMa" or "UMi"`);
  if (st.buildingLoss !== "low" && st.buildingLoss !== "high") throw new RangeError(`settings.buildingLoss = ${JSON.stringify(st.buildingLoss)} must be "low" or "high"`);
  if (!(st.overlapDeltaDb >= 0)) throw new RangeError(`settings.overlapDeltaDb = ${st.overlapDeltaDb} must be ≥ 0`);
  if (!(st.overlapMaxOthers >= 0)) throw new RangeError(`settings.overlapMaxOthers = ${st.overlapMaxOthers} must be ≥ 0`);
  const ids = new Set<string>();
  for (const cell of scenario.cells) {
    if (ids.has(cell.id)) throw new RangeError(`cell "${cell.id}": id is listed twice`);
    ids.add(cell.id);
    validateCell(scenario, cell, models, beamSets);
  }
}

/** Checks the shape of a change list: known cell, known parameter, value of the right type. */
export function validateChanges(scenario: Scenario, changes: readonly ParameterChange[]): void {
  const ids = new Set(scenario.cells.map((c) => c.id));
  changes.forEach((ch, i) => {
    if (!ids.has(ch.cellId)) throw new RangeError(`change ${i}: cellId ${JSON.stringify(ch.cellId)} names no cell`);
    if (!CELL_PARAMETERS.includes(ch.parameter)) throw new RangeError(`change ${i} (cell "${ch.cellId}"): parameter ${JSON.stringify(ch.parameter)} is not one of ${CELL_PARAMETERS.join(", ")}`);
    const wantString = ch.parameter === "beamSetId";
    if (wantString ? typeof ch.value !== "string" : typeof ch.value !== "number" || !Number.isFinite(ch.value)) {
      throw new RangeError(`change ${i} (cell "${ch.cellId}"): ${ch.parameter} = ${JSON.stringify(ch.value)} must be ${wantString ? "a string" : "a finite number"}`);
    }
  });
}
