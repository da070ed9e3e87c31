// Number and date formatting shared by the review components. Deterministic (no locale, UTC dates) so that
// server-rendered and hydrated markup agree whatever the browser's time zone.

export const DASH = "–";

export function fixed(value: number | null | undefined, digits: number, unit = ""): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return DASH;
  // a value that rounds to zero prints as 0.00, never −0.00 (which reads as a change)
  const text = (Number(value.toFixed(digits)) === 0 ? 0 : value).toFixed(digits);
  return unit ? `${text} ${unit}` : text;
}

/** Signed, e.g. "+1.25" / "−0.40" (true minus sign). */
export function signed(value: number | null | undefined, digits: number, unit = ""): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return DASH;
  const rounded = Number(value.toFixed(digits));
  const text = Math.abs(rounded).toFixed(digits);
  const sign = rounded > 0 ? "+" : rounded < 0 ? "−" : "±";
  return unit ? `${sign}${text} ${unit}` : `${sign}${text}`;
}

/** A 0..1 ratio as a percentage. */
export function percent(ratio: number | null | undefined, digits = 1): string {
  return ratio === null || ratio === undefined ? DASH : fixed(ratio * 100, digits, "%");
}

export function floorLabel(floor: number): string {
  return floor === 0 ? "Outdoor" : `Floor ${floor}`;
}

const pad = (n: number) => String(n).padStart(2, "0");

/** "2026-03-14 09:05 UTC" */
export function utcDateTime(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.getUTCFullYear()}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())} ${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())} UTC`;
}

/** "2026-03-14" (UTC) */
export function utcDate(isoOrMs: string | number): string {
  const d = new Date(isoOrMs);
  if (Number.isNaN(d.getTime())) return String(isoOrMs);
  return `${d.getUTCFullYear()}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())}`;
}

export type Trend = "better" | "worse" | "same";

/** Direction of a delta after rounding to what is shown, for "higher is better" quantities. */
export function trendOf(delta: number | null | undefined, digits: number): Trend | null {
  if (delta === null || delta === undefined || !Number.isFinite(delta)) return null;
  const rounded = Number(delta.toFixed(digits));
  return rounded > 0 ? "better" : rounded < 0 ? "worse" : "same";
}

export const TREND_SYMBOL: Record<Trend, string> = { better: "▲", worse: "▼", same: "=" };
