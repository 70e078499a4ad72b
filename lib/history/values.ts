/**
 * Writing the values of a chain document for people reading a change: each param and part figure in
 * engineering notation with its unit (`47.0 kΩ`), words as they are, a missing value as "—".
 */
import { PARAM_SPECS } from "@/lib/chain/params";
import type { NodeKind } from "@/lib/chain/types";
import { formatQuantity, type QuantityUnit } from "@/lib/units";

/** Units of the part figures (chain-format.md, "parts"). */
export const PART_UNITS: Readonly<Record<string, QuantityUnit>> = {
  gbw: "hertz",
  aol: "none",
  slewRate: "V/s",
  vos: "volt",
  ib: "ampere",
  en: "V/√Hz",
  in: "A/√Hz",
  enCorner: "hertz",
  inCorner: "hertz",
  swingLow: "volt",
  swingHigh: "volt",
  inputLow: "volt",
  inputHigh: "volt",
};

/** Units of the document's analysis settings. */
export const ANALYSIS_UNITS: Readonly<Record<string, QuantityUnit>> = {
  fMin: "hertz",
  fMax: "hertz",
  points: "none",
  temperatureK: "none",
  noiseLow: "hertz",
  noiseHigh: "hertz",
  aliasTargetDb: "none",
};

const SUFFIX: Readonly<Record<string, string>> = { temperatureK: " K", aliasTargetDb: " dB" };

/** The unit a stage param is written in, or null for words and plain counts. */
export function paramUnit(kind: string, param: string): QuantityUnit | null {
  const spec = PARAM_SPECS[kind as NodeKind]?.[param];
  const unit = spec?.rule?.unit;
  if (!unit || unit === "kelvin" || unit === "dB" || unit === "pixels" || unit === "fraction") return null;
  return unit;
}

/**
 * One value as text. Numbers with a unit get an SI prefix and three significant digits; integers
 * without a unit (bits, points) are written whole; fractions (tolerances) as a percentage.
 */
export function formatValue(value: unknown, unit: QuantityUnit | "percent" | null, suffix = ""): string {
  if (value === undefined) return "—";
  if (value === null) return "none";
  if (typeof value === "number") {
    if (!Number.isFinite(value)) return String(value);
    if (unit === "percent") return `${Number((value * 100).toPrecision(3))} %`;
    if (unit === null || unit === "none") {
      if (Number.isInteger(value) && Math.abs(value) < 1e6) return `${value}${suffix}`;
      return `${formatQuantity(value, "none")}${suffix}`;
    }
    return formatQuantity(value, unit);
  }
  if (typeof value === "string") return value === "" ? "(empty)" : value;
  if (typeof value === "boolean") return value ? "yes" : "no";
  return JSON.stringify(value);
}

export function formatParam(kind: string, param: string, value: unknown): string {
  return formatValue(value, paramUnit(kind, param));
}

export function formatPartFigure(field: string, value: unknown): string {
  return formatValue(value, PART_UNITS[field] ?? null);
}

export function formatAnalysisSetting(field: string, value: unknown): string {
  return formatValue(value, ANALYSIS_UNITS[field] ?? null, SUFFIX[field] ?? "");
}
