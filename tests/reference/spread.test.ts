/**
 * Tolerance spread (lib/engine/spread.ts) against published and derived values, references.md §15.
 * Monte Carlo checks use a fixed seed and about 4 standard errors as the tolerance (references.md §15:
 * standard error of a mean σ/√N, of a standard deviation about σ/√(2(N − 1))).
 */
import { describe, expect, it, vi } from "vitest";
import seedrandom from "seedrandom";
import { analyzeChain } from "@/lib/engine";
import { P2Quantiles, runSpread, spreadParts, startSpread, mulberry32, type SpreadResult } from "@/lib/engine/spread";
import type { Chain } from "@/lib/chain/types";
import { adc, inverting, makeChain, noninverting, rcLowpass, sallenKey, source } from "./support/chain-builders";
import { near } from "./support/checks";

vi.setConfig({ testTimeout: 180_000 });

const stage = (r: SpreadResult, id: string) => r.stages.find((s) => s.id === id)!;

/** source → one stage → ADC, with the given tolerances */
function one(node: Chain["nodes"][number], tolerances: Chain["tolerances"]): Chain {
  return { ...makeChain({ nodes: [source({ amplitude: 0.1, fHigh: 100 }), node, adc("adc", { vinLow: -10, vinHigh: 10 })] }), tolerances };
}

describe("distribution of the draws", () => {
  // an ideal inverting stage's dcGain is −r2/r1 exactly, so with r1 fixed it is linear in r2's draw
  const gainChain = (distribution: "uniform" | "normal", N: number) =>
    runSpread(one(inverting("u", { r1: 1e4, r2: 1e5 }), { resistor: 0.05, capacitor: 0, overrides: { "u.r1": 0 } }), { trials: N, seed: 7, distribution });

  it("uniform ±t has σ = t/√3", () => {
    const N = 10_000;
    const g = stage(gainChain("uniform", N), "u").dcGain!;
    const t = 0.05;
    const sigma = t / Math.sqrt(3);
    near(g.sd / Math.abs(g.nominal!), sigma, { rel: 4 / Math.sqrt(2 * (N - 1)) }, "JCGM 100:2008 (GUM) §4.3.7, rectangular distribution σ = a/√3 (clause number from memory)");
    near(g.mean / g.nominal!, 1, { abs: (4 * sigma) / Math.sqrt(N) }, "mean of a symmetric distribution is its centre");
    // every build inside ±t
    expect(g.min / g.nominal!).toBeLessThanOrEqual(1 + t);
    expect(g.max / g.nominal!).toBeGreaterThanOrEqual(1 - t);
    expect(Math.abs(g.max / g.nominal!)).toBeLessThanOrEqual(1 + t + 1e-12);
    expect(Math.abs(g.min / g.nominal!)).toBeGreaterThanOrEqual(1 - t - 1e-12);
  });

  it("normal with σ = t/3, truncated at ±t: σ = 0.98658·t/3", () => {
    const N = 10_000;
    const g = stage(gainChain("normal", N), "u").dcGain!;
    const t = 0.05;
    // derived from the truncated-normal variance σ²·(1 − 2·a·φ(a)/(2Φ(a) − 1)) at a = 3: φ(3) = 0.00443185, Φ(3) = 0.99865010
    const factor = Math.sqrt(1 - (2 * 3 * 0.00443185) / (2 * 0.9986501 - 1));
    expect(factor).toBeCloseTo(0.98658, 5);
    near(g.sd / Math.abs(g.nominal!), (factor * t) / 3, { rel: 4 / Math.sqrt(2 * (N - 1)) }, "tolerance as 3σ (common practice), truncated-normal variance (derived)");
    expect(Math.abs(g.max / g.nominal!) - 1).toBeLessThanOrEqual(t + 1e-12);
    expect(1 - Math.abs(g.min / g.nominal!)).toBeLessThanOrEqual(t + 1e-12);
  });

  it("the generator is the published mulberry32 and uniform on [0, 1)", () => {
    // mean 1/2 and variance 1/12 of the uniform distribution, within 4 standard errors
    const rng = mulberry32(12345);
    const N = 100_000;
    let s = 0;
    let s2 = 0;
    for (let i = 0; i < N; i++) {
      const u = rng();
      expect(u >= 0 && u < 1).toBe(true);
      s += u;
      s2 += u * u;
    }
    const mean = s / N;
    near(mean, 0.5, { abs: 4 * Math.sqrt(1 / 12 / N) }, "uniform mean 1/2");
    near(s2 / N - mean * mean, 1 / 12, { rel: 0.01 }, "uniform variance 1/12");
    // same seed, same stream
    const a = mulberry32(99);
    const b = mulberry32(99);
    for (let i = 0; i < 10; i++) expect(a()).toBe(b());
  });
});

