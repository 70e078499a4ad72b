/**
 * The source's optional `sensitivity` (V per unit of the measurand) and `unit` (its short name): accepted
 * when valid, refused with the field named when not, and absent stays absent so older documents come
 * back unchanged.
 */
import { describe, expect, it } from "vitest";
import { exampleChain } from "@/lib/chain/example";
import { validateChain, validateDraft } from "@/lib/chain/schema";

function withSource(extra: Record<string, unknown>): unknown {
  const doc = exampleChain() as unknown as { nodes: { params: Record<string, unknown> }[] };
  doc.nodes[0].params = { ...doc.nodes[0].params, ...extra };
  return doc;
}

function errorsOf(doc: unknown) {
  const r = validateChain(doc);
  return r.ok ? [] : r.errors;
}

describe("source sensitivity and unit", () => {
  it("keeps a declared sensitivity and unit", () => {
    const r = validateChain(withSource({ sensitivity: 0.002, unit: "kg" }));
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const p = r.chain.nodes[0].params as unknown as Record<string, unknown>;
    expect(p.sensitivity).toBe(0.002);
    expect(p.unit).toBe("kg");
  });

  it("accepts a negative sensitivity (a falling output) and null for none", () => {
    expect(validateChain(withSource({ sensitivity: -0.01, unit: "°C" })).ok).toBe(true);
    expect(validateChain(withSource({ sensitivity: null, unit: "" })).ok).toBe(true);
  });

  it("leaves both absent when the document leaves them out", () => {
    const r = validateChain(exampleChain());
    if (!r.ok) throw new Error("example refused");
    expect("sensitivity" in r.chain.nodes[0].params).toBe(false);
    expect("unit" in r.chain.nodes[0].params).toBe(false);
  });

  it("refuses a zero sensitivity, naming the field", () => {
    const errs = errorsOf(withSource({ sensitivity: 0 }));
    expect(errs.map((e) => e.path)).toEqual(["nodes[0].params.sensitivity"]);
    expect(errs[0].message).toMatch(/must not be 0/);
  });

  it("refuses text and non-finite sensitivities with the rule in words", () => {
    const text = errorsOf(withSource({ sensitivity: "2m" }));
    expect(text[0].path).toBe("nodes[0].params.sensitivity");
    expect(text[0].message).toMatch(/volts per unit of the measurand/);
    expect(errorsOf(withSource({ sensitivity: true }))[0].path).toBe("nodes[0].params.sensitivity");
  });

  it("refuses a unit that is not short text", () => {
    expect(errorsOf(withSource({ unit: 5 }))[0].path).toBe("nodes[0].params.unit");
    const long = errorsOf(withSource({ unit: "x".repeat(17) }));
    expect(long[0].path).toBe("nodes[0].params.unit");
    expect(long[0].message).toMatch(/up to 16 characters/);
    expect(validateChain(withSource({ unit: "x".repeat(16) })).ok).toBe(true);
  });

  it("checks the same rules in a draft", () => {
    const draft = { format: "chainwright.chain/1", name: "d", nodes: [{ id: "s", kind: "source", params: { sensitivity: 0 } }], edges: [] };
    const r = validateDraft(draft);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0].path).toBe("nodes[0].params.sensitivity");
    draft.nodes[0].params = { sensitivity: 0.5, unit: "lx" } as never;
    expect(validateDraft(draft).ok).toBe(true);
  });

  it("suggests the field for a near miss", () => {
    const errs = errorsOf(withSource({ sensitivty: 0.1 }));
    expect(errs[0].message).toMatch(/did you mean sensitivity\?/);
  });
});
