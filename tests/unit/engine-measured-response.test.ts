import { describe, expect, it } from "vitest";
import { compareResponses, interpolateLogF, unwrapDegrees, wrapDegrees } from "@/lib/engine/measured-response";

/** n points per decade from f1 to f2, both ends included. */
const logGrid = (f1: number, f2: number, perDecade: number) => {
  const n = Math.round(Math.log10(f2 / f1) * perDecade) + 1;
  return Float64Array.from({ length: n }, (_, k) => f1 * 10 ** (k / perDecade));
};

// First-order low-pass H = 1/(1 + j·f/fc): |H| = −10·log10(1 + (f/fc)²) dB, phase −atan(f/fc)
// (derived from the first-order formula).
const FC = 1000;
const lpDb = (f: number) => -10 * Math.log10(1 + (f / FC) ** 2);
const lpDeg = (f: number) => (-Math.atan(f / FC) * 180) / Math.PI;

describe("wrapDegrees", () => {
  it("maps onto (−180, 180]", () => {
    expect(wrapDegrees(180)).toBe(180);
    expect(wrapDegrees(-180)).toBe(180);
    expect(wrapDegrees(190)).toBeCloseTo(-170, 12);
    expect(wrapDegrees(-190)).toBeCloseTo(170, 12);
    expect(wrapDegrees(725)).toBeCloseTo(5, 12);
    expect(wrapDegrees(Infinity)).toBeNaN();
  });
});

describe("unwrapDegrees", () => {
  it("removes the jumps of a wrapped phase and keeps gaps as NaN", () => {
    const u = unwrapDegrees([-170, 175, 160, NaN, 140, 100]);
    expect(Array.from(u.subarray(0, 3))).toEqual([-170, -185, -200]);
    expect(u[3]).toBeNaN();
    expect(u[4]).toBe(-220);
    expect(u[5]).toBe(-260);
  });
});

describe("interpolateLogF", () => {
  it("is exact for a straight line in log f and at grid points, NaN outside", () => {
    // y = 20·log10(f): a slope of 20 dB per decade, linear in log f, so interpolation has no error
    const f = [10, 100, 1000];
    const y = f.map((x) => 20 * Math.log10(x));
    expect(interpolateLogF(f, y, Math.sqrt(10 * 100))).toBeCloseTo(30, 12);
    expect(interpolateLogF(f, y, 500)).toBeCloseTo(20 * Math.log10(500), 12);
    expect(interpolateLogF(f, y, 100)).toBe(40);
    expect(interpolateLogF(f, y, 1000)).toBe(60);
    expect(interpolateLogF(f, y, 9.99)).toBeNaN();
    expect(interpolateLogF(f, y, 1001)).toBeNaN();
    expect(interpolateLogF(f, y, 0)).toBeNaN();
  });

  it("interpolates in log f, not in f", () => {
    // halfway in log between 10 and 1000 is 100; halfway in f would be 505
    expect(interpolateLogF([10, 1000], [0, 1], 100)).toBeCloseTo(0.5, 12);
  });

  it("gives NaN next to a non-finite grid value (a flagged pole)", () => {
    expect(interpolateLogF([1, 10, 100], [0, NaN, 0], 3)).toBeNaN();
    expect(interpolateLogF([1, 10, 100], [0, NaN, 0], 30)).toBeNaN();
    expect(interpolateLogF([1, 10, 100], [5, NaN, 0], 1)).toBe(5);
  });
});

describe("compareResponses", () => {
  const grid = logGrid(1, 1e5, 100);
  const computed = { f: grid, db: Array.from(grid, lpDb), ph: Array.from(grid, lpDeg) };

  it("recovers a known difference: +0.5 dB gain and a 20 µs delay", () => {
    // measured = computed × 10^(0.5/20) × e^(−j2πfτ): the difference is +0.5 dB and −360·f·τ degrees
    // (a pure delay's phase, derived from e^(−jωτ)); measured at frequencies off the computed grid,
    // with the measured phase wrapped as an instrument reports it
    const tau = 20e-6;
    const mf = logGrid(3.7, 7.3e4, 7);
    const measured = {
      f: mf,
      db: Array.from(mf, (x) => lpDb(x) + 0.5),
      ph: Array.from(mf, (x) => wrapDegrees(lpDeg(x) - 360 * x * tau)),
    };
    const d = compareResponses(measured, computed);
    expect(d.compared).toBe(mf.length);
    expect(d.outside).toBe(0);
    // the interpolation bound h²/8·max|y''| (h = 0.01 decade): about 3e-4 dB and 1.5e-3° for this corner
    for (let k = 0; k < mf.length; k++) {
      expect(d.diffDb[k]).toBeCloseTo(0.5, 3);
      expect(Math.abs(wrapDegrees(d.diffDeg[k] + 360 * mf[k] * tau))).toBeLessThan(5e-3);
      expect(d.computedDb[k]).toBeCloseTo(lpDb(mf[k]), 3);
    }
    expect(d.rmsDb).toBeCloseTo(0.5, 3);
    // the largest phase difference by size is the wrapped delay phase nearest ±180° (near 25 kHz)
    const largest = Math.max(...Array.from(mf, (x) => Math.abs(wrapDegrees(-360 * x * tau))));
    expect(Math.abs(d.worstDeg!.value)).toBeCloseTo(largest, 2);
    expect(d.worstDeg!.f).toBeGreaterThan(2e4);
    expect(d.worstDeg!.f).toBeLessThan(3e4);
  });

  it("reads the computed phase across its wrap near ±180°, not through 0°", () => {
    // a grid whose phase goes from −170° to −190°, reported wrapped as −170° and +170°
    const c = { f: [100, 400], db: [0, 0], ph: [-170, 170] };
    const d = compareResponses({ f: [200], db: [0], ph: [180] }, c);
    expect(d.computedDeg[0]).toBeCloseTo(180, 9);
    expect(d.diffDeg[0]).toBeCloseTo(0, 9);
  });

  it("leaves measured points outside the computed grid uncompared and counts them", () => {
    const d = compareResponses({ f: [0.5, 10, 2e5], db: [0, 0, 0], ph: [0, 0, 0] }, computed);
    expect(d.outside).toBe(2);
    expect(d.compared).toBe(1);
    expect(d.diffDb[0]).toBeNaN();
    expect(d.diffDb[2]).toBeNaN();
    expect(d.diffDb[1]).toBeCloseTo(-lpDb(10), 3);
    expect(d.worstDb!.f).toBe(10);
  });

  it("has no figures when nothing overlaps", () => {
    const d = compareResponses({ f: [2e5], db: [0], ph: [0] }, computed);
    expect(d.compared).toBe(0);
    expect(d.rmsDb).toBeNaN();
    expect(d.worstDb).toBeNull();
  });
});
