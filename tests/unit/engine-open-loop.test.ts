import { describe, expect, it } from "vitest";
import { openLoop } from "@/lib/engine/open-loop";
import { limitAtZero, mul, poly, ratioAt } from "@/lib/engine/poly";

/** A(jω) = n/d for the polynomials openLoop returns. */
const gainAt = (part: Parameters<typeof openLoop>[0], f: number) => {
  const ol = openLoop(part);
  const [re, im] = ratioAt(ol.n, ol.d, 2 * Math.PI * f);
  return { re, im, ol };
};

describe("openLoop", () => {
  it("is the single-pole model aol/(1 + s·aol/(2π·gbw)) with both figures (references.md §4)", () => {
    // A0 = 1e5, GBW = 1 MHz → fa = 10 Hz: |A(10 Hz)| = A0/√2, |A(1 MHz)| ≈ 1
    const a = gainAt({ aol: 1e5, gbw: 1e6 }, 10);
    expect(Math.hypot(a.re, a.im)).toBeCloseTo(1e5 / Math.SQRT2, 6);
    expect((Math.atan2(a.im, a.re) * 180) / Math.PI).toBeCloseTo(-45, 10);
    const b = gainAt({ aol: 1e5, gbw: 1e6 }, 1e6);
    expect(Math.hypot(b.re, b.im)).toBeCloseTo(1e5 / Math.sqrt(1 + 1e10), 12);
  });
  it("is 2π·gbw/s with gbw only and flat with aol only", () => {
    const a = gainAt({ gbw: 1e6 }, 1000);
    expect(a.re).toBeCloseTo(0, 9);
    expect(a.im).toBeCloseTo(-1000, 9);
    const b = gainAt({ aol: 5e4 }, 1e6);
    expect(b.re).toBe(5e4);
    expect(b.im).toBe(0);
  });
  it("is ideal (d ≡ 0) without figures, and zero gain for a figure of 0", () => {
    const ideal = openLoop(undefined);
    expect(ideal.ideal).toBe(true);
    expect(Array.from(ideal.d)).toEqual([0]);
    const zero = openLoop({ gbw: 0, aol: 1e5 });
    expect(zero.degenerate).toBe(true);
    expect(Array.from(zero.n)).toEqual([0]);
  });
});

describe("limitAtZero", () => {
  it("cancels common powers of s exactly", () => {
    // ideal integrator input admittance s·c/(s·c·r) → 1/r
    expect(limitAtZero(poly(0, 1e-8), poly(0, 1e-8 * 1e4))).toBeCloseTo(1e-4, 18);
  });
  it("reports a pole at s = 0 as an infinity with the right sign", () => {
    expect(limitAtZero(poly(-1), poly(0, 1e-4))).toBe(-Infinity);
    expect(limitAtZero(poly(2), mul(poly(0, 1), poly(3)))).toBe(Infinity);
  });
  it("is the plain ratio when the denominator is not zero at s = 0", () => {
    expect(limitAtZero(poly(3, 1), poly(4, 5))).toBe(0.75);
    expect(limitAtZero(poly(0), poly(0, 1))).toBe(0);
  });
});
