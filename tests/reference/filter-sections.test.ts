/**
 * The filter sections — Sallen-Key low-pass with gain, Sallen-Key high-pass (unity and with gain), MFB
 * high-pass — against closed forms derived from their nodal equations (derivations beside each check) and
 * against the whole-chain mathjs reference (support/nodal.ts, written from the topology table of
 * lib/chain/README.md "Filter sections", not from the engine).
 *
 * Derivations (ideal op-amp, K = 1 + rf/rg, the topology as drawn):
 * - Sallen-Key low-pass (r1 in→A, r2 A→(+), c1 A→out, c2 (+)→vref): KCL at (+): V_A = V+·(1 + s·r2·c2);
 *   at A: (Vin − V_A)/r1 = (V_A − V+)/r2 + s·c1·(V_A − K·V+). Eliminating V_A:
 *   H = K/(1 + s·((r1 + r2)·c2 + r1·c1·(1 − K)) + s²·r1r2c1c2), so ω0 = 1/√(r1r2c1c2) and
 *   Q = √(r1r2c1c2)/((r1 + r2)·c2 + r1·c1·(1 − K)); with r1 = r2, c1 = c2, Q = 1/(3 − K), i.e. K = 3 − 1/Q
 *   (the equal-component design; the same result is in the usual active-filter texts, from memory).
 * - Sallen-Key high-pass (c1 in→A, c2 A→(+), r1 A→out, r2 (+)→vref): at (+): V_A = V+·(1 + 1/(s·r2·c2));
 *   at A: s·c1·(Vin − V_A) = s·c2·(V_A − V+) + (V_A − K·V+)/r1, giving
 *   H = K·s²·r1r2c1c2/(1 + s·(r1·(c1 + c2) + r2·c2·(1 − K)) + s²·r1r2c1c2): r2 — the resistor to vref —
 *   is the one multiplied by (1 − K). Equal components again give Q = 1/(3 − K).
 * - MFB high-pass (c1 in→A, r1 A→vref, c2 A→out, c3 A→(−), r2 (−)→out): (−) is a virtual earth, so
 *   V_A = −Vo/(s·c3·r2); KCL at A: s·c1·(Vin − V_A) = V_A/r1 + s·c2·(V_A − Vo) + s·c3·V_A, giving
 *   H = −(c1/c2)·s²/(s² + s·(c1 + c2 + c3)/(r2·c2·c3) + 1/(r1·r2·c2·c3)).
 * - At ω0 a second-order section's |H| is (passband gain)·Q, for the low-pass and the high-pass alike, so a
 *   Butterworth section (Q = 1/√2) is 20·log10(1/√2) = −3.0103 dB below its passband there.
 */
import { describe, it, vi } from "vitest";
import { idealCharacteristics } from "@/lib/engine";
import type { Chain, ChainNode } from "@/lib/chain/types";
import { adc, makeChain, mfbHighpass, rcLowpass, sallenKey, sallenKeyHighpass, source } from "./support/chain-builders";
import { cabs, cx, type Cx } from "./support/cx";
import { near, nearPhase, same, dB, phaseDeg } from "./support/checks";
import { dcInterval, noiseRms } from "./support/reference-analysis";
import { responseAt } from "./support/nodal";
import { analyze, pathTo, responseOf, stageOf } from "./support/engine-access";

vi.setConfig({ testTimeout: 180_000 });

const TAU = 2 * Math.PI;
const chainOf = (stage: ChainNode, parts = {}, src = {}): Chain =>
  makeChain({ nodes: [source({ resistance: 0, ...src }), stage, adc("adc", { vinLow: -10, vinHigh: 10 })], parts });
const parts = { slow: { aol: 1e5, gbw: 1e6 }, gbw: { gbw: 3e6 }, flat: { aol: 2e4 } };

