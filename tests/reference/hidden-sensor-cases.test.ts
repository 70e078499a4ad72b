/**
 * Hand-built cases for the sensor sources and front-end stages (issue 14): TIA loop stability by
 * the noise-gain construction, the TIA's noise at the output, the charge amplifier's corner and
 * in-band gain with a finite-gain op-amp, the difference amplifier loaded by the bridge's arms and
 * its resistor-mismatch common-mode rejection, the in-amp's gain and internal common-mode levels, a
 * photodiode in photovoltaic mode, and a band from DC through an integrator. Every expectation is
 * a closed form derived beside it (sources named; "from memory" where it is), or our own loop-gain
 * computation, never a number read off the engine.
 */
import { describe, it, vi } from "vitest";
import type { StageResult } from "@/lib/chain/types";
import {
  adc,
  bridge,
  chargeAmp,
  differenceAmp,
  inAmp,
  integrator,
  makeChain,
  noninverting,
  photodiode,
  piezo,
  thermocouple,
  transimpedance,
} from "./support/chain-builders";
import { dB, holds, near, nearPhase, phaseDeg, same } from "./support/checks";
import { cx, type Cx } from "./support/cx";
import { K_BOLTZMANN, inverseGain, jw, responseAt } from "./support/nodal";
import { Q_ELECTRON, maxOverBand } from "./support/reference-analysis";
import { analyze, pathTo, stageOf, warningsOf } from "./support/engine-access";

vi.setConfig({ testTimeout: 180_000, hookTimeout: 180_000 });

const T = 298.15; // the chain's temperatureK (chain-builders default)
const extra = <X>(s: StageResult, key: string) => s[key] as X;
const ONE = cx(1, 0);

interface Stability {
  cin: number;
  crossover: number;
  phaseMarginDeg: number;
  peakingDb: number;
  suggestedCf: number;
}

/**
 * Our own loop of a TIA or charge amp by the standard noise-gain construction (feedback-amplifier
 * theory, e.g. any op-amp stability text): β = Zs/(Zs + Zf), i.e. 1/β(s) = 1 + Zf·(1/Rsh + s·(Cj + cin)),
 * Zf = rf/(1 + s·rf·cf), loop gain T = A(s)·β with the format's single-pole A(s). The crossover is
 * |T| = 1 (found by bisection in ln f: |A| falls and |1/β| rises or flattens, so |T| falls throughout),
 * phase margin 180° + arg T there, and the closed-loop peaking the largest 20·log10|T/(1 + T)|.
 */
function loop(p: { aol?: number; gbw?: number }, rf: number, cf: number, rsh: number, c: number) {
  const t = (f: number): Cx => {
    const s = jw(f);
    const zf = cx(rf, 0).div(ONE.add(s.mul(rf * cf)));
    const invBeta = ONE.add(zf.mul(cx(1 / rsh, 0).add(s.mul(c))));
    return ONE.div(inverseGain(p, s).mul(invBeta));
  };
  let lo = Math.log(1e-3);
  let hi = Math.log(1e12);
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (t(Math.exp(mid)).abs() > 1) lo = mid;
    else hi = mid;
  }
  const fc = Math.exp((lo + hi) / 2);
  let pm = phaseDeg(t(fc)) + 180;
  if (pm > 180) pm -= 360;
  const closed = (f: number) => {
    const x = t(f);
    return x.div(ONE.add(x)).abs();
  };
  // peaking against the low-frequency value (1 mHz: the loop gain there is its DC value), as
  // lib/engine/README.md defines it ("peaking of 1/(1 + 1/(Aβ))")
  const peak = maxOverBand(closed, fc / 1e3, fc * 1e3).value;
  return { fc, pm, peakingDb: Math.max(0, 20 * Math.log10(peak / closed(1e-3))) };
}

