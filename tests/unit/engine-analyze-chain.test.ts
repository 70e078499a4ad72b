/**
 * analyzeChain: the whole result contract of chain-format.md ("Analysis result"), checked against the
 * worked example, closed forms and the check values of references.md (source named beside each check).
 */
import { describe, expect, it } from "vitest";
import { exampleChain } from "@/lib/chain/example";
import type { AnalysisResult, Chain, ChainNode, Part, StageResult } from "@/lib/chain/types";
import { analyzeChain, BOLTZMANN, ENGINE_VERSION, idealCharacteristics } from "@/lib/engine";
import { adc, chainOf, line, randomChain, rails, source } from "./engine-fixtures";

const op = (id: string, kind: string, params: Record<string, number | null>, extra: Record<string, unknown> = {}): ChainNode =>
  ({ id, kind, params: { vref: 0, ...params }, rails: rails(), part: null, ...extra }) as ChainNode;
const stage = (r: AnalysisResult, id: string, path = 0): StageResult => r.paths[path].stages.find((s) => s.id === id)!;
const codes = (r: AnalysisResult) => r.warnings.map((w) => `${w.nodeId}:${w.code}`);
/** |a − b| ≤ half a unit in the last printed digit of b (references.md §0 tolerance for printed values) */
const printed = (a: number | null | undefined, b: number, digits: number) =>
  expect(Math.abs((a ?? NaN) - b)).toBeLessThanOrEqual(0.5 * 10 ** -digits + 1e-15);

/** Every number anywhere in the result is finite. */
function allFinite(x: unknown): boolean {
  if (typeof x === "number") return Number.isFinite(x);
  if (Array.isArray(x)) return x.every(allFinite);
  if (x && typeof x === "object") return Object.values(x).every(allFinite);
  return true;
}

