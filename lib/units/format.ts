/**
 * Writing SI numbers for people: `4.70 kΩ` in tables and readouts, `4.7k` on cards. Output of both forms
 * parses back with parseQuantity (same prefixes and unit symbols).
 */
import type { QuantityUnit } from "./parse";

/** The symbol written after the prefix; "none" writes only the prefix. */
export const UNIT_SYMBOLS: Record<QuantityUnit, string> = {
  ohm: "Ω",
  farad: "F",
  volt: "V",
  hertz: "Hz",
  second: "s",
  ampere: "A",
  "V/s": "V/s",
  "V/√Hz": "V/√Hz",
  "A/√Hz": "A/√Hz",
  none: "",
};

/** Prefixes used when writing, by power of ten (micro as the micro sign U+00B5). */
const WRITE_PREFIX: ReadonlyMap<number, string> = new Map([
  [-18, "a"],
  [-15, "f"],
  [-12, "p"],
  [-9, "n"],
  [-6, "µ"],
  [-3, "m"],
  [0, ""],
  [3, "k"],
  [6, "M"],
  [9, "G"],
  [12, "T"],
]);
const MIN_EXP = -18;
const MAX_EXP = 12;

interface Engineering {
  /** mantissa text with `digits` significant digits */
  mantissa: string;
  prefix: string;
}

/**
 * Split a finite non-zero value into a mantissa in [1, 1000) and an SI prefix. Rounding to `digits`
 * significant digits happens first (through toExponential, so 999.7 at three digits becomes 1.00 k, not
 * 1000) and the decimal point is then moved in the text, never by dividing, so no 4.699999 noise appears.
 * Outside the prefix range (below atto, above tera) the number is written with an exponent and no prefix.
 */
function engineering(value: number, digits: number): Engineering {
  const sci = value.toExponential(digits - 1); // e.g. "-4.70e+3"
  const m = /^(-?)(\d)(?:\.(\d+))?e([+-]\d+)$/.exec(sci)!;
  const [, sign, lead, frac = "", expText] = m;
  const exp10 = Number(expText);
  const exp3 = Math.floor(exp10 / 3) * 3;
  if (exp3 < MIN_EXP || exp3 > MAX_EXP) return { mantissa: sci.replace("e+", "e"), prefix: "" };
  const all = lead + frac;
  const intLen = exp10 - exp3 + 1; // 1 to 3 digits before the point
  const padded = all.padEnd(intLen, "0");
  const rest = padded.slice(intLen);
  return { mantissa: `${sign}${padded.slice(0, intLen)}${rest ? `.${rest}` : ""}`, prefix: WRITE_PREFIX.get(exp3)! };
}

function checkDigits(digits: number): number {
  if (!Number.isInteger(digits) || digits < 1 || digits > 17) throw new RangeError("digits must be an integer from 1 to 17");
  return digits;
}

/**
 * `formatQuantity(4700, "ohm")` → `"4.70 kΩ"`: SI prefix, `digits` significant digits (trailing zeros kept,
 * they say how precise the figure is), a space, then the unit symbol. Non-finite values give "—".
 */
export function formatQuantity(value: number, unit: QuantityUnit, digits = 3): string {
  checkDigits(digits);
  const symbol = UNIT_SYMBOLS[unit] ?? "";
  if (!Number.isFinite(value)) return "—";
  if (value === 0) return symbol ? `0 ${symbol}` : "0";
  const { mantissa, prefix } = engineering(value, digits);
  const tail = `${prefix}${symbol}`;
  return tail ? `${mantissa} ${tail}` : mantissa;
}

/**
 * Compact engineering form for cards: `4.7k`, `10n`, `2.2µ`, trailing zeros dropped and no space;
 * with `unit` the symbol follows directly (`4.7kΩ`). Non-finite values give "—".
 */
export function formatCompact(value: number, unit: QuantityUnit = "none", digits = 3): string {
  checkDigits(digits);
  const symbol = UNIT_SYMBOLS[unit] ?? "";
  if (!Number.isFinite(value)) return "—";
  if (value === 0) return `0${symbol}`;
  const { mantissa, prefix } = engineering(value, digits);
  const trimmed = mantissa.includes("e")
    ? mantissa
    : mantissa.includes(".")
      ? mantissa.replace(/0+$/, "").replace(/\.$/, "")
      : mantissa;
  return `${trimmed}${prefix}${symbol}`;
}
