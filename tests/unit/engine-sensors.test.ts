/**
 * Sensor sources and their front-end stages against closed forms. Each check names where its value comes
 * from; "derived" means derived here from the circuit as drawn in chain-format.md ("Sensor sources").
 */
import Complex from "complex.js";
import { describe, expect, it } from "vitest";
import { analyzeChain, bridgeOutput, compileChain, differenceAmpCmSpread, differenceAmpGains, tiaStability } from "@/lib/engine";
import type { Chain, ChainNode, Part } from "@/lib/chain/types";
import { BOLTZMANN } from "@/lib/engine/constants";
import { adc, line, rails } from "./engine-fixtures";

const TAU = 2 * Math.PI;
const safety = "low-voltage" as const;

const bridge = (p: Record<string, unknown> = {}): ChainNode =>
  ({ id: "src", kind: "bridge", params: { excitation: 5, fullScale: 0.002, loadLow: 0, loadHigh: 1, offset: 0, resistance: 350, vcm: null, fLow: 0, fHigh: 10, noiseDensity: 0, safety, ...p } }) as ChainNode;
const photodiode = (p: Record<string, unknown> = {}): ChainNode =>
  ({ id: "src", kind: "photodiode", params: { dc: 0, dcSpread: 0, amplitude: 1e-6, fLow: 0, fHigh: 1e3, capacitance: 100e-12, shuntResistance: 1e9, darkCurrent: 0, noiseDensity: 0, safety, ...p } }) as ChainNode;
const piezo = (p: Record<string, unknown> = {}): ChainNode =>
  ({ id: "src", kind: "piezo", params: { amplitude: 1e-10, fLow: 1, fHigh: 1e3, capacitance: 1e-9, leakage: 1e9, safety, ...p } }) as ChainNode;
const op = (id: string, kind: string, params: Record<string, unknown>, part: string | null = null, r = rails()): ChainNode =>
  ({ id, kind, params: { vref: 0, ...(kind === "transimpedance" || kind === "chargeAmp" ? { cin: 0 } : {}), ...params }, rails: r, part }) as ChainNode;

function at(chain: Chain, id: string, f: number): Complex {
  const cc = compileChain(chain);
  const sw = cc.sweep(Float64Array.of(f));
  const i = cc.nodeIds.indexOf(id);
  return new Complex(sw.cumRe[i][0], sw.cumIm[i][0]);
}