describe("RC corner with R ±1 % and C ±5 %, uniform (references.md §15)", () => {
  const N = 10_000;
  const chain = one(rcLowpass("rc", { r: 1e4, c: 1e-8 }), { resistor: 0.01, capacitor: 0.05 });
  const res = runSpread(chain, { trials: N, seed: 12345 });
  const fc = stage(res, "rc").f0!;
  const f0 = 1 / (2 * Math.PI * 1e4 * 1e-8);

  it("mean and σ of fc", () => {
    const sd = 0.0294937;
    near(fc.nominal!, f0, { rel: 1e-12 }, "fc = 1/(2πRC)");
    near(fc.mean / f0, 1.00086795, { abs: (4 * sd) / Math.sqrt(N) }, "references.md §15, exact mean 1.00086795 (derived from E[1/(1+u)])");
    near(fc.sd / f0, sd, { rel: 4 / Math.sqrt(2 * (N - 1)) }, "references.md §15, exact σ 0.0294937 (derived)");
  });

  it("worst case is the published bound and brackets every build", () => {
    const wc = res.worstCase.find((w) => w.nodeId === "rc" && w.metric === "f0")!;
    near(wc.low! / f0, 0.942951, { rel: 1e-6 }, "references.md §15, worst-case bounds 1/(1.01·1.05)");
    near(wc.high! / f0, 1.063264, { rel: 1e-6 }, "references.md §15, worst-case bounds 1/(0.99·0.95)");
    expect(wc.outside).toBe(0);
    expect(fc.min).toBeGreaterThanOrEqual(wc.low!);
    expect(fc.max).toBeLessThanOrEqual(wc.high!);
    // the corner itself: both parts at their plus end for the lowest corner
    expect(wc.lowCorner).toEqual({ "rc.r": 1, "rc.c": 1 });
  });

  it("sensitivities of fc to R and C are −1", () => {
    for (const s of res.sensitivity) near(s.f0!, -1, { rel: 1e-6 }, "references.md §15, S_R = S_C = −1 for fc = 1/(2πRC)");
  });

  it("an independent draw (seedrandom) of the same formula agrees with the engine's statistics", () => {
    const rng = seedrandom("independent");
    const xs: number[] = [];
    for (let i = 0; i < N; i++) xs.push(1 / ((1 + 0.01 * (2 * rng() - 1)) * (1 + 0.05 * (2 * rng() - 1))));
    const m = xs.reduce((a, b) => a + b, 0) / N;
    const sd = Math.sqrt(xs.reduce((a, b) => a + (b - m) ** 2, 0) / (N - 1));
    // two independent estimates: the difference has √2 times one standard error
    near(fc.mean / f0, m, { abs: (4 * Math.SQRT2 * 0.0295) / Math.sqrt(N) }, "independent Monte Carlo with seedrandom (references.md §16)");
    near(fc.sd / f0, sd, { rel: (4 * Math.SQRT2) / Math.sqrt(2 * (N - 1)) }, "independent Monte Carlo with seedrandom (references.md §16)");
  });
});

describe("gain and second-order sections (references.md §15)", () => {
  it("non-inverting G = 100 with both resistors ±1 %: σ and worst case", () => {
    const N = 10_000;
    const res = runSpread(one(noninverting("u", { rf: 99e3, rg: 1e3 }), { resistor: 0.01, capacitor: 0.05 }), { trials: N, seed: 3 });
    const g = stage(res, "u").dcGain!;
    near(g.sd / g.nominal!, 0.00808332, { rel: 0.05 }, "references.md §15, linearised 0.808332 %, Monte Carlo 0.80875 %");
    const wc = res.worstCase.find((w) => w.nodeId === "u" && w.metric === "dcGain")!;
    near(wc.low!, 98.0396, { abs: 5e-5 }, "references.md §15, worst case 98.0396 = 1 + 99·0.99/1.01");
    near(wc.high!, 102.0, { abs: 5e-4 }, "references.md §15, worst case 102.000 = 1 + 99·1.01/0.99");
    expect(wc.outside).toBe(0);
  });

  it("Sallen-Key equal-R Butterworth with all four parts ±1 %: σ of f0 and Q, structural sensitivities", () => {
    const N = 10_000;
    const chain = one(sallenKey("sk", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }), { resistor: 0.01, capacitor: 0.01 });
    const res = runSpread(chain, { trials: N, seed: 11 });
    const s = stage(res, "sk");
    const tol = 4 / Math.sqrt(2 * (N - 1));
    // second-order (non-linear) terms are well under the sampling tolerance at ±1 %
    near(s.f0!.sd / s.f0!.nominal!, 0.0057735, { rel: tol }, "references.md §15, f0 relative σ linearised 0.57735 %, Monte Carlo 0.57783 %");
    near(s.q!.sd / s.q!.nominal!, 0.00408248, { rel: tol }, "references.md §15, Q relative σ linearised 0.408248 %, Monte Carlo 0.40854 %");
    const sens = Object.fromEntries(res.sensitivity.map((x) => [x.param, x]));
    near(sens.c1.q!, 0.5, { abs: 1e-6 }, "references.md §15, S_Ca = ½ (c1 is Ca)");
    near(sens.c2.q!, -0.5, { abs: 1e-6 }, "references.md §15, S_Cb = −½ (c2 is Cb)");
    near(sens.r1.q!, 0, { abs: 1e-6 }, "references.md §15, S_R1 = 0 in the equal-R case");
    near(sens.r2.q!, 0, { abs: 1e-6 }, "references.md §15, S_R2 = 0 in the equal-R case");
    for (const p of ["r1", "r2", "c1", "c2"]) near(sens[p].f0!, -0.5, { abs: 1e-6 }, "derived from ω0 = 1/√(R1R2CaCb), references.md §6");
    for (const w of res.worstCase.filter((x) => x.metric !== "margin")) expect(w.outside, `${w.nodeId} ${w.metric}`).toBe(0);
  });
});

