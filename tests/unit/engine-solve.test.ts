import { describe, expect, it } from "vitest";
import { analyzeChain, compileChain } from "@/lib/engine";
import {
  SOLVED_PARAMS,
  SOLVE_TARGETS,
  figuresOf,
  sensitivities,
  solveStage,
  type SolvableKind,
  type SolveTargets,
  type SolvedParams,
} from "@/lib/engine/solve";
import { E_SERIES, type ESeries } from "@/lib/units";
import type { ChainNode } from "@/lib/chain/types";
import { line, rails, source } from "./engine-fixtures";

const DEFAULTS: Record<SolvableKind, Record<string, number | null>> = {
  inverting: { vref: 0 },
  noninverting: { vref: 0 },
  lossyIntegrator: { vref: 0 },
  integrator: { vref: 0 },
  rcLowpass: {},
  rcHighpass: { vbias: 0 },
  sallenKeyLowpass: { vref: 0 },
  mfbLowpass: { vref: 0 },
  sallenKeyHighpass: { vref: 0 },
  mfbHighpass: { vref: 0 },
};
const OPAMP = new Set<SolvableKind>(["inverting", "noninverting", "lossyIntegrator", "integrator", "sallenKeyLowpass", "mfbLowpass", "sallenKeyHighpass", "mfbHighpass"]);
const HIGHPASS = new Set<SolvableKind>(["rcHighpass", "sallenKeyHighpass", "mfbHighpass"]);

function stage(kind: SolvableKind, params: SolvedParams): ChainNode {
  const node = { id: "u1", kind, params: { ...DEFAULTS[kind], ...params } } as Record<string, unknown>;
  if (OPAMP.has(kind)) node.rails = rails();
  return node as unknown as ChainNode;
}

/**
 * The engine's own analysis of the stage in a chain (ideal op-amp): f0, q of its StageResult, and the
 * passband gain — dcGain, or for a high-pass |H| at 10⁴·f0 from the response (within 1e-8 of H(∞)).
 */
function analysed(kind: SolvableKind, params: SolvedParams) {
  const chain = line([source("src", { amplitude: 1e-3 }), stage(kind, params)]);
  const first = analyzeChain(chain, { noise: false }).paths[0].stages.find((s) => s.id === "u1")!;
  let gain = Math.abs(first.dcGain ?? NaN);
  if (HIGHPASS.has(kind)) {
    const r = analyzeChain(chain, { noise: false, freqs: [(first.f0 as number) * 1e4] });
    gain = 10 ** ((r.paths[0].response.magDb[0] as number) / 20);
  }
  return { ...first, gain };
}

function inSeries(v: number, series: ESeries): boolean {
  const m = v / 10 ** Math.floor(Math.log10(v) + 1e-12);
  return [...E_SERIES[series], 10].some((x) => Math.abs(x / m - 1) < 1e-9);
}

const CASES: [SolvableKind, SolveTargets][] = [
  ["inverting", { gain: 47, minInputImpedance: 10e3, series: "E96" }],
  ["noninverting", { gain: 11 }],
  ["lossyIntegrator", { gain: 10, f0: 2e3, tolerance: 0.03 }],
  ["integrator", { f0: 500 }],
  ["rcLowpass", { f0: 1234 }],
  ["rcHighpass", { f0: 2, maxCapacitance: 4.7e-6 }],
  ["sallenKeyLowpass", { f0: 1000, q: Math.SQRT1_2 }],
  ["mfbLowpass", { gain: 10, f0: 1000, q: Math.SQRT1_2, minInputImpedance: 5e3 }],
  ["sallenKeyLowpass", { gain: 3 - Math.SQRT2, f0: 2e3, q: Math.SQRT1_2 }],
  ["sallenKeyHighpass", { f0: 100, q: Math.SQRT1_2 }],
  ["sallenKeyHighpass", { gain: 2, f0: 50, q: 1.2, series: "E96" }],
  ["mfbHighpass", { gain: 2, f0: 300, q: Math.SQRT1_2, capacitorSeries: "E24" }],
];