describe("TIA stability: the noise-gain construction against the engine's figures", () => {
  const tia = (cf: number, gbw = 1e7, aol?: number) =>
    makeChain({
      nodes: [photodiode({ capacitance: 100e-12, shuntResistance: 1e13, amplitude: 1e-7 }), transimpedance("t", { rf: 1e6, cf, cin: 5e-12 }, { part: "p" }), adc("adc")],
      parts: { p: aol === undefined ? { gbw } : { gbw, aol } },
    });
  it("no cf, gbw-only op-amp: a second-order loop with Q = √(ωt·rf·C) (derived), crossover and margin agree", () => {
    const c = tia(0);
    const s = extra<Stability>(stageOf(analyze(c), "t"), "stability");
    const C = 105e-12;
    near(s.cin, C, { rel: 1e-12 }, "lib/engine/README.md: the loop sees the photodiode capacitance plus cin");
    // Derived: with A = ωt/s and Rsh → ∞, T = ωt/(s·(1 + s·rf·C)), the closed loop −rf/(1 + s/ωt + s²·rf·C/ωt):
    // ωn = √(ωt/(rf·C)), Q = √(ωt·rf·C). |T(ωc)| = 1 gives x = ωc·rf·C with x²(1 + x²) = Q⁴, and
    // PM = 90° − atan(x) = atan(1/x). (The textbook second-order form PM = atan(2ζ/√(√(1 + 4ζ⁴) − 2ζ²)),
    // ζ = 1/(2Q), control-systems texts, from memory, is the same number.)
    const wt = 2 * Math.PI * 1e7;
    const q = Math.sqrt(wt * 1e6 * C);
    const x = Math.sqrt((Math.sqrt(1 + 4 * q ** 4) - 1) / 2);
    const zeta = 1 / (2 * q);
    near(Math.atan(1 / x), Math.atan((2 * zeta) / Math.sqrt(Math.sqrt(1 + 4 * zeta ** 4) - 2 * zeta ** 2)), { rel: 1e-12 }, "self-check: the derived margin equals the textbook second-order form");
    near(s.crossover, x / (2 * Math.PI * 1e6 * C), { rel: 1e-6 }, "derived: crossover ωc = x/(rf·C)");
    near(s.phaseMarginDeg, (Math.atan(1 / x) * 180) / Math.PI, { abs: 1e-4 }, "derived: PM = atan(1/x) of the second-order TIA loop");
    // second-order low-pass peak Q/√(1 − 1/(4Q²)) for Q > 1/√2 (references.md §6 form; a standard result)
    near(s.peakingDb, 20 * Math.log10(q / Math.sqrt(1 - 1 / (4 * q * q))), { abs: 1e-4 }, "derived: closed-loop peaking of the second-order loop");
    holds(s.phaseMarginDeg < 45, "self-check: this uncompensated TIA is below the 45° target");
    same(warningsOf(analyze(c), "tia-stability", "t").length > 0, true, "lib/engine/README.md: tia-stability under 45° (a common target)");
  });
  for (const [label, cf, aol] of [
    ["cf at the common design rule", Math.sqrt(105e-12 / (2 * Math.PI * 1e6 * 1e7)), 1e5],
    ["a small cf", 0.5e-12, 3e5],
    ["a generous cf", 10e-12, undefined],
  ] as const) {
    it(`${label}: crossover, margin and peaking from our own loop gain`, () => {
      const c = tia(cf, 1e7, aol);
      const r = analyze(c);
      const s = extra<Stability>(stageOf(r, "t"), "stability");
      const ref = loop(aol === undefined ? { gbw: 1e7 } : { gbw: 1e7, aol }, 1e6, cf, 1e13, 105e-12);
      near(s.crossover, ref.fc, { rel: 1e-5 }, `noise-gain construction, |A·β| = 1 by bisection, ${label}`);
      near(s.phaseMarginDeg, ref.pm, { abs: 1e-3 }, `noise-gain construction, 180° + arg(A·β) at the crossover, ${label}`);
      near(s.peakingDb, ref.peakingDb, { abs: 1e-3 }, `noise-gain construction, max 20·log10|T/(1 + T)|, ${label}`);
      // the design rule cf = √(Cin/(2π·rf·GBW)) (common practice, lib/engine/README.md), the same for every cf
      near(s.suggestedCf, Math.sqrt(105e-12 / (2 * Math.PI * 1e6 * 1e7)), { rel: 1e-9 }, "common design rule cf = √(C/(2π·rf·GBW))");
      same(warningsOf(r, "tia-stability", "t").length > 0, ref.pm < 45, `lib/engine/README.md: tia-stability exactly when the margin is under 45°, ${label}`);
    });
  }
});