describe("ideal H(s) of the new kinds against their closed forms", () => {
  it("transimpedance: −rf/(1 + s·rf·cf) per ampere (derived: virtual ground, so Cj and Rsh carry no current)", () => {
    const ch = line([photodiode(), op("t", "transimpedance", { rf: 1e6, cf: 2e-12, cin: 5e-12 })]);
    for (const f of [1, 1e3, 79577.47, 1e6]) {
      const want = new Complex(-1e6, 0).div(new Complex(1, TAU * f * 1e6 * 2e-12));
      expect(at(ch, "t", f).sub(want).abs() / want.abs()).toBeLessThan(1e-12);
    }
  });
  it("charge amplifier: −s·rf/(1 + s·rf·cf) per coulomb, −1/cf in its passband (derived; the usual charge-amp gain)", () => {
    const ch = line([piezo(), op("q", "chargeAmp", { cf: 1e-9, rf: 1e9 })]);
    const fc = 1 / (TAU * 1e9 * 1e-9);
    expect(at(ch, "q", 1e4).abs()).toBeCloseTo(1e9, -2); // 1/cf = 1e9 V/C well above fc
    const h = at(ch, "q", fc); // at the corner: |H| = (1/cf)/√2, +135° (−1 · 45° lead)
    expect(h.abs() / (1e9 / Math.SQRT2)).toBeCloseTo(1, 10);
    expect((h.arg() * 180) / Math.PI).toBeCloseTo(-135, 8);
  });
  it("the stage's f0 is 1/(2π·rf·cf) for both (first-order pole of rf ∥ cf, derived from the H(s) above); none without cf", () => {
    const tia = analyzeChain(line([photodiode(), op("t", "transimpedance", { rf: 1e6, cf: 2e-12 }), adc("adc")]));
    const t = tia.paths[0].stages.find((s) => s.id === "t")!;
    expect(t.f0! / (1 / (TAU * 1e6 * 2e-12))).toBeCloseTo(1, 12); // 79.577 kHz
    expect(t.q).toBeNull();
    // where the ideal |H| is rf/√2: the corner the card and the plot's marker show
    const ch = line([photodiode(), op("t", "transimpedance", { rf: 1e6, cf: 2e-12 })]);
    expect(at(ch, "t", t.f0!).abs() / (1e6 / Math.SQRT2)).toBeCloseTo(1, 10);
    const amp = analyzeChain(line([piezo(), op("q", "chargeAmp", { cf: 1e-9, rf: 1e9 }), adc("adc")])).paths[0].stages.find((s) => s.id === "q")!;
    expect(amp.f0! * TAU * 1e9 * 1e-9).toBeCloseTo(1, 12); // 0.159 Hz
    const bare = analyzeChain(line([photodiode(), op("t", "transimpedance", { rf: 1e6, cf: 0 }), adc("adc")])).paths[0].stages.find((s) => s.id === "t")!;
    expect(bare.f0).toBeNull();
  });
  it("each stage's own gain over the band (bandGain): 1/cf for a charge amplifier, whose DC gain is 0; K for a Sallen-Key high-pass well above f0 (derived from their H(s))", () => {
    // charge amp, ideal op-amp: |H| = (1/cf)·ωτ/√(1 + (ωτ)²), τ = rf·cf = 1 s, largest at the band's top (2 kHz)
    const q = analyzeChain(line([piezo({ fLow: 2, fHigh: 2e3 }), op("q", "chargeAmp", { cf: 1e-9, rf: 1e9 }), adc("adc")])).paths[0].stages.find((s) => s.id === "q")!;
    const wt = TAU * 2e3 * 1;
    expect(q.dcGain).toBe(0);
    expect(q.bandGain! / (1e9 * (wt / Math.hypot(1, wt)))).toBeCloseTo(1, 9);
    // Sallen-Key high-pass, equal capacitors, gain K = 1 + rf/rg = 2: f0 = 1/(2π·√(r1r2)·c) = 1.13 kHz;
    // a band from 100 kHz to 1 MHz sees the asymptote K (within (f0/f)² of it)
    const hp = { id: "src", kind: "source", params: { dc: 0, dcSpread: 0, amplitude: 0.1, fLow: 1e5, fHigh: 1e6, resistance: 0, noiseDensity: 0, safety } } as ChainNode;
    const sk = analyzeChain(line([hp, op("h", "sallenKeyHighpass", { c1: 1e-8, c2: 1e-8, r1: 1e4, r2: 2e4, rf: 1e4, rg: 1e4 }), adc("adc")])).paths[0].stages.find((s) => s.id === "h")!;
    expect(sk.dcGain).toBe(0);
    expect(sk.bandGain! / 2).toBeCloseTo(1, 3);
  });
  it("difference amplifier: gain r2/r1 with r4/r3 = r2/r1 and no legs; 0 common-mode gain (derived from the two dividers)", () => {
    const ch = line([bridge({ resistance: 1e-9 }), op("d", "differenceAmp", { r1: 1e4, r2: 1e5, r3: 1e4, r4: 1e5 })]);
    expect(at(ch, "d", 1).re).toBeCloseTo(10, 6);
    const g = differenceAmpGains(1e4, 1e5, 1e4, 1e5);
    expect(g.ad).toBe(10);
    expect(g.acm).toBe(0);
  });
  it("instrumentation amplifier (3-op-amp): gain 1 + 2·rf/rg (the textbook three-op-amp result)", () => {
    const ch = line([bridge(), op("ia", "inAmp", { rg: 1e3, rf: 24.5e3, rd: 10e3, cmrrDb: null })]);
    expect(at(ch, "ia", 1).re).toBeCloseTo(1 + (2 * 24.5e3) / 1e3, 10);
  });
  it("in-amp with GBW: the closed form n²K/((dK + n·rg)(2d + n)) has its DC value at finite aol (derived)", () => {
    const parts: Record<string, Part> = { p: { aol: 1e5, gbw: 1e6 } };
    const ch = line([bridge(), op("ia", "inAmp", { rg: 1e3, rf: 24.5e3, rd: 10e3, cmrrDb: null }, "p")], parts);
    const K = 1e3 + 49e3;
    const A = 1e5;
    // ideal first stage K/rg under loop gain A·rg/K; the unity difference stage A/(2 + A)
    const want = (A * K) / (K + A * 1e3) * (A / (2 + A));
    expect(at(ch, "ia", 1e-6).re / want).toBeCloseTo(1, 9);
  });
});

