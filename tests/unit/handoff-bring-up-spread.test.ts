/**
 * Tolerance spread at the bring-up test points: Monte Carlo ranges stay inside the worst-case corners
 * worked by hand and come close to them, are reproducible from the seed, and collapse with zero tolerance.
 */
import { describe, expect, it } from "vitest";
import { analyzeChain } from "@/lib/engine";
import { buildBringUpSheet } from "@/lib/handoff/bring-up";
import { bringUpSpread } from "@/lib/handoff/bring-up-spread";
import { demo } from "./handoff-support";

describe("bringUpSpread", () => {
  it("AC at the hull's coupling node stays between the corners of s·r·c/(1 + s·(r + rs)·c) and nears them", () => {
    const { hull } = demo();
    const f = 2;
    const sheet = buildBringUpSheet(hull, analyzeChain(hull), [f]);
    const s = bringUpSpread(hull, sheet, 400, 7);
    const r = s.points.find((p) => p.nodeId === "ac")!.amplitude[0]!;
    // |H| rises with r·c below the corner, so the corners are r·c at (1 − 1 %)(1 − 5 %) and (1 + 1 %)(1 + 5 %)
    const w = 2 * Math.PI * f;
    const amp = (rf: number, cf: number) => {
      const rr = 100e3 * rf;
      const cc = 1e-6 * cf;
      return (0.5 * w * rr * cc) / Math.hypot(1, w * (rr + 100) * cc);
    };
    const lo = amp(0.99, 0.95);
    const hi = amp(1.01, 1.05);
    expect(r.min).toBeGreaterThanOrEqual(lo - 1e-12);
    expect(r.max).toBeLessThanOrEqual(hi + 1e-12);
    expect(r.max - r.min).toBeGreaterThan(0.8 * (hi - lo));
    expect(s.parts).toBe(8);
  });

  it("is the same for the same seed and differs for another; zero tolerance gives the nominal only", () => {
    const { turbidity } = demo();
    const sheet = buildBringUpSheet(turbidity, analyzeChain(turbidity), [10]);
    expect(bringUpSpread(turbidity, sheet, 50, 3)).toEqual(bringUpSpread(turbidity, sheet, 50, 3));
    expect(bringUpSpread(turbidity, sheet, 50, 4)).not.toEqual(bringUpSpread(turbidity, sheet, 50, 3));
    const exact = structuredClone(turbidity);
    exact.tolerances = { ...exact.tolerances, resistor: 0, capacitor: 0 };
    const flat = bringUpSpread(exact, buildBringUpSheet(exact, analyzeChain(exact), [10]), 20, 1);
    flat.points.forEach((p, j) => {
      expect(p.dcNominal!.max - p.dcNominal!.min).toBe(0);
      expect(p.dcNominal!.min).toBeCloseTo(sheet.points[j].dcNominal!, 12);
      expect(p.amplitude[0]!.min).toBeCloseTo(sheet.points[j].ac[0].amplitude!, 12);
    });
  });

  it("the gain stage's DC nominal moves with r2/(r1 + rs) within its corners", () => {
    const { turbidity } = demo();
    const sheet = buildBringUpSheet(turbidity, analyzeChain(turbidity), []);
    const r = bringUpSpread(turbidity, sheet, 400, 11).points.find((p) => p.nodeId === "inv")!.dcNominal!;
    // −0.5·r2/(r1 + 1 kΩ): most negative at r2 high, r1 low (1 %); the part's finite gain moves it < 1e-4
    const most = (-0.5 * 20e3 * 1.01) / (10e3 * 0.99 + 1e3);
    const least = (-0.5 * 20e3 * 0.99) / (10e3 * 1.01 + 1e3);
    expect(r.min).toBeGreaterThan(most - 1e-4);
    expect(r.max).toBeLessThan(least + 1e-4);
    expect(r.max - r.min).toBeGreaterThan(0.7 * (least - most));
  });
});
