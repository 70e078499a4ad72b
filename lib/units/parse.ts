/**
 * Reading engineering notation typed at the edges (inspector fields, CLI flags) into plain SI numbers.
 * The chain document itself only ever holds numbers; this module is the one place where text becomes a
 * quantity. The rules and the cases we refuse are listed in README.md beside this file.
 */

export type QuantityUnit =
  | "ohm"
  | "farad"
  | "volt"
  | "hertz"
  | "second"
  | "ampere"
  | "V/s"
  | "V/√Hz"
  | "A/√Hz"
  | "none";

export const QUANTITY_UNITS: readonly QuantityUnit[] = [
  "ohm",
  "farad",
  "volt",
  "hertz",
  "second",
  "ampere",
  "V/s",
  "V/√Hz",
  "A/√Hz",
  "none",
];

export interface ParseOptions {
  /** the unit the field expects; a different unit symbol in the text is refused */
  unit?: QuantityUnit;
}

export type ParseResult =
  | { ok: true; value: number; /** the unit written in the text, or null when none was written */ unit: QuantityUnit | null }
  | { ok: false; error: string };

/** Plain-word names of the units, for error messages. */
export const UNIT_WORDS: Record<QuantityUnit, string> = {
  ohm: "ohms",
  farad: "farads",
  volt: "volts",
  hertz: "hertz",
  second: "seconds",
  ampere: "amperes",
  "V/s": "volts per second",
  "V/√Hz": "volts per root hertz",
  "A/√Hz": "amperes per root hertz",
  none: "a plain ratio",
};

/** SI prefixes as powers of ten. Case matters, as in SI: m is milli, M is mega. */
export const SI_PREFIX_EXPONENT: Readonly<Record<string, number>> = {
  a: -18,
  f: -15,
  p: -12,
  n: -9,
  µ: -6,
  u: -6,
  m: -3,
  k: 3,
  M: 6,
  G: 9,
  T: 12,
};

interface UnitSpelling {
  unit: QuantityUnit;
  /** extra power of ten the spelling carries (V/µs is 1e6 V/s) */
  exponent: number;
}

/** Every unit spelling we read, exactly as written (case-sensitive). */
const UNIT_SPELLINGS: ReadonlyMap<string, UnitSpelling> = (() => {
  const m = new Map<string, UnitSpelling>();
  const add = (unit: QuantityUnit, exponent: number, ...spellings: string[]) => {
    for (const s of spellings) m.set(s, { unit, exponent });
  };
  add("ohm", 0, "Ω", "ohm", "ohms", "Ohm", "Ohms");
  add("farad", 0, "F");
  add("volt", 0, "V");
  add("hertz", 0, "Hz");
  add("second", 0, "s");
  add("ampere", 0, "A");
  add("V/s", 0, "V/s");
  add("V/s", 3, "V/ms");
  add("V/s", 6, "V/µs", "V/us");
  add("V/s", 9, "V/ns");
  for (const root of ["√Hz", "√(Hz)", "rtHz", "rt(Hz)", "sqrt(Hz)", "sqrtHz"]) {
    add("V/√Hz", 0, `V/${root}`);
    add("A/√Hz", 0, `A/${root}`);
  }
  return m;
})();

/**
 * Letters that stand for the decimal point in a letter code (IEC 60062: 4k7, 2R2, 4n7; common practice:
 * 3V3): the SI prefixes from pico up, K (kilo in resistor codes), and R and V for a multiplier of one.
 */
const CODE_LETTER_EXPONENT: Readonly<Record<string, number>> = {
  ...Object.fromEntries(Object.entries(SI_PREFIX_EXPONENT).filter(([, e]) => e >= -12)),
  K: 3,
  R: 0,
  V: 0,
};

const MAX_LENGTH = 64;

const fail = (error: string): ParseResult => ({ ok: false, error });

/**
 * Parse a quantity typed by a person: `4k7`, `10 kΩ`, `2.2uF`, `1.5 MHz`, `0.5 V/µs`, `15nV/rtHz`,
 * `1e-9`, `-5`. Returns the value in SI base units. Never throws.
 */
