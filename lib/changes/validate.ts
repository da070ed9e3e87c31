// Domain checks of a request's items against the baseline network: the cell exists, the
// parameter is one we change, the value has the right type and lies within the cell's
// hardware range. Every problem is collected and thrown at once, so the engineer fixes the
// whole list in one go.

import {
  CELL_PARAMETERS,
  type AntennaModel,
  type BeamSet,
  type Cell,
  type CellParameter,
} from "../radio/scenario";
import { invalid, type IssueDetail } from "./errors";

/** An item as it arrives (after the schema, or read back from storage). */
export interface ItemLike {
  cellId: string;
  parameter: string;
  newValue: number | string;
}

/** An item checked against the baseline, with the value it replaces. */
export interface ValidatedItem {
  /** Index in the submitted list (ChangeItem.position). */
  position: number;
  cellId: string;
  parameter: CellParameter;
  oldValue: number | string;
  newValue: number | string;
  /** The new value equals the baseline value (see the warning). */
  unchanged: boolean;
}

export interface ValidationResult {
  items: ValidatedItem[];
  /** Not refusals: things the engineer should see (e.g. an item that changes nothing). */
  warnings: IssueDetail[];
}

/** Catalogues may be given as a map by id or as a list. */
export type Catalogue<T extends { id: string }> = ReadonlyMap<string, T> | readonly T[];

/** DESIGN §3: electrical tilt 0–15° unless the antenna model says otherwise. */
export const DEFAULT_ELECTRICAL_TILT_RANGE: readonly [number, number] = [0, 15];

// Two values this close are the same setting; below any hardware's step.
const SAME_VALUE_TOLERANCE = 1e-9;

const NUMERIC: ReadonlySet<CellParameter> = new Set<CellParameter>([
  "azimuthDeg",
  "mechanicalTiltDeg",
  "electricalTiltDeg",
  "rsPowerDbm",
]);

const WORDS: Readonly<Record<CellParameter, string>> = {
  azimuthDeg: "azimuth",
  mechanicalTiltDeg: "mechanical tilt",
  electricalTiltDeg: "electrical tilt",
  beamSetId: "beam set",
  rsPowerDbm: "RS power",
};

const UNITS: Readonly<Record<CellParameter, string>> = {
  azimuthDeg: "°",
  mechanicalTiltDeg: "°",
  electricalTiltDeg: "°",
  beamSetId: "",
  rsPowerDbm: " dBm",
};

function toMap<T extends { id: string }>(catalogue: Catalogue<T>): ReadonlyMap<string, T> {
  if (catalogue instanceof Map) return catalogue;
  return new Map((catalogue as readonly T[]).map((entry) => [entry.id, entry]));
}

function show(value: unknown): string {
  return typeof value === "string" ? JSON.stringify(value) : String(value);
}

export function isCellParameter(value: unknown): value is CellParameter {
  return typeof value === "string" && (CELL_PARAMETERS as readonly string[]).includes(value);
}

/** The inclusive hardware range of a numeric parameter for one antenna model, or null when none. */
export function rangeOf(model: AntennaModel, parameter: CellParameter): { min: number; max: number } | null {
  const pick = (min: number, max: number) =>
    Number.isFinite(min) && Number.isFinite(max) && min <= max ? { min, max } : null;
  switch (parameter) {
    case "electricalTiltDeg":
      return (
        pick(model.electricalTiltMinDeg, model.electricalTiltMaxDeg) ?? {
          min: DEFAULT_ELECTRICAL_TILT_RANGE[0],
          max: DEFAULT_ELECTRICAL_TILT_RANGE[1],
        }
      );
    case "mechanicalTiltDeg":
      return pick(model.mechanicalTiltMinDeg, model.mechanicalTiltMaxDeg);
    case "rsPowerDbm":
      return pick(model.rsPowerMinDbm, model.rsPowerMaxDbm);
    default:
      return null;
  }
}

export function sameValue(a: number | string, b: number | string): boolean {
  if (typeof a === "number" && typeof b === "number") return Math.abs(a - b) <= SAME_VALUE_TOLERANCE;
  return a === b;
}

/**
 * Check items against the baseline cells and the hardware catalogues; return them with the
 * old value filled in. Throws one DomainError("invalid") whose details list every problem
 * as { path: "items[i].field", message } naming the value.
 *
 * A new value equal to the old one is a warning, not an error: it is harmless to the model
 * and to the network, and it arises legitimately after a rebase when another request already
 * set that value; refusing it would make such a rebase fail.
 */
