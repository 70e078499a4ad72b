/**
 * Item 1: every stage kind with an ideal op-amp against its ideal H(s) (chain-format.md
 * "Stage kinds") and the check values of references.md §2, §5, §6, §7, through the
 * public `analyzeChain(chain, { freqs })`. Source resistance 0 and an ADC with infinite
 * input resistance, so the path response is the stage's own H.
 * Tolerances (references.md §0): closed forms 1e-9 relative (≈ 1e-8 dB; 1e-7 dB used,
 * phase 1e-6°); printed check values ± half a unit in the last printed digit.
 */
import { describe, it } from "vitest";
import type { Cx } from "./support/cx";
import {
  integrator,
  inverting,
  lossyIntegrator,
  mfb,
  noninverting,
  rcHighpass,
  rcLowpass,
  sallenKey,
  single,
} from "./support/chain-builders";
import {
  integratorH,
  invertingH,
  lossyIntegratorH,
  mfbF0Q,
  mfbH,
  noninvertingH,
  rcHighpassH,
  rcLowpassH,
  sallenKeyF0Q,
  sallenKeyH,
} from "./support/closed-forms";
import { dB, near, nearPhase, phaseDeg, same, holds } from "./support/checks";
import { analyze, pathTo, responseOf, stageOf } from "./support/engine-access";
import type { ChainNode } from "@/lib/chain/types";

const SWEEP = [0.1, 0.7, 3.3, 10, 47, 159.15494, 333, 1000, 1591.5494, 4700, 2.2e4, 1e5, 6.8e5, 1e6];

/** Compare the engine's path response with a closed form at every SWEEP frequency. */
function againstClosedForm(stage: ChainNode, h: (f: number) => Cx, source: string) {
  const chain = single(stage);
  const r = responseOf(chain, "adc", SWEEP);
  same(r.f.length, SWEEP.length, `chain-format.md: response at exactly the --freq frequencies (${source})`);
  SWEEP.forEach((f, i) => {
    near(r.f[i], f, { rel: 1e-12 }, `chain-format.md: response.f echoes the requested frequency`);
    near(r.magDb[i], dB(h(f)), { abs: 1e-7 }, `${source}, |H| at ${f} Hz`);
    nearPhase(r.phaseDeg[i], phaseDeg(h(f)), 1e-6, `${source}, phase at ${f} Hz`);
    const p = r.phaseDeg[i] as number;
    holds(p > -180 && p <= 180, `chain-format.md: phaseDeg wrapped to (−180, 180] (${source})`);
  });
}