describe("TIA output noise density, term by term (ideal-gain op-amp with en and in)", () => {
  it("4kT/rf, shot, shunt and in− through |Zf|, en through the noise gain |1 + Zf·Ys|", () => {
    const [rf, cf, cj, rsh, i0, dark, en, inoise] = [1e5, 2e-12, 50e-12, 1e8, 2e-6, 1e-9, 8e-9, 2e-13];
    const c = makeChain({
      nodes: [photodiode({ dc: i0, darkCurrent: dark, capacitance: cj, shuntResistance: rsh, amplitude: 1e-7 }), transimpedance("t", { rf, cf }, { part: "p" }), adc("adc")],
      parts: { p: { en, in: inoise } },
    });
    const freqs = [10, 1e3, 1e5, 3e5];
    const density = pathTo(analyze(c, freqs), "adc").noise.density as number[];
    freqs.forEach((f, i) => {
      // Derived for an ideal-gain op-amp, (+) at ground: every current noise at (−) (rf's Johnson
      // current 4kT/rf, the shot noise 2q(I + Idark) by Schottky's formula, the shunt's 4kT/Rsh, the
      // op-amp's in−) flows through Zf = rf/(1 + jω·rf·cf); en appears times 1 + Zf·Ys, Ys = 1/Rsh + jω·Cj.
      const s = jw(f);
      const zf = cx(rf, 0).div(ONE.add(s.mul(rf * cf)));
      const ng = ONE.add(zf.mul(cx(1 / rsh, 0).add(s.mul(cj))));
      const currents = (4 * K_BOLTZMANN * T) / rf + 2 * Q_ELECTRON * (i0 + dark) + (4 * K_BOLTZMANN * T) / rsh + inoise * inoise;
      const want = Math.sqrt(currents * zf.abs() ** 2 + en * en * ng.abs() ** 2);
      near(density[i], want, { rel: 1e-9 }, `derived TIA noise: Johnson (Nyquist 1928), shot (Schottky), en·noise gain, at ${f} Hz`);
    });
  });
});

describe("charge amplifier on a piezo element", () => {
  const [cs, rl, cf, rf] = [1e-9, 1e11, 100e-12, 1e9];
  it("ideal op-amp: Vo/q = −s·rf/(1 + s·rf·cf), the corner 1/(2π·rf·cf) and −1/cf (−Cs/cf of the open-circuit voltage) in the band", () => {
    const fc = 1 / (2 * Math.PI * rf * cf);
    const c = makeChain({ nodes: [piezo({ capacitance: cs, leakage: rl, fLow: 0.5, fHigh: 5e3 }), chargeAmp("q", { cf, rf }), adc("adc")] });
    const freqs = [0.1, fc, 100, 1e4];
    const r = analyze(c, freqs);
    const resp = pathTo(r, "adc").response;
    freqs.forEach((f, i) => {
      const s = jw(f);
      const h = s.mul(-rf).div(ONE.add(s.mul(rf * cf))); // lib/chain/README.md ideal H(s)
      near(resp.magDb[i], dB(h), { abs: 1e-7 }, `lib/chain/README.md chargeAmp ideal H(s), ${f.toPrecision(3)} Hz`);
      nearPhase(resp.phaseDeg[i], phaseDeg(h), 1e-6, `lib/chain/README.md chargeAmp ideal H(s), ${f.toPrecision(3)} Hz`);
    });
    near(resp.magDb[1], 20 * Math.log10(1 / cf / Math.SQRT2), { abs: 1e-7 }, "derived: −3 dB from 1/cf at 1/(2π·rf·cf)");
    // in the band the output over the open-circuit voltage q/Cs is −Cs/cf (the usual charge-amp gain, derived from −1/cf)
    near(resp.magDb[3]! - 20 * Math.log10(1 / cs), 20 * Math.log10(cs / cf), { abs: 2e-6 }, "derived: Vo/Voc → −Cs/cf well above the corner");
    near(extra<number>(stageOf(r, "q"), "lowCorner"), fc, { rel: 1e-12 }, "lib/chain/README.md: the low corner 1/(2π·rf·cf)");
    same(warningsOf(r, "charge-corner", "q").length, 1, "lib/engine/README.md: charge-corner when 1/(2π·rf·cf) lies above fLow (1.59 Hz > 0.5 Hz)");
  });
  it("finite flat gain: Vo/q = −s/(Yf + (Yf + Ys)/A), the in-band gain −Cs/(cf + (Cs + cf)/A)", () => {
    const aol = 2000;
    const c = makeChain({ nodes: [piezo({ capacitance: cs, leakage: rl, fLow: 2, fHigh: 5e3 }), chargeAmp("q", { cf, rf }, { part: "p" }), adc("adc")], parts: { p: { aol } } });
    const freqs = [0.3, 3, 1e3, 5e4];
    const r = analyze(c, freqs);
    const resp = pathTo(r, "adc").response;
    freqs.forEach((f, i) => {
      // Derived by KCL at (−) with V− = −Vo/A: (V− − Vo)·Yf + V−·Ys = s·q, Yf = 1/rf + s·cf, Ys = 1/Rl + s·Cs
      const s = jw(f);
      const yf = cx(1 / rf, 0).add(s.mul(cf));
      const ys = cx(1 / rl, 0).add(s.mul(cs));
      const h = s.neg().div(yf.add(yf.add(ys).div(aol)));
      near(resp.magDb[i], dB(h), { abs: 1e-7 }, `derived finite-gain charge amp, ${f} Hz`);
      nearPhase(resp.phaseDeg[i], phaseDeg(h), 1e-6, `derived finite-gain charge amp, ${f} Hz`);
    });
    // the textbook in-band limit (rf and Rl open): |Vo/Voc| = Cs/(cf + (Cs + cf)/A)
    near(resp.magDb[2]! - 20 * Math.log10(1 / cs), 20 * Math.log10(cs / (cf + (cs + cf) / aol)), { abs: 1e-3 }, "derived: the in-band charge gain with finite open-loop gain");
  });
});

