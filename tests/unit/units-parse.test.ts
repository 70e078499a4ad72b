import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { parseQuantity, type QuantityUnit } from "@/lib/units";

/** The value of a parse that must succeed. */
function value(text: string, unit?: QuantityUnit): number {
  const r = parseQuantity(text, unit ? { unit } : {});
  if (!r.ok) throw new Error(`${text}: ${r.error}`);
  return r.value;
}

function error(text: string, unit?: QuantityUnit): string {
  const r = parseQuantity(text, unit ? { unit } : {});
  if (r.ok) throw new Error(`${text} parsed as ${r.value}, expected an error`);
  return r.error;
}

describe("parseQuantity", () => {
  it("reads SI prefixes case-sensitively, as SI defines them", () => {
    expect(value("1a")).toBe(1e-18);
    expect(value("1f")).toBe(1e-15);
    expect(value("2.2p")).toBe(2.2e-12);
    expect(value("10n")).toBe(1e-8);
    expect(value("2.2µ")).toBe(2.2e-6);
    expect(value("2.2μ")).toBe(2.2e-6); // Greek mu as well as the micro sign
    expect(value("2.2u")).toBe(2.2e-6);
    expect(value("1m")).toBe(1e-3);
    expect(value("1M")).toBe(1e6);
    expect(value("4.7k")).toBe(4700);
    expect(value("3G")).toBe(3e9);
    expect(value("1T")).toBe(1e12);
  });

  it("builds each value as the double nearest the decimal (no 2.2 × 1e-6 rounding noise)", () => {
    expect(value("2.2uF")).toBe(Number("2.2e-6"));
    expect(value("4.7n")).toBe(Number("4.7e-9"));
    expect(value("0.1")).toBe(0.1);
  });

  it("reads the IEC 60062 letter code", () => {
    expect(value("4k7")).toBe(4700);
    expect(value("2R2")).toBe(2.2);
    expect(value("1M5")).toBe(1.5e6);
    expect(value("4n7")).toBe(4.7e-9);
    expect(value("R47")).toBe(0.47);
    expect(value("10R")).toBe(10);
    expect(value("4k7Ω", "ohm")).toBe(4700);
    expect(value("4n7 F", "farad")).toBe(4.7e-9);
    expect(value("1m5F")).toBe(1.5e-3); // m is milli in a capacitor code too
  });

  it("reads the common 3V3 style for volts and ties R and V to their units", () => {
    expect(value("3V3", "volt")).toBe(3.3);
    expect(value("-2V5")).toBe(-2.5);
    expect(error("3V3", "ohm")).toMatch(/volts.*ohms/);
    expect(error("2R2", "volt")).toMatch(/ohms.*volts/);
    expect(error("2R2F")).toMatch(/disagree/);
  });

  it("accepts unit symbols and one space between number and unit", () => {
    expect(value("10 kΩ", "ohm")).toBe(1e4);
    expect(value("10 kΩ", "ohm")).toBe(1e4); // U+2126 ohm sign
    expect(value("10kohm", "ohm")).toBe(1e4);
    expect(value("10 ohms", "ohm")).toBe(10);
    expect(value("1.5 MHz", "hertz")).toBe(1.5e6);
    expect(value("1.5 mHz", "hertz")).toBe(1.5e-3);
    expect(value("2.2uF", "farad")).toBe(2.2e-6);
    expect(value("10 ms", "second")).toBe(0.01);
    expect(value("10 mA", "ampere")).toBe(0.01);
    expect(value("5 V", "volt")).toBe(5);
  });

  it("reads slew rates per second and per microsecond", () => {
    expect(value("0.5 V/µs", "V/s")).toBe(5e5);
    expect(value("0.5V/us", "V/s")).toBe(5e5);
    expect(value("13 V/ms", "V/s")).toBe(13e3);
    expect(value("500 kV/s", "V/s")).toBe(5e5);
    expect(value("2 V/ns", "V/s")).toBe(2e9);
  });

  it("reads noise densities with every spelling of root hertz", () => {
    expect(value("15 nV/√Hz", "V/√Hz")).toBe(1.5e-8);
    expect(value("15nV/rtHz", "V/√Hz")).toBe(1.5e-8);
    expect(value("15 nV/sqrt(Hz)", "V/√Hz")).toBe(1.5e-8);
    expect(value("1 fA/√Hz", "A/√Hz")).toBe(1e-15);
    expect(error("15 nV/√Hz", "A/√Hz")).toMatch(/volts per root hertz.*amperes per root hertz/);
  });

  it("reads plain numbers, signs and exponents", () => {
    expect(value("1e-9")).toBe(1e-9);
    expect(value("1E3")).toBe(1000);
    expect(value("-5")).toBe(-5);
    expect(value("+5")).toBe(5);
    expect(value("−5")).toBe(-5); // U+2212 minus sign
    expect(value(".5")).toBe(0.5);
    expect(value("5.")).toBe(5);
    expect(value("0")).toBe(0);
    expect(value("1e3 Hz", "hertz")).toBe(1000);
    expect(value("  42  ")).toBe(42);
  });

  it("refuses a unit that contradicts the expected one, naming both", () => {
    const e = error("10 kΩ", "farad");
    expect(e).toContain("ohms");
    expect(e).toContain("farads");
    expect(error("1 kHz", "volt")).toMatch(/hertz.*volts/);
    expect(error("2 V", "none")).toMatch(/volts.*plain ratio/);
  });

  it("refuses ambiguous text rather than guessing", () => {
    expect(error("1.5kk")).toMatch(/two prefixes/);
    expect(error("4k7k")).toMatch(/already sets the multiplier/);
    expect(error("1,5k")).toMatch(/comma/);
    expect(error("1,000")).toMatch(/comma/);
    expect(error("4.7k7")).toMatch(/letter code/);
    expect(error("4 k7")).toMatch(/letter code/);
    expect(error("1e3k")).toMatch(/exponent or a prefix/);
    expect(error("10 k Ω")).toMatch(/space/);
    expect(error("1.2.3")).toMatch(/not a number/);
  });

  it("refuses uppercase K except as the resistor code's kilo", () => {
    expect(value("10K", "ohm")).toBe(1e4);
    expect(value("4K7", "ohm")).toBe(4700);
    expect(value("10KΩ")).toBe(1e4);
    expect(error("10K")).toMatch(/K is not an SI prefix/);
    expect(error("10 KHz", "hertz")).toMatch(/K is not an SI prefix/);
    expect(error("4K7", "farad")).toMatch(/K is not an SI prefix/);
  });

  it("refuses meg and lowercase unit symbols whose prefix case cannot be trusted", () => {
    expect(error("10meg")).toMatch(/meg.*M for mega/);
    expect(error("10Meg", "ohm")).toMatch(/meg/);
    expect(error("1.5 mhz", "hertz")).toMatch(/write Hz/);
    expect(error("1.5 MHZ", "hertz")).toMatch(/write Hz/);
    expect(error("10 mv", "volt")).toMatch(/case-sensitive/);
  });

  it("refuses what is not a finite number", () => {
    expect(error("")).toMatch(/empty/);
    expect(error("   ")).toMatch(/empty/);
    expect(error("k")).toMatch(/does not start with a number/);
    expect(error("abc")).toMatch(/does not start with a number/);
    expect(error("Infinity")).toMatch(/finite/);
    expect(error("NaN")).toMatch(/finite/);
    expect(error("1e999")).toMatch(/too large/);
    expect(error("1e-999")).toMatch(/too small/);
    expect(error("2e")).toMatch(/exponent needs digits/);
    expect(error("0x10")).toMatch(/not a unit/);
    expect(error("1".repeat(100))).toMatch(/too long/);
    expect(parseQuantity(42 as unknown as string).ok).toBe(false);
    expect(parseQuantity("1", { unit: "furlong" as QuantityUnit }).ok).toBe(false);
  });

  it("reports the unit written in the text", () => {
    const r = parseQuantity("10 kΩ");
    expect(r.ok && r.unit).toBe("ohm");
    const plain = parseQuantity("10k");
    expect(plain.ok && plain.unit).toBe(null);
  });

  it("never throws on random text (property)", () => {
    const alphabet = fc.constantFrom(..."0123456789.,eE+-−kKmMµuμnpfaGTRVΩΩFHzsA/√rtq() \u00a0".split(""));
    fc.assert(
      fc.property(fc.oneof(fc.string(), fc.array(alphabet, { maxLength: 20 }).map((a) => a.join(""))), (s) => {
        const r = parseQuantity(s);
        if (r.ok) expect(Number.isFinite(r.value)).toBe(true);
        else expect(r.error.length).toBeGreaterThan(0);
      }),
      { numRuns: 3000 },
    );
  });
});