export function parseQuantity(text: unknown, opts: ParseOptions = {}): ParseResult {
  if (typeof text !== "string") return fail("expected text such as 4.7k");
  const expected = opts.unit;
  if (expected !== undefined && !QUANTITY_UNITS.includes(expected)) return fail(`unknown unit "${String(expected)}"`);
  if (text.length > MAX_LENGTH) return fail(`too long (over ${MAX_LENGTH} characters)`);
  const s = normalise(text);
  if (s === "") return fail("empty: type a number such as 4.7k");
  if (s.includes(",")) {
    return fail("a comma could be a decimal mark or a thousands separator; write a point for decimals (1.5k) and no separators");
  }
  const code = parseLetterCode(s, expected);
  if (code) return code;
  return parsePlain(s, expected);
}

function normalise(text: string): string {
  return text
    .replace(/[\u00a0\u2009\u202f]/g, " ") // no-break and thin spaces
    .replace(/\u2212/g, "-") // typographic minus
    .replace(/\u2126/g, "Ω") // ohm sign → Greek capital omega
    .replace(/\u03bc/g, "µ") // Greek mu → micro sign
    .trim();
}

/** `4k7`, `R47`, `2R2`, `1M5`, `4n7`, `3V3`, optionally followed by a unit symbol: `4k7Ω`, `4n7 F`. */
function parseLetterCode(s: string, expected: QuantityUnit | undefined): ParseResult | null {
  const m = /^([+-]?)(\d*)([RVpnµumkKMGT])(\d+)(.*)$/.exec(s);
  if (!m) {
    // `10R` (ten ohms) and `3V` (plain volts) have nothing after the letter; `10R` is handled here.
    const r = /^([+-]?)(\d+)R$/.exec(s);
    if (!r) return null;
    return finish(`${r[1]}${r[2]}`, 0, "ohm", s, expected);
  }
  const [, sign, whole, letter, frac, rest] = m;
  if (whole === "" && letter !== "R" && !(letter in SI_PREFIX_EXPONENT)) return null;
  const tail = rest.trim();
  if (/^[.eE\d]/.test(rest)) return fail(`"${s}": a letter code like 4k7 has digits only on both sides of its letter`);
  let unit: QuantityUnit | null = null;
  if (tail !== "") {
    const spelled = UNIT_SPELLINGS.get(tail);
    if (!spelled || spelled.exponent !== 0) {
      if (tail[0] in SI_PREFIX_EXPONENT || tail[0] === "K") {
        return fail(`"${s}": the letter ${letter} already sets the multiplier; a second prefix makes it ambiguous`);
      }
      return unknownUnit(tail, s);
    }
    unit = spelled.unit;
  }
  // The decimal-point letters R and V name their own unit.
  const implied = letter === "R" ? "ohm" : letter === "V" ? "volt" : null;
  if (implied) {
    if (unit !== null && unit !== implied) return fail(`"${s}": the letter ${letter} and the unit symbol disagree`);
    unit = implied;
  }
  if (letter === "K" && (unit ?? expected) !== "ohm") {
    return fail(`"${s}": K is not an SI prefix; write k for kilo (uppercase K is read as kilo only in resistor codes)`);
  }
  return finish(`${sign}${whole === "" ? "0" : whole}.${frac}`, CODE_LETTER_EXPONENT[letter], unit, s, expected);
}