describe("bridge output", () => {
  it("quarter bridge ≈ Vex·ΔR/(4R) for small ΔR; exact from the two dividers (derived)", () => {
    const vex = 5;
    const x = 0.002;
    // dividers: R(1+x)/(R(1+x) + R) − 1/2
    const exact = vex * ((1 + x) / (2 + x) - 0.5);
    expect(bridgeOutput(vex, x, 1)).toBeCloseTo(exact, 15);
    expect(bridgeOutput(vex, x, 1) / ((vex * x) / 4)).toBeCloseTo(1, 2); // x/(4 + 2x): 0.1 % low at x = 0.002
    expect(bridgeOutput(vex, x, 2)).toBeCloseTo((vex * x) / 2, 15);
    expect(bridgeOutput(vex, x, 4)).toBeCloseTo(vex * x, 15);
  });
  it("a bridge source carries excitation × rated output as its full-scale differential signal", () => {
    const ch = line([bridge({ excitation: 5, fullScale: 0.002, offset: 4e-4 }), op("ia", "inAmp", { rg: 1e3, rf: 24.5e3, rd: 10e3, cmrrDb: null, vref: 2.5 }, null, rails(0, 5))]);
    const r = analyzeChain(ch);
    const st = r.paths[0].stages[0];
    const g = 50;
    // DC: mid-scale 5 mV ± 2 mV offset, times 50, onto vref 2.5 V
    expect(st.dcOut!.min).toBeCloseTo(2.5 + g * (0.005 - 0.002), 9);
    expect(st.dcOut!.max).toBeCloseTo(2.5 + g * (0.005 + 0.002), 9);
    expect(st.acPeak).toBeCloseTo(g * 0.005, 9);
  });
});

describe("difference amplifier CMRR from resistor mismatch", () => {
  it("Acm = (r1·r4 − r2·r3)/(r1·(r3 + r4)) (derived) and worst case 4t·G/(1 + G), CMRR (1 + G)/(4t) (Pallás-Areny & Webster, Sensors and Signal Conditioning, from memory; derived here)", () => {
    const [r1, r2, r3, r4] = [1e4, 1e5, 1.01e4, 1e5];
    expect(differenceAmpGains(r1, r2, r3, r4).acm).toBeCloseTo((r1 * r4 - r2 * r3) / (r1 * (r3 + r4)), 14);
    const G = 10;
    const t = 0.001;
    expect(differenceAmpCmSpread(1e4, 1e5, 1e4, 1e5, t) / ((4 * t * G) / (1 + G))).toBeCloseTo(1, 6);
  });
  it("the mismatch moves the output DC by Acm·vcm (engine against the formula)", () => {
    const [r1, r2, r3, r4] = [1e4, 1e5, 1.01e4, 1e5];
    const ch = line([bridge({ resistance: 1e-9, loadLow: 0, loadHigh: 0 }), op("d", "differenceAmp", { r1, r2, r3, r4 })]);
    ch.tolerances = { resistor: 0, capacitor: 0 };
    const r = analyzeChain(ch);
    const acm = (r1 * r4 - r2 * r3) / (r1 * (r3 + r4));
    expect(r.paths[0].stages[0].dcOut!.min).toBeCloseTo(acm * 2.5, 9);
  });
});