/** A chain with real headroom questions: gain stages, a filter, offsets, a converter. */
function headroomChain(): Chain {
  const chain = makeChain({
    nodes: [
      source({ dc: 0.1, dcSpread: 0.01, amplitude: 0.1, fLow: 1, fHigh: 2000 }),
      noninverting("g1", { rf: 9e3, rg: 1e3 }, { part: "p", rails: { low: -5, high: 5 } }),
      sallenKey("sk", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }, { part: "p", rails: { low: -5, high: 5 } }),
      inverting("g2", { r1: 1e4, r2: 2.2e4 }, { part: "p", rails: { low: -5, high: 5 } }),
      adc("adc", { vinLow: -4.096, vinHigh: 4.096, sampleRate: 50e3 }),
    ],
    parts: { p: { gbw: 1e6, aol: 1e5, vos: 1e-3, ib: 1e-9, swingLow: 0.1, swingHigh: 0.1, inputLow: 0, inputHigh: 1.5 } },
  });
  return { ...chain, tolerances: { resistor: 0.05, capacitor: 0.1 } };
}

describe("headroom over builds", () => {
  const chain = headroomChain();

  it("the nominal margins and clip flags are analyzeChain's", () => {
    const res = runSpread(chain, { trials: 1, seed: 1 });
    const a = analyzeChain(chain);
    for (const st of a.paths[0].stages) {
      if (!st.status) continue;
      const m = st.margins as { low: number; high: number };
      const ip = st.inputRange!;
      const expected = Math.min(m.low, m.high, ip.peak!.min - ip.allowed.low, ip.allowed.high - ip.peak!.max);
      near(stage(res, st.id).margin!.nominal!, expected, { rel: 1e-9, abs: 1e-12 }, "analyzeChain's margins (same engine, coarser peak search)");
      near(stage(res, st.id).dcGain!.nominal!, st.dcGain!, { rel: 1e-12 }, "analyzeChain's dcGain");
    }
    const ad = a.paths[0].adc!;
    const peak = ad.peakIn as { min: number; max: number };
    near(stage(res, "adc").margin!.nominal!, Math.min(peak.min + 4.096, 4.096 - peak.max), { rel: 1e-9 }, "analyzeChain's ADC peak interval");
  });

  it("a build's margin is analyzeChain's margin of that build", () => {
    // run a few builds, then rebuild the worst-case corner of g2's margin by hand and analyse it whole
    const res = runSpread(chain, { trials: 50, seed: 5 });
    const wc = res.worstCase.find((w) => w.nodeId === "g2" && w.metric === "margin")!;
    const parts = spreadParts(chain);
    const nodes = chain.nodes.map((n) => {
      const mine = parts.filter((p) => p.nodeId === n.id);
      if (!mine.length) return n;
      const params = { ...n.params } as Record<string, number>;
      for (const p of mine) params[p.param] = p.nominal * (1 + wc.lowCorner[p.key] * p.tolerance);
      return { ...n, params } as unknown as typeof n;
    });
    const a = analyzeChain({ ...chain, nodes });
    const st = a.paths[0].stages.find((s) => s.id === "g2")!;
    const m = st.margins as { low: number; high: number };
    const ip = st.inputRange!;
    near(wc.low!, Math.min(m.low, m.high, ip.peak!.min - ip.allowed.low, ip.allowed.high - ip.peak!.max), { rel: 1e-9 }, "analyzeChain of the corner build");
    expect(wc.low!).toBeLessThan(wc.nominal!);
  });

  it("worst case brackets every build; the clip share counts builds with a negative margin", () => {
    const res = runSpread(chain, { trials: 2000, seed: 21 });
    for (const w of res.worstCase) {
      expect(w.outside, `${w.nodeId} ${w.metric}`).toBe(0);
      const st = stage(res, w.nodeId)[w.metric]!;
      const lo = Math.min(w.low!, w.high!);
      const hi = Math.max(w.low!, w.high!);
      const slack = 1e-9 * Math.max(Math.abs(lo), Math.abs(hi), 1e-3);
      expect(st.min).toBeGreaterThanOrEqual(lo - slack);
      expect(st.max).toBeLessThanOrEqual(hi + slack);
    }
    // this chain is built so that g2 sometimes clips: the nominal margin is small against its spread
    const g2 = stage(res, "g2");
    expect(g2.margin!.min).toBeLessThan(0);
    expect(g2.margin!.max).toBeGreaterThan(0);
    expect(g2.clipShare).toBeGreaterThan(0);
    expect(g2.clipShare).toBeLessThan(1);
    expect(res.clipShare).toBeGreaterThanOrEqual(g2.clipShare);
    expect(res.clipCount).toBe(Math.round(res.clipShare * res.done));
  });

  it("the envelope holds the nominal response, min ≤ p5 ≤ p95 ≤ max", () => {
    const res = runSpread(chain, { trials: 300, seed: 2, points: 200 });
    const e = res.response.paths[0];
    const a = analyzeChain(chain, { points: 200, noise: false });
    e.nominal.forEach((v, k) => near(v!, a.paths[0].response.magDb[k]!, { abs: 1e-9 }, "analyzeChain's response"));
    for (let k = 0; k < 200; k++) {
      expect(e.min[k]!).toBeLessThanOrEqual(e.p5[k]! + 1e-12);
      expect(e.p5[k]!).toBeLessThanOrEqual(e.p95[k]! + 1e-12);
      expect(e.p95[k]!).toBeLessThanOrEqual(e.max[k]! + 1e-12);
    }
    // in the passband the spread is small; in the stopband of the filter it is wider
    const at = (f: number) => res.response.f.findIndex((x) => x >= f);
    expect(e.max[at(10)]! - e.min[at(10)]!).toBeLessThan(e.max[at(1e5)]! - e.min[at(1e5)]!);
  });
});

