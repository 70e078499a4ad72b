/**
 * Item 5: slew (references.md §10), noise (§11), ADC (§12), alias attenuation (§13),
 * the nyquist and safety warnings (chain-format.md "ADC", "Slew rate", "Noise").
 * Noise integrals of the reference side use the adaptive Simpson of support/simpson.ts
 * on |H|² from the nodal solver; the engine's integrals are held to 1e-4 relative
 * (references.md §0, values from numerical integration in the tool).
 */
import { describe, it, vi } from "vitest";
import type { Chain, ChainNode, Part } from "@/lib/chain/types";
import {
  adc,
  inverting,
  makeChain,
  mfb,
  noninverting,
  rcLowpass,
  sallenKey,
  source,
} from "./support/chain-builders";
import { near, same, holds } from "./support/checks";
import { K_BOLTZMANN, buildNet } from "./support/nodal";
import { magAt, maxOverBand, noiseRms, slewNeeded } from "./support/reference-analysis";
import { analyze, pathTo, stageOf, warningsOf } from "./support/engine-access";

// Heavy reference integrals and spawned processes: room for a loaded two-core machine.
vi.setConfig({ testTimeout: 180_000, hookTimeout: 180_000 });

const NUM = { rel: 1e-4 };

function followerChain(src: Parameters<typeof source>[0], part: Part, analysis: Chain["analysis"] | object = {}, extra: ChainNode[] = []): Chain {
  return makeChain({
    nodes: [source(src), noninverting("u", { rf: null, rg: null }, { part: "p", rails: { low: -15, high: 15 } }), ...extra, adc("adc", { vinLow: -15, vinHigh: 15 })],
    parts: { p: part },
    analysis,
  });
}

describe("slew rate (references.md §10; chain-format.md 'Slew rate')", () => {
  it("required slew 2π·f·Vp at the top of the band", () => {
    const a = stageOf(analyze(followerChain({ amplitude: 10, fLow: 1, fHigh: 2e4 }, {})), "u");
    near(a.slewNeeded, 1.25664e6, { abs: 5 }, "references.md §10: 20 kHz at 10 V peak needs 1.25664 V/µs");
    const b = stageOf(analyze(followerChain({ amplitude: 2.5, fLow: 1, fHigh: 1e5 }, {})), "u");
    near(b.slewNeeded, 1.570796e6, { abs: 0.5 }, "references.md §10: 100 kHz at 2.5 V peak needs 1.570796 V/µs");
  });
  it("12 V peak at 10 kHz needs 0.75398 V/µs: a 0.5 V/µs part gets a slew warning, a 1 V/µs part does not", () => {
    const slow = analyze(followerChain({ amplitude: 12, fLow: 10, fHigh: 1e4 }, { slewRate: 0.5e6 }));
    near(stageOf(slow, "u").slewNeeded, 0.75398e6, { abs: 5 }, "references.md §10: 0.75398 V/µs");
    same(warningsOf(slow, "slew", "u").length, 1, "references.md §10: a 0.5 V/µs part cannot supply it (FPBW 6631.46 Hz)");
    const fast = analyze(followerChain({ amplitude: 12, fLow: 10, fHigh: 1e4 }, { slewRate: 1e6 }));
    same(warningsOf(fast, "slew").length, 0, "references.md §10: 1 V/µs > 0.754 V/µs, no warning");
  });
  it("through a peaking filter the maximum is inside the band (nodal solve, max of 2πf·A·|H|)", () => {
    const chain = makeChain({
      nodes: [
        source({ amplitude: 1, fLow: 10, fHigh: 1e5 }),
        sallenKey("sk", { r1: 1e4, r2: 1e4, c1: 1e-7, c2: 1.5625e-9 }), // Q = ½√(c1/c2) = 4, f0 ≈ 1.27 kHz
        inverting("g", { r1: 1e4, r2: 4.7e4 }),
        adc("adc", { vinLow: -20, vinHigh: 20 }),
      ],
    });
    const r = analyze(chain);
    near(stageOf(r, "sk").slewNeeded, slewNeeded(chain, "sk"), { rel: 1e-4 }, "chain-format.md slew definition, mathjs nodal solve + golden-section max");
    near(stageOf(r, "g").slewNeeded, slewNeeded(chain, "g"), { rel: 1e-4 }, "chain-format.md slew definition at the second stage");
  });
});

