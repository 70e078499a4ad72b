import { describe, expect, it } from "vitest";
import { applyEdits, applyParams, insertAfter } from "@/lib/store/solve-apply";
import { createEditorStore } from "@/lib/store/editor-store";
import type { DraftDoc } from "@/lib/store/draft";

const doc = (): DraftDoc => ({
  format: "chainwright.chain/1",
  name: "t",
  parts: {},
  nodes: [
    { id: "src", kind: "source", params: { dc: 0, amplitude: 0.1, fLow: 1, fHigh: 100 }, position: { x: 0, y: 0 } },
    { id: "u1", kind: "inverting", params: { r1: 1e4, r2: 2e4, vref: 0 }, rails: { low: -5, high: 5 }, part: null, position: { x: 220, y: 0 } },
    { id: "adc1", kind: "adc", params: { bits: 12, sampleRate: 1e3, vinLow: 0, vinHigh: 5 }, position: { x: 440, y: 0 } },
  ],
  edges: [
    { from: "src", to: "u1" },
    { from: "u1", to: "adc1" },
  ],
});

describe("solver edits to the draft", () => {
  it("applyParams sets only the given params and is one undo step in the store", () => {
    const store = createEditorStore({ doc: doc() });
    const before = store.getState().doc;
    store.getState().actions.commit(applyParams(before, "u1", { r1: 4.7e3, r2: 47e3 }));
    expect(store.getState().doc.nodes[1].params).toEqual({ r1: 4.7e3, r2: 47e3, vref: 0 });
    store.getState().actions.undo();
    expect(store.getState().doc).toBe(before);
    expect(applyParams(before, "nope", { r1: 1 })).toBe(before);
  });
  it("applyEdits applies several nodes' values", () => {
    const d = applyEdits(doc(), [
      { id: "u1", params: { vref: 1.25 } },
      { id: "adc1", params: { vinHigh: 4.096 } },
    ]);
    expect(d.nodes[1].params.vref).toBe(1.25);
    expect(d.nodes[2].params.vinHigh).toBe(4.096);
  });
  it("insertAfter puts the sections between a node and what it fed, with its rails, and moves the rest right", () => {
    const { doc: d, ids } = insertAfter(doc(), "u1", [
      { kind: "sallenKeyLowpass", label: "Section 1", params: { r1: 1e4, r2: 1e4, c1: 20e-9, c2: 10e-9, vref: 0 } },
      { kind: "sallenKeyLowpass", label: "Section 2", params: { r1: 1e4, r2: 1e4, c1: 40e-9, c2: 10e-9, vref: 0 } },
    ]);
    expect(ids).toHaveLength(2);
    expect(d.edges).toEqual(
      expect.arrayContaining([
        { from: "src", to: "u1" },
        { from: "u1", to: ids[0] },
        { from: ids[0], to: ids[1] },
        { from: ids[1], to: "adc1" },
      ]),
    );
    expect(d.edges).toHaveLength(4);
    const made = d.nodes.filter((n) => ids.includes(n.id));
    for (const n of made) expect(n.rails).toEqual({ low: -5, high: 5 });
    expect(d.nodes.find((n) => n.id === "adc1")!.position!.x).toBe(440 + 2 * 220);
    expect(made.map((n) => n.position!.x)).toEqual([440, 660]);
  });
});
