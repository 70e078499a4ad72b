/** Number formatting for warning messages only (results carry plain SI numbers). */

const PREFIXES: [number, string][] = [
  [1e9, "G"],
  [1e6, "M"],
  [1e3, "k"],
  [1, ""],
  [1e-3, "m"],
  [1e-6, "µ"],
  [1e-9, "n"],
  [1e-12, "p"],
  [1e-15, "f"],
];

/** `value` with an SI prefix and `digits` significant digits, e.g. si(0.0123, "V") → "12.3 mV". */
export function si(value: number, unit: string, digits = 3): string {
  if (!Number.isFinite(value)) return `${value} ${unit}`;
  if (value === 0) return `0 ${unit}`;
  const a = Math.abs(value);
  const [scale, prefix] = PREFIXES.find(([s]) => a >= s * 0.9995) ?? PREFIXES[PREFIXES.length - 1];
  const shown = Number((value / scale).toPrecision(digits));
  return `${shown} ${prefix}${unit}`;
}

export const db = (v: number) => `${v.toFixed(1)} dB`;