describe("reproducibility", () => {
  const chain = headroomChain();
  it("same seed, same result, however the run is split into batches; another seed differs", () => {
    const whole = runSpread(chain, { trials: 120, seed: 42, points: 100 });
    const run = startSpread(chain, { trials: 120, seed: 42, points: 100 });
    let partial: SpreadResult | null = null;
    while (!run.step(7)) if (!partial && run.result().done > 30) partial = run.result();
    expect(run.result()).toEqual(whole);
    expect(partial!.complete).toBe(false);
    expect(partial!.done).toBeLessThan(120);
    expect(runSpread(chain, { trials: 120, seed: 42, points: 100 })).toEqual(whole);
    expect(runSpread(chain, { trials: 120, seed: 43, points: 100 }).stages[0].dcGain!.mean).not.toBe(whole.stages[0].dcGain!.mean);
  });

  it("refuses bad options, naming the field", () => {
    expect(() => startSpread(chain, { trials: 0, seed: 1 })).toThrow(/trials/);
    expect(() => startSpread(chain, { trials: 10, seed: -1 })).toThrow(/seed/);
    expect(() => startSpread(chain, { trials: 10, seed: 1, points: 1 })).toThrow(/points/);
  });
});

describe("P² quantile estimator (Jain and Chlamtac 1985)", () => {
  it("estimates the 5 % and 95 % points of a uniform sample", () => {
    const rng = seedrandom("p2");
    const p5 = new P2Quantiles(0.05, 1);
    const p95 = new P2Quantiles(0.95, 1);
    for (let i = 0; i < 20_000; i++) {
      const u = rng();
      p5.add(0, u);
      p95.add(0, u);
    }
    // sampling error of a quantile: √(p(1 − p)/N)/density = 0.0015 here; the estimator adds little
    near(p5.value(0), 0.05, { abs: 0.006 }, "uniform 5 % point (definition)");
    near(p95.value(0), 0.95, { abs: 0.006 }, "uniform 95 % point (definition)");
  });
});