describe("solveStage: every solved set, re-analysed by the engine, meets its targets", () => {
  for (const [kind, targets] of CASES) {
    it(`${kind} ${JSON.stringify(targets)}`, () => {
      const res = solveStage(kind, targets);
      expect(res.problem).toBeNull();
      expect(res.sets.length).toBeGreaterThan(0);
      const tol = targets.tolerance ?? 0.02;
      for (const set of res.sets) {
        // standard values only
        for (const k of SOLVED_PARAMS[kind]) {
          const v = set.params[k];
          if (v == null) continue;
          expect(inSeries(v, k.startsWith("c") ? (targets.capacitorSeries ?? "E12") : (targets.series ?? "E24"))).toBe(true);
        }
        // independent re-analysis: analyzeChain's StageResult, not the solver's own figures
        const st = analysed(kind, set.params);
        for (const y of SOLVE_TARGETS[kind]) {
          const got = y === "gain" ? st.gain : y === "f0" ? st.f0 : st.q;
          const want = targets[y] ?? 1; // a Sallen-Key's gain left out means 1
          expect(Math.abs((got as number) / want - 1)).toBeLessThanOrEqual(tol + 1e-12);
          expect((got as number) / want - 1).toBeCloseTo(set.errors[y] as number, 7);
        }
        if (targets.minInputImpedance) expect(set.achieved.inputImpedance!).toBeGreaterThanOrEqual(targets.minInputImpedance);
      }
    });
  }
});

describe("solveStage: hand-worked sets", () => {
  it("inverting ×10 with a 10 kΩ floor, E24: r1 = 10 kΩ, r2 = 100 kΩ first", () => {
    // By hand: r1 ≥ 10 kΩ; r2 = 10·r1 is exact for every E24 r1 (the series repeats per decade), so all
    // exact sets tie on error and sensitivity (S_r2 = +1, S_r1 = −1); the smallest largest resistor wins:
    // r1 = 10 kΩ, r2 = 100 kΩ.
    const res = solveStage("inverting", { gain: 10, minInputImpedance: 10e3 });
    expect(res.sets[0].params).toEqual({ r1: 10e3, r2: 100e3 });
    expect(res.sets[0].errors.gain).toBe(0);
    expect(res.sets[0].sensitivity.gain).toEqual({ r1: expect.closeTo(-1, 9), r2: expect.closeTo(1, 9) });
  });
  it("non-inverting ×11: rf = 10 kΩ, rg = 1 kΩ; ×1 is a follower", () => {
    // By hand: 1 + rf/rg = 11 → rf = 10·rg, exact for every E24 rg ≥ 1 kΩ; smallest largest resistor:
    // rg = 1 kΩ, rf = 10 kΩ. S_rf = rf/(rf + rg) = 10/11, S_rg = −10/11 [derived from K = 1 + rf/rg].
    const res = solveStage("noninverting", { gain: 11 });
    expect(res.sets[0].params).toEqual({ rf: 10e3, rg: 1e3 });
    expect(res.sets[0].sensitivity.gain!.rf).toBeCloseTo(10 / 11, 8);
    expect(solveStage("noninverting", { gain: 1 }).sets[0].params).toEqual({ rf: null, rg: null });
  });
  it("RC low-pass 1 kHz from E12 capacitors and E24 resistors", () => {
    // By hand: r·c = 1/(2π·1000) = 159.155 µs. 16 kΩ·10 nF = 160 µs (f = 994.7 Hz, −0.53 %) is the
    // closest E24 × E12 product with r in 1 kΩ…1 MΩ; 1.6 kΩ·100 nF and 160 kΩ·1 nF tie, and the smallest
    // resistor wins among equals.
    const res = solveStage("rcLowpass", { f0: 1000 });
    expect(res.sets[0].params).toEqual({ r: 1.6e3, c: 100e-9 });
    expect(res.sets[0].errors.f0).toBeCloseTo(1 / (2 * Math.PI * 160e-6 * 1000) - 1, 12);
    expect(res.sets[0].errors.f0).toBeCloseTo(-0.005282, 5);
  });
});

