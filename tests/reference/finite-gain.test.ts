/**
 * Item 2: finite open-loop gain and finite gain-bandwidth (references.md §4, §6, §7).
 * Gain stages against the closed-loop formulas; every op-amp kind with a part against
 * the independent mathjs nodal solve of tests/reference/support/nodal.ts, in which
 * the op-amp is the source Vo = A(s)·(V+ − V−) with A(s) = aol/(1 + s·aol/(2π·gbw)).
 */
import { describe, it } from "vitest";
import type { Part } from "@/lib/chain/types";
import type { ChainNode } from "@/lib/chain/types";
import {
  integrator,
  inverting,
  lossyIntegrator,
  mfb,
  noninverting,
  sallenKey,
  single,
} from "./support/chain-builders";
import { invertingFiniteH, noninvertingFiniteH, opAmpGain, sallenKeyFiniteH } from "./support/closed-forms";
import { cx } from "./support/cx";
import { dB, near, nearPhase, phaseDeg } from "./support/checks";
import { responseAt } from "./support/nodal";
import { analyze, responseOf, stageOf } from "./support/engine-access";

const P = { aol: 1e5, gbw: 1e6 };
const logSweep = (lo: number, hi: number, n: number) => Array.from({ length: n }, (_, i) => lo * Math.pow(hi / lo, i / (n - 1)));
const SWEEP = logSweep(0.1, 1e6, 31);

function withPart(stage: ChainNode, part: Part) {
  return single(stage, { parts: { p: part } });
}