describe("TIA stability by the noise-gain construction", () => {
  it("phase margin 90° − atan(ωc·rf·Cin) where ωt/ω·1/|1 + jω·rf·Cin| = 1 (derived: cf = 0, GBW-only op-amp, rsh → ∞)", () => {
    const rf = 1e6;
    const cin = 100e-12;
    const gbw = 10e6;
    const tau = rf * cin;
    const wt = TAU * gbw;
    // ω²(1 + ω²τ²) = ωt²  →  ω² = (−1 + √(1 + 4τ²ωt²))/(2τ²)
    const wc = Math.sqrt((-1 + Math.sqrt(1 + 4 * tau * tau * wt * wt)) / (2 * tau * tau));
    const pm = 90 - (Math.atan(wc * tau) * 180) / Math.PI;
    const s = tiaStability(rf, 0, 1e15, cin, { gbw });
    expect(s.crossover! / (wc / TAU)).toBeCloseTo(1, 6);
    expect(s.phaseMarginDeg!).toBeCloseTo(pm, 4);
    expect(s.phaseMarginDeg!).toBeLessThan(10);
  });
  it("the suggested cf = √(Cin/(2π·rf·GBW)) (a common design rule) lifts the margin to about 45° or more", () => {
    const s0 = tiaStability(1e6, 0, 1e9, 100e-12, { gbw: 10e6, aol: 1e6 });
    const s1 = tiaStability(1e6, s0.suggestedCf!, 1e9, 100e-12, { gbw: 10e6, aol: 1e6 });
    expect(s0.suggestedCf!).toBeCloseTo(Math.sqrt(100e-12 / (TAU * 1e6 * 10e6)), 18);
    expect(s1.phaseMarginDeg!).toBeGreaterThan(45);
    expect(s1.peakingDb!).toBeLessThan(s0.peakingDb!);
  });
  it("analyzeChain warns with the suggested capacitor when the margin is low", () => {
    const parts: Record<string, Part> = { p: { gbw: 10e6, aol: 1e6 } };
    const ch = line([photodiode(), op("t", "transimpedance", { rf: 1e6, cf: 0 }, "p")], parts);
    const w = analyzeChain(ch).warnings.find((x) => x.code === "tia-stability");
    expect(w?.message).toMatch(/phase margin .*suggest|about .*F .*common design rule/);
  });
});