describe("sensitivities (classical S = ∂ln y/∂ln x)", () => {
  it("Sallen-Key: f0 −½ to every part; Q: ½ − r1/(r1 + r2), ½ − r2/(r1 + r2), +½ (c1), −½ (c2)", () => {
    // Closed forms derived from Q = √(r1r2c1c2)/(c2(r1 + r2)) and ω0 = 1/√(r1r2c1c2) (references.md §6);
    // the equal-R case S_c1 = ½, S_c2 = −½, S_r = 0 is references.md §15's structural check.
    const p = { r1: 12e3, r2: 4.7e3, c1: 47e-9, c2: 6.8e-9 };
    const s = sensitivities("sallenKeyLowpass", p);
    for (const k of ["r1", "r2", "c1", "c2"]) expect(s.f0![k]).toBeCloseTo(-0.5, 7);
    expect(s.q!.r1).toBeCloseTo(0.5 - 12e3 / 16.7e3, 7);
    expect(s.q!.r2).toBeCloseTo(0.5 - 4.7e3 / 16.7e3, 7);
    expect(s.q!.c1).toBeCloseTo(0.5, 7);
    expect(s.q!.c2).toBeCloseTo(-0.5, 7);
    const eq = sensitivities("sallenKeyLowpass", { r1: 1e4, r2: 1e4, c1: 20e-9, c2: 10e-9 });
    expect(eq.q!.r1).toBeCloseTo(0, 7);
    expect(eq.q!.r2).toBeCloseTo(0, 7);
  });
  it("MFB: gain −1 to r1, +1 to r2, none to r3; Q to r1 = r2r3/(r1·D) with D = r2 + r3 + r2r3/r1", () => {
    // derived from Q = √(r2r3c1c2)/(c2·D): ∂ln Q/∂ln r1 = −∂ln D/∂ln r1 = (r2r3/r1)/D
    const p = { r1: 4.7e3, r2: 47e3, r3: 10e3, c1: 33e-9, c2: 1.5e-9 };
    const s = sensitivities("mfbLowpass", p);
    expect(s.gain!.r1).toBeCloseTo(-1, 8);
    expect(s.gain!.r2).toBeCloseTo(1, 8);
    expect(s.gain!.r3).toBeCloseTo(0, 8);
    const D = 47e3 + 10e3 + (47e3 * 10e3) / 4.7e3;
    expect(s.q!.r1).toBeCloseTo((47e3 * 10e3) / 4.7e3 / D, 7);
    expect(s.f0!.r1).toBeCloseTo(0, 8);
  });
  it("ranks by error step (0.25 %), then by total |S|", () => {
    const res = solveStage("sallenKeyLowpass", { f0: 1000, q: 0.6, limit: 30 });
    const keys = res.sets.map((s) => [Math.ceil(s.worstError / 2.5e-3 - 1e-9), s.sensitivityTotal]);
    for (let i = 1; i < keys.length; i++) {
      expect(keys[i][0]).toBeGreaterThanOrEqual(keys[i - 1][0]);
      if (keys[i][0] === keys[i - 1][0]) expect(keys[i][1]).toBeGreaterThanOrEqual(keys[i - 1][1] - 1e-9);
    }
    // the minimum of Σ|S| for a unity Sallen-Key is 3 (f0: 4 × ½; Q: ½ + ½ at equal resistors)
    expect(res.sets[0].sensitivityTotal).toBeGreaterThanOrEqual(3 - 1e-6);
  });
});