describe("difference amplifier on a bridge: arm loading and resistor mismatch", () => {
  it("matched 10 k/100 k behind a 350 Ω bridge: Vd gain r2/(r1 + R/2), no common-mode shift", () => {
    const R = 350;
    const c = makeChain({ nodes: [bridge({ excitation: 5, fullScale: 2e-3, resistance: R }), differenceAmp("d", { r1: 1e4, r2: 1e5, r3: 1e4, r4: 1e5 }), adc("adc")] });
    const r = analyze(c, [1, 50]);
    // Derived: each leg adds R/2 to r1 and to r3, so r4/(r3 + R/2) still equals r2/(r1 + R/2): the pair sees
    // a matched stage of gain r2/(r1 + R/2) (vcm rejected), not the unloaded r2/r1 = 10.
    const g = 1e5 / (1e4 + R / 2);
    near(pathTo(r, "adc").adc?.pathDcGain, g, { rel: 1e-12 }, "derived: loaded difference gain r2/(r1 + R/2)");
    near(pathTo(r, "adc").response.magDb[1], 20 * Math.log10(g), { abs: 1e-9 }, "derived: flat response of the ideal stage");
    const vd = 5 * 2e-3 * 0.5; // mid-point of the 0..full-scale span
    const dc = stageOf(r, "d").dcOut!;
    // The common-mode error of lib/engine/README.md: |vcm|·t·Σ|∂Acm/∂ln ri|. Derived by hand for this
    // balanced-with-legs stage (a = r1 + R/2, G' = r2/a): |∂Acm/∂ln r2| = |∂Acm/∂ln r4| = G'/(1 + G') and
    // |∂Acm/∂ln r1| = |∂Acm/∂ln r3| = (r1/a)·G'/(1 + G'), so 2t·(1 + r1/a)·G'/(1 + G'): the 4t·G/(1 + G)
    // of the README when R = 0, a little less here, as the legs do not vary with the tolerance.
    const a = 1e4 + R / 2;
    const err = 2.5 * 0.01 * 2 * (1 + 1e4 / a) * (g / (1 + g));
    near(dc.min, g * vd - err, { abs: 1e-9 }, "derived: DC = G·Vd(mid) less the common-mode error");
    near(dc.max, g * vd + err, { abs: 1e-9 }, "derived: DC = G·Vd(mid) plus the common-mode error");
  });
  it("a matched network stated as 0.01 % by tolerances.overrides: its common-mode error and worst CMRR use 0.01 %", () => {
    const [r1, r2] = [1e4, 1e5];
    const c = makeChain({ nodes: [thermocouple({ vcm: 2, tLow: 25, tHigh: 25.0001 }), differenceAmp("d", { r1, r2, r3: r1, r4: r2 }), adc("adc")] });
    c.tolerances = { ...c.tolerances, overrides: { "d.r1": 1e-4, "d.r2": 1e-4, "d.r3": 1e-4, "d.r4": 1e-4 } };
    const s = stageOf(analyze(c), "d");
    const G = r2 / r1;
    // derived (support/reference-analysis cmError): matched, no legs, each |∂Acm/∂ln ri| = G/(1 + G)
    near((s.dcOut!.max - s.dcOut!.min) / 2, (2 * 4 * 1e-4 * G) / (1 + G), { rel: 1e-6 }, "lib/chain/README.md overrides: the stated 0.01 % sets |vcm|·4t·G/(1 + G)");
    near(extra<{ worstDb: number }>(s, "cmrr").worstDb, 20 * Math.log10((1 + G) / 4e-4), { abs: 1e-5 }, "worst-case CMRR (1 + G)/(4t) with the stated t = 0.01 %");
  });
  it("CMRR: nominal |Ad/Acm| from the four-resistor transfer, worst case (1 + G)/(4t) when matched", () => {
    // Derived from Vo = V+·(1 + r2/r1) − V−·r2/r1 with V+ = E+·r4/(r3 + r4) (ideal op-amp, no legs: a
    // thermocouple with leadResistance 0): Ad = (k·(1 + G) + G)/2, Acm = k·(1 + G) − G, k = r4/(r3 + r4), G = r2/r1.
    const [r1, r2, r3, r4] = [1e4, 1e5, 1.01e4, 1e5];
    const c = makeChain({ nodes: [thermocouple({ vcm: 1 }), differenceAmp("d", { r1, r2, r3, r4 }), adc("adc")] });
    const cm = extra<{ differentialGain: number; commonModeGain: number; nominalDb: number | null; worstDb: number }>(stageOf(analyze(c), "d"), "cmrr");
    const G = r2 / r1;
    const k = r4 / (r3 + r4);
    const ad = (k * (1 + G) + G) / 2;
    const acm = k * (1 + G) - G;
    near(cm.differentialGain, ad, { rel: 1e-9 }, "derived four-resistor Ad");
    near(cm.commonModeGain, acm, { rel: 1e-6 }, "derived four-resistor Acm (1 % mismatch of r3)");
    near(cm.nominalDb, 20 * Math.log10(Math.abs(ad / acm)), { abs: 1e-6 }, "derived: CMRR = 20·log10|Ad/Acm|");
    const matched = makeChain({ nodes: [thermocouple({ vcm: 1 }), differenceAmp("d", { r1, r2, r3: r1, r4: r2 }), adc("adc")] });
    const cm2 = extra<{ nominalDb: number | null; worstDb: number }>(stageOf(analyze(matched), "d"), "cmrr");
    same(cm2.nominalDb, null, "matched resistors: Acm = 0, no finite nominal CMRR (the engine's null)");
    // textbook worst case for 1 % resistors (from memory: CMRR ≈ (1 + G)/(4t)), which the derived
    // first-order spread 4t·G/(1 + G) of Acm over Ad = G gives exactly
    near(cm2.worstDb, 20 * Math.log10((1 + G) / (4 * 0.01)), { abs: 1e-6 }, "worst-case CMRR (1 + G)/(4t) of a matched four-resistor stage");
  });
});