describe("gain stages with a single-pole op-amp: references.md §4 values", () => {
  it("non-inverting G = 100, A0 = 1e5, GBW = 1 MHz", () => {
    const c = withPart(noninverting("u", { rf: 99e3, rg: 1e3 }, { part: "p" }), P);
    const r = responseOf(c, "adc", [1000, 10010, 1e5]);
    near(r.magDb[0], 39.94819, { abs: 5e-6 }, "references.md §4 at 1 kHz [DERIVED]");
    nearPhase(r.phaseDeg[0], -5.70493, 5e-6, "references.md §4 at 1 kHz [DERIVED]");
    near(r.magDb[1], 36.98102, { abs: 5e-4 }, "references.md §4 at 10.010 kHz (−3 dB point, printed to 5 digits)");
    nearPhase(r.phaseDeg[1], -45, 5e-3, "references.md §4 at the −3 dB point");
    near(r.magDb[2], 19.9567, { abs: 5e-6 }, "references.md §4 at 100 kHz");
    nearPhase(r.phaseDeg[2], -84.28373, 5e-6, "references.md §4 at 100 kHz");
    near(stageOf(analyze(c), "u").dcGain, 99.9000999, { abs: 5e-8 }, "references.md §4: DC gain 99.9000999");
  });
  it("follower, inverting G = −1 and G = 11", () => {
    const f = responseOf(withPart(noninverting("u", { rf: null, rg: null }, { part: "p" }), P), "adc", [1e5]);
    near(f.magDb[0], -0.0432997, { abs: 5e-8 }, "references.md §4 follower at 100 kHz");
    nearPhase(f.phaseDeg[0], -5.710536, 5e-7, "references.md §4 follower at 100 kHz");
    const i = responseOf(withPart(inverting("u", { r1: 1e4, r2: 1e4 }, { part: "p" }), P), "adc", [1000]);
    near(i.magDb[0], -0.000191, { abs: 5e-7 }, "references.md §4 G = −1 at 1 kHz");
    nearPhase(i.phaseDeg[0], 179.8854, 5e-5, "references.md §4 G = −1 at 1 kHz");
    const g = withPart(noninverting("u", { rf: 1e4, rg: 1e3 }, { part: "p" }), P);
    const gr = responseOf(g, "adc", [1e5]);
    near(gr.magDb[0], 17.3835, { abs: 5e-6 }, "references.md §4 G = 11 at 100 kHz");
    nearPhase(gr.phaseDeg[0], -47.72317, 5e-6, "references.md §4 G = 11 at 100 kHz");
    near(stageOf(analyze(g), "u").dcGain, 10.99879, { abs: 5e-6 }, "references.md §4: G = 11 DC gain 10.998790");
  });
  it("DC gain with finite A0 (references.md §4, Sedra & Smith Eq. (2.5) [MEMORY])", () => {
    const inv = (rin: number, rf: number, a0: number) => stageOf(analyze(withPart(inverting("u", { r1: rin, r2: rf }, { part: "p" }), { aol: a0 })), "u").dcGain;
    near(inv(1e3, 2e4, 1e5), -19.9958, { abs: 5e-5 }, "references.md §4: Rf/Rin = 20, A = 1e5 → −19.9958");
    near(inv(1e3, 99e3, 1e5), -98.9011, { abs: 5e-5 }, "references.md §4: Rf/Rg = 99, A0 = 1e5 → −98.90110");
    const rows: [number, number][] = [
      [1e3, -90.8265],
      [1e4, -99.0001],
      [1e5, -99.8991],
      [1e6, -99.9899],
    ];
    for (const [a, g] of rows) near(inv(1e3, 1e5, a), g, { abs: 5e-5 }, `references.md §4 table, R2/R1 = 100, A = ${a}`);
    const ni = (a0: number) => stageOf(analyze(withPart(noninverting("u", { rf: 99e3, rg: 1e3 }, { part: "p" }), { aol: a0 })), "u").dcGain;
    near(ni(1e4), 99.0099, { abs: 5e-5 }, "references.md §4: β = 0.01, A0 = 1e4 → 99.00990");
    near(ni(1e5), 99.9001, { abs: 5e-5 }, "references.md §4: β = 0.01, A0 = 1e5 → 99.90010");
    near(ni(1e6), 99.99, { abs: 5e-5 }, "references.md §4: β = 0.01, A0 = 1e6 → 99.99000");
  });
  it("GBW only (A = 2π·gbw/s): −3 dB at GBW/NG, and DC gain exact (references.md §4 table)", () => {
    const rows: [ChainNode, number, number][] = [
      [noninverting("u", { rf: 999e3, rg: 1e3 }, { part: "p" }), 1000, 1e3],
      [noninverting("u", { rf: 9e3, rg: 1e3 }, { part: "p" }), 10, 1e5],
      [inverting("u", { r1: 1e4, r2: 1e4 }, { part: "p" }), -1, 5e5],
      [inverting("u", { r1: 1e3, r2: 1e4 }, { part: "p" }), -10, 90909.0909],
      [inverting("u", { r1: 1e3, r2: 1e5 }, { part: "p" }), -100, 9900.990099],
    ];
    for (const [stage, g, f3] of rows) {
      const c = withPart(stage, { gbw: 1e6 });
      const r = responseOf(c, "adc", [f3]);
      near(r.magDb[0], 20 * Math.log10(Math.abs(g)) - 10 * Math.log10(2), { abs: 1e-7 }, `references.md §4: G = ${g}, f−3dB = GBW/NG = ${f3} Hz`);
      nearPhase(r.phaseDeg[0], (g < 0 ? 180 : 0) - 45, 1e-6, `references.md §4: single closed-loop pole at GBW/NG, G = ${g}`);
      near(stageOf(analyze(c), "u").dcGain, g, { rel: 1e-12 }, "chain-format.md: gbw without aol → A = 2π·gbw/s, infinite at DC");
    }
  });
  it("aol only is a flat gain: closed-loop formula at every frequency", () => {
    const c = withPart(inverting("u", { r1: 1e3, r2: 1e5 }, { part: "p" }), { aol: 1e3 });
    const r = responseOf(c, "adc", [1, 1e3, 1e6]);
    const g = invertingFiniteH(1e3, 1e5, cx(1e3));
    r.magDb.forEach((m, i) => near(m, dB(g), { abs: 1e-7 }, `references.md §4 Eq. (2.5) with flat A = 1e3 (chain-format.md: aol without gbw), point ${i}`));
  });
  it("gain stages across the band against A(s)β/(1 + A(s)β) (references.md §4)", () => {
    const inv = responseOf(withPart(inverting("u", { r1: 2.2e3, r2: 4.7e4 }, { part: "p" }), P), "adc", SWEEP);
    const ni = responseOf(withPart(noninverting("u", { rf: 4.7e4, rg: 2.2e3 }, { part: "p" }), P), "adc", SWEEP);
    SWEEP.forEach((f, i) => {
      const a = opAmpGain(P.aol, P.gbw, f);
      const hi = invertingFiniteH(2.2e3, 4.7e4, a);
      const hn = noninvertingFiniteH(4.7e4, 2.2e3, a);
      near(inv.magDb[i], dB(hi), { abs: 1e-7 }, `references.md §4 inverting closed loop at ${f} Hz`);
      nearPhase(inv.phaseDeg[i], phaseDeg(hi), 1e-6, `references.md §4 inverting closed loop at ${f} Hz`);
      near(ni.magDb[i], dB(hn), { abs: 1e-7 }, `references.md §4 non-inverting closed loop at ${f} Hz`);
      nearPhase(ni.phaseDeg[i], phaseDeg(hn), 1e-6, `references.md §4 non-inverting closed loop at ${f} Hz`);
    });
  });
});