describe("ideal stage responses equal their closed forms (chain-format.md table)", () => {
  it("inverting: −r2/r1 (references.md §3)", () => {
    againstClosedForm(inverting("u", { r1: 1e3, r2: 99e3 }), () => invertingH(1e3, 99e3), "derived from H = −R2/R1, references.md §3");
  });
  it("non-inverting: 1 + rf/rg, and the follower (references.md §3)", () => {
    againstClosedForm(noninverting("u", { rf: 99e3, rg: 1e3 }), () => noninvertingH(99e3, 1e3), "derived from H = 1 + Rf/Rg, references.md §3");
    againstClosedForm(noninverting("u", { rf: null, rg: null }), () => noninvertingH(0, 1), "follower, H = 1 (chain-format.md: rg null)");
    againstClosedForm(noninverting("u", { rf: 1e4, rg: null }), () => noninvertingH(0, 1), "follower with rf joining out to (−), H = 1 (chain-format.md)");
  });
  it("lossy integrator: −(R2/R1)/(1 + sR2C2) (references.md §5)", () => {
    againstClosedForm(
      lossyIntegrator("u", { r1: 1e4, r2: 1e5, c2: 1e-8 }),
      (f) => lossyIntegratorH(1e4, 1e5, 1e-8, f),
      "derived from H = −(R2/R1)/(1+sR2C2), references.md §5",
    );
  });
  it("integrator: −1/(s·r1·c2) (chain-format.md table)", () => {
    againstClosedForm(integrator("u", { r1: 1e4, c2: 1e-8 }), (f) => integratorH(1e4, 1e-8, f), "derived from H = −1/(sR1C2), chain-format.md");
  });
  it("RC low-pass and high-pass, unloaded (references.md §2)", () => {
    againstClosedForm(rcLowpass("u", { r: 1e4, c: 1e-8 }), (f) => rcLowpassH(1e4, 1e-8, f), "derived from H = 1/(1+sRC), references.md §2");
    againstClosedForm(rcHighpass("u", { r: 1e5, c: 1e-6 }), (f) => rcHighpassH(1e5, 1e-6, f), "derived from H = sRC/(1+sRC), references.md §2");
  });
  it("Sallen-Key low-pass in the chain-format.md labelling (references.md §6)", () => {
    againstClosedForm(
      sallenKey("u", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }),
      (f) => sallenKeyH(1e4, 1e4, 2e-8, 1e-8, f),
      "derived from H = 1/(1+s·c2(r1+r2)+s²r1r2c1c2), references.md §6 (Sallen & Key 1955)",
    );
    // unequal resistors so that swapping r1/r2 or c1/c2 in the engine would show
    againstClosedForm(
      sallenKey("u", { r1: 4.7e3, r2: 2.2e4, c1: 3.3e-8, c2: 2.2e-9 }),
      (f) => sallenKeyH(4.7e3, 2.2e4, 3.3e-8, 2.2e-9, f),
      "derived from the Sallen-Key H, references.md §6, unequal parts",
    );
  });
  it("MFB low-pass in the chain-format.md labelling (references.md §7)", () => {
    againstClosedForm(
      mfb("u", { r1: 1e3, r2: 1e4, r3: 1e4, c1: 1e-7, c2: 2.2e-9 }),
      (f) => mfbH(1e3, 1e4, 1e4, 1e-7, 2.2e-9, f),
      "derived from H = −(R2/R1)/(1+s·c2(r2+r3+r2r3/r1)+s²c1c2r2r3), references.md §7",
    );
    againstClosedForm(
      mfb("u", { r1: 2.2e3, r2: 6.8e3, r3: 3.3e4, c1: 4.7e-8, c2: 1e-9 }),
      (f) => mfbH(2.2e3, 6.8e3, 3.3e4, 4.7e-8, 1e-9, f),
      "derived from the MFB H, references.md §7, unequal parts",
    );
  });
});