describe("three-op-amp in-amp", () => {
  it("gain 1 + 2·rf/rg on a flat response, its internal common-mode levels, and the warning on a 5 V supply", () => {
    const [rg, rf] = [1e3, 24.5e3];
    const G = 1 + (2 * rf) / rg; // 50, the standard three-op-amp result (any instrumentation text)
    const mk = (rails: { low: number; high: number }) =>
      makeChain({ nodes: [bridge({ excitation: 5, fullScale: 2e-3, loadLow: -1, loadHigh: 1, resistance: 350 }), inAmp("ia", { rg, rf, vref: 2.5 }, { rails }), adc("adc")] });
    const r = analyze(mk({ low: -15, high: 15 }), [1, 30]);
    near(pathTo(r, "adc").adc?.pathDcGain, G, { rel: 1e-12 }, "textbook in-amp gain 1 + 2·rf/rg (legs carry no current with ideal op-amps)");
    near(pathTo(r, "adc").response.magDb[1], 20 * Math.log10(G), { abs: 1e-9 }, "textbook in-amp gain, flat with ideal op-amps");
    near(stageOf(r, "ia").dcOut?.max, 2.5, { abs: 1e-12 }, "derived: Vd mid-point 0 (load −1..1), the output sits at vref");
    const cm = extra<{ vcm: number; pins: { min: number; max: number }; internal: { min: number; max: number } }>(stageOf(r, "ia"), "commonMode");
    // Derived with ideal gains: the inputs are vcm ± Vd/2, the first-stage outputs vcm ± G·Vd/2, with
    // |Vd| up to excitation·fullScale = 10 mV and vcm = excitation/2 = 2.5 V.
    near(cm.pins.min, 2.5 - 0.005, { abs: 1e-12 }, "derived: input pins vcm − Vd/2");
    near(cm.pins.max, 2.5 + 0.005, { abs: 1e-12 }, "derived: input pins vcm + Vd/2");
    near(cm.internal.min, 2.5 - (G * 0.01) / 2, { abs: 1e-12 }, "derived: A1/A2 outputs vcm − G·Vd/2");
    near(cm.internal.max, 2.5 + (G * 0.01) / 2, { abs: 1e-12 }, "derived: A1/A2 outputs vcm + G·Vd/2");
    same(warningsOf(r, "inamp-common-mode", "ia").length, 0, "±15 V: every internal level inside");
    // on 0..2.6 V the first stage must swing to 2.75 V: outside the rail
    same(warningsOf(analyze(mk({ low: 0, high: 2.6 })), "inamp-common-mode", "ia").length > 0, true, "lib/engine/README.md inamp-common-mode: A1/A2 outputs vcm ± G·Vd/2 beyond the swing");
  });
  it("stated CMRR: ± |vcm|·G/CMRR at the output (lib/engine/README.md)", () => {
    const c = makeChain({ nodes: [thermocouple({ vcm: 2, tLow: 25, tHigh: 25.0001 }), inAmp("ia", { rg: 5e3, cmrrDb: 80 }), adc("adc")] });
    const dc = stageOf(analyze(c), "ia").dcOut!;
    const G = 1 + 50e3 / 5e3;
    const vd = 41e-6 * 0.00005; // the mid-point of the 25..25.0001 °C range over tCold 25 °C
    near((dc.max - dc.min) / 2, (2 * G) / 1e4, { rel: 1e-9 }, "derived: |vcm|·G/10^(80/20)");
    near((dc.max + dc.min) / 2, G * vd, { abs: 1e-12 }, "derived: centre G·Vd(mid)");
  });
});

