/**
 * Snapping to standard values (lib/engine/snap.ts) with the figures before and after, against
 * references.md §6 and §14.
 */
import { describe, expect, it } from "vitest";
import { snapPlan } from "@/lib/engine/snap";
import { adc, makeChain, sallenKey, source } from "./support/chain-builders";
import { near } from "./support/checks";

// references.md §6: synthesis for f0 = 1 kHz, Q = 1/√2, R = 10 kΩ gives Cb = 11.25395 nF, Ca = 22.50791 nF
const chain = makeChain({
  nodes: [source({ fHigh: 100 }), sallenKey("sk", { r1: 1e4, r2: 1e4, c1: 22.50791e-9, c2: 11.25395e-9 }), adc("adc", { vinLow: -10, vinHigh: 10 })],
});

describe("snap to standard values", () => {
  it("E24 on the whole chain: 22 nF and 11 nF, Q stays 0.707107 and f0 becomes 1023.087 Hz", () => {
    const plan = snapPlan(chain, "E24");
    expect(plan.changes.map((c) => [c.key, c.to])).toEqual([
      ["sk.c1", 22e-9],
      ["sk.c2", 11e-9],
    ]); // the 10 kΩ resistors are already E24 values
    const sk = plan.stages.find((s) => s.id === "sk")!;
    near(sk.before.f0!, 1000, { rel: 1e-6 }, "references.md §6, the synthesised section");
    near(sk.after.q!, 0.707107, { abs: 5e-7 }, "references.md §6, E24 snap keeps Q = 0.707107");
    near(sk.after.f0!, 1023.087, { abs: 5e-4 }, "references.md §6, E24 snap gives f0 = 1023.087 Hz");
    const p = plan.chain.nodes.find((n) => n.id === "sk")!.params as { c1: number; c2: number };
    expect(p.c1).toBe(22e-9);
    expect(p.c2).toBe(11e-9);
    // the input chain is not touched
    expect((chain.nodes[1].params as { c1: number }).c1).toBe(22.50791e-9);
  });

  it("one part at a time, and E96 picks the log-nearest value (references.md §14 vectors)", () => {
    const one = snapPlan(chain, "E96", "sk.c2");
    expect(one.changes).toHaveLength(1);
    // 11.25395 nF: E96 neighbours 11.3 and 11.0; 11.3 is nearer by ratio
    expect(one.changes[0]).toMatchObject({ key: "sk.c2", to: 11.3e-9 });
    const odd = makeChain({ nodes: [source(), sallenKey("sk", { r1: 4.8e3, r2: 15915.49, c1: 6.5e-9, c2: 1e-9 }), adc("adc")] });
    const to = Object.fromEntries(snapPlan(odd, "E96").changes.map((c) => [c.param, c.to]));
    // references.md §14: 4.8 kΩ → 4.75k, 15915.49 Ω → 15.8k, 6.5 nF → 6.49n in E96
    near(to.r1, 4750, { rel: 1e-12 }, "references.md §14 nearest-value vectors, E96");
    near(to.r2, 15800, { rel: 1e-12 }, "references.md §14 nearest-value vectors, E96");
    near(to.c1, 6.49e-9, { rel: 1e-12 }, "references.md §14 nearest-value vectors, E96");
    expect(() => snapPlan(chain, "E24", "sk.vref")).toThrow(/not a resistor or capacitor/);
  });
});
