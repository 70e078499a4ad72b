import { describe, expect, it } from "vitest";
import { checkConnection, pathTo, reaches, tidyLayout, LAYOUT } from "@/lib/store/graph";
import type { DraftDoc, DraftNode } from "@/lib/store/draft";

const node = (id: string, kind: DraftNode["kind"]): DraftNode => ({ id, kind, params: {} });
const doc = (nodes: DraftNode[], edges: DraftDoc["edges"] = []) => ({ nodes, edges });

describe("checkConnection", () => {
  const base = doc(
    [node("src", "source"), node("u1", "inverting"), node("u2", "lossyIntegrator"), node("adc", "adc")],
    [{ from: "src", to: "u1" }, { from: "u1", to: "u2" }],
  );

  it("accepts a forward connection to a node without input", () => {
    expect(checkConnection(base, "u2", "adc")).toEqual({ ok: true });
  });

  it("refuses a second input to a node", () => {
    const r = checkConnection(base, "src", "u2");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/already has an input/);
  });

  it("refuses a loop back to an earlier node", () => {
    const loop = doc(base.nodes, [{ from: "u1", to: "u2" }]);
    const r = checkConnection(loop, "u2", "u1");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/loop/);
  });

  it("refuses edges into the source, out of an ADC and onto itself", () => {
    expect(checkConnection(base, "u2", "src").ok).toBe(false);
    expect(checkConnection(doc([...base.nodes, node("u3", "inverting")]), "adc", "u3").ok).toBe(false);
    expect(checkConnection(base, "u2", "u2").ok).toBe(false);
  });

  it("allows fan-out from one node to several", () => {
    const fan = doc([...base.nodes, node("adc2", "adc")], [...base.edges, { from: "u2", to: "adc" }]);
    expect(checkConnection(fan, "u2", "adc2").ok).toBe(true);
  });
});

describe("reaches", () => {
  it("follows edges transitively and only forwards", () => {
    const edges = [{ from: "a", to: "b" }, { from: "b", to: "c" }];
    expect(reaches(edges, "a", "c")).toBe(true);
    expect(reaches(edges, "c", "a")).toBe(false);
  });
});

describe("pathTo", () => {
  it("walks back to the source", () => {
    const d = doc([node("src", "source"), node("u1", "inverting"), node("adc", "adc")], [
      { from: "src", to: "u1" },
      { from: "u1", to: "adc" },
    ]);
    expect(pathTo(d, "adc")).toEqual(["src", "u1", "adc"]);
  });
  it("is empty for a node not fed from the source", () => {
    const d = doc([node("src", "source"), node("u1", "inverting")]);
    expect(pathTo(d, "u1")).toEqual([]);
  });
});

describe("tidyLayout", () => {
  it("puts each node one column right of its input, and centres a fork's parent between its branches", () => {
    const d = doc(
      [node("src", "source"), node("u1", "inverting"), node("adc1", "adc"), node("adc2", "adc"), node("loose", "rcLowpass")],
      [{ from: "src", to: "u1" }, { from: "u1", to: "adc1" }, { from: "u1", to: "adc2" }],
    );
    const p = tidyLayout(d);
    expect(p.src.x).toBe(LAYOUT.originX);
    expect(p.u1.x).toBe(LAYOUT.originX + LAYOUT.columnGap);
    expect(p.adc1.x).toBe(LAYOUT.originX + 2 * LAYOUT.columnGap);
    expect(p.adc2.y - p.adc1.y).toBe(LAYOUT.rowGap);
    expect(p.u1.y).toBe((p.adc1.y + p.adc2.y) / 2);
    // The loose node sits below the source's tree, in the first column.
    expect(p.loose.x).toBe(LAYOUT.originX);
    expect(p.loose.y).toBeGreaterThan(p.adc2.y);
  });

  it("continues a chain deeper than the wrap on a band below, from the left again", () => {
    const ids = ["src", ...Array.from({ length: 10 }, (_, i) => `g${i + 1}`), "adc1"];
    const nodes = ids.map((id, i) => node(id, i === 0 ? "source" : i === ids.length - 1 ? "adc" : "noninverting"));
    const edges = ids.slice(1).map((id, i) => ({ from: ids[i], to: id }));
    const p = tidyLayout(doc(nodes, edges));
    const w = LAYOUT.wrapColumns;
    // the first band: columns 0 … w−1 on one line
    for (let i = 0; i < w; i++) expect(p[ids[i]]).toEqual({ x: LAYOUT.originX + i * LAYOUT.columnGap, y: LAYOUT.originY });
    // the rest: from the left again, one band lower (one row tall here, plus the gap)
    for (let i = w; i < ids.length; i++) {
      expect(p[ids[i]]).toEqual({ x: LAYOUT.originX + (i - w) * LAYOUT.columnGap, y: LAYOUT.originY + LAYOUT.rowGap + LAYOUT.bandGap });
    }
  });

  it("leaves a chain of exactly the wrap width on one line", () => {
    const ids = Array.from({ length: LAYOUT.wrapColumns }, (_, i) => `n${i}`);
    const p = tidyLayout(doc(ids.map((id, i) => node(id, i ? "rcLowpass" : "source")), ids.slice(1).map((id, i) => ({ from: ids[i], to: id }))));
    expect(new Set(ids.map((id) => p[id].y)).size).toBe(1);
  });
});