describe("noise (references.md §11)", () => {
  const T300 = { temperatureK: 300 };
  it("4kTR of a source resistance over a flat band (references.md §11.1)", () => {
    const at = (T: number) =>
      pathTo(analyze(followerChain({ resistance: 1e3 }, {}, { temperatureK: T, noiseLow: 1e-3, fMax: 1e4 + 1e-3, fMin: 1e-3 })), "adc").noise;
    near(at(300).totalRms, 407.035e-9, { rel: 2e-6 }, "references.md §11.1: 1 kΩ over 10 kHz at 300 K → 407.035 nV");
    near(at(290).totalRms, 400.194e-9, { rel: 2e-6 }, "references.md §11.1: 400.194 nV at 290 K (the published '400 nV', Johnson 1928)");
  });
  it("kT/C: an RC low-pass integrates to √(kT/C) (references.md §11.2, Razavi ch. 7 [MEMORY])", () => {
    const c = 1e-9;
    const rcNoise = (temperatureK: number) =>
      pathTo(analyze(makeChain({ nodes: [source(), rcLowpass("rc", { r: 1e4, c }), adc("adc")], analysis: { fMax: 1e11, noiseLow: 1e-3, temperatureK } })), "adc").noise;
    near(rcNoise(298.15).totalRms, Math.sqrt((K_BOLTZMANN * 298.15) / c), { rel: 2e-4 }, "references.md §11.2: v² = kT/C, independent of R");
    near(rcNoise(300).totalRms, 2.035177e-6, { rel: 2e-4 }, "references.md §11.2: 1 nF at 300 K → 2.035177 µV");
  });
  it("band-limited RC noise equals 4kTR·fc·(atan(fH/fc) − atan(fL/fc)) (derived from NEB, references.md §11.3)", () => {
    const [r, c] = [1e4, 1e-8];
    const fc = 1 / (2 * Math.PI * r * c);
    const chain = makeChain({ nodes: [source(), rcLowpass("rc", { r, c }), adc("adc")], analysis: { noiseLow: 10, noiseHigh: 5000, fMax: 1e5 } });
    const n = pathTo(analyze(chain), "adc").noise;
    const band = (lo: number, hi: number) => Math.sqrt(4 * K_BOLTZMANN * 298.15 * r * fc * (Math.atan(hi / fc) - Math.atan(lo / fc)));
    near(n.outputRms, band(10, 5000), NUM, "derived: ∫ 4kTR/(1+(f/fc)²) df over [noiseLow, noiseHigh]");
    near(n.totalRms, band(10, 1e5), NUM, "chain-format.md: totalRms over [noiseLow, fMax]");
    near(n.low, 10, { abs: 0 }, "chain-format.md: noise.low = noiseLow");
    near(n.high, 5000, { abs: 0 }, "chain-format.md: noise.high = noiseHigh");
  });
  it("op-amp stage densities of references.md §11.4 over a 10 kHz band (ideal bandwidth)", () => {
    const band = { ...T300, noiseLow: 1, noiseHigh: 10001 };
    const ni = (rf: number, rg: number, en: number, inn: number, rs: number) =>
      pathTo(analyze(makeChain({
        nodes: [source({ resistance: rs }), noninverting("u", { rf, rg }, { part: "p" }), adc("adc")],
        parts: { p: { en, in: inn } },
        analysis: band,
      })), "adc").noise;
    const s1 = ni(1e4, 1e3, 10e-9, 1e-12, 0);
    near(s1.outputRms, 118.4165e-9 * 100, NUM, "references.md §11.4 stage 1: 118.4165 nV/√Hz × √(10 kHz)");
    const byEl = (el: string) => s1.contributions.find((c) => c.nodeId === "u" && c.element === el)?.rms;
    near(byEl("en"), 110e-9 * 100, NUM, "references.md §11.4 stage 1: en·NG = 110.000 nV/√Hz");
    near(byEl("in-"), 10e-9 * 100, NUM, "references.md §11.4 stage 1: in·Rf = 10.000 nV/√Hz");
    near(byEl("rf"), 12.8716e-9 * 100, { rel: 2e-4 }, "references.md §11.4 stage 1: Rf term 12.8716 nV/√Hz");
    near(byEl("rg"), 40.7035e-9 * 100, NUM, "references.md §11.4 stage 1: Rg·(Rf/Rg) term 40.7035 nV/√Hz");
    near(ni(1e4, 1e3, 10e-9, 1e-12, 1e3).outputRms, 127.0754e-9 * 100, NUM, "references.md §11.4 stage 1 with Rs = 1 kΩ");
    near(ni(99e3, 1e3, 4e-9, 0.5e-12, 0).outputRms, 571.3767e-9 * 100, NUM, "references.md §11.4 stage 2");
    near(ni(1e3, 1e3, 2.9e-9, 1.5e-12, 100).outputRms, 8.703e-9 * 100, { rel: 2e-4 }, "references.md §11.4 stage 3 (Rs = 100 Ω)");
  });
  it("closed-loop roll-off only: 141.506 µV with GBW = 10 MHz (references.md §11.4, NEB = 1.5708·GBW/NG)", () => {
    const chain = makeChain({
      nodes: [source(), noninverting("u", { rf: 1e4, rg: 1e3 }, { part: "p" }), adc("adc")],
      parts: { p: { en: 10e-9, in: 1e-12, gbw: 1e7 } },
      analysis: { ...T300, noiseLow: 1e-3, fMax: 1e12 },
    });
    near(pathTo(analyze(chain), "adc").noise.totalRms, 141.506e-6, NUM, "references.md §11.4: 118.4165 nV/√Hz over 1.427997 MHz");
  });
  it("Sallen-Key and MFB resistor noise (references.md §11.5, 300 K)", () => {
    const wide = { ...T300, noiseLow: 1e-3, fMax: 1e10 };
    const sk = pathTo(analyze(makeChain({ nodes: [source(), sallenKey("u", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }), adc("adc")], analysis: wide })), "adc").noise;
    near(sk.totalRms, 0.910159e-6, NUM, "references.md §11.5: Sallen-Key 6(a) resistors 0.910159 µV");
    near(sk.contributions.find((c) => c.element === "r1")?.rms, 0.455079e-6, NUM, "references.md §11.5: R1 term 0.455079 µV = √(kT/Ca)");
    near(sk.contributions.find((c) => c.element === "r2")?.rms, 0.788221e-6, NUM, "references.md §11.5: R2 term 0.788221 µV");
    const m = pathTo(analyze(makeChain({ nodes: [source(), mfb("u", { r1: 1e4, r2: 1e4, r3: 1e4, c1: 45e-9, c2: 1e-8 }), adc("adc")], analysis: wide })), "adc").noise;
    near(m.totalRms, 1.204027e-6, NUM, "references.md §11.5: MFB 7(a) resistors 1.204027 µV");
    near(m.contributions.find((c) => c.element === "r3")?.rms, 1.083306e-6, NUM, "references.md §11.5: MFB R3 term 1.083306 µV");
    near(m.contributions.find((c) => c.element === "r1")?.rms, 0.371571e-6, NUM, "references.md §11.5: MFB R1 term 0.371571 µV");
  });
  it("1/f corners: en²·(1 + fc/f) and in²·(1 + fc/f) (references.md §11.4 [PRACTICE] model, integral derived)", () => {
    const a = pathTo(analyze(followerChain({}, { en: 10e-9, enCorner: 100 }, { noiseLow: 0.1, noiseHigh: 1e4 })), "adc").noise;
    near(a.outputRms, 1.05599e-6, { rel: 5e-5 }, "references.md §11.4: 10 nV/√Hz, corner 100 Hz, 0.1 Hz–10 kHz → 1.05599 µV");
    const [rs, inn, fc, lo, hi] = [1e4, 1e-12, 1e3, 1, 2e4];
    const b = pathTo(analyze(followerChain({ resistance: rs }, { in: inn, inCorner: fc }, { noiseLow: lo, noiseHigh: hi })), "adc").noise;
    const expected = Math.sqrt((inn * rs) ** 2 * (fc * Math.log(hi / lo) + hi - lo) + 4 * K_BOLTZMANN * 298.15 * rs * (hi - lo));
    near(b.outputRms, expected, NUM, "derived: in·Rs with the 1/f corner, k·√(fc·ln(fH/fL) + fH − fL), plus 4kTRs");
  });
  it("source noiseDensity is carried like the signal", () => {
    const chain = makeChain({
      nodes: [source({ noiseDensity: 50e-9 }), inverting("u", { r1: 1e4, r2: 1e5 }), adc("adc")],
      analysis: { noiseLow: 1, noiseHigh: 1e4 + 1 },
    });
    const n = pathTo(analyze(chain), "adc").noise;
    const src = n.contributions.find((c) => c.element === "source");
    near(src?.rms, 50e-9 * 10 * 100, NUM, "chain-format.md: source noiseDensity × |H| = 10 over 10 kHz");
  });
  it("whole chains against the adaptive-Simpson integral of the nodal |H|² (worked example part and a mixed chain)", () => {
    const mixed = makeChain({
      nodes: [
        source({ resistance: 1e3, noiseDensity: 5e-9 }),
        noninverting("g", { rf: 2.2e4, rg: 1e3 }, { part: "a" }),
        sallenKey("sk", { r1: 1e4, r2: 2.2e4, c1: 2.2e-8, c2: 4.7e-9 }, { part: "b" }),
        rcLowpass("rc", { r: 2.2e3, c: 1e-8 }),
        mfb("mf", { r1: 4.7e3, r2: 1e4, r3: 1e4, c1: 4.7e-8, c2: 2.2e-9 }, { part: "b" }),
        adc("adc", { vinLow: -5, vinHigh: 5, sampleRate: 1e5 }),
      ],
      parts: { a: { en: 4e-9, in: 2e-12, enCorner: 20, inCorner: 200, gbw: 1e7, aol: 1e6 }, b: { en: 15e-9, in: 1e-15, gbw: 1e6, aol: 1e5 } },
      analysis: { noiseLow: 0.5, noiseHigh: 2e4, fMax: 1e6 },
    });
    const n = pathTo(analyze(mixed), "adc").noise;
    const ref = noiseRms(mixed, "adc", 0.5, 2e4, 1e-8);
    near(n.outputRms, ref.rms, NUM, "adaptive Simpson of Σ PSD·|T|² from the mathjs nodal solve, [noiseLow, noiseHigh]");
    near(n.totalRms, noiseRms(mixed, "adc", 0.5, 1e6, 1e-8).rms, NUM, "same, [noiseLow, fMax]");
    for (const part of ref.parts.filter((p) => p.rms > 0.05 * ref.rms)) {
      const got = n.contributions.find((c) => c.nodeId === part.owner && c.element === part.element);
      near(got?.rms, part.rms, { rel: 1e-3 }, `per-source integral, ${part.owner}.${part.element} (types.ts NoiseContribution)`);
    }
    const sumSq = n.contributions.reduce((s, c) => s + c.rms * c.rms, 0);
    near(Math.sqrt(sumSq), n.outputRms, { rel: 1e-6 }, "chain-format.md: powers add (contributions RSS to outputRms)");
    near(n.contributions.reduce((s, c) => s + c.share, 0), 1, { abs: 1e-6 }, "types.ts: shares of outputRms² sum to 1");
  });
});