describe("photodiode without a TIA, and a band from DC through an integrator", () => {
  it("photovoltaic mode into a follower: V/i = Rsh/(1 + s·Rsh·Cj) (the Norton section unloaded)", () => {
    const [rsh, cj] = [1e8, 1e-10];
    const c = makeChain({ nodes: [photodiode({ shuntResistance: rsh, capacitance: cj }), noninverting("f", { rf: null, rg: null }), adc("adc")] });
    const freqs = [0.1, 15.9, 1e3];
    const resp = pathTo(analyze(c, freqs), "adc").response;
    freqs.forEach((f, i) => {
      const h = cx(rsh, 0).div(ONE.add(jw(f).mul(rsh * cj))); // derived: the current into Rsh ∥ Cj
      near(resp.magDb[i], dB(h), { abs: 1e-7 }, `derived photovoltaic response, ${f} Hz`);
      nearPhase(resp.phaseDeg[i], phaseDeg(h), 1e-6, `derived photovoltaic response, ${f} Hz`);
    });
  });
  it("thermocouple (band from DC) → in-amp → integrator: the integrator's peak is null with a warning, the in-amp's is finite", () => {
    const c = makeChain({ nodes: [thermocouple(), inAmp("ia", { rg: 1e3 }), integrator("int", { r1: 1e4, c2: 1e-6 }), adc("adc")] });
    const r = analyze(c);
    const G = 1 + 50e3 / 1e3;
    near(stageOf(r, "ia").acPeak, (G * 41e-6 * 400) / 2, { rel: 1e-9 }, "derived: in-amp peak G·seebeck·(tHigh − tLow)/2, flat from DC");
    same(stageOf(r, "int").acPeak, null, "chain-format.md: a peak at DC through an integrator has no finite value: null");
    holds(r.warnings.some((w) => w.nodeId === "int"), "chain-format.md: null with a warning");
    holds(Number.isFinite(responseAt(c, "ia", 1).abs()), "self-check: the nodal reference is regular away from DC");
  });
});


