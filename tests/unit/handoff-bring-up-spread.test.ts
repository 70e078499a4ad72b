/**
 * Tolerance spread at the bring-up test points: Monte Carlo ranges stay inside the worst-case corners
 * worked by hand and come close to them, are reproducible from the seed, and collapse with zero tolerance.
 */
import { describe, expect, it } from "vitest";
import type { Chain } from "@/lib/chain/types";
import { analyzeChain } from "@/lib/engine";
import { chainWithFactors, mulberry32, spreadParts } from "@/lib/engine/spread";
import { buildBringUpSheet, defaultTestFrequencies } from "@/lib/handoff/bring-up";
import { bringUpSpread, withSpread } from "@/lib/handoff/bring-up-spread";
import { demo } from "./handoff-support";

describe("bringUpSpread", () => {
  it("AC at the hull's charge amplifier stays between the corners of −s·rf/(1 + s·rf·cf) and nears them", () => {
    const { hull } = demo();
    const f = 2;
    const sheet = buildBringUpSheet(hull, analyzeChain(hull), [f]);
    const s = bringUpSpread(hull, sheet, 400, 7);
    const r = s.points.find((p) => p.nodeId === "ca")!.amplitude[0]!;
    // |H| = ω·rf/√(1 + (ω·rf·cf)²) per coulomb (the charge amplifier's closed form) rises with rf and falls
    // with cf, so the corners are rf (1 ∓ 1 %) with cf (1 ± 5 %). The op-amp's finite gain moves |H| by
    // about 1e-5 of itself, hence the small allowance.
    const { rf, cf } = hull.nodes.find((n) => n.id === "ca")!.params as { rf: number; cf: number };
    const q = (hull.nodes[0].params as { amplitude: number }).amplitude;
    const w = 2 * Math.PI * f;
    const amp = (kr: number, kc: number) => (q * w * rf * kr) / Math.hypot(1, w * rf * kr * cf * kc);
    const lo = amp(0.99, 1.05);
    const hi = amp(1.01, 0.95);
    expect(r.min).toBeGreaterThanOrEqual(lo * (1 - 1e-4));
    expect(r.max).toBeLessThanOrEqual(hi * (1 + 1e-4));
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

  it("the TIA's DC nominal moves with rf within its corners", () => {
    const { turbidity } = demo();
    const sheet = buildBringUpSheet(turbidity, analyzeChain(turbidity), []);
    const r = bringUpSpread(turbidity, sheet, 400, 11).points.find((p) => p.nodeId === "tia")!.dcNominal!;
    // −rf·(light + dark current) (the transimpedance formula, vref 0): most negative at rf + 1 %; the
    // part's finite gain moves it by about 1e-6 of itself
    const pd = turbidity.nodes.find((n) => n.id === "pd")!.params as { dc: number; darkCurrent: number };
    const rf = (turbidity.nodes.find((n) => n.id === "tia")!.params as { rf: number }).rf;
    const most = -rf * 1.01 * (pd.dc + pd.darkCurrent);
    const least = -rf * 0.99 * (pd.dc + pd.darkCurrent);
    expect(r.min).toBeGreaterThan(most - 1e-4);
    expect(r.max).toBeLessThan(least + 1e-4);
    expect(r.max - r.min).toBeGreaterThan(0.7 * (least - most));
  });
});

/**
 * The spread the sheet, its CSV and its table carry, replayed build by build through the engine's own
 * entry points: the parts and draws of lib/engine/spread.ts (spreadParts, mulberry32, δ = t·(2u − 1) in
 * part order, as its uniform draw), each build analysed whole by analyzeChain and put on a sheet by
 * buildBringUpSheet, and the ranges joined here. Expectations come from the engine on whatever the demo
 * chains are, not from pinned numbers.
 */
function replay(chain: Chain, frequencies: number[], trials: number, seed: number) {
  const parts = spreadParts(chain);
  const rng = mulberry32(seed);
  const sheets = Array.from({ length: trials }, () => {
    const factor = parts.map((p) => 1 + p.tolerance * (2 * rng() - 1));
    const build = chainWithFactors(chain, parts, factor);
    return buildBringUpSheet(build, analyzeChain(build), frequencies);
  });
  const join = (values: (number | null)[]) => (values.some((x) => x === null) ? null : { min: Math.min(...(values as number[])), max: Math.max(...(values as number[])) });
  return sheets[0].points.map((tp, j) => ({
    nodeId: tp.nodeId,
    dcNominal: join(sheets.map((s) => s.points[j].dcNominal)),
    dcInterval: sheets.some((s) => !s.points[j].dcInterval) ? null : join(sheets.flatMap((s) => [s.points[j].dcInterval!.min, s.points[j].dcInterval!.max])),
    amplitude: frequencies.map((_, k) => join(sheets.map((s) => s.points[j].ac[k].amplitude))),
  }));
}

const near = (a: { min: number; max: number } | null, b: { min: number; max: number } | null) => {
  expect(a === null).toBe(b === null);
  if (!a || !b) return;
  const tol = 1e-9 * Math.max(1, Math.abs(b.min), Math.abs(b.max));
  expect(Math.abs(a.min - b.min)).toBeLessThanOrEqual(tol);
  expect(Math.abs(a.max - b.max)).toBeLessThanOrEqual(tol);
};

describe("withSpread: the sheet's spread against the engine, build by build", () => {
  const TRIALS = 30;
  for (const name of ["hull", "ballast", "turbidity"] as const) {
    it(`${name}: DC nominal, DC reading and AC amplitude ranges equal the engine's builds joined`, () => {
      const chain = demo()[name];
      const freqs = defaultTestFrequencies(chain);
      const sheet = withSpread(chain, buildBringUpSheet(chain, analyzeChain(chain), freqs), TRIALS, 5);
      const spread = sheet.spread!;
      expect(spread).toMatchObject({ trials: TRIALS, seed: 5, distribution: "uniform", parts: spreadParts(chain).length });
      const expected = replay(chain, freqs, TRIALS, 5);
      expect(spread.points.map((p) => p.nodeId)).toEqual(sheet.points.map((p) => p.nodeId));
      spread.points.forEach((p, j) => {
        near(p.dcNominal, expected[j].dcNominal);
        near(p.dcInterval, expected[j].dcInterval);
        p.amplitude.forEach((a, k) => near(a, expected[j].amplitude[k]));
        // the joined reading holds every build's nominal, and the nominal sheet's own interval lies in it
        if (p.dcInterval && p.dcNominal) {
          expect(p.dcInterval.min).toBeLessThanOrEqual(p.dcNominal.min);
          expect(p.dcInterval.max).toBeGreaterThanOrEqual(p.dcNominal.max);
        }
      });
    });
  }

  it("states the chain's tolerances and counts the parts that have their own", () => {
    const { turbidity } = demo();
    const chain = structuredClone(turbidity);
    const [first] = spreadParts(chain);
    chain.tolerances = { resistor: 0.02, capacitor: 0.1, overrides: { [first.key]: 0.001 } };
    const s = bringUpSpread(chain, buildBringUpSheet(chain, analyzeChain(chain), [10]), 5, 1);
    expect(s.tolerances).toEqual({ resistor: 0.02, capacitor: 0.1, overrides: 1 });
    expect(() => bringUpSpread(chain, buildBringUpSheet(chain, analyzeChain(chain), [10]), 0, 1)).toThrow(/trials/);
  });
});
