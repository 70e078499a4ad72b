import { describe, expect, it } from "vitest";
import { makeClip, parseClip, pasteClip, CLIP_FORMAT } from "@/lib/store/clipboard";
import { emptyDoc, type DraftDoc } from "@/lib/store/draft";

function sample(): DraftDoc {
  return {
    ...emptyDoc("A"),
    parts: { p1: { label: "Model A", gbw: 1e6 } },
    nodes: [
      { id: "src", kind: "source", params: { dc: 0 }, position: { x: 0, y: 0 } },
      { id: "u1", kind: "inverting", params: { r1: 1e3, r2: 1e4 }, part: "p1", rails: { low: -5, high: 5 }, position: { x: 100, y: 0 } },
      { id: "u2", kind: "lossyIntegrator", params: { r1: 1e3 }, part: null, position: { x: 200, y: 0 } },
    ],
    edges: [{ from: "src", to: "u1" }, { from: "u1", to: "u2" }],
  };
}

describe("makeClip", () => {
  it("takes the chosen nodes, the edges among them and the parts they use", () => {
    const clip = makeClip(sample(), ["u1", "u2"])!;
    expect(clip.format).toBe(CLIP_FORMAT);
    expect(clip.nodes.map((n) => n.id)).toEqual(["u1", "u2"]);
    expect(clip.edges).toEqual([{ from: "u1", to: "u2" }]);
    expect(Object.keys(clip.parts)).toEqual(["p1"]);
  });
  it("gives null for an empty selection", () => {
    expect(makeClip(sample(), [])).toBeNull();
  });
});

describe("parseClip", () => {
  it("reads back what makeClip wrote and ignores foreign text", () => {
    const clip = makeClip(sample(), ["u1"])!;
    expect(parseClip(JSON.stringify(clip))?.nodes[0].id).toBe("u1");
    expect(parseClip("hello")).toBeNull();
    expect(parseClip(JSON.stringify({ format: "other", nodes: [], edges: [] }))).toBeNull();
  });
});

describe("pasteClip", () => {
  it("gives fresh ids, keeps inner edges and shifts positions", () => {
    const d = sample();
    const out = pasteClip(d, makeClip(d, ["u1", "u2"])!);
    expect(out.newIds).toEqual(["u3", "u4"]);
    expect(out.doc.edges).toContainEqual({ from: "u3", to: "u4" });
    const u3 = out.doc.nodes.find((n) => n.id === "u3")!;
    expect(u3.position).toEqual({ x: 140, y: 40 });
    expect(u3.rails).toEqual({ low: -5, high: 5 });
    expect(u3.part).toBe("p1");
  });

  it("carries a part into another chain and renames it when the key there means another model", () => {
    const clip = makeClip(sample(), ["u1"])!;
    const other: DraftDoc = { ...emptyDoc("B"), parts: { p1: { label: "Something else" } } };
    const out = pasteClip(other, clip);
    const pasted = out.doc.nodes[0];
    expect(pasted.part).toBe("p2");
    expect(out.doc.parts.p2.label).toBe("Model A");
    expect(out.doc.parts.p1.label).toBe("Something else");
  });

  it("leaves out a second source", () => {
    const d = sample();
    const out = pasteClip(d, makeClip(d, ["src", "u1"])!);
    expect(out.doc.nodes.filter((n) => n.kind === "source")).toHaveLength(1);
    expect(out.skipped.length).toBe(1);
    expect(out.newIds).toEqual(["u3"]);
  });
});
