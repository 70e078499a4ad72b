/**
 * `tolerances.overrides` (a backward-compatible addition to chain-format.md): per-part tolerances keyed
 * "nodeId.param", each a fraction in [0, 0.5], naming a resistor or capacitor of a node of the chain.
 */
import { describe, expect, it } from "vitest";
import { validateChain } from "@/lib/chain/schema";
import { exampleChain } from "@/lib/chain/example";
import { spreadParts } from "@/lib/engine/spread";

const withOverrides = (overrides: unknown) => ({ ...exampleChain(), tolerances: { resistor: 0.01, capacitor: 0.05, overrides } });
const errorsOf = (doc: unknown) => {
  const r = validateChain(doc);
  return r.ok ? [] : r.errors;
};

describe("tolerances.overrides", () => {
  it("is optional: a document without it stays without it", () => {
    const r = validateChain(exampleChain());
    expect(r.ok).toBe(true);
    if (r.ok) expect("overrides" in r.chain.tolerances).toBe(false);
  });

  it("accepts fractions for resistor and capacitor params, and the spread uses them", () => {
    const r = validateChain(withOverrides({ "u1.r1": 0.001, "u1.c2": 0.1 }));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const parts = Object.fromEntries(spreadParts(r.chain).map((p) => [p.key, p.tolerance]));
    expect(parts).toEqual({ "u1.r1": 0.001, "u1.r2": 0.01, "u1.c2": 0.1 });
  });

  it("refuses a value outside [0, 0.5], a malformed key, an unknown node and a param that is not R or C", () => {
    expect(errorsOf(withOverrides({ "u1.r1": 0.6 }))[0].path).toBe('tolerances.overrides["u1.r1"]');
    expect(errorsOf(withOverrides({ "u1.r1": "1%" }))[0].path).toBe('tolerances.overrides["u1.r1"]');
    expect(errorsOf(withOverrides({ r1: 0.01 }))[0]).toMatchObject({ path: "tolerances.overrides.r1", message: expect.stringMatching(/nodeId\.param/) });
    expect(errorsOf(withOverrides({ "u9.r1": 0.01 }))[0]).toMatchObject({ message: expect.stringMatching(/u9/) });
    expect(errorsOf(withOverrides({ "u1.vref": 0.01 }))[0]).toMatchObject({ message: expect.stringMatching(/not a resistor or capacitor/) });
    expect(errorsOf(withOverrides([]))[0].path).toBe("tolerances.overrides");
  });
});