export function validateItems(
  items: readonly ItemLike[],
  cells: ReadonlyMap<string, Cell>,
  antennaModels: Catalogue<AntennaModel>,
  beamSets: Catalogue<BeamSet>,
): ValidationResult {
  const models = toMap(antennaModels);
  const sets = toMap(beamSets);
  const errors: IssueDetail[] = [];
  const warnings: IssueDetail[] = [];
  const out: ValidatedItem[] = [];
  const seen = new Map<string, number>();

  if (items.length === 0) errors.push({ path: "items", message: "a request needs at least one item" });

  items.forEach((item, i) => {
    const at = `items[${i}]`;
    const errorCount = errors.length;
    const cell = cells.get(item.cellId);
    if (cell === undefined) {
      errors.push({ path: `${at}.cellId`, message: `unknown cell ${show(item.cellId)}` });
    }
    if (!isCellParameter(item.parameter)) {
      errors.push({
        path: `${at}.parameter`,
        message: `unknown parameter ${show(item.parameter)}; expected one of ${CELL_PARAMETERS.join(", ")}`,
      });
    }
    if (cell === undefined || !isCellParameter(item.parameter)) return;
    const parameter = item.parameter;

    const key = `${cell.id}\u0000${parameter}`;
    const first = seen.get(key);
    if (first !== undefined) {
      errors.push({
        path: `${at}.parameter`,
        message: `duplicate of items[${first}]: cell ${show(cell.id)} ${parameter} may appear only once per request`,
      });
    } else seen.set(key, i);

    const model = models.get(cell.antennaModelId);
    if (model === undefined) {
      errors.push({
        path: `${at}.cellId`,
        message: `cell ${show(cell.id)} refers to unknown antenna model ${show(cell.antennaModelId)}`,
      });
      return;
    }

    const value = item.newValue;
    const valuePath = `${at}.newValue`;
    const word = WORDS[parameter];
    if (NUMERIC.has(parameter)) {
      if (typeof value !== "number" || !Number.isFinite(value)) {
        errors.push({ path: valuePath, message: `${word} must be a finite number, got ${show(value)}` });
      } else if (parameter === "azimuthDeg") {
        // Bearing clockwise from north in [0, 360): 360 is written 0 (DESIGN: 0–359.9°).
        if (value < 0 || value >= 360) {
          errors.push({
            path: valuePath,
            message: `azimuth ${value}° is outside [0, 360)° for cell ${show(cell.id)} (north is 0, not 360)`,
          });
        }
      } else {
        const range = rangeOf(model, parameter);
        if (range === null) {
          errors.push({
            path: valuePath,
            message: `antenna model ${show(model.id)} of cell ${show(cell.id)} defines no valid ${word} range`,
          });
        } else if (value < range.min || value > range.max) {
          const unit = UNITS[parameter];
          errors.push({
            path: valuePath,
            message: `${word} ${value}${unit} is outside ${range.min}–${range.max}${unit} for antenna model ${show(model.id)} of cell ${show(cell.id)}`,
          });
        }
      }
    } else {
      // beamSetId: an id from the catalogue that this antenna hardware supports.
      if (typeof value !== "string" || value === "") {
        errors.push({ path: valuePath, message: `beam set must be a beam-set id, got ${show(value)}` });
      } else if (!sets.has(value)) {
        errors.push({ path: valuePath, message: `unknown beam set ${show(value)}` });
      } else if (!model.beamSetIds.includes(value)) {
        errors.push({
          path: valuePath,
          message: `beam set ${show(value)} is not supported by antenna model ${show(model.id)} of cell ${show(cell.id)} (supported: ${model.beamSetIds.map(show).join(", ") || "none"})`,
        });
      }
    }

    if (errors.length !== errorCount) return;
    const oldValue = cell[parameter];
    const unchanged = sameValue(oldValue, value);
    if (unchanged) {
      warnings.push({
        path: valuePath,
        message: `${word} of cell ${show(cell.id)} is already ${show(oldValue)}${UNITS[parameter]}; this item changes nothing`,
      });
    }
    out.push({ position: i, cellId: cell.id, parameter, oldValue, newValue: value, unchanged });
  });

  if (errors.length > 0) {
    throw invalid(errors, `${errors.length} problem${errors.length === 1 ? "" : "s"} in the items`);
  }
  return { items: out, warnings };
}