describe("ADC figures (references.md §12)", () => {
  const quiet = (bits: number, vinLow: number, vinHigh: number, nd = 0, analysis = {}) =>
    pathTo(analyze(makeChain({
      nodes: [source({ noiseDensity: nd }), noninverting("u", { rf: null, rg: null }), adc("adc", { bits, vinLow, vinHigh })],
      analysis,
    })), "adc").adc!;
  it("LSB and q/√12", () => {
    const rows: [number, number, number, number][] = [
      [3.3, 12, 805.664e-6, 232.575e-6],
      [4.096, 12, 1e-3, 288.675e-6],
      [5, 16, 76.2939e-6, 22.02416e-6],
      [10, 16, 152.588e-6, 44.0483e-6],
      [5, 24, 0.298023e-6, 0.0860319e-6],
    ];
    for (const [fsr, bits, lsb, qn] of rows) {
      const a = quiet(bits, -fsr / 2, fsr / 2);
      near(a.lsb, fsr / 2 ** bits, { rel: 1e-12 }, "references.md §12: q = FSR/2^N");
      near(a.lsb, lsb, { rel: 1e-6 }, `references.md §12 table: ${fsr} V, ${bits} bits`);
      near(a.quantNoiseRms, qn, { rel: 1e-5 }, `references.md §12 table: q/√12 for ${fsr} V, ${bits} bits`);
    }
  });
  it("ideal SNR 6.02·N + 1.76 dB (the rounded constants, chain-format.md)", () => {
    const rows: [number, number][] = [[8, 49.92], [10, 61.96], [12, 74.0], [14, 86.04], [16, 98.08], [18, 110.12], [20, 122.16], [24, 146.24]];
    for (const [bits, snr] of rows) near(quiet(bits, 0, 5).idealSnrDb, snr, { abs: 1e-9 }, `references.md §12, 6.02N + 1.76 column, N = ${bits}`);
  });
  it("SNR and ENOB with analog noise: 16 bits, 5 V FSR (references.md §12 table)", () => {
    const band = { noiseLow: 0.5, fMax: 1e4 + 0.5, fMin: 0.5 }; // fMax − noiseLow = 10 kHz
    const rows: [number, number, number][] = [
      [0, 98.0905, 16.0017],
      [20e-6, 95.4788, 15.5679],
      [50e-6, 90.199, 14.6909],
      [100e-6, 84.7428, 13.7845],
    ];
    for (const [vn, snr, enob] of rows) {
      const a = quiet(16, 0, 5, vn / 100, band);
      near(a.snrDb, snr, { abs: 5e-5 }, `references.md §12: SNR with ${vn * 1e6} µV rms analog noise`);
      near(a.enob, enob, { abs: 5e-5 }, `references.md §12: ENOB = (SNR − 1.76)/6.02 with ${vn * 1e6} µV`);
    }
  });
});