describe("analyzeChain", () => {
  describe("the worked example of chain-format.md", () => {
    const r = analyzeChain(exampleChain());
    const u1 = stage(r, "u1");
    const a = r.paths[0].adc!;
    it("has the format, engine version and path", () => {
      expect(r.format).toBe("chainwright.analysis/1");
      expect(r.engine).toBe(ENGINE_VERSION);
      expect(ENGINE_VERSION).toBe("0.1.0");
      expect(r.paths.map((p) => p.nodes)).toEqual([["src", "u1", "adc"]]);
    });
    it("reproduces the stage figures", () => {
      printed(u1.dcGain, -9.9989, 5);
      printed(u1.f0, 159.15, 2);
      expect(u1.q).toBeNull();
      printed(u1.dcOut!.min, -2.08007, 5);
      printed(u1.dcOut!.max, -1.87989, 5);
      printed(u1.acPeak, 0.494986, 6);
      printed(u1.peakOut!.min, -2.57506, 5);
      printed(u1.peakOut!.max, -1.38491, 5);
      expect(u1.usable).toEqual({ low: -4.95, high: 4.95 });
      expect(u1.status).toBe("ok");
      printed(u1.slewNeeded as number, 386.97, 2);
    });
    it("reproduces the noise figures", () => {
      const nz = r.paths[0].noise;
      printed(nz.outputRms, 1.369e-5, 8);
      printed(nz.totalRms, 1.369e-5, 8);
      expect(nz.low).toBe(0.1);
      expect(nz.high).toBe(1e6);
      expect(nz.contributions.reduce((t, c) => t + c.share, 0)).toBeCloseTo(1, 12);
      expect(nz.contributions[0]).toMatchObject({ nodeId: "u1", element: "en" });
    });
    it("reproduces the ADC figures and the alias warning", () => {
      expect(a.lsb).toBe(1.25e-4);
      printed(a.quantNoiseRms, 3.608e-5, 8);
      printed(a.idealSnrDb, 98.08, 2);
      printed(a.aliasAttenuationDb, 21.115, 3);
      printed(a.pathDcGain, -9.8999, 4);
      printed(a.rangeUse, 0.145, 3);
      expect(a.status).toBe("ok");
      // snr for a full-scale sine with totalRms and q/√12 in power (derived, references.md §12)
      const snr = 20 * Math.log10(8.192 / (2 * Math.SQRT2) / Math.hypot(r.paths[0].noise.totalRms, a.quantNoiseRms));
      expect(a.snrDb).toBeCloseTo(snr, 10);
      expect(a.enob).toBeCloseTo((snr - 1.76) / 6.02, 10);
      expect(codes(r)).toEqual(["adc:alias"]);
    });
    it("plots on the log grid with `points` points and exact ends", () => {
      const { f, magDb, phaseDeg } = r.paths[0].response;
      expect(f.length).toBe(600);
      expect(f[0]).toBe(0.1);
      expect(f[599]).toBe(1e6);
      expect(magDb.length).toBe(600);
      expect(phaseDeg.every((p) => p !== null && p > -180 && p <= 180)).toBe(true);
    });
  });

  describe("response", () => {
    it("uses opts.points over analysis.points, and exactly opts.freqs when given", () => {
      const ch = exampleChain();
      expect(analyzeChain(ch, { points: 7 }).paths[0].response.f.length).toBe(7);
      const r = analyzeChain(ch, { freqs: [10, 1e3, 3] });
      expect(r.paths[0].response.f).toEqual([10, 1e3, 3]);
    });
    it("wraps phase to (−180, 180]: an ideal inverting stage reads +180°", () => {
      const r = analyzeChain(line([source(), op("u", "inverting", { r1: 1e3, r2: 1e4 })]), { freqs: [1, 1e3, 1e6] });
      expect(r.paths[0].response.phaseDeg).toEqual([180, 180, 180]);
      expect(r.paths[0].response.magDb.every((m) => Math.abs(m! - 20) < 1e-12)).toBe(true);
    });
    it("is the voltage at the ADC pin over the source EMF, with the ADC's input resistance as load", () => {
      // divider Rin/(Rs + Rin) at every frequency (derived)
      const r = analyzeChain(line([source("s", { resistance: 1e3 }), adc("a", { inputResistance: 9e3 })]), { freqs: [1, 1e5] });
      for (const m of r.paths[0].response.magDb) expect(m).toBeCloseTo(20 * Math.log10(0.9), 12);
    });
    it("gives null and a `pole` warning where the response is not finite, never Infinity", () => {
      const r = analyzeChain(line([source(), op("i", "integrator", { r1: 1e4, c2: 1e-8 })]), { freqs: [0, 10] });
      expect(r.paths[0].response.magDb[0]).toBeNull();
      expect(r.paths[0].response.magDb[1]).toBeCloseTo(20 * Math.log10(1 / (2 * Math.PI * 10 * 1e-4)), 10);
      expect(codes(r)).toContain("i:pole");
      expect(allFinite(r)).toBe(true);
    });
  });

  describe("DC operating point", () => {
    it("takes the noise gain as driven: 1 + r2/(r1 + Rs) on ±vos (chain-format.md)", () => {
      const ch = line([source("s", { resistance: 1e3 }), op("u", "inverting", { r1: 1e4, r2: 1e5 }, { part: "p" })], { p: { vos: 1e-3 } });
      const u = stage(analyzeChain(ch), "u");
      expect(u.dcOut!.max).toBeCloseTo(1e-3 * (1 + 1e5 / 1.1e4), 15);
      expect(u.dcOut!.min).toBeCloseTo(-1e-3 * (1 + 1e5 / 1.1e4), 15);
      expect(u.dcGain).toBe(-10);
    });
    it("adds offset and bias terms worst-case (references.md §9, uncompensated 11 mV + 8 mV = 19 mV)", () => {
      const ch = line([source(), op("u", "inverting", { r1: 1e4, r2: 1e5 }, { part: "p" })], { p: { vos: 1e-3, ib: 80e-9 } });
      const u = stage(analyzeChain(ch), "u");
      expect(u.dcOut!.max).toBeCloseTo(0.019, 14);
      expect(u.dcOut!.min).toBeCloseTo(-0.019, 14);
    });
    it("non-inverting G = 100: NG·Vos + Ib·Rf = 109.9 mV (references.md §9)", () => {
      const ch = line([source(), op("u", "noninverting", { rf: 99e3, rg: 1e3 }, { part: "p" })], { p: { vos: 1e-3, ib: 100e-9 } });
      expect(stage(analyzeChain(ch), "u").dcOut!.max).toBeCloseTo(0.1099, 14);
    });
    it("lets every ± term take its sign independently through the cascade", () => {
      // stage 1: G = 2, vos 1 mV; stage 2: G = −3, vos 2 mV → 1 mV·2·3 + 2 mV·(1 + 3) = 14 mV (derived)
      const ch = line(
        [source(), op("a", "noninverting", { rf: 1e3, rg: 1e3 }, { part: "p1" }), op("b", "inverting", { r1: 1e3, r2: 3e3 }, { part: "p2" })],
        { p1: { vos: 1e-3 }, p2: { vos: 2e-3 } },
      );
      const b = stage(analyzeChain(ch), "b");
      expect(b.dcOut!.max).toBeCloseTo(0.014, 15);
      expect(b.dcOut!.min).toBeCloseTo(-0.014, 15);
    });
    it("carries the source's dc ± dcSpread and each vref", () => {
      // out = vref·(1 + r2/r1) − (r2/r1)·dc with r2/r1 = 2 (derived from superposition)
      const ch = line([source("s", { dc: 0.5, dcSpread: 0.01 }), op("u", "inverting", { r1: 1e3, r2: 2e3, vref: 1 })]);
      const u = stage(analyzeChain(ch), "u");
      expect(u.dcOut!.min).toBeCloseTo(3 - 2 * 0.51, 14);
      expect(u.dcOut!.max).toBeCloseTo(3 - 2 * 0.49, 14);
    });
    it("biases a high-pass output at vbias, loaded by what it drives", () => {
      const ch = line([source("s", { dc: 3 }), { id: "hp", kind: "rcHighpass", params: { r: 1e5, c: 1e-6, vbias: 2.5 } }, adc("a", { inputResistance: 4e5 })]);
      const r = analyzeChain(ch);
      expect(r.paths[0].adc!.dcIn).toEqual({ min: 2.5 * 0.8, max: 2.5 * 0.8 });
      expect(stage(r, "hp").dcGain).toBe(0);
    });
    it("loads the (+) input's bias current onto the source resistance (Sallen-Key follower)", () => {
      const ch = line([source("s", { resistance: 500 }), op("u", "sallenKeyLowpass", { r1: 1e4, r2: 2e4, c1: 2e-8, c2: 1e-8 }, { part: "p" })], {
        p: { ib: 1e-9, vos: 1e-4 },
      });
      // ib flows through Rs + r1 + r2 at DC; vos with unity noise gain (derived)
      expect(stage(analyzeChain(ch), "u").dcOut!.max).toBeCloseTo(1e-9 * 30500 + 1e-4, 15);
    });
  });

  describe("integrators", () => {
    const ch = line([
      source("s", { dc: 0.1, amplitude: 1e-4 }),
      op("i", "integrator", { r1: 1e4, c2: 1e-7 }),
      op("g", "noninverting", { rf: 1e3, rg: 1e3 }),
      { id: "hp", kind: "rcHighpass", params: { r: 1e5, c: 1e-6, vbias: 0.5 } },
      op("h", "noninverting", { rf: null, rg: null }),
    ]);
    const r = analyzeChain(ch);
    it("report no DC gain or output, status clip and `no-dc-path`", () => {
      const i = stage(r, "i");
      expect(i.dcGain).toBeNull();
      expect(i.dcOut).toBeNull();
      expect(i.peakOut).toBeNull();
      expect(i.status).toBe("clip");
      expect(codes(r)).toContain("i:no-dc-path");
    });
    it("leave what follows unbounded (null, with a warning naming the integrator)", () => {
      const g = stage(r, "g");
      expect(g.dcOut).toBeNull();
      expect(g.status).toBe("clip");
      const w = r.warnings.find((x) => x.nodeId === "g" && x.code === "dc-unbounded")!;
      expect(w.message).toMatch(/integrator i/);
    });
    it("are bounded again after a DC-blocking section", () => {
      expect(stage(r, "h").dcOut!.min).toBeCloseTo(0.5, 15);
      expect(stage(r, "h").dcOut!.max).toBeCloseTo(0.5, 15);
      expect(stage(r, "h").status).toBe("ok");
    });
    it("give a null peak when the source band reaches DC", () => {
      const dc = analyzeChain(line([source("s", { fLow: 0, fHigh: 10 }), op("i", "integrator", { r1: 1e4, c2: 1e-7 })]));
      expect(stage(dc, "i").acPeak).toBeNull();
      expect(codes(dc)).toContain("i:pole");
      expect(allFinite(dc)).toBe(true);
    });
    it("keep dcGain null even with a finite-aol part", () => {
      const fa = analyzeChain(line([source(), op("i", "integrator", { r1: 1e4, c2: 1e-7 }, { part: "p" })], { p: { aol: 1e5 } }));
      expect(stage(fa, "i").dcGain).toBeNull();
    });
  });

  describe("headroom", () => {
    // ±15 V rails, 1.5 V swing each side (usable ±13.5 V), inverting G = −10, Vos = 1 mV, Ib = 80 nA:
    // DC error 19 mV (references.md §9, uncompensated)
    const part: Part = { vos: 1e-3, ib: 80e-9, swingLow: 1.5, swingHigh: 1.5 };
    const run = (amplitude: number) =>
      analyzeChain(line([source("s", { amplitude }), op("u", "inverting", { r1: 1e4, r2: 1e5 }, { part: "p" })], { p: part }));
    it("is tight at a 1.2 V peak: 13.5 − 12.019 = 1.481 V to spare, under 10 % of 27 V (common practice)", () => {
      const r = run(1.2);
      const u = stage(r, "u");
      expect(u.acPeak).toBeCloseTo(12, 12);
      expect(u.status).toBe("tight");
      expect((u.margins as { high: number }).high).toBeCloseTo(13.5 - 12.019, 12);
      expect(codes(r)).toEqual(["u:rail-tight"]);
    });
    it("clips at a 1.4 V peak by 0.519 V and names the signal peak as the cause", () => {
      const r = run(1.4);
      const u = stage(r, "u");
      expect(u.status).toBe("clip");
      const w = r.warnings.find((x) => x.code === "rail-clip")!;
      expect(w.nodeId).toBe("u");
      expect(w.message).toMatch(/519 mV above/);
      expect(w.message).toMatch(/Largest push: the signal peak \(14 V\)/);
      expect(u.cause).toMatchObject({ check: "output", side: "high", cause: "the signal peak" });
    });
    it("marks ok / tight / clip at the 10 % boundary", () => {
      // ideal follower on ±1 V rails: usable span 2 V, tight under 0.2 V to spare
      const st = (dc: number) => stage(analyzeChain(line([source("s", { dc, amplitude: 0 }), { ...op("u", "noninverting", { rf: null, rg: null }), rails: { low: -1, high: 1 } } as ChainNode])), "u").status;
      expect(st(0.79)).toBe("ok");
      expect(st(0.81)).toBe("tight");
      expect(st(1.01)).toBe("clip");
      expect(st(-1.01)).toBe("clip");
    });
    it("names the source's DC when it drives a stage into a rail", () => {
      const r = analyzeChain(line([source("s", { dc: 2, amplitude: 0.01 }), op("u", "noninverting", { rf: 9e3, rg: 1e3 })]));
      const w = r.warnings.find((x) => x.code === "rail-clip")!;
      expect(w.message).toMatch(/reaches 20.1 V, 5.1 V above its high limit 15 V/);
      expect(w.message).toMatch(/Largest push: the source's DC \(20 V\)/);
    });
    it("names a reference when vref drives it", () => {
      const r = analyzeChain(line([source("s", { amplitude: 0.01 }), op("u", "inverting", { r1: 1e3, r2: 1e4, vref: -2 })]));
      const w = r.warnings.find((x) => x.code === "rail-clip")!;
      expect(w.message).toMatch(/below its low limit/);
      expect(w.message).toMatch(/the vref of u/);
    });
    it("checks the (+) input against its common-mode range (input-range)", () => {
      const ch = line([source("s", { dc: 3.6, amplitude: 0 }), { ...op("u", "noninverting", { rf: null, rg: null }, { part: "p" }), rails: { low: -5, high: 5 } } as ChainNode], {
        p: { inputHigh: 1.5 },
      });
      const r = analyzeChain(ch);
      const u = stage(r, "u");
      expect(u.inputRange).toEqual({ peak: { min: 3.6, max: 3.6 }, allowed: { low: -5, high: 3.5 } });
      expect(u.status).toBe("clip");
      expect(r.warnings.find((w) => w.code === "input-range")!.message).toMatch(/\(\+\) input reaches 3.6 V, 100 mV above/);
    });
  });

  describe("slew", () => {
    it("needs 2π·f·Vp at the band edge: 12 V peak at 10 kHz = 0.75398 V/µs (references.md §10)", () => {
      const ch = line([source("s", { amplitude: 1.2, fLow: 10, fHigh: 1e4 }), op("u", "noninverting", { rf: 9e3, rg: 1e3 }, { part: "p" })], { p: { slewRate: 0.5e6 } });
      const r = analyzeChain(ch);
      expect(stage(r, "u").slewNeeded).toBeCloseTo(0.75398e6, -1);
      expect(stage(r, "u").slewNeeded).toBeCloseTo(2 * Math.PI * 1e4 * 12, 6);
      expect(stage(r, "u").slewRate).toBe(0.5e6);
      expect(codes(r)).toContain("u:slew");
    });
    it("has no slew warning when the part is fast enough", () => {
      const ch = line([source("s", { amplitude: 1.2, fHigh: 1e4 }), op("u", "noninverting", { rf: 9e3, rg: 1e3 }, { part: "p" })], { p: { slewRate: 1e6 } });
      expect(codes(analyzeChain(ch))).not.toContain("u:slew");
    });
  });

  describe("noise", () => {
    const at = (T: number, extra: object = {}) => ({ temperatureK: T, ...extra });
    it("of a resistor is 4kTR: 1 kΩ over 10 kHz at 290 K gives 400.194 nV (references.md §11.1)", () => {
      const ch = line([source("s", { resistance: 1e3 }), op("u", "noninverting", { rf: null, rg: null })], {}, at(290, { noiseLow: 1e-9, noiseHigh: 1e4 }));
      const nz = analyzeChain(ch).paths[0].noise;
      expect(nz.outputRms).toBeCloseTo(Math.sqrt(4 * BOLTZMANN * 290 * 1e3 * (1e4 - 1e-9)), 16);
      printed(nz.outputRms * 1e9, 400.194, 3);
      expect(nz.contributions).toEqual([expect.objectContaining({ nodeId: "s", element: "resistance", share: 1 })]);
    });
    it("of an RC low-pass integrates to kT/C (references.md §11.2)", () => {
      const ch = line([source(), { id: "lp", kind: "rcLowpass", params: { r: 1e4, c: 1e-9 } }], {}, at(300, { noiseLow: 1e-3, fMax: 1e11 }));
      const nz = analyzeChain(ch, { points: 2 }).paths[0].noise;
      const fc = 1 / (2 * Math.PI * 1e4 * 1e-9);
      // exact over the band: (kT/C)·(2/π)·(atan(fH/fc) − atan(fL/fc)) (derived from ∫ 4kTR/(1 + (f/fc)²) df)
      const exact = ((BOLTZMANN * 300) / 1e-9) * (2 / Math.PI) * (Math.atan(1e11 / fc) - Math.atan(1e-3 / fc));
      expect(Math.abs(nz.totalRms ** 2 / exact - 1)).toBeLessThan(1e-6);
      printed(nz.totalRms * 1e6, 2.035177, 6);
    });
    it("of an op-amp stage: en·NG, in·Rf and the resistors (references.md §11.4, 300 K)", () => {
      const stageNoise = (en: number, cur: number, rf: number, rg: number, rs: number) => {
        const ch = line([source("s", { resistance: rs }), op("u", "noninverting", { rf, rg }, { part: "p" })], { p: { en, in: cur } }, at(300, { noiseLow: 1, noiseHigh: 1e4 + 1 }));
        return analyzeChain(ch, { points: 2 }).paths[0].noise;
      };
      const s1 = stageNoise(10e-9, 1e-12, 1e4, 1e3, 0);
      expect(s1.outputRms / 1e2).toBeCloseTo(118.4165e-9, 13);
      const byElement = Object.fromEntries(s1.contributions.map((c) => [c.element, c.rms / 1e2]));
      expect(byElement.en).toBeCloseTo(110e-9, 15);
      expect(byElement["in-"]).toBeCloseTo(10e-9, 15);
      expect(byElement.rf).toBeCloseTo(12.8716e-9, 13);
      expect(byElement.rg).toBeCloseTo(40.7035e-9, 13);
      expect(stageNoise(10e-9, 1e-12, 1e4, 1e3, 1e3).outputRms / 1e2).toBeCloseTo(127.0754e-9, 13);
      expect(stageNoise(4e-9, 0.5e-12, 99e3, 1e3, 0).outputRms / 1e2).toBeCloseTo(571.3767e-9, 12);
      expect(stageNoise(2.9e-9, 1.5e-12, 1e3, 1e3, 100).outputRms / 1e2).toBeCloseTo(8.703e-9, 12);
    });
    it("with a 1/f corner: 10 nV/√Hz, 100 Hz corner, 0.1 Hz–10 kHz → 1.05599 µV (references.md §11.4)", () => {
      const ch = line([source(), op("u", "noninverting", { rf: null, rg: null }, { part: "p" })], { p: { en: 10e-9, enCorner: 100 } }, { noiseLow: 0.1, noiseHigh: 1e4 });
      printed(analyzeChain(ch, { points: 2 }).paths[0].noise.outputRms * 1e6, 1.05599, 5);
    });
    it("of the Sallen-Key resistors: 0.455079 and 0.788221 µV, 0.910159 µV together (references.md §11.5)", () => {
      const ch = line([source(), op("u", "sallenKeyLowpass", { r1: 1e4, r2: 1e4, c1: 20e-9, c2: 10e-9 })], {}, at(300, { noiseLow: 1e-7, fMax: 1e11 }));
      const nz = analyzeChain(ch, { points: 2 }).paths[0].noise;
      const by = Object.fromEntries(nz.contributions.map((c) => [c.element, c.rms * 1e6]));
      printed(by.r1, 0.455079, 6);
      printed(by.r2, 0.788221, 6);
      printed(nz.outputRms * 1e6, 0.910159, 6);
    });
    it("of the MFB resistors: 0.371571, 0.371571, 1.083306 µV, 1.204027 µV together (references.md §11.5)", () => {
      const ch = line([source(), op("u", "mfbLowpass", { r1: 1e4, r2: 1e4, r3: 1e4, c1: 45e-9, c2: 10e-9 })], {}, at(300, { noiseLow: 1e-7, fMax: 1e11 }));
      const nz = analyzeChain(ch, { points: 2 }).paths[0].noise;
      const by = Object.fromEntries(nz.contributions.map((c) => [c.element, c.rms * 1e6]));
      printed(by.r1, 0.371571, 6);
      printed(by.r2, 0.371571, 6);
      printed(by.r3, 1.083306, 6);
      printed(nz.outputRms * 1e6, 1.204027, 6);
    });
    it("through a cascade into a 16-bit ADC: 4.284446 µV, SNR 97.9292 dB, ENOB 15.9749 (references.md §8)", () => {
      const ch = line(
        [
          source(),
          op("g", "noninverting", { rf: 1e4, rg: 1e3 }, { part: "p" }),
          op("sk", "sallenKeyLowpass", { r1: 1e4, r2: 1e4, c1: 20e-9, c2: 10e-9 }),
          adc("adc", { vinLow: -2.5, vinHigh: 2.5, sampleRate: 1e4 }),
        ],
        { p: { en: 10e-9, in: 1e-12 } },
        // the published figures integrate from 0 to ∞: a band of 1e-7 Hz … 1e11 Hz is that to 1e-10
        at(300, { noiseLow: 1e-7, fMax: 1e11 }),
      );
      const p = analyzeChain(ch, { points: 2 }).paths[0];
      // exact: the stage's density (en·NG)² + (in·Rf)² + 4kT·(Rf + Rg·(Rf/Rg)²) over the R1 path's
      // 1250 Hz, plus the Sallen-Key resistors' 0.910159 µV (references.md §11.4, §11.5). The printed
      // 4.284446 µV was computed from the rounded 118.4165 nV/√Hz, hence 1e-6 relative against it.
      const kT4 = 4 * BOLTZMANN * 300;
      const exact = Math.sqrt(1250 * (110e-9 ** 2 + 1e-8 ** 2 + kT4 * (1e4 + 1e3 * 100)) + 0.910159e-6 ** 2);
      expect(Math.abs(p.noise.totalRms / exact - 1)).toBeLessThan(1e-7);
      expect(Math.abs(p.noise.totalRms / 4.284446e-6 - 1)).toBeLessThan(1e-6);
      printed(p.adc!.snrDb as number, 97.9292, 4);
      printed(p.adc!.enob as number, 15.9749, 4);
    });
    it("splits outputRms (to noiseHigh) from totalRms (to fMax)", () => {
      const ch = line([source("s", { resistance: 1e3 }), op("u", "noninverting", { rf: null, rg: null })], {}, { noiseLow: 1, noiseHigh: 101, fMax: 401 });
      const nz = analyzeChain(ch, { points: 2 }).paths[0].noise;
      expect(nz.totalRms / nz.outputRms).toBeCloseTo(2, 12);
      expect(nz.high).toBe(101);
    });
  });

  describe("ADC", () => {
    const ideal = (bits: number, vinLow: number, vinHigh: number, analysis = {}, src = {}) =>
      analyzeChain(line([source("s", { amplitude: 0, ...src }), adc("a", { bits, vinLow, vinHigh, sampleRate: 1e4 })], {}, analysis), { points: 2 }).paths[0].adc!;
    it("has LSB = FSR/2^N, q/√12 and 6.02N + 1.76 (references.md §12)", () => {
      const a = ideal(12, 0, 3.3);
      printed(a.lsb * 1e6, 805.664, 3);
      printed(a.quantNoiseRms * 1e6, 232.575, 3);
      const b = ideal(16, -2.5, 2.5);
      printed(b.lsb * 1e6, 76.2939, 4);
      printed(b.quantNoiseRms * 1e6, 22.02416, 5);
      for (const [n, v] of [[8, 49.92], [10, 61.96], [12, 74], [16, 98.08], [24, 146.24]])
        expect(ideal(n, 0, 1).idealSnrDb).toBeCloseTo(v, 10);
    });
    it("has SNR 98.0905 dB and ENOB 16.0017 with no analog noise (references.md §12)", () => {
      const a = ideal(16, -2.5, 2.5);
      printed(a.snrDb as number, 98.0905, 4);
      printed(a.enob as number, 16.0017, 4);
    });
    it("loses SNR to 20 µV of analog noise: 95.4788 dB, ENOB 15.5679 (references.md §12)", () => {
      // a flat source density over [noiseLow, fMax] adding to exactly 20 µV rms
      const nd = 20e-6 / Math.sqrt(1e6 - 0.1);
      const a = ideal(16, -2.5, 2.5, {}, { noiseDensity: nd });
      printed(a.snrDb as number, 95.4788, 4);
      printed(a.enob as number, 15.5679, 4);
    });
    it("measures alias attenuation at sampleRate − fHigh against the band (first-order RC, derived)", () => {
      const fc = 1000;
      const r = 1e4;
      const c = 1 / (2 * Math.PI * fc * r);
      const run = (aliasTargetDb: number | null) =>
        analyzeChain(
          line([source("s", { fLow: 0, fHigh: 100 }), { id: "lp", kind: "rcLowpass", params: { r, c } }, adc("a", { bits: 12, sampleRate: 48e3 })], {}, { aliasTargetDb }),
          { points: 2 },
        );
      const res = run(null);
      const a = res.paths[0].adc!;
      // band maximum |H(0)| = 1; worst folding gain at 47.9 kHz (derived from |H| = 1/√(1 + (f/fc)²))
      expect(a.aliasAttenuationDb).toBeCloseTo(10 * Math.log10(1 + (47.9e3 / fc) ** 2), 9);
      expect(codes(res)).toContain("a:alias");
      expect(codes(run(30))).not.toContain("a:alias");
      expect(codes(run(40))).toContain("a:alias");
    });
    it("reports fHigh ≥ sampleRate/2 as `nyquist`, status clip, alias null", () => {
      const r = analyzeChain(line([source("s", { fHigh: 600 }), adc("a", { sampleRate: 1200 })]), { points: 2 });
      expect(r.paths[0].adc!.status).toBe("clip");
      expect(r.paths[0].adc!.aliasAttenuationDb).toBeNull();
      expect(codes(r)).toContain("a:nyquist");
    });
    it("uses the lowest folding frequency alone when sampleRate − fHigh is above fMax", () => {
      const r = analyzeChain(line([source("s", { fHigh: 100 }), adc("a", { sampleRate: 5e6 })]), { points: 2 });
      expect(r.paths[0].adc!.aliasBand).toEqual({ low: 5e6 - 100, high: 5e6 - 100, worstF: 5e6 - 100 });
      expect(r.paths[0].adc!.aliasAttenuationDb).toBeCloseTo(0, 12);
    });
    it("holds the input to [vinLow, vinHigh]: adc-range, rangeUse, pathDcGain", () => {
      const r = analyzeChain(line([source("s", { dc: 0.9, amplitude: 0.2 }), adc("a", { vinLow: -1, vinHigh: 1 })]), { points: 2 });
      const a = r.paths[0].adc!;
      expect(a.status).toBe("clip");
      expect(a.rangeUse).toBeCloseTo(0.2, 14);
      expect(a.pathDcGain).toBe(1);
      expect(r.warnings.find((w) => w.code === "adc-range")!.message).toMatch(/reaches 1.1 V, 100 mV above its high limit 1 V/);
      const ok = analyzeChain(line([source("s", { dc: 0, amplitude: 0.2 }), adc("a", { vinLow: -1, vinHigh: 1 })]), { points: 2 });
      expect(ok.paths[0].adc!.status).toBe("ok");
    });
  });

  describe("paths, stages, warnings", () => {
    const fan = chainOf(
      [
        source("s", { resistance: 100, safety: "mains-connected" }),
        { id: "lp", kind: "rcLowpass", params: { r: 1e3, c: 1e-7 } },
        op("a", "inverting", { r1: 1e4, r2: 2e4 }),
        op("b", "sallenKeyLowpass", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }),
        adc("x"),
        adc("y"),
      ],
      [
        { from: "s", to: "lp" },
        { from: "lp", to: "a" },
        { from: "lp", to: "b" },
        { from: "a", to: "x" },
        { from: "b", to: "y" },
      ],
    );
    const r = analyzeChain(fan, { points: 5 });
    it("lists one path per leaf, with stages in path order (passive ones without status)", () => {
      expect(r.paths.map((p) => p.nodes)).toEqual([
        ["s", "lp", "a", "x"],
        ["s", "lp", "b", "y"],
      ]);
      expect(r.paths[0].stages.map((s) => s.id)).toEqual(["lp", "a"]);
      expect(stage(r, "lp").status).toBeUndefined();
      expect(stage(r, "a").status).toBe("ok");
    });
    it("reports f0 and q of each stage's ideal response", () => {
      expect(stage(r, "b", 1).f0).toBe(idealCharacteristics(fan.nodes[3]).f0);
      expect(stage(r, "b", 1).q).toBe(idealCharacteristics(fan.nodes[3]).q);
    });
    it("gives the shared section the load of both branches (in its DC gain)", () => {
      // lp at DC: Rs + r in series into r1 of `a` (virtual earth); b draws nothing at DC (derived)
      expect(stage(r, "lp").dcGain).toBeCloseTo(1e4 / (1e4 + 1e3), 14);
      expect(r.paths[0].adc!.pathDcGain).toBeCloseTo(-2e4 / (1e4 + 1e3 + 100), 14);
    });
    it("warns about safety for mains- and body-connected sources, once", () => {
      const w = r.warnings.filter((x) => x.code === "safety");
      expect(w.length).toBe(1);
      expect(w[0].nodeId).toBe("s");
      expect(w[0].message).toMatch(/isolation, creepage, leakage or safety ratings/);
      expect(w[0].message).toMatch(/Local codes and licensed practice govern/);
      const body = analyzeChain(line([source("s", { safety: "body-connected" }), adc()]), { points: 2 });
      expect(codes(body)).toContain("s:safety");
      expect(codes(analyzeChain(line([source("s"), adc()]), { points: 2 }))).not.toContain("s:safety");
    });
  });

  describe("robustness", () => {
    it.each(Array.from({ length: 12 }, (_, k) => `robust-${k}`))("never throws nor returns a non-finite number (%s)", (seed) => {
      const ch: Chain = randomChain(seed, 7, { integrators: true });
      ch.nodes[0] = source("src", { fLow: seed.endsWith("3") ? 0 : 2, fHigh: 3e3, dc: 0.1, dcSpread: 0.01, resistance: 50 });
      const r = analyzeChain(ch, { freqs: [0, 1, 1e3, 1e6] });
      expect(allFinite(r)).toBe(true);
      expect(r.paths.length).toBeGreaterThan(0);
    });
    it("is deterministic", () => {
      const ch = randomChain("det", 6);
      expect(JSON.stringify(analyzeChain(ch, { points: 50 }))).toBe(JSON.stringify(analyzeChain(ch, { points: 50 })));
    });
  });
});
