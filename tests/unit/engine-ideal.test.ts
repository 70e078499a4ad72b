import { describe, expect, it } from "vitest";
import { idealCharacteristics } from "@/lib/engine";
import type { ChainNode } from "@/lib/chain/types";

const rails = { low: -5, high: 5 };
const rel = (a: number | null, b: number) => Math.abs((a ?? NaN) / b - 1);

describe("idealCharacteristics", () => {
  it("gives Sallen-Key f0 and Q (references.md §6(a), (b))", () => {
    // c1 is §6's Ca (A → out), c2 its Cb ((+) → vref)
    const a = idealCharacteristics({ id: "s", kind: "sallenKeyLowpass", params: { r1: 1e4, r2: 1e4, c1: 20e-9, c2: 10e-9, vref: 0 }, rails } as ChainNode);
    expect(rel(a.f0, 1125.3954)).toBeLessThan(1e-7);
    expect(rel(a.q, 0.70710678)).toBeLessThan(1e-8);
    const b = idealCharacteristics({ id: "s", kind: "sallenKeyLowpass", params: { r1: 1e4, r2: 1e4, c1: 22e-9, c2: 10e-9, vref: 0 }, rails } as ChainNode);
    expect(rel(b.f0, 1073.02241)).toBeLessThan(1e-8);
    expect(rel(b.q, 0.74161985)).toBeLessThan(1e-8);
  });
  it("gives MFB f0 and Q (references.md §7(a), (c))", () => {
    // c1 is §7's Cg (A → ground), c2 its Cf ((−) → out)
    const a = idealCharacteristics({ id: "m", kind: "mfbLowpass", params: { r1: 1e4, r2: 1e4, r3: 1e4, c1: 45e-9, c2: 10e-9, vref: 0 }, rails } as ChainNode);
    expect(rel(a.f0, 750.2636)).toBeLessThan(1e-7);
    expect(rel(a.q, 0.70710678)).toBeLessThan(1e-8);
    const c = idealCharacteristics({ id: "m", kind: "mfbLowpass", params: { r1: 1e3, r2: 1e4, r3: 1e4, c1: 100e-9, c2: 2.2e-9, vref: 0 }, rails } as ChainNode);
    expect(rel(c.f0, 1073.02241)).toBeLessThan(1e-8);
    expect(rel(c.q, 0.56183322)).toBeLessThan(1e-8);
  });
  it("gives first-order corners with q null (references.md §2, §5)", () => {
    const lp = idealCharacteristics({ id: "r", kind: "rcLowpass", params: { r: 1e4, c: 10e-9 } });
    expect(rel(lp.f0, 1591.5494309)).toBeLessThan(1e-9);
    expect(lp.q).toBeNull();
    const li = idealCharacteristics({ id: "l", kind: "lossyIntegrator", params: { r1: 1e4, r2: 1e5, c2: 1e-8, vref: 0 }, rails } as ChainNode);
    expect(rel(li.f0, 159.15494)).toBeLessThan(1e-7);
    const hp = idealCharacteristics({ id: "h", kind: "rcHighpass", params: { r: 1e5, c: 1e-6, vbias: 0 } });
    expect(rel(hp.f0, 1.5915494)).toBeLessThan(1e-7);
  });
  it("gives an integrator's unity-gain frequency 1/(2π·r1·c2)", () => {
    const i = idealCharacteristics({ id: "i", kind: "integrator", params: { r1: 1e4, c2: 1e-8, vref: 0 }, rails } as ChainNode);
    expect(rel(i.f0, 1591.5494309)).toBeLessThan(1e-9);
    expect(i.q).toBeNull();
  });
  it("has no frequency for gain stages", () => {
    const g = idealCharacteristics({ id: "g", kind: "inverting", params: { r1: 1e3, r2: 1e4, vref: 0 }, rails } as ChainNode);
    expect(g).toEqual({ f0: null, q: null, order: 0 });
  });
});
