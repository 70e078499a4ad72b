/**
 * stageModel: with an ideal op-amp (n = 1, d = 0) every closed form must reduce to the ideal H(s) of
 * chain-format.md's table, at arbitrary complex s; with finite gain, to the closed-loop formulas.
 */
import Complex from "complex.js";
import { describe, expect, it } from "vitest";
import type { OpAmpNode } from "@/lib/chain/types";
import { openLoop } from "@/lib/engine/open-loop";
import type { Poly } from "@/lib/engine/poly";
import { stageModel } from "@/lib/engine/stage-models";

const at = (p: Poly, s: Complex) => Array.from(p).reduceRight((acc: Complex, c) => acc.mul(s).add(c), new Complex(0, 0));
const node = (kind: string, params: Record<string, number | null>) =>
  ({ id: "u", kind, params: { vref: 0, ...params }, rails: { low: -5, high: 5 } }) as OpAmpNode;
const ideal = openLoop(undefined);
const S = [new Complex(0, 1234), new Complex(-300, 7e4), new Complex(5, 0.5)];
const close = (a: Complex, b: Complex) => expect(a.sub(b).abs() / b.abs()).toBeLessThan(1e-12);

describe("stageModel", () => {
  it("reduces to the ideal H(s) of every kind (chain-format.md table)", () => {
    const one = new Complex(1, 0);
    const cases: [OpAmpNode, (s: Complex) => Complex][] = [
      [node("inverting", { r1: 2e3, r2: 3e4 }), () => new Complex(-15, 0)],
      [node("noninverting", { rf: 9e3, rg: 1e3 }), () => new Complex(10, 0)],
      [node("noninverting", { rf: null, rg: null }), () => one],
      [node("lossyIntegrator", { r1: 1e4, r2: 1e5, c2: 1e-8 }), (s) => new Complex(-10, 0).div(s.mul(1e-3).add(1))],
      [node("integrator", { r1: 1e4, c2: 1e-8 }), (s) => new Complex(-1, 0).div(s.mul(1e-4))],
      [
        node("sallenKeyLowpass", { r1: 1e4, r2: 2e4, c1: 3e-8, c2: 1e-8 }),
        (s) => one.div(s.mul(1e-8 * 3e4).add(s.mul(s).mul(1e4 * 2e4 * 3e-8 * 1e-8)).add(1)),
      ],
      [
        node("mfbLowpass", { r1: 1e4, r2: 2e4, r3: 5e3, c1: 4.7e-8, c2: 1e-9 }),
        (s) => new Complex(-2, 0).div(s.mul(1e-9 * (2e4 + 5e3 + (2e4 * 5e3) / 1e4)).add(s.mul(s).mul(4.7e-8 * 1e-9 * 2e4 * 5e3)).add(1)),
      ],
    ];
    for (const [n, h] of cases) {
      const m = stageModel(n, ideal);
      for (const s of S) close(at(m.vin.vo, s).div(at(m.den, s)), h(s));
    }
  });
  // filters: ideal H(s) derived by hand from the nodal equations of each topology (lib/engine/README.md)
  it("reduces the Sallen-Key sections with gain and the MFB high-pass to their ideal H(s)", () => {
    const [r1, r2, c1, c2, rf, rg] = [1.2e4, 3.3e4, 4.7e-9, 2.2e-9, 1.5e4, 2.2e4];
    const K = 1 + rf / rg;
    const t2 = r1 * r2 * c1 * c2;
    const lp = (k: number) => (s: Complex) =>
      new Complex(k, 0).div(s.mul(s).mul(t2).add(s.mul((r1 + r2) * c2 + r1 * c1 * (1 - k))).add(1));
    const hp = (k: number) => (s: Complex) =>
      s.mul(s).mul(k * t2).div(s.mul(s).mul(t2).add(s.mul(r1 * (c1 + c2) + r2 * c2 * (1 - k))).add(1));
    const [m1, m2, m3] = [22e-9, 10e-9, 4.7e-9];
    const mfbHp = (s: Complex) =>
      s.mul(s).mul(-m1 * m3 * r1 * r2).div(s.mul(s).mul(m2 * m3 * r1 * r2).add(s.mul(r1 * (m1 + m2 + m3))).add(1));
    const cases: [OpAmpNode, (s: Complex) => Complex][] = [
      [node("sallenKeyLowpass", { r1, r2, c1, c2, rf, rg }), lp(K)],
      [node("sallenKeyLowpass", { r1, r2, c1, c2, rf, rg: null }), lp(1)],
      [node("sallenKeyHighpass", { c1, c2, r1, r2, rf, rg }), hp(K)],
      [node("sallenKeyHighpass", { c1, c2, r1, r2, rf: null, rg: null }), hp(1)],
      [node("sallenKeyHighpass", { c1, c2, r1, r2, rf, rg: null }), hp(1)],
      [node("mfbHighpass", { c1: m1, c2: m2, c3: m3, r1, r2 }), mfbHp],
    ];
    for (const [n, h] of cases) {
      const m = stageModel(n, ideal);
      for (const s of S) close(at(m.vin.vo, s).div(at(m.den, s)), h(s));
    }
  });
  it("gives the Sallen-Key low-pass with gain the unity-gain closed form when K = 1 (rg absent)", () => {
    // rf alone only carries the (−) pin current: the signal response equals the hand-derived unity-gain form
    const p = { r1: 1.2e4, r2: 3.3e4, c1: 4.7e-9, c2: 2.2e-9 };
    for (const ol of [openLoop({ aol: 1e5, gbw: 1e6 }), openLoop({ gbw: 3e6 }), openLoop({ aol: 2e4 })]) {
      const a = stageModel(node("sallenKeyLowpass", p), ol);
      const b = stageModel(node("sallenKeyLowpass", { ...p, rf: 1e4, rg: null }), ol);
      for (const s of S) {
        close(at(b.vin.vo, s).div(at(b.den, s)), at(a.vin.vo, s).div(at(a.den, s)));
        close(at(b.vin.iin, s).div(at(b.den, s)), at(a.vin.iin, s).div(at(a.den, s)));
      }
    }
  });
  it("gives an inverting stage's input impedance r1 + r2/(1 + A) with finite gain", () => {
    const m = stageModel(node("inverting", { r1: 1e3, r2: 1e5 }), openLoop({ aol: 1e3 }));
    const s = new Complex(0, 1);
    close(at(m.den, s).div(at(m.vin.iin, s)), new Complex(1e3 + 1e5 / 1001, 0));
  });
  it("matches references.md §6's finite-A Sallen-Key form A/[(A + 1) + s(A·Cb(R1 + R2) + CaR1 + Cb(R1 + R2)) + s²(A + 1)R1R2CaCb]", () => {
    const A = 5e3;
    const [r1, r2, ca, cb] = [1e4, 1.5e4, 2.2e-8, 1e-8];
    const m = stageModel(node("sallenKeyLowpass", { r1, r2, c1: ca, c2: cb }), openLoop({ aol: A }));
    for (const s of S) {
      const want = new Complex(A, 0).div(
        s.mul(A * cb * (r1 + r2) + ca * r1 + cb * (r1 + r2)).add(s.mul(s).mul((A + 1) * r1 * r2 * ca * cb)).add(A + 1),
      );
      close(at(m.vin.vo, s).div(at(m.den, s)), want);
    }
  });
  it("lists each resistor, en, the pin currents and vref as sources", () => {
    const els = (n: OpAmpNode) => stageModel(n, ideal).sources.map((x) => x.element);
    expect(els(node("mfbLowpass", { r1: 1, r2: 1, r3: 1, c1: 1, c2: 1 }))).toEqual(["r1", "r2", "r3", "en", "in-", "vref"]);
    expect(els(node("sallenKeyLowpass", { r1: 1, r2: 1, c1: 1, c2: 1 }))).toEqual(["r1", "r2", "en", "in+", "vref"]);
    expect(els(node("noninverting", { rf: 1, rg: 1 }))).toEqual(["rf", "rg", "en", "in-", "in+", "vref"]);
    expect(els(node("integrator", { r1: 1, c2: 1 }))).toEqual(["r1", "en", "in-", "vref"]);
    expect(els(node("sallenKeyLowpass", { r1: 1, r2: 1, c1: 1, c2: 1, rf: 1, rg: 1 }))).toEqual(["r1", "r2", "rf", "rg", "en", "in+", "in-", "vref"]);
    expect(els(node("sallenKeyHighpass", { r1: 1, r2: 1, c1: 1, c2: 1, rf: null, rg: null }))).toEqual(["r1", "r2", "en", "in+", "vref"]);
    expect(els(node("sallenKeyHighpass", { r1: 1, r2: 1, c1: 1, c2: 1, rf: 1, rg: null }))).toEqual(["r1", "r2", "rf", "en", "in+", "in-", "vref"]);
    expect(els(node("mfbHighpass", { r1: 1, r2: 1, c1: 1, c2: 1, c3: 1 }))).toEqual(["r1", "r2", "en", "in-", "vref"]);
  });
});