/** The engine's response at exactly `freqs` as complex numbers. */
function engineAt(chain: Chain, freqs: number[]): Cx[] {
  const r = responseOf(chain, "adc", freqs);
  return r.magDb.map((m, k) => {
    const mag = 10 ** ((m as number) / 20);
    const ph = ((r.phaseDeg[k] as number) * Math.PI) / 180;
    return cx(mag * Math.cos(ph), mag * Math.sin(ph));
  });
}

/** a + b·s + c·s² at s = jω */
const quad = (a: number, b: number, c: number, w: number) => cx(a - c * w * w, b * w);

describe("Sallen-Key low-pass with gain", () => {
  it("equal components with K = 3 − 1/Q give the target Q; Butterworth is −3.0103 dB at f0", () => {
    const [R, C] = [10e3, 10e-9];
    const f0 = 1 / (TAU * R * C);
    for (const q of [Math.SQRT1_2, 2, 5]) {
      const K = 3 - 1 / q;
      const rg = 10e3;
      const node = sallenKey("sk", { r1: R, r2: R, c1: C, c2: C, rf: (K - 1) * rg, rg });
      const ic = idealCharacteristics(node);
      near(ic.q, q, { rel: 1e-12 }, "derived: equal-component Sallen-Key Q = 1/(3 − K)");
      near(ic.f0, f0, { rel: 1e-12 }, "derived: ω0 = 1/√(r1r2c1c2)");
      const [dc, at] = engineAt(chainOf(node), [1e-3, f0]);
      near(cabs(dc), K, { rel: 1e-9 }, "derived: DC gain K = 1 + rf/rg");
      near(dB(at) - dB(dc), 20 * Math.log10(q), { abs: 1e-6 }, "derived: |H(jω0)| = K·Q");
      nearPhase(phaseDeg(at), -90, 1e-6, "derived: phase −90° at ω0");
    }
    const bw = sallenKey("sk", { r1: R, r2: R, c1: C, c2: C, rf: (2 - Math.SQRT2) * 10e3, rg: 10e3 });
    const [dc, at] = engineAt(chainOf(bw), [1e-3, f0]);
    near(dB(at) - dB(dc), -3.0103, { abs: 1e-4 }, "Butterworth second order: −3.01 dB at the corner (20·log10(1/√2))");
  });

  it("unequal parts: the ideal H(s) derived above, and Q with the (1 − K) term on r1·c1", () => {
    const [r1, r2, c1, c2, rf, rg] = [12e3, 33e3, 4.7e-9, 2.2e-9, 15e3, 22e3];
    const K = 1 + rf / rg;
    const node = sallenKey("sk", { r1, r2, c1, c2, rf, rg });
    const t = Math.sqrt(r1 * r2 * c1 * c2);
    near(idealCharacteristics(node).q, t / ((r1 + r2) * c2 + r1 * c1 * (1 - K)), { rel: 1e-12 }, "derived: Q of the Sallen-Key low-pass with gain");
    const fs = [10, 1e3, 2.9e3, 1e4, 1e5];
    const got = engineAt(chainOf(node), fs);
    fs.forEach((f, k) => {
      const w = TAU * f;
      const h = cx(K, 0).div(quad(1, (r1 + r2) * c2 + r1 * c1 * (1 - K), r1 * r2 * c1 * c2, w));
      near(cabs(got[k].sub(h)) / cabs(h), 0, { abs: 1e-9 }, `derived: ideal H(s) of the Sallen-Key low-pass with gain at ${f} Hz`);
    });
  });

  it("with finite op-amps, against the whole-chain nodal reference (mathjs lusolve)", () => {
    for (const part of ["slow", "gbw", "flat"]) {
      for (const rg of [22e3, null]) {
        const ch = chainOf(sallenKey("sk", { r1: 12e3, r2: 33e3, c1: 4.7e-9, c2: 2.2e-9, rf: 15e3, rg }, { part }), parts, { resistance: 600 });
        const fs = [3, 800, 2.5e3, 4e4, 6e5];
        const got = engineAt(ch, fs);
        fs.forEach((f, k) => {
          const ref = responseAt(ch, "adc", f);
          near(cabs(got[k].sub(ref)) / cabs(ref), 0, { abs: 1e-9 }, `nodal reference, part ${part}, rg ${rg}, ${f} Hz`);
        });
      }
    }
  });
});

