// Cell parameter values as stored in the temporal record: numbers as their shortest
// exact decimal text (String(n) round-trips every double), beam sets as their code.
import type { CellParameter } from "../../radio/scenario";

export function encodeParameterValue(value: number | string): string {
  return typeof value === "number" ? String(value) : value;
}

export function decodeParameterValue(parameter: CellParameter, text: string): number | string {
  if (parameter === "beamSetId") return text;
  const value = Number(text);
  if (!Number.isFinite(value)) throw new RangeError(`stored ${parameter} value "${text}" is not a number`);
  return value;
}
