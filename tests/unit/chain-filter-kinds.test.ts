/**
 * The filter sections in the chain schema: backward compatibility of the Sallen-Key low-pass (no rf/rg
 * means unity gain, filled in as null), the rf-with-rg rule, and the high-pass kinds' required params.
 */
import { describe, expect, it } from "vitest";
import { validateChain } from "@/lib/chain/schema";

const doc = (stage: Record<string, unknown>) => ({
  format: "chainwright.chain/1",
  name: "filters",
  nodes: [
    { id: "src", kind: "source", params: { dc: 0, amplitude: 0.1, fLow: 1, fHigh: 1e3 } },
    { id: "f", rails: { low: -5, high: 5 }, ...stage },
  ],
  edges: [{ from: "src", to: "f" }],
});

describe("filter sections in the schema", () => {
  it("reads a Sallen-Key low-pass written before rf/rg existed as unity gain (rf and rg null)", () => {
    const r = validateChain(doc({ kind: "sallenKeyLowpass", params: { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 } }));
    expect(r.ok && r.chain.nodes[1].params).toEqual({ r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8, rf: null, rg: null, vref: 0 });
  });

  it("refuses rg without rf on both Sallen-Key kinds, naming rf", () => {
    for (const [kind, params] of [
      ["sallenKeyLowpass", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8, rg: 1e4 }],
      ["sallenKeyHighpass", { c1: 1e-8, c2: 1e-8, r1: 1e4, r2: 2e4, rg: 1e4 }],
    ] as const) {
      const r = validateChain(doc({ kind, params }));
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.errors.map((e) => e.path)).toContain("nodes[1].params.rf");
    }
  });

  it("requires every capacitor and resistor of the high-pass sections and fills in the defaults", () => {
    const hp = validateChain(doc({ kind: "sallenKeyHighpass", params: { c1: 1e-8, c2: 1e-8, r1: 1e4 } }));
    expect(hp.ok).toBe(false);
    if (!hp.ok) expect(hp.errors[0]).toMatchObject({ path: "nodes[1].params.r2", message: expect.stringMatching(/ohms/) });
    const mfb = validateChain(doc({ kind: "mfbHighpass", params: { c1: 1e-8, c2: 1e-8, r1: 4.7e3, r2: 2.2e4 } }));
    expect(mfb.ok).toBe(false);
    if (!mfb.ok) expect(mfb.errors[0]).toMatchObject({ path: "nodes[1].params.c3", message: expect.stringMatching(/farads/) });
    const ok = validateChain(doc({ kind: "mfbHighpass", params: { c1: 1e-8, c2: 1e-8, c3: 1e-8, r1: 4.7e3, r2: 2.2e4 } }));
    expect(ok.ok && ok.chain.nodes[1].params).toEqual({ c1: 1e-8, c2: 1e-8, c3: 1e-8, r1: 4.7e3, r2: 2.2e4, vref: 0 });
    const g = validateChain(doc({ kind: "sallenKeyHighpass", params: { c1: 1e-8, c2: 1e-8, r1: 1e4, r2: 2e4, rf: 2.2e3, rg: 1e4 } }));
    expect(g.ok).toBe(true);
  });
});