describe("Sallen-Key high-pass", () => {
  it("equal components with K = 3 − 1/Q give the target Q; Butterworth is −3.0103 dB at f0; DC is blocked", () => {
    const [R, C] = [10e3, 10e-9];
    const f0 = 1 / (TAU * R * C);
    for (const q of [0.5, Math.SQRT1_2, 2]) {
      const K = 3 - 1 / q;
      const rf = K === 1 ? null : (K - 1) * 10e3;
      const node = sallenKeyHighpass("hp", { c1: C, c2: C, r1: R, r2: R, rf, rg: rf === null ? null : 10e3 });
      near(idealCharacteristics(node).q, q, { rel: 1e-12 }, "derived: equal-component Sallen-Key high-pass Q = 1/(3 − K)");
      const [lo, at, hi] = engineAt(chainOf(node), [f0, f0, 1e4 * f0].slice(0, 3));
      near(dB(at) - 20 * Math.log10(K), 20 * Math.log10(q), { abs: 1e-6 }, "derived: |H(jω0)| = K·Q");
      nearPhase(phaseDeg(lo), 90, 1e-6, "derived: phase +90° at ω0");
      near(cabs(hi), K, { rel: 1e-6 }, "derived: passband gain K far above f0");
    }
    // unity gain, r2 = 2·r1 with equal capacitors: Q = √(r1r2)·c/(2·r1·c) = √2/2 (Butterworth)
    const bw = sallenKeyHighpass("hp", { c1: C, c2: C, r1: R, r2: 2 * R });
    const fb = 1 / (TAU * Math.sqrt(2) * R * C);
    near(idealCharacteristics(bw).q, Math.SQRT1_2, { rel: 1e-12 }, "derived: unity-gain high-pass Q = √(r2/r1)/2");
    near(dB(engineAt(chainOf(bw), [fb])[0]), -3.0103, { abs: 1e-4 }, "Butterworth second order: −3.01 dB at the corner");
    near(stageOf(analyze(chainOf(bw)), "hp").dcGain, 0, { abs: 0 }, "derived: the series capacitors block DC");
  });

  it("unequal parts: the ideal H(s) derived above (r2 is the resistor carrying (1 − K))", () => {
    const [c1, c2, r1, r2, rf, rg] = [4.7e-9, 10e-9, 12e3, 33e3, 2.2e3, 10e3];
    const K = 1 + rf / rg;
    const node = sallenKeyHighpass("hp", { c1, c2, r1, r2, rf, rg });
    // with rf = 5.6 kΩ the s coefficient r1·(c1 + c2) + r2·c2·(1 − K) is below 0: the section oscillates, no Q
    const unstable = sallenKeyHighpass("hp", { c1, c2, r1, r2, rf: 5.6e3, rg });
    same(idealCharacteristics(unstable).q, null, "derived: r1·(c1 + c2) + r2·c2·(1 − K) < 0 has no positive Q");
    const t = Math.sqrt(r1 * r2 * c1 * c2);
    near(idealCharacteristics(node).q, t / (r1 * (c1 + c2) + r2 * c2 * (1 - K)), { rel: 1e-12 }, "derived: Q of the Sallen-Key high-pass");
    const fs = [5, 300, 1.7e3, 1e4, 3e5];
    const got = engineAt(chainOf(node), fs);
    fs.forEach((f, k) => {
      const w = TAU * f;
      const num = cx(-K * r1 * r2 * c1 * c2 * w * w, 0);
      const h = num.div(quad(1, r1 * (c1 + c2) + r2 * c2 * (1 - K), r1 * r2 * c1 * c2, w));
      near(cabs(got[k].sub(h)) / cabs(h), 0, { abs: 1e-9 }, `derived: ideal H(s) of the Sallen-Key high-pass at ${f} Hz`);
    });
  });

  it("with finite op-amps and a loaded input, against the whole-chain nodal reference", () => {
    for (const part of ["slow", "gbw", "flat"]) {
      for (const [rf, rg] of [[null, null], [5.6e3, null], [5.6e3, 10e3]] as const) {
        const ch = makeChain({
          nodes: [
            source({ resistance: 1e3 }),
            rcLowpass("rc", { r: 2.2e3, c: 1e-10 }),
            sallenKeyHighpass("hp", { c1: 4.7e-9, c2: 10e-9, r1: 12e3, r2: 33e3, rf, rg }, { part }),
            adc("adc", { vinLow: -10, vinHigh: 10, inputResistance: 2e4 }),
          ],
          parts,
        });
        const fs = [2, 400, 1.7e3, 5e4, 8e5];
        const got = engineAt(ch, fs);
        fs.forEach((f, k) => {
          const ref = responseAt(ch, "adc", f);
          near(cabs(got[k].sub(ref)) / cabs(ref), 0, { abs: 1e-9 }, `nodal reference, part ${part}, rf ${rf}, rg ${rg}, ${f} Hz`);
        });
      }
    }
  });

  it("DC: the output sits at vref ± K·(vos + ib·r2) ± rf·ib, whatever the source DC", () => {
    // Derived with the capacitors open: V+ = vref − ib·r2 (in+ drawn through r2), V− = V+ ± vos, and
    // KCL at (−) with ib− drawn there: Vo = V− + rf·((V− − vref)/rg + ib−) = vref + K·(V− − vref) + rf·ib−.
    const [r2, rf, rg, vref, vos, ib] = [33e3, 5.6e3, 10e3, 2.5, 1e-3, 1e-8];
    const K = 1 + rf / rg;
    const ch = makeChain({
      nodes: [
        source({ dc: 1.2, dcSpread: 0.1 }),
        sallenKeyHighpass("hp", { c1: 4.7e-9, c2: 10e-9, r1: 12e3, r2, rf, rg, vref }, { part: "p" }),
        adc("adc", { vinLow: 0, vinHigh: 5 }),
      ],
      parts: { p: { vos, ib } },
    });
    const s = stageOf(analyze(ch), "hp");
    const half = K * (vos + ib * r2) + rf * ib;
    near(s.dcOut?.min, vref - half, { abs: 1e-12 }, "derived: Sallen-Key high-pass DC (min)");
    near(s.dcOut?.max, vref + half, { abs: 1e-12 }, "derived: Sallen-Key high-pass DC (max)");
    const ref = dcInterval(ch, "hp")!;
    near(s.dcOut?.min, ref.min, { abs: 1e-12 }, "nodal reference DC interval (min)");
    near(s.dcOut?.max, ref.max, { abs: 1e-12 }, "nodal reference DC interval (max)");
  });
});