describe("charge-amp low corner, noise and cautions", () => {
  it("warns when 1/(2π·rf·cf) sits above the band's low edge", () => {
    const ch = line([piezo({ fLow: 1 }), op("q", "chargeAmp", { cf: 1e-9, rf: 1e7 })]);
    const r = analyzeChain(ch);
    expect(r.paths[0].stages[0].lowCorner).toBeCloseTo(1 / (TAU * 1e-2), 9);
    expect(r.warnings.some((x) => x.code === "charge-corner")).toBe(true);
    const ok = analyzeChain(line([piezo({ fLow: 1 }), op("q", "chargeAmp", { cf: 1e-9, rf: 1e10 })]));
    expect(ok.warnings.some((x) => x.code === "charge-corner")).toBe(false);
  });
  it("photodiode shot and shunt noise share the signal's transfer: their rms ratio is √(2qI/(4kT/Rsh)) (Schottky; Johnson–Nyquist)", () => {
    const i = 1e-6;
    const rsh = 1e8;
    const ch = line([photodiode({ dc: i, shuntResistance: rsh }), op("t", "transimpedance", { rf: 1e5, cf: 1e-11 })]);
    const c = analyzeChain(ch).paths[0].noise.contributions;
    const shot = c.find((x) => x.element === "shot")!.rms;
    const shunt = c.find((x) => x.element === "shunt")!.rms;
    const kT4 = 4 * BOLTZMANN * 298.15;
    expect(shot / shunt).toBeCloseTo(Math.sqrt((2 * 1.602176634e-19 * i) / (kT4 / rsh)), 9);
  });
  it("input-referred noise of a photodiode channel is a current: √((2qI + 4kT/Rsh + 4kT/rf)·B) through a flat ideal TIA (Schottky; Johnson–Nyquist; derived)", () => {
    const i = 1e-6;
    const rsh = 1e8;
    const rf = 1e5;
    // ideal op-amp (no part), no cf: the TIA is −rf at every frequency, so the noise band B is exactly fHigh − fLow
    const ch = line([photodiode({ dc: i, shuntResistance: rsh, capacitance: 0, fLow: 10, fHigh: 1e3 }), op("t", "transimpedance", { rf, cf: 0 })], {}, { noiseLow: 10, noiseHigh: 1e3 });
    const nz = analyzeChain(ch).paths[0].noise as { inputUnit?: string; bandGain?: number; inputReferredRms?: number; outputRms: number };
    expect(nz.inputUnit).toBe("A");
    expect(nz.bandGain! / rf).toBeCloseTo(1, 9);
    const kT4 = 4 * BOLTZMANN * ch.analysis.temperatureK;
    const want = Math.sqrt((2 * 1.602176634e-19 * i + kT4 / rsh + kT4 / rf) * (1e3 - 10));
    expect(nz.inputReferredRms! / want).toBeCloseTo(1, 6); // about 0.76 nA rms
    // a piezo's figures are charges, a bridge's volts
    const q = analyzeChain(line([piezo(), op("q", "chargeAmp", { cf: 1e-9, rf: 1e9 })])).paths[0].noise as { inputUnit?: string };
    expect(q.inputUnit).toBe("C");
    const v = analyzeChain(line([bridge(), op("ia", "inAmp", { rg: 1e3, rf: 24.5e3, rd: 1e4, cmrrDb: null })])).paths[0].noise as { inputUnit?: string };
    expect(v.inputUnit).toBe("V");
  });
  it("every sensor source carries the safety caution when marked", () => {
    for (const src of [bridge({ safety: "body-connected" }), photodiode({ safety: "mains-connected" })]) {
      const next = src.kind === "bridge" ? op("ia", "inAmp", { rg: 1e3, rf: 24.5e3, rd: 1e4, cmrrDb: null }) : op("t", "transimpedance", { rf: 1e5, cf: 1e-11 });
      const w = analyzeChain(line([src, next])).warnings.find((x) => x.code === "safety");
      expect(w?.message).toMatch(/Local codes and licensed practice govern/);
    }
  });
});

describe("in-amp common-mode range", () => {
  it("flags the internal nodes when the first-stage gain pushes o1/o2 past the swing on a single supply", () => {
    const parts: Record<string, Part> = { r: { swingLow: 0.05, swingHigh: 0.05, inputLow: -0.1, inputHigh: 1.2 } };
    const fine = line([bridge(), op("ia", "inAmp", { rg: 1e3, rf: 24.5e3, rd: 1e4, cmrrDb: null, vref: 0.5 }, "r", rails(0, 5)), adc("a", { vinLow: 0, vinHigh: 4.096 })], parts);
    expect(analyzeChain(fine).warnings.some((w) => w.code === "inamp-common-mode")).toBe(false);
    // gain 1001: o1 = 2.5 V + 1001·5 mV ≈ 7.5 V > 4.95 V
    const hot = line([bridge(), op("ia", "inAmp", { rg: 50, rf: 25e3, rd: 1e4, cmrrDb: null, vref: 0.5 }, "r", rails(0, 5))], parts);
    const w = analyzeChain(hot).warnings.filter((x) => x.code === "inamp-common-mode");
    expect(w.some((x) => /input-stage outputs/.test(x.message))).toBe(true);
  });
});
