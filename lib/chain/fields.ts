/**
 * Field-level building blocks of the chain schema: numbers with their unit and limit, ids, text. Each
 * builder produces one plain-words message that states the whole rule with its unit
 * (`must be a positive number of farads`), plus what was found when that helps.
 */
import { z } from "zod";
import { parseQuantity, UNIT_WORDS, type QuantityUnit } from "../units";

export type Bound = "positive" | "nonNegative" | "any";

export interface NumberRule {
  /** unit for the message and for the text hint */
  unit: QuantityUnit | "kelvin" | "dB" | "pixels" | "fraction";
  bound: Bound;
  /** integer from min to max (inclusive) */
  integer?: { min: number; max: number };
  /** inclusive range for non-integers */
  range?: { min: number; max: number };
  /** what null means; when set, null is accepted */
  nullMeans?: string;
  /** said after the rule, e.g. "(V/V, not dB)" */
  note?: string;
}

const UNIT_PLURAL: Record<NumberRule["unit"], string> = {
  ...UNIT_WORDS,
  "V/√Hz": "V/√Hz",
  "A/√Hz": "A/√Hz",
  none: "",
  kelvin: "kelvin",
  dB: "decibels",
  pixels: "",
  fraction: "",
};

/** The rule in words: "a positive number of ohms", "an integer from 1 to 32". */
export function ruleText(rule: NumberRule): string {
  let core: string;
  if (rule.integer) core = `an integer from ${rule.integer.min} to ${rule.integer.max}`;
  else if (rule.range && rule.unit === "fraction") {
    core = `a fraction from ${rule.range.min} to ${rule.range.max} (0.01 is 1 %)`;
  } else {
    const unit = UNIT_PLURAL[rule.unit];
    const of = unit ? ` of ${unit}` : "";
    if (rule.bound === "positive") core = `a positive number${of}`;
    else if (rule.bound === "nonNegative") core = `a number${of}, 0 or more`;
    else core = `a number${of}`;
    if (rule.range) core += ` from ${rule.range.min} to ${rule.range.max}`;
  }
  if (rule.note) core += ` ${rule.note}`;
  return rule.nullMeans ? `${core}, or null for ${rule.nullMeans}` : core;
}

/** Does `v` meet the rule? Only finite numbers ever do (no NaN, no ±Infinity). */
export function meetsRule(v: unknown, rule: NumberRule): boolean {
  if (v === null) return rule.nullMeans !== undefined;
  if (typeof v !== "number" || !Number.isFinite(v)) return false;
  if (rule.bound === "positive" && !(v > 0)) return false;
  if (rule.bound === "nonNegative" && !(v >= 0)) return false;
  if (rule.integer && !(Number.isInteger(v) && v >= rule.integer.min && v <= rule.integer.max)) return false;
  if (rule.range && !(v >= rule.range.min && v <= rule.range.max)) return false;
  return true;
}

/** A short, safe rendering of what was found, for messages. */
export function describeFound(v: unknown): string {
  if (v === null) return "null";
  if (Array.isArray(v)) return "a list";
  switch (typeof v) {
    case "number":
      return String(v);
    case "string":
      return `text ${JSON.stringify(v.length > 24 ? `${v.slice(0, 24)}…` : v)}`;
    case "boolean":
      return String(v);
    case "object":
      return "an object";
    default:
      return `a ${typeof v}`;
  }
}

/** The full message for a value that breaks `rule`. */
export function numberMessage(rule: NumberRule, v: unknown): string {
  const want = ruleText(rule);
  if (v === undefined) return `is required: ${want}`;
  if (typeof v === "string") {
    const read = parseQuantity(v, isQuantityUnit(rule.unit) ? { unit: rule.unit } : {});
    const hint = read.ok && meetsRule(read.value, rule) ? `; write ${read.value} for ${JSON.stringify(v)}` : "";
    return `must be ${want}, not text (the document holds plain numbers in SI units${hint})`;
  }
  return `must be ${want} (found ${describeFound(v)})`;
}

function isQuantityUnit(u: NumberRule["unit"]): u is QuantityUnit {
  return u !== "kelvin" && u !== "dB" && u !== "pixels" && u !== "fraction";
}

/**
 * A field judged by `problem` (null when the value is fine, else the message). Its failure does not
 * abort the parse, so the document-level graph rules are still checked and reported with it.
 */
export function checked<T>(problem: (v: unknown) => string | null) {
  return z.custom<T>((v) => problem(v) === null, { abort: false, error: (iss) => problem(iss.input) ?? "is not valid" });
}

/** A number field with its unit and limit; one message for every way it can be wrong. */
export function num(rule: NumberRule) {
  return checked<number>((v) => (v !== null && meetsRule(v, rule) ? null : numberMessage(rule, v)));
}

/** Like num, but null is a value with a meaning (rule.nullMeans). */
export function numOrNull(rule: NumberRule & { nullMeans: string }) {
  return checked<number | null>((v) => (meetsRule(v, rule) ? null : numberMessage(rule, v)));
}

// Common rules.
export const OHMS: NumberRule = { unit: "ohm", bound: "positive" };
export const FARADS: NumberRule = { unit: "farad", bound: "positive" };
export const VOLTS: NumberRule = { unit: "volt", bound: "any" };

/**
 * Names every plain JavaScript object already carries. An id or part key with one of these names would
 * confuse any code that keeps a lookup table in an ordinary object (and `__proto__` would replace the
 * table's prototype), so they are refused even though their characters are allowed.
 */
export const RESERVED_NAMES: ReadonlySet<string> = new Set(Object.getOwnPropertyNames(Object.prototype));

export const ID_RULE_TEXT = "1 to 32 characters of letters, digits, _ and -";
const ID_PATTERN = /^[A-Za-z0-9_-]{1,32}$/;

export function idProblem(v: unknown): string | null {
  if (v === undefined) return `is required: ${ID_RULE_TEXT}`;
  if (typeof v !== "string") return `must be text of ${ID_RULE_TEXT} (found ${describeFound(v)})`;
  if (!ID_PATTERN.test(v)) return `must be ${ID_RULE_TEXT} (found ${describeFound(v)})`;
  if (RESERVED_NAMES.has(v)) return `must not be "${v}", a name every JavaScript object already has; choose another`;
  return null;
}

/** A node id or part key. */
export const idField = checked<string>(idProblem);

/** Text of a bounded length; `nonBlank` also refuses text made only of spaces. */
export function text(what: string, min: number, max: number, nonBlank = false) {
  const rule = `${what} of ${min === 0 ? "up to" : `${min} to`} ${max} characters`;
  const problem = (v: unknown): string | null => {
    if (v === undefined) return `is required: ${rule}`;
    if (typeof v !== "string") return `must be ${rule} (found ${describeFound(v)})`;
    if (v.length < min || v.length > max) return `must be ${rule} (found ${v.length})`;
    if (nonBlank && v.trim() === "") return `must be ${rule}, not only spaces`;
    return null;
  };
  return checked<string>(problem);
}

/** One of a fixed set of words. */
export function oneOf<T extends string>(values: readonly T[]) {
  const list = values.map((v) => JSON.stringify(v)).join(", ");
  return checked<T>((v) => {
    if (typeof v === "string" && (values as readonly string[]).includes(v)) return null;
    return v === undefined ? `is required: one of ${list}` : `must be one of ${list} (found ${describeFound(v)})`;
  });
}