describe("MFB high-pass", () => {
  const p = { c1: 22e-9, c2: 10e-9, c3: 4.7e-9, r1: 3.3e3, r2: 47e3 };

  it("H(s) = −(c1/c2)·s²/(s² + s·(c1 + c2 + c3)/(r2c2c3) + 1/(r1r2c2c3)), f0, Q and the passband gain", () => {
    const { c1, c2, c3, r1, r2 } = p;
    const node = mfbHighpass("m", p);
    const w0 = 1 / Math.sqrt(r1 * r2 * c2 * c3);
    const ic = idealCharacteristics(node);
    near(ic.f0, w0 / TAU, { rel: 1e-12 }, "derived: ω0² = 1/(r1r2c2c3)");
    near(ic.q, Math.sqrt((r2 * c2 * c3) / r1) / (c1 + c2 + c3), { rel: 1e-12 }, "derived: ω0/Q = (c1 + c2 + c3)/(r2c2c3)");
    const fs = [1, 100, w0 / TAU, 5e3, 1e5];
    const got = engineAt(chainOf(node), fs);
    fs.forEach((f, k) => {
      const w = TAU * f;
      const h = cx((c1 / c2) * w * w, 0).div(cx(-w * w + 1 / (r1 * r2 * c2 * c3), (w * (c1 + c2 + c3)) / (r2 * c2 * c3)));
      near(cabs(got[k].sub(h)) / cabs(h), 0, { abs: 1e-9 }, `derived: MFB high-pass H(s) at ${f} Hz`);
    });
    const far = engineAt(chainOf(node), [1e9 * ic.f0!])[0];
    near(far.re, -c1 / c2, { rel: 1e-6 }, "derived: passband gain −c1/c2");
    const q2 = mfbHighpass("m", { c1: 10e-9, c2: 10e-9, c3: 10e-9, r1: 10e3, r2: 45e3 });
    // equal capacitors: Q = √(r2/r1)/3, so r2 = 4.5·r1 gives 1/√2 (Butterworth), −3.0103 dB at f0
    near(idealCharacteristics(q2).q, Math.SQRT1_2, { rel: 1e-12 }, "derived: equal-capacitor MFB high-pass Q = √(r2/r1)/3");
    near(dB(engineAt(chainOf(q2), [idealCharacteristics(q2).f0!])[0]), -3.0103, { abs: 1e-4 }, "Butterworth: −3.01 dB at f0");
  });

  it("with finite op-amps and a loaded input, against the whole-chain nodal reference", () => {
    for (const part of ["slow", "gbw", "flat"]) {
      const ch = makeChain({
        nodes: [source({ resistance: 1e3 }), rcLowpass("rc", { r: 2.2e3, c: 1e-10 }), mfbHighpass("m", p, { part }), adc("adc", { vinLow: -10, vinHigh: 10, inputResistance: 2e4 })],
        parts,
      });
      const fs = [2, 400, 1.7e3, 5e4, 8e5];
      const got = engineAt(ch, fs);
      fs.forEach((f, k) => {
        const ref = responseAt(ch, "adc", f);
        near(cabs(got[k].sub(ref)) / cabs(ref), 0, { abs: 1e-9 }, `nodal reference, part ${part}, ${f} Hz`);
      });
    }
  });

  it("DC: vref ± (vos + r2·ib) at the output; noise against the nodal reference", () => {
    // Derived with the capacitors open: (+) = vref, V− = vref ± vos, and ib− flows only through r2.
    const [vref, vos, ib] = [1.65, 2e-3, 5e-8];
    const ch = makeChain({
      nodes: [source({ dc: 0.4 }), mfbHighpass("m", { ...p, vref }, { part: "p" }), adc("adc", { vinLow: 0, vinHigh: 3.3 })],
      // gbw alone: infinite gain at DC, so the ideal derivation holds exactly there (the noise sees the finite GBW)
      parts: { p: { vos, ib, en: 10e-9, in: 1e-12, gbw: 1e6 } },
      analysis: { fMax: 1e5, noiseLow: 10 },
    });
    const r = analyze(ch);
    const s = stageOf(r, "m");
    near(s.dcOut?.min, vref - vos - p.r2 * ib, { abs: 1e-12 }, "derived: MFB high-pass DC (min)");
    near(s.dcOut?.max, vref + vos + p.r2 * ib, { abs: 1e-12 }, "derived: MFB high-pass DC (max)");
    const ref = noiseRms(ch, "adc", 10, 1e5, 1e-8);
    near(pathTo(r, "adc").noise.outputRms, ref.rms, { rel: 1e-4 }, "adaptive Simpson of the nodal |T|² of every resistor and op-amp source");
  });
});
