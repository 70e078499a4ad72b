import { describe, expect, it } from "vitest";
import { toMagnitudePhase } from "@/lib/engine";

describe("toMagnitudePhase", () => {
  it("gives 20·log10|H| and the phase wrapped to (−180, 180]", () => {
    const { magDb, phaseDeg } = toMagnitudePhase(Float64Array.of(-10, 0, 1, -1), Float64Array.of(-0, 1, -1, 0));
    expect(magDb[0]).toBeCloseTo(20, 12);
    expect(phaseDeg[0]).toBe(180); // −180 is folded onto +180
    expect(phaseDeg[1]).toBeCloseTo(90, 12);
    expect(magDb[2]).toBeCloseTo(10 * Math.log10(2), 12);
    expect(phaseDeg[2]).toBeCloseTo(-45, 12);
    expect(phaseDeg[3]).toBe(180);
  });
  it("marks zero and non-finite points with NaN", () => {
    const { magDb, phaseDeg } = toMagnitudePhase(Float64Array.of(0, Infinity, NaN), Float64Array.of(0, 0, 1));
    expect(Array.from(magDb).every(Number.isNaN)).toBe(true);
    expect(Array.from(phaseDeg).every(Number.isNaN)).toBe(true);
  });
});
