/**
 * The complex.js nodal path on its own, against closed forms (it must be right by itself, not only
 * agree with the fast path).
 */
import Complex from "complex.js";
import { describe, expect, it } from "vitest";
import { referenceResponse, referenceTransfer } from "@/lib/engine";
import type { ChainNode } from "@/lib/chain/types";
import { adc, line, rails, source } from "./engine-fixtures";

const op = (id: string, kind: string, params: Record<string, number | null>, part: string | null = null): ChainNode =>
  ({ id, kind, params: { vref: 0, ...params }, rails: rails(), part }) as ChainNode;
const db = (c: Complex | null) => 20 * Math.log10(c!.abs());
const deg = (c: Complex | null) => (c!.arg() * 180) / Math.PI;

describe("referenceResponse", () => {
  it("MFB 7(a) at f0: −3.0102999566 dB and +90° (references.md §7, the mathjs lusolve check of §16)", () => {
    const ch = line([source(), op("m", "mfbLowpass", { r1: 1e4, r2: 1e4, r3: 1e4, c1: 45e-9, c2: 10e-9 })]);
    const r = referenceResponse(ch, [750.2636]).get("m")!;
    expect(db(r.cum[0])).toBeCloseTo(-3.0102999566, 5);
    expect(deg(r.cum[0])).toBeCloseTo(90, 3);
  });
  it("Sallen-Key 6(a) with GBW = 1 MHz at f0: −3.01050 dB, −90.1290° (references.md §6)", () => {
    const ch = line([source(), op("s", "sallenKeyLowpass", { r1: 1e4, r2: 1e4, c1: 20e-9, c2: 10e-9 }, "p")], { p: { aol: 1e5, gbw: 1e6 } });
    const r = referenceResponse(ch, [1125.3954]).get("s")!;
    expect(db(r.cum[0])).toBeCloseTo(-3.0105, 4);
    expect(deg(r.cum[0])).toBeCloseTo(-90.129, 3);
  });
  it("loads a section exactly: two equal RC sections give 1/(1 + 3sRC + (sRC)²) (chain-format.md)", () => {
    const ch = line([source(), { id: "a", kind: "rcLowpass", params: { r: 1e3, c: 1e-7 } }, { id: "b", kind: "rcLowpass", params: { r: 1e3, c: 1e-7 } }]);
    const f = 2000;
    const x = new Complex(0, 2 * Math.PI * f * 1e-4);
    const h = new Complex(1, 0).div(x.mul(x).add(x.mul(3)).add(1));
    const r = referenceResponse(ch, [f]).get("b")!;
    expect(r.cum[0]!.sub(h).abs() / h.abs()).toBeLessThan(1e-13);
    // individual: the second section alone, loaded by nothing: 1/(1 + sRC)
    expect(r.ind[0]!.sub(new Complex(1, 0).div(x.add(1))).abs()).toBeLessThan(1e-13);
  });
  it("reads an ADC at its input pin with its input resistance as load", () => {
    const r = referenceResponse(line([source("s", { resistance: 3e3 }), adc("a", { inputResistance: 1e3 })]), [10]);
    expect(r.get("a")!.cum[0]!.re).toBeCloseTo(0.25, 14);
  });
});

describe("referenceTransfer", () => {
  it("carries vos with the noise gain 1 + r2/(r1 + Rs) at DC (chain-format.md)", () => {
    const ch = line([source("s", { resistance: 1e3 }), op("u", "inverting", { r1: 1e4, r2: 1e5 })]);
    expect(referenceTransfer(ch, "u:en", "u", false, 0)!.re).toBeCloseTo(1 + 1e5 / 1.1e4, 13);
  });
  it("takes in− through r2 (references.md §5: Ib− = 80 nA gives 8 mV through R2 = 100 kΩ)", () => {
    const ch = line([source(), op("u", "lossyIntegrator", { r1: 1e4, r2: 1e5, c2: 1e-8 })]);
    expect(referenceTransfer(ch, "u:in-", "u", false, 0)!.re * 80e-9).toBeCloseTo(8e-3, 15);
  });
  it("is null where the network has no DC solution (an ideal integrator at DC)", () => {
    const ch = line([source(), op("i", "integrator", { r1: 1e4, c2: 1e-8 })]);
    expect(referenceTransfer(ch, "src:emf", "i", false, 0)).toBeNull();
    expect(referenceTransfer(ch, "src:emf", "i", false, 10)!.abs()).toBeCloseTo(1 / (2 * Math.PI * 10 * 1e-4), 8);
  });
});