describe("input impedance floor", () => {
  it("matches the engine's input admittance (compileChain yRe/yIm) for Sallen-Key and MFB", () => {
    const cases: [SolvableKind, SolvedParams][] = [
      ["sallenKeyLowpass", { r1: 15e3, r2: 9.1e3, c1: 560e-9, c2: 330e-12 }],
      ["mfbLowpass", { r1: 7.5e3, r2: 75e3, r3: 6.8e3, c1: 33e-9, c2: 1.5e-9 }],
    ];
    for (const [kind, p] of cases) {
      const fig = figuresOf(kind, p);
      const chain = line([source("src"), stage(kind, p)]);
      const compiled = compileChain(chain);
      const f0 = fig.f0!;
      const n = 240;
      const freqs = new Float64Array(n + 1).map((_, i) => f0 * 10 ** (i / 40 - 3));
      const sw = compiled.sweep(freqs);
      const k = compiled.nodeIds.indexOf("u1");
      let min = Infinity;
      for (let i = 0; i <= n; i++) min = Math.min(min, 1 / Math.hypot(sw.yRe[k][i], sw.yIm[k][i]));
      min = Math.min(min, p.r1 as number);
      expect(Math.abs(fig.inputImpedance! / min - 1)).toBeLessThan(1e-9);
    }
  });
  it("a high-Q Sallen-Key dips far below r1 at resonance, and the floor rejects it", () => {
    const fig = figuresOf("sallenKeyLowpass", { r1: 15e3, r2: 9.1e3, c1: 560e-9, c2: 330e-12 });
    expect(fig.q!).toBeGreaterThan(19);
    expect(fig.inputImpedance!).toBeLessThan(1e3);
    const res = solveStage("sallenKeyLowpass", { f0: 1000, q: 20, minInputImpedance: 10e3 });
    for (const s of res.sets) expect(s.achieved.inputImpedance!).toBeGreaterThanOrEqual(10e3);
  });
});

describe("solveStage says which constraint stops it", () => {
  it("Q beyond the capacitor spread", () => {
    const r = solveStage("sallenKeyLowpass", { f0: 1000, q: 5, minCapacitance: 1e-9, maxCapacitance: 10e-9 });
    expect(r.sets).toEqual([]);
    expect(r.problem).toMatch(/c1\/c2 ≥ 4Q² = 100.*at most 10.*capacitor ceiling/);
    const m = solveStage("mfbLowpass", { gain: 10, f0: 1000, q: 1, minCapacitance: 1e-9, maxCapacitance: 22e-9 });
    expect(m.problem).toMatch(/4Q²\(1 \+ gain\) = 44/);
  });
  it("a corner too low for the resistor maximum under the capacitor ceiling", () => {
    // by hand: 1 Hz with c ≤ 1 µF needs r ≥ 1/(2π·1·1e-6) = 159 kΩ per resistor pair; at 0.01 Hz 15.9 MΩ
    const r = solveStage("rcLowpass", { f0: 0.01 });
    expect(r.problem).toMatch(/resistors above 1000000 Ω.*capacitor ceiling/);
  });
  it("a gain below 1 on a non-inverting stage, missing targets, an impedance floor above the resistor range", () => {
    expect(solveStage("noninverting", { gain: 0.5 }).problem).toMatch(/below 1/);
    expect(solveStage("mfbLowpass", { f0: 1000 }).problem).toMatch(/gain and Q target/);
    expect(solveStage("inverting", { gain: 2, minInputImpedance: 2e6 }).problem).toMatch(/floor 2000000 Ω is above the largest allowed resistor/);
  });
  it("a tolerance no set can meet gives the nearest sets and the missed target", () => {
    const r = solveStage("lossyIntegrator", { f0: 1000, gain: 5, minInputImpedance: 20e3, series: "E12", tolerance: 0.001 });
    expect(r.sets).toEqual([]);
    expect(r.nearest.length).toBeGreaterThan(0);
    expect(r.problem).toMatch(/within ±0.1 %: the closest misses (gain|f0) by/);
  });
});
