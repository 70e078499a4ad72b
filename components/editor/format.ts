/** Number formatting for the workspace, all through lib/units so cards, tables and readouts agree. */
import { formatCompact, formatQuantity, type QuantityUnit } from "@/lib/units";

export const fmt = (value: number | null | undefined, unit: QuantityUnit, digits = 3): string =>
  value === null || value === undefined ? "—" : formatQuantity(value, unit, digits);

export const fmtCompact = (value: number | null | undefined, unit: QuantityUnit = "none", digits = 3): string =>
  value === null || value === undefined ? "—" : formatCompact(value, unit, digits);

export const fmtVolts = (v: number | null | undefined): string => fmt(v, "volt", 3);

/** 800000 per ampere → "800.0 kV/A"; 0 → "0 V/C" (the SI prefix joins the unit, a bare number gets a space). */
function perSensorUnit(v: number, perUnit: "A" | "C"): string {
  const q = fmt(v, "none", 4).trim();
  return /[a-zA-Zµ]$/.test(q) ? `${q}V/${perUnit}` : `${q} V/${perUnit}`;
}

/** A gain's value with its sign: a plain ratio (`digits` significant), or with V/A or V/C (−800.0 kV/A). */
export function fmtGainValue(g: number, perUnit: "V" | "A" | "C" = "V", digits = 4): string {
  return `${g < 0 ? "−" : ""}${perUnit === "V" ? fmtCompact(Math.abs(g), "none", digits) : perSensorUnit(Math.abs(g), perUnit)}`;
}

/** A figure's name with what it is per when that is not a plain ratio: "DC gain (V/A)". */
export const perUnitName = (name: string, perUnit: "V" | "A" | "C"): string => (perUnit === "V" ? name : `${name} (V/${perUnit})`);

/**
 * A gain with its sign and in dB: a plain ratio (−10.0, 20.0 dB), or per ampere or coulomb of the sensor
 * for a front end or a whole path from a photodiode or piezo (−800.0 kV/A, 118.1 dB re 1 V/A).
 * Unbounded gains are named so.
 */
export function fmtGain(g: number | null | undefined, perUnit: "V" | "A" | "C" = "V"): string {
  if (g === null || g === undefined) return "unbounded";
  if (!Number.isFinite(g)) return "—";
  const ref = perUnit === "V" ? "dB" : `dB re 1 V/${perUnit}`;
  const db = g === 0 ? `−∞ ${ref}` : `${(20 * Math.log10(Math.abs(g))).toFixed(1)} ${ref}`;
  return `${fmtGainValue(g, perUnit)} (${db.replace("-", "−")})`;
}

export const fmtDb = (db: number | null | undefined, digits = 1): string =>
  db === null || db === undefined || !Number.isFinite(db) ? "—" : `${db.toFixed(digits).replace("-", "−")} dB`;
