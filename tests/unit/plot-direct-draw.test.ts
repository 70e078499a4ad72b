import { describe, expect, it } from "vitest";
import { linePath } from "@/components/plots/direct-draw";

describe("linePath", () => {
  const px = (v: number) => 100 * Math.log10(v); // a log axis: one decade per 100 px
  const py = (v: number) => 50 - v; // y grows downwards on screen

  it("maps every point through the axes and joins the run with line segments", () => {
    expect(linePath([1, 10, 100], [0, -20, -40], px, py)).toBe("M0,50L100,70L200,90");
  });

  it("starts a new subpath after a gap, whether null or not finite", () => {
    expect(linePath([1, 10, 100, 1000], [0, null, 10, 20], px, py)).toBe("M0,50M200,40L300,30");
    expect(linePath([1, 10, 100], [0, Number.NaN, 10], px, py)).toBe("M0,50M200,40");
    // an x the axis cannot place (log of a non-positive value) is a gap too
    expect(linePath([0, 10, 100], [1, 2, 3], (v) => (v > 0 ? px(v) : Number.NaN), py)).toBe("M100,48L200,47");
  });

  it("rounds to hundredths of a pixel and gives nothing for no drawable point", () => {
    expect(linePath([2], [1 / 3], px, py)).toBe("M30.1,49.67");
    expect(linePath([1, 2], [null, null], px, py)).toBe("");
  });
});