/** A decimal number with optional exponent, then optionally one space, an SI prefix and a unit symbol. */
function parsePlain(s: string, expected: QuantityUnit | undefined): ParseResult {
  const m = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+))(?:[eE]([+-]?\d+))?( ?)(.*)$/.exec(s);
  if (!m) {
    if (/^[+-]?(?:inf|infinity|nan)$/i.test(s)) return fail("must be a finite number");
    if (/^[+-]?\d*\.\d*\./.test(s)) return fail(`"${s}" has more than one decimal point`);
    if (/^[+-]?\s*[A-Za-zµΩ√]/.test(s)) return fail(`"${s}" does not start with a number`);
    return fail(`"${s}" is not a number`);
  }
  const [, mantissa, exp, , suffix] = m;
  const exponent = exp === undefined ? 0 : Number(exp);
  if (/^\s/.test(suffix)) return fail(`"${s}": too many spaces`);
  if (suffix === "") return finish(mantissa, exponent, null, s, expected);
  if (/^[eE]/.test(suffix)) return fail(`"${s}": an exponent needs digits (1e-9)`);
  if (/^[.\d]/.test(suffix)) return fail(`"${s}" is not a number (a space or a second decimal point inside it?)`);
  if (/^[RVpnµumkKMGT]\d/.test(suffix)) {
    return fail(`"${s}": digits after a prefix; write a letter code as 4k7 (no point, no space) or a decimal as 4.7k`);
  }
  if (/\s/.test(suffix)) return fail(`"${s}": a space goes only between the number and its unit (10 kΩ)`);
  if (/^meg/i.test(suffix)) return fail(`"${s}": "meg" is not an SI prefix; write M for mega (10M) or m for milli`);
  const parsed = splitSuffix(suffix);
  if ("error" in parsed) return fail(`"${s}": ${parsed.error}`);
  if (exp !== undefined && parsed.prefix !== "") {
    return fail(`"${s}": write an exponent or a prefix, not both (1e3 or 1k)`);
  }
  if (parsed.prefix === "K" && (parsed.unit ?? expected) !== "ohm") {
    return fail(`"${s}": K is not an SI prefix; write k for kilo (uppercase K is read as kilo only for ohms)`);
  }
  const prefixExp = parsed.prefix === "" ? 0 : parsed.prefix === "K" ? 3 : SI_PREFIX_EXPONENT[parsed.prefix];
  return finish(mantissa, exponent + prefixExp + parsed.unitExponent, parsed.unit, s, expected);
}

function splitSuffix(suffix: string): { prefix: string; unit: QuantityUnit | null; unitExponent: number } | { error: string } {
  const whole = UNIT_SPELLINGS.get(suffix);
  if (whole) return { prefix: "", unit: whole.unit, unitExponent: whole.exponent };
  const first = suffix[0];
  const rest = suffix.slice(1);
  if (first in SI_PREFIX_EXPONENT || first === "K") {
    if (rest === "") return { prefix: first, unit: null, unitExponent: 0 };
    const spelled = UNIT_SPELLINGS.get(rest);
    if (spelled) return { prefix: first, unit: spelled.unit, unitExponent: spelled.exponent };
    if (rest[0] in SI_PREFIX_EXPONENT && (rest.length === 1 || UNIT_SPELLINGS.has(rest.slice(1)))) {
      return { error: `two prefixes in a row ("${first}${rest[0]}")` };
    }
    return { error: unknownUnitText(rest) };
  }
  return { error: unknownUnitText(suffix) };
}

function unknownUnitText(u: string): string {
  const lower = u.toLowerCase();
  if (/^[a-zµ]?hz$/i.test(u)) return `"${u}" is not a unit we read; write Hz (and mind the prefix: m is milli, M is mega)`;
  if (lower === "db") return "a decibel figure is not a quantity here; give a plain ratio (V/V)";
  if (lower === "v" || lower === "f" || lower === "a" || lower === "s") {
    return `"${u}" is not a unit we read (unit symbols are case-sensitive: V, F, A, s)`;
  }
  return `"${u}" is not a unit or prefix we read`;
}

function unknownUnit(u: string, s: string): ParseResult {
  return fail(`"${s}": ${unknownUnitText(u)}`);
}

/** Build the number from a decimal mantissa and a power of ten in one step, so `2.2u` is the double nearest 2.2e-6. */
function finish(
  mantissa: string,
  exponent: number,
  unit: QuantityUnit | null,
  original: string,
  expected: QuantityUnit | undefined,
): ParseResult {
  if (unit !== null && expected !== undefined && unit !== expected) {
    return fail(`"${original}" is in ${UNIT_WORDS[unit]}, but this field takes ${UNIT_WORDS[expected]}`);
  }
  const value = Number(`${mantissa}e${exponent}`);
  if (!Number.isFinite(value)) return fail(`"${original}" is too large`);
  if (value === 0 && /[1-9]/.test(mantissa)) return fail(`"${original}" is too small to represent`);
  return { ok: true, value: value === 0 ? 0 : value, unit };
}