describe("published check values through the engine", () => {
  const pts = (stage: ChainNode, rows: [number, number, number | null][], dbTol: number, phTol: number, source: string) => {
    const r = responseOf(single(stage), "adc", rows.map((x) => x[0]));
    rows.forEach(([f, db, ph], i) => {
      near(r.magDb[i], db, { abs: dbTol }, `${source} at ${f} Hz`);
      if (ph !== null) nearPhase(r.phaseDeg[i], ph, phTol, `${source} at ${f} Hz`);
    });
  };
  it("references.md §2 RC tables", () => {
    const fc = 1591.5494309189535;
    pts(rcLowpass("u", { r: 1e4, c: 1e-8 }), [
      [0.1 * fc, -0.0432137, -5.7105931],
      [fc, -3.0102999566, -45],
      [10 * fc, -20.0432137, -84.2894069],
      [1000, -1.4450701, -32.1419076],
      [1e5, -35.9646973, -89.0881863],
    ], 5e-8, 5e-8, "references.md §2 low-pass table [DERIVED]");
    const fh = 1.5915494309189535;
    pts(rcHighpass("u", { r: 1e5, c: 1e-6 }), [
      [0.1 * fh, -20.0432137, 84.2894069],
      [fh, -3.0103, 45],
      [10 * fh, -0.0432137, 5.7105931],
      [50, -0.0043981, 1.8231657],
      [0.5, -10.4657782, 72.5594055],
    ], 5e-5, 5e-7, "references.md §2 high-pass table [DERIVED]");
  });
  it("references.md §5 lossy integrator table", () => {
    pts(lossyIntegrator("u", { r1: 1e4, r2: 1e5, c2: 1e-8 }), [
      [1, 19.99983, 179.64],
      [159.15494, 16.9897, 135.0],
      [1000, 3.92776, 99.04306],
      [1591.5494, -0.0432137, 95.71059],
      [1e4, -15.9647, 90.91181],
    ], 6e-6, 6e-5, "references.md §5 lossy integrator table [DERIVED]");
  });
  it("references.md §6 Sallen-Key (a), (b), (c)", () => {
    const f0 = 1125.3954;
    pts(sallenKey("u", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }), [
      [112.54, -0.00043, -8.1297],
      [f0, -3.0103, -90.0],
      [2 * f0, -12.30449, -136.6861],
      [10 * f0, -40.00043, -171.8703],
    ], 5e-5, 5e-4, "references.md §6(a) ideal column [DERIVED]");
    pts(sallenKey("u", { r1: 1e4, r2: 1e4, c1: 2.2e-8, c2: 1e-8 }), [
      [1073.02241, -2.59637, -90],
      [10730.2241, -39.99253, null],
    ], 5e-5, 5e-4, "references.md §6(b), E12 parts [DERIVED]");
    pts(sallenKey("u", { r1: 1e4, r2: 1e4, c1: 1e-8, c2: 1e-8 }), [[1591.5494, -6.0206, -90]], 5e-5, 5e-4,
      "references.md §6(c): equal parts, |H(f0)| = Q = 0.5 (−3.01 dB here would be wrong)");
  });
  it("references.md §7 MFB (a), (b), (c)", () => {
    pts(mfb("u", { r1: 1e4, r2: 1e4, r3: 1e4, c1: 45e-9, c2: 1e-8 }), [
      [1, 0.0, 179.892],
      [750.2636, -3.0103, 90.0],
      [1500.5272, -12.30449, 43.3139],
      [7502.636, -40.00043, 8.1297],
    ], 5e-5, 5e-4, "references.md §7(a) ideal column [DERIVED]");
    pts(mfb("u", { r1: 1e4, r2: 1e4, r3: 1e4, c1: 47e-9, c2: 1e-8 }), [[734.12701, -2.82145, null]], 5e-5, 0,
      "references.md §7(b), Cg = 47 nF [DERIVED]");
    pts(mfb("u", { r1: 1e3, r2: 1e4, r3: 1e4, c1: 1e-7, c2: 2.2e-9 }), [
      [1073.02241, 14.99215, 90.0],
      [10730.2241, -20.05086, 10.1921],
    ], 5e-5, 5e-4, "references.md §7(c) ideal column [DERIVED]");
  });
  it("references.md §3 gain stages in dB", () => {
    pts(noninverting("u", { rf: 99e3, rg: 1e3 }), [[1000, 40.0, 0]], 5e-4, 1e-9, "references.md §3: G = 100, 40.000 dB");
    pts(inverting("u", { r1: 1e3, r2: 99e3 }), [[1000, 39.9127, 180]], 5e-5, 1e-9, "references.md §3: G = −99, 39.9127 dB, 180°");
    pts(noninverting("u", { rf: 1e4, rg: 1e3 }), [[1000, 20.8279, 0]], 5e-5, 1e-9, "references.md §3: G = 11, 20.8279 dB");
  });
});

