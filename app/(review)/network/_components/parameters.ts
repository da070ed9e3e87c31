// How the network pages name and print the cell parameters a request may change.
import type { CellParameter } from "@/lib/radio/scenario";

export interface ParameterDisplay {
  label: string;
  unit: string;
  /** Decimals for numbers; null for text values (beam sets). */
  digits: number | null;
}

export const PARAMETER_DISPLAY: Record<CellParameter, ParameterDisplay> = {
  azimuthDeg: { label: "Azimuth", unit: "°", digits: 1 },
  mechanicalTiltDeg: { label: "Mechanical tilt", unit: "°", digits: 1 },
  electricalTiltDeg: { label: "Electrical tilt", unit: "°", digits: 1 },
  beamSetId: { label: "Beam set", unit: "", digits: null },
  rsPowerDbm: { label: "RS power", unit: "dBm", digits: 1 },
};

export function parameterText(parameter: CellParameter, value: number | string, beamSetNames: Record<string, string> = {}): string {
  const { unit, digits } = PARAMETER_DISPLAY[parameter];
  if (digits === null) return beamSetNames[String(value)] ?? String(value);
  const text = Number(value).toFixed(digits);
  return unit === "°" ? `${text}°` : unit ? `${text} ${unit}` : text;
}
