/** Number formatting for the workspace, all through lib/units so cards, tables and readouts agree. */
import { formatCompact, formatQuantity, type QuantityUnit } from "@/lib/units";

export const fmt = (value: number | null | undefined, unit: QuantityUnit, digits = 3): string =>
  value === null || value === undefined ? "—" : formatQuantity(value, unit, digits);

export const fmtCompact = (value: number | null | undefined, unit: QuantityUnit = "none", digits = 3): string =>
  value === null || value === undefined ? "—" : formatCompact(value, unit, digits);

export const fmtVolts = (v: number | null | undefined): string => fmt(v, "volt", 3);

/** A gain as a plain ratio with its sign (−10.0) and in dB (20.0 dB); unbounded gains are named so. */
export function fmtGain(g: number | null | undefined): string {
  if (g === null || g === undefined) return "unbounded";
  if (!Number.isFinite(g)) return "—";
  const db = g === 0 ? "−∞ dB" : `${(20 * Math.log10(Math.abs(g))).toFixed(1)} dB`;
  return `${g < 0 ? "−" : ""}${fmtCompact(Math.abs(g), "none", 4)} (${db.replace("-", "−")})`;
}

export const fmtDb = (db: number | null | undefined, digits = 1): string =>
  db === null || db === undefined || !Number.isFinite(db) ? "—" : `${db.toFixed(digits).replace("-", "−")} dB`;
