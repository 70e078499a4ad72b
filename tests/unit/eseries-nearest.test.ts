/**
 * E-series checks. Tables: IEC 60063:2015 (E6–E24 in its Table 1, E48–E96 in Table 2), as transcribed in
 * references.md §14. Vectors, structural facts and tie cases: references.md §14, marked [DERIVED] there
 * (nearest = smallest |ln(x/v)| over the neighbouring decades).
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { E_SERIES, E_SERIES_NAMES, nearestPreferred, neighbours, type ESeries } from "@/lib/units";

const round2 = (x: number) => Math.round(x * 100) / 100;

describe("E_SERIES tables (IEC 60063)", () => {
  it("has the published lengths", () => {
    expect(E_SERIES.E6).toHaveLength(6);
    expect(E_SERIES.E12).toHaveLength(12);
    expect(E_SERIES.E24).toHaveLength(24);
    expect(E_SERIES.E48).toHaveLength(48);
    expect(E_SERIES.E96).toHaveLength(96);
  });

  it("nests: E12 is every 2nd E24 value, E6 every 4th; E48 is every 2nd E96 value (IEC 60063)", () => {
    expect(E_SERIES.E12).toEqual(E_SERIES.E24.filter((_, i) => i % 2 === 0));
    expect(E_SERIES.E6).toEqual(E_SERIES.E24.filter((_, i) => i % 4 === 0));
    expect(E_SERIES.E48).toEqual(E_SERIES.E96.filter((_, i) => i % 2 === 0));
  });

  it("E96 is round(10^(i/96), 2) with no exception (derived, references.md §14)", () => {
    E_SERIES.E96.forEach((v, i) => expect(v).toBe(round2(10 ** (i / 96))));
  });

  it("E24 keeps its historical values where the rounded geometric series differs (IEC 60063; derived)", () => {
    const geometric = Array.from({ length: 24 }, (_, i) => Math.round(10 ** (i / 24) * 10) / 10);
    const differs = E_SERIES.E24.map((v, i) => (v !== geometric[i] ? i : -1)).filter((i) => i >= 0);
    expect(differs).toEqual([10, 11, 12, 13, 14, 15, 16, 22]);
    expect([2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2].every((v) => E_SERIES.E24.includes(v))).toBe(true);
  });

  it("largest adjacent ratios 1.5, 1.25, 1.1538, 1.0533, 1.0301 (derived, references.md §14)", () => {
    const expected: Record<ESeries, number> = { E6: 1.5, E12: 1.25, E24: 1.1538, E48: 1.0533, E96: 1.0301 };
    for (const s of E_SERIES_NAMES) {
      const t = [...E_SERIES[s], 10];
      const max = Math.max(...t.slice(1).map((v, i) => v / t[i]));
      expect(max).toBeCloseTo(expected[s], 4);
    }
  });
});

describe("nearestPreferred", () => {
  // references.md §14, nearest-value vectors [DERIVED].
  const vectors: [number, number[]][] = [
    [4800, [4700, 4700, 4700, 4870, 4750]],
    [1563, [1500, 1500, 1600, 1540, 1580]],
    [9.9, [10, 10, 10, 10, 10]],
    [9.6, [10, 10, 10, 9.53, 9.53]],
    [0.0475, [0.047, 0.047, 0.047, 0.0464, 0.0475]],
    [33, [33, 33, 33, 33.2, 33.2]],
    [2.65, [2.2, 2.7, 2.7, 2.61, 2.67]],
    [7200, [6800, 6800, 7500, 7150, 7150]],
    [15915.49, [15000, 15000, 16000, 16200, 15800]],
    [6.5e-9, [6.8e-9, 6.8e-9, 6.8e-9, 6.49e-9, 6.49e-9]],
  ];
  for (const [x, want] of vectors) {
    it(`${x} → E6…E96 ${want.join(", ")} (references.md §14, derived)`, () => {
      E_SERIES_NAMES.forEach((s, i) => expect(nearestPreferred(x, s)).toBeCloseTo(want[i], 12 - Math.floor(Math.log10(want[i]))));
    });
  }

  it("returns exactly the decimal value (4.7 × 10³ is 4700, not 4700.000000000001)", () => {
    expect(nearestPreferred(4800, "E12")).toBe(4700);
    expect(nearestPreferred(0.0475, "E96")).toBe(0.0475);
    expect(nearestPreferred(6.5e-9, "E6")).toBe(6.8e-9);
  });

  it("breaks the linear-distance ties by ratio: 1.58, 3.09, 6.8, 5.1 (references.md §14, derived)", () => {
    expect(nearestPreferred(1.56, "E96")).toBe(1.58);
    expect(nearestPreferred(3.05, "E96")).toBe(3.09);
    expect(nearestPreferred(6.5, "E24")).toBe(6.8);
    expect(nearestPreferred(4.9, "E24")).toBe(5.1);
  });

  it("switches at the log midpoint √(4.7·5.1) = 4.8959 in E24 (derived)", () => {
    expect(nearestPreferred(4.895, "E24")).toBe(4.7);
    expect(nearestPreferred(4.897, "E24")).toBe(5.1);
  });

  it("rolls over decades in both directions", () => {
    expect(nearestPreferred(0.99, "E6")).toBe(1);
    expect(nearestPreferred(1.01, "E6")).toBe(1);
    expect(nearestPreferred(980, "E96")).toBe(976);
    expect(nearestPreferred(990, "E96")).toBe(1000);
  });

  it("refuses non-positive and non-finite values and unknown series", () => {
    expect(() => nearestPreferred(0, "E24")).toThrow(RangeError);
    expect(() => nearestPreferred(-1, "E24")).toThrow(RangeError);
    expect(() => nearestPreferred(Number.NaN, "E24")).toThrow(RangeError);
    expect(() => nearestPreferred(Number.POSITIVE_INFINITY, "E24")).toThrow(RangeError);
    expect(() => nearestPreferred(1, "E7" as ESeries)).toThrow(RangeError);
  });

  it("picks a value within the series' worst snapping error (√(max ratio) − 1) and it is one of the two neighbours (property)", () => {
    const worst: Record<ESeries, number> = { E6: 0.2247, E12: 0.118, E24: 0.0742, E48: 0.0263, E96: 0.0149 };
    fc.assert(
      fc.property(fc.double({ min: 1e-12, max: 1e12, noNaN: true }), fc.constantFrom(...E_SERIES_NAMES), (x, s) => {
        const v = nearestPreferred(x, s);
        expect(Math.abs(v / x - 1)).toBeLessThanOrEqual(worst[s] + 1e-4);
        const { below, above } = neighbours(x, s);
        expect(v === below || v === above).toBe(true);
      }),
      { numRuns: 2000 },
    );
  });
});

describe("neighbours", () => {
  it("gives the series values on either side", () => {
    expect(neighbours(4800, "E24")).toEqual({ below: 4700, above: 5100 });
    expect(neighbours(9.9, "E12")).toEqual({ below: 8.2, above: 10 });
    expect(neighbours(1.05, "E6")).toEqual({ below: 1, above: 1.5 });
    expect(neighbours(0.95, "E6")).toEqual({ below: 0.68, above: 1 });
  });

  it("gives the value itself on both sides when x is in the series", () => {
    expect(neighbours(4700, "E12")).toEqual({ below: 4700, above: 4700 });
    expect(neighbours(0.0475, "E96")).toEqual({ below: 0.0475, above: 0.0475 });
  });

  it("brackets x (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-12, max: 1e12, noNaN: true }), fc.constantFrom(...E_SERIES_NAMES), (x, s) => {
        const { below, above } = neighbours(x, s);
        expect(below).toBeLessThanOrEqual(x * (1 + 1e-12));
        expect(above).toBeGreaterThanOrEqual(x * (1 - 1e-12));
        expect(above / below).toBeLessThan(1.51);
      }),
      { numRuns: 2000 },
    );
  });
});
