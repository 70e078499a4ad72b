/** The sensor kinds in the chain format: params with defaults, and the pairing rules named by edge. */
import { describe, expect, it } from "vitest";
import { validateChain, validateDraft } from "@/lib/chain/schema";

const doc = (nodes: unknown[], edges: { from: string; to: string }[]) => ({ format: "chainwright.chain/1", name: "t", nodes, edges });
const rails = { low: 0, high: 5 };
const bridge = { id: "src", kind: "bridge", params: { excitation: 5, fullScale: 0.002, resistance: 350, fHigh: 10 } };
const pd = { id: "src", kind: "photodiode", params: { amplitude: 1e-6, fLow: 0, fHigh: 1e3, capacitance: 5e-11, shuntResistance: 1e9 } };
const ia = { id: "ia", kind: "inAmp", params: { rg: 1e3 }, rails };
const tia = { id: "t", kind: "transimpedance", params: { rf: 1e5 }, rails };

describe("sensor kinds in the chain format", () => {
  it("fills the defaults of a bridge and an in-amp", () => {
    const v = validateChain(doc([bridge, ia], [{ from: "src", to: "ia" }]));
    expect(v.ok).toBe(true);
    if (!v.ok) return;
    const [b, a] = v.chain.nodes;
    expect(b.params).toMatchObject({ loadLow: 0, loadHigh: 1, offset: 0, vcm: null, fLow: 0, safety: "low-voltage" });
    expect(a.params).toMatchObject({ rf: 25e3, rd: 10e3, vref: 0, cmrrDb: null });
  });
  it("refuses a bridge into a voltage stage, naming the edge and the stages it may feed", () => {
    const v = validateDraft(doc([bridge, { id: "lp", kind: "rcLowpass", params: {} }], [{ from: "src", to: "lp" }]));
    expect(v.ok).toBe(false);
    if (v.ok) return;
    expect(v.errors[0].path).toBe("edges[0].to");
    expect(v.errors[0].message).toMatch(/differential output .*differenceAmp.*inAmp/);
  });
  it("refuses an in-amp fed from a single-ended node, and a TIA fed from a voltage source", () => {
    const src = { id: "src", kind: "source", params: { dc: 0, amplitude: 0.1, fLow: 1, fHigh: 10 } };
    const a = validateDraft(doc([src, ia], [{ from: "src", to: "ia" }]));
    expect(!a.ok && a.errors[0].message).toMatch(/takes a differential pair/);
    const b = validateDraft(doc([src, tia], [{ from: "src", to: "t" }]));
    expect(!b.ok && b.errors[0].message).toMatch(/takes a current .* photodiode or piezo/);
  });
  it("a photodiode into a TIA feeds that one stage; into voltage stages it may fan out (Norton form)", () => {
    const second = { id: "u", kind: "noninverting", params: { rf: null, rg: null }, rails };
    const v = validateDraft(doc([pd, tia, second], [{ from: "src", to: "t" }, { from: "src", to: "u" }]));
    expect(!v.ok && v.errors.map((e) => e.path)).toContain("edges[1].from");
    const w = validateChain(doc([pd, second, { ...second, id: "u2" }], [{ from: "src", to: "u" }, { from: "src", to: "u2" }]));
    expect(w.ok).toBe(true);
  });
  it("names a wrong sensor param by its field", () => {
    const v = validateChain(doc([{ ...bridge, params: { ...bridge.params, fullScale: -1 } }, ia], [{ from: "src", to: "ia" }]));
    expect(!v.ok && v.errors[0].path).toBe("nodes[0].params.fullScale");
  });
  it("counts a sensor as the chain's one source", () => {
    const src = { id: "s2", kind: "source", params: { dc: 0, amplitude: 0.1, fLow: 1, fHigh: 10 } };
    const v = validateChain(doc([bridge, ia, src], [{ from: "src", to: "ia" }]));
    expect(!v.ok && v.errors.some((e) => /2 sources/.test(e.message))).toBe(true);
  });
});