describe("every op-amp kind with a finite-GBW part against the independent nodal solve", () => {
  const cases: [string, ChainNode][] = [
    ["Sallen-Key 6(a)", sallenKey("u", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }, { part: "p" })],
    ["Sallen-Key, unequal, high Q", sallenKey("u", { r1: 2.2e3, r2: 4.7e4, c1: 1e-7, c2: 1e-9 }, { part: "p" })],
    ["MFB 7(a)", mfb("u", { r1: 1e4, r2: 1e4, r3: 1e4, c1: 45e-9, c2: 1e-8 }, { part: "p" })],
    ["MFB 7(c)", mfb("u", { r1: 1e3, r2: 1e4, r3: 1e4, c1: 1e-7, c2: 2.2e-9 }, { part: "p" })],
    ["lossy integrator", lossyIntegrator("u", { r1: 1e4, r2: 1e5, c2: 1e-8 }, { part: "p" })],
    ["integrator", integrator("u", { r1: 1e4, c2: 1e-8 }, { part: "p" })],
  ];
  const parts: [string, Part][] = [
    ["A0 = 1e5, GBW = 1 MHz", P],
    ["GBW 100 kHz only", { gbw: 1e5 }],
    ["flat A0 = 300", { aol: 300 }],
  ];
  for (const [name, stage] of cases) {
    for (const [pname, part] of parts) {
      it(`${name}, ${pname}: 31 points, 0.1 Hz – 1 MHz, to 1e-9 relative`, () => {
        const c = withPart(stage, part);
        const r = responseOf(c, "adc", SWEEP);
        SWEEP.forEach((f, i) => {
          const h = responseAt(c, "adc", f);
          near(r.magDb[i], dB(h), { abs: 1e-7 }, `mathjs nodal solve (op-amp as VCVS), ${name}, ${pname}, ${f} Hz`);
          nearPhase(r.phaseDeg[i], phaseDeg(h), 1e-6, `mathjs nodal solve (op-amp as VCVS), ${name}, ${pname}, ${f} Hz`);
        });
      });
    }
  }

  it("Sallen-Key also agrees with the finite-A closed form of references.md §6 and its GBW column", () => {
    const c = withPart(cases[0][1], P);
    const freqs = [10, 1125.3954, 2250.7908, 11253.954];
    const r = responseOf(c, "adc", freqs);
    freqs.forEach((f, i) => {
      const h = sallenKeyFiniteH(1e4, 1e4, 2e-8, 1e-8, opAmpGain(1e5, 1e6, f), f);
      near(r.magDb[i], dB(h), { abs: 1e-7 }, "references.md §6 finite-A form [DERIVED, SymPy]");
    });
    near(r.magDb[1], -3.0105, { abs: 5e-5 }, "references.md §6(a) GBW column at f0");
    nearPhase(r.phaseDeg[1], -90.129, 5e-4, "references.md §6(a) GBW column at f0");
    near(r.magDb[2], -12.31442, { abs: 5e-5 }, "references.md §6(a) GBW column at 2·f0");
    nearPhase(r.phaseDeg[2], -136.8753, 5e-4, "references.md §6(a) GBW column at 2·f0");
    near(r.magDb[3], -40.01477, { abs: 5e-5 }, "references.md §6(a) GBW column at 10·f0");
    nearPhase(r.phaseDeg[3], -172.5269, 5e-4, "references.md §6(a) GBW column at 10·f0");
  });

  it("MFB GBW columns of references.md §7 (a) and (c)", () => {
    const a = responseOf(withPart(cases[2][1], P), "adc", [750.2636, 7502.636]);
    near(a.magDb[0], -3.01514, { abs: 5e-5 }, "references.md §7(a) GBW column at f0");
    nearPhase(a.phaseDeg[0], 89.893, 5e-4, "references.md §7(a) GBW column at f0");
    near(a.magDb[1], -40.01454, { abs: 5e-5 }, "references.md §7(a) GBW column at 10·f0");
    nearPhase(a.phaseDeg[1], 7.692, 5e-4, "references.md §7(a) GBW column at 10·f0");
    const c = responseOf(withPart(cases[3][1], P), "adc", [1073.02241, 10730.2241]);
    near(c.magDb[0], 14.93942, { abs: 5e-5 }, "references.md §7(c) GBW column at f0");
    nearPhase(c.phaseDeg[0], 89.7106, 5e-4, "references.md §7(c) GBW column at f0");
    near(c.magDb[1], -20.11436, { abs: 5e-5 }, "references.md §7(c) GBW column at 10·f0");
    nearPhase(c.phaseDeg[1], 9.5695, 5e-4, "references.md §7(c) GBW column at 10·f0");
  });

  it("stage dcGain with finite aol for second-order sections (nodal solve at DC)", () => {
    const sk = withPart(cases[0][1], P);
    near(stageOf(analyze(sk), "u").dcGain, 1e5 / (1e5 + 1), { rel: 1e-9 }, "references.md §6 finite-A form at s = 0: A/(A+1)");
    const m = withPart(cases[3][1], P);
    near(stageOf(analyze(m), "u").dcGain, responseAt(m, "u", 1e-9).re, { rel: 1e-9 }, "mathjs nodal solve at DC, MFB 7(c), A0 = 1e5");
    const li = withPart(cases[4][1], P);
    near(stageOf(analyze(li), "u").dcGain, -10 / (1 + 11 / 1e5), { rel: 1e-9 }, "references.md §4 Eq. (2.5): −(R2/R1)/(1 + (1 + R2/R1)/A0)");
  });
});