describe("alias attenuation (references.md §13; chain-format.md 'ADC')", () => {
  /** Butterworth sections for fc = 10 kHz, equal-R Sallen-Key synthesis of references.md §6: Cb = 1/(2Qω0R), Ca = 2Q/(ω0R). */
  const w0 = 2 * Math.PI * 1e4;
  const R = 1e4;
  const sk = (id: string, q: number) => sallenKey(id, { r1: R, r2: R, c1: (2 * q) / (w0 * R), c2: 1 / (2 * q * w0 * R) });
  const mk = (stages: ChainNode[], adcExtra = {}, analysis = {}) =>
    makeChain({ nodes: [source({ fLow: 1, fHigh: 1e4 }), ...stages, adc("adc", { bits: 12, sampleRate: 1e5, vinLow: -5, vinHigh: 5, ...adcExtra })], analysis });
  const orders: [number, ChainNode[], number][] = [
    [1, [rcLowpass("rc", { r: R, c: 1 / (w0 * R) }), noninverting("buf", { rf: null, rg: null })], 19.138],
    [2, [sk("s1", Math.SQRT1_2)], 38.17],
    [4, [sk("s1", 1 / (2 * Math.cos(Math.PI / 8))), sk("s2", 1 / (2 * Math.cos((3 * Math.PI) / 8)))], 76.339],
  ];
  for (const [n, stages, att] of orders) {
    it(`order ${n} Butterworth at fs − fc = 90 kHz: ${att} dB`, () => {
      const a = pathTo(analyze(mk(stages)), "adc").adc!;
      near(a.aliasAttenuationDb, att, { abs: 5e-4 }, `references.md §13 table, n = ${n}, fc = 10 kHz, fs = 100 kSPS, at fs − fc [DERIVED]`);
    });
  }
  it("a peaking section: in-band maximum minus the maximum from fs − fHigh to fMax (nodal solve)", () => {
    const chain = makeChain({
      nodes: [
        source({ fLow: 10, fHigh: 2000 }),
        sallenKey("sk", { r1: 1e4, r2: 1e4, c1: 1e-7, c2: 1.5625e-9 }),
        adc("adc", { sampleRate: 2e4, inputResistance: 1e5 }),
      ],
    });
    const net = buildNet(chain);
    const pin = net.outputOf.get("adc")!;
    const inBand = maxOverBand((f) => magAt(net, pin, f), 10, 2000).value;
    const folded = maxOverBand((f) => magAt(net, pin, f), 18000, 1e6).value;
    near(pathTo(analyze(chain), "adc").adc!.aliasAttenuationDb, 20 * Math.log10(inBand / folded), { abs: 1e-4 },
      "chain-format.md alias definition, mathjs nodal solve + golden-section maxima");
  });
  it("alias warning under aliasTargetDb; null target means the ideal SNR", () => {
    const first = orders[0][1];
    same(warningsOf(analyze(mk(first)), "alias", "adc").length, 1, "chain-format.md: 19.1 dB < 74.0 dB (ideal SNR of 12 bits) → alias");
    same(warningsOf(analyze(mk(first, {}, { aliasTargetDb: 10 })), "alias").length, 0, "chain-format.md: 19.1 dB ≥ 10 dB target → no alias warning");
    same(warningsOf(analyze(mk(first, {}, { aliasTargetDb: 30 })), "alias", "adc").length, 1, "chain-format.md: 19.1 dB < 30 dB target → alias");
    same(warningsOf(analyze(mk(first, { bits: 2 })), "alias").length, 0, "chain-format.md: 2 bits, ideal SNR 13.8 dB < 19.1 dB → no alias warning");
  });
  it("nyquist: fHigh ≥ sampleRate/2 gives the warning, ADC status clip and alias null", () => {
    for (const fs of [2e4, 1.5e4]) {
      const r = analyze(mk(orders[1][1], { sampleRate: fs }));
      const a = pathTo(r, "adc").adc!;
      same(warningsOf(r, "nyquist", "adc").length, 1, `chain-format.md: fHigh 10 kHz ≥ ${fs / 2} Hz → nyquist`);
      same(a.status, "clip", "chain-format.md: nyquist sets the ADC status to clip");
      same(a.aliasAttenuationDb, null, "chain-format.md: alias attenuation null under nyquist");
    }
    const fine = analyze(mk(orders[1][1], { sampleRate: 2.0001e4 }));
    same(warningsOf(fine, "nyquist").length, 0, "chain-format.md: fHigh just under sampleRate/2 → no nyquist");
  });
});

describe("safety (chain-format.md; product.md cautions)", () => {
  for (const safety of ["mains-connected", "body-connected"] as const) {
    it(`${safety} source gets a safety warning that defers to codes and licensed practice`, () => {
      const r = analyze(followerChain({ safety }, {}));
      const w = warningsOf(r, "safety", "src");
      same(w.length, 1, `chain-format.md: safety warning for a ${safety} source`);
      holds(/isolation|creepage|leakage/i.test(w[0]?.message ?? ""), "product.md: says Chainwright does not check isolation, creepage, leakage or ratings");
      holds(/code|licensed/i.test(w[0]?.message ?? ""), "product.md: local codes and licensed practice govern");
    });
  }
  it("a low-voltage source has none", () => {
    same(warningsOf(analyze(followerChain({}, {})), "safety").length, 0, "chain-format.md: safety only for mains/body-connected");
  });
});