describe("stage figures: dcGain, f0, q (chain-format.md 'Analysis result')", () => {
  const figures = (stage: ChainNode) => stageOf(analyze(single(stage)), stage.id);
  it("first-order and gain stages", () => {
    near(figures(inverting("u", { r1: 1e3, r2: 99e3 })).dcGain, -99, { rel: 1e-12 }, "references.md §3: inverting G = −99");
    near(figures(noninverting("u", { rf: 99e3, rg: 1e3 })).dcGain, 100, { rel: 1e-12 }, "references.md §3: non-inverting G = 100");
    near(figures(noninverting("u", { rf: null, rg: null })).dcGain, 1, { rel: 1e-12 }, "chain-format.md: follower gain 1");
    const li = figures(lossyIntegrator("u", { r1: 1e4, r2: 1e5, c2: 1e-8 }));
    near(li.dcGain, -10, { rel: 1e-12 }, "references.md §5: DC gain −R2/R1");
    near(li.f0, 159.15494309189535, { rel: 1e-9 }, "references.md §5: fp = 1/(2πR2C2)");
    same(li.q, null, "chain-format.md: q null for a first-order stage");
  });
  it("second-order sections", () => {
    const sk = figures(sallenKey("u", { r1: 4.7e3, r2: 2.2e4, c1: 3.3e-8, c2: 2.2e-9 }));
    const skRef = sallenKeyF0Q(4.7e3, 2.2e4, 3.3e-8, 2.2e-9);
    near(sk.f0, skRef.f0, { rel: 1e-9 }, "references.md §6: f0 = 1/(2π√(R1R2CaCb))");
    near(sk.q, skRef.q, { rel: 1e-9 }, "references.md §6: Q = √(R1R2CaCb)/(Cb(R1+R2))");
    near(sk.dcGain, 1, { rel: 1e-12 }, "references.md §6: unity-gain Sallen-Key");
    const a = figures(sallenKey("u", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }));
    near(a.f0, 1125.3954, { abs: 5e-5 }, "references.md §6(a): f0 = 1125.39540 Hz");
    near(a.q, 0.70710678, { abs: 5e-9 }, "references.md §6(a): Q = 0.70710678");
    const mc = figures(mfb("u", { r1: 1e3, r2: 1e4, r3: 1e4, c1: 1e-7, c2: 2.2e-9 }));
    near(mc.f0, 1073.02241, { abs: 5e-6 }, "references.md §7(c): f0 = 1073.02241 Hz");
    near(mc.q, 0.56183322, { abs: 5e-9 }, "references.md §7(c): Q = 0.56183322");
    near(mc.dcGain, -10, { rel: 1e-12 }, "references.md §7(c): K = −R2/R1 = −10");
    const mr = mfbF0Q(2.2e3, 6.8e3, 3.3e4, 4.7e-8, 1e-9);
    const m2 = figures(mfb("u", { r1: 2.2e3, r2: 6.8e3, r3: 3.3e4, c1: 4.7e-8, c2: 1e-9 }));
    near(m2.f0, mr.f0, { rel: 1e-9 }, "references.md §7: f0 = 1/(2π√(R2R3CgCf))");
    near(m2.q, mr.q, { rel: 1e-9 }, "references.md §7: Q = √(R2R3CgCf)/(Cf(R2+R3+R2R3/R1))");
  });
});

describe("the response grid (chain-format.md 'Analysis result')", () => {
  it("log grid from fMin to fMax with `points` points; options.points overrides", () => {
    const chain = single(rcLowpass("u", { r: 1e4, c: 1e-8 }), { analysis: { fMin: 2, fMax: 2e5, points: 51 } });
    const r = pathTo(analyze(chain), "adc").response;
    same(r.f.length, 51, "chain-format.md: `points` points");
    near(r.f[0], 2, { rel: 1e-12 }, "chain-format.md: grid starts at fMin");
    near(r.f[50], 2e5, { rel: 1e-12 }, "chain-format.md: grid ends at fMax");
    near(r.f[25], Math.sqrt(2 * 2e5), { rel: 1e-9 }, "chain-format.md: log grid, geometric mid-point");
    r.f.forEach((f, i) => near(r.magDb[i], dB(rcLowpassH(1e4, 1e-8, f)), { abs: 1e-7 }, "references.md §2 low-pass on the grid"));
    const r2 = pathTo(analyze(chain, { points: 7 }), "adc").response;
    same(r2.f.length, 7, "types.ts AnalyzeOptions.points overrides analysis.points");
  });
});
