import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { formatCompact, formatQuantity, parseQuantity, QUANTITY_UNITS } from "@/lib/units";

describe("formatQuantity", () => {
  it("writes an SI prefix, the chosen significant digits and the unit symbol", () => {
    expect(formatQuantity(4700, "ohm")).toBe("4.70 kΩ");
    expect(formatQuantity(1e-8, "farad")).toBe("10.0 nF");
    expect(formatQuantity(2.2e-6, "farad")).toBe("2.20 µF");
    expect(formatQuantity(159.15, "hertz")).toBe("159 Hz");
    expect(formatQuantity(1.5e-8, "V/√Hz")).toBe("15.0 nV/√Hz");
    expect(formatQuantity(5e5, "V/s")).toBe("500 kV/s");
    expect(formatQuantity(-4.096, "volt")).toBe("-4.10 V");
    expect(formatQuantity(-4.096, "volt", 4)).toBe("-4.096 V");
    expect(formatQuantity(0.1, "hertz")).toBe("100 mHz");
    expect(formatQuantity(1e5, "none")).toBe("100 k");
    expect(formatQuantity(12, "none")).toBe("12.0");
  });

  it("carries a rounding overflow into the next prefix", () => {
    expect(formatQuantity(999.7, "ohm")).toBe("1.00 kΩ");
    expect(formatQuantity(999_999, "hertz", 3)).toBe("1.00 MHz");
    expect(formatQuantity(0.99999, "volt", 2)).toBe("1.0 V");
  });

  it("writes zero, non-finite values and values beyond the prefixes plainly", () => {
    expect(formatQuantity(0, "volt")).toBe("0 V");
    expect(formatQuantity(Number.NaN, "volt")).toBe("—");
    expect(formatQuantity(Number.POSITIVE_INFINITY, "ohm")).toBe("—");
    expect(formatQuantity(1e20, "ohm")).toBe("1.00e20 Ω");
    expect(formatQuantity(1e-20, "farad")).toBe("1.00e-20 F");
  });

  it("refuses a digit count outside 1 to 17", () => {
    expect(() => formatQuantity(1, "volt", 0)).toThrow(RangeError);
    expect(() => formatQuantity(1, "volt", 18)).toThrow(RangeError);
  });
});

describe("formatCompact", () => {
  it("writes the card form without trailing zeros or space", () => {
    expect(formatCompact(4700)).toBe("4.7k");
    expect(formatCompact(1e-8)).toBe("10n");
    expect(formatCompact(2.2e-6)).toBe("2.2µ");
    expect(formatCompact(100e3)).toBe("100k");
    expect(formatCompact(4700, "ohm")).toBe("4.7kΩ");
    expect(formatCompact(0)).toBe("0");
    expect(formatCompact(Number.NaN)).toBe("—");
  });
});

describe("formatQuantity with parseQuantity (round trip, property)", () => {
  const finite = fc.double({ min: -1e15, max: 1e15, noNaN: true, noDefaultInfinity: true });
  const tiny = fc.double({ min: 1e-19, max: 1e-3, noNaN: true });
  const units = fc.constantFrom(...QUANTITY_UNITS);

  it("parses what it writes back to the value within the rounding of the digits", () => {
    fc.assert(
      fc.property(fc.oneof(finite, tiny), units, fc.integer({ min: 1, max: 15 }), (x, unit, digits) => {
        const r = parseQuantity(formatQuantity(x, unit, digits), { unit });
        expect(r.ok).toBe(true);
        if (!r.ok) return;
        // Rounding to d significant digits moves a value by at most half a unit in the d-th digit.
        const tol = Math.abs(x) * 0.5 * 10 ** (1 - digits) * (1 + 1e-9) + 1e-300;
        expect(Math.abs(r.value - x)).toBeLessThanOrEqual(tol);
      }),
      { numRuns: 3000 },
    );
  });

  it("is exact at 17 digits, and the compact form parses back too", () => {
    fc.assert(
      fc.property(fc.oneof(finite, tiny), units, (x, unit) => {
        const r = parseQuantity(formatQuantity(x, unit, 17), { unit });
        expect(r.ok && r.value).toBe(x === 0 ? 0 : x);
        const c = parseQuantity(formatCompact(x, unit), { unit });
        expect(c.ok).toBe(true);
      }),
      { numRuns: 2000 },
    );
  });
});
