/**
 * The draft level (chain-format.md "Two levels of validity") and the live-analysis subset of a draft.
 */
import { describe, expect, it } from "vitest";
import { completeSubchain, validateChain, validateDraft } from "@/lib/chain/schema";
import { exampleChain } from "@/lib/chain/example";

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- documents under test are built and broken freely
type Doc = Record<string, any>;
const rails = { low: -5, high: 5 };
const src = (params: Doc = {}) => ({ id: "src", kind: "source", params: { dc: 0, amplitude: 0.1, fLow: 1, fHigh: 100, ...params } });
const inv = (id: string, params: Doc = { r1: 1e3, r2: 1e4 }, extra: Doc = { rails }) => ({ id, kind: "inverting", params, ...extra });
const rc = (id: string, params: Doc = { r: 1e3, c: 1e-7 }) => ({ id, kind: "rcLowpass", params });
const adc = (id: string, params: Doc = { bits: 12, sampleRate: 1e3, vinLow: 0, vinHigh: 3.3 }) => ({ id, kind: "adc", params });
const edge = (from: string, to: string) => ({ from, to });
const draft = (nodes: Doc[], edges: Doc[] = []): Doc => ({ format: "chainwright.chain/1", name: "Sketch", nodes, edges });

describe("validateDraft", () => {
  it("accepts an unfinished sketch: missing params and rails, no ADC, loose nodes, no source, two sources", () => {
    const cases = [
      draft([src({ fHigh: undefined }), inv("u1", { r1: 1e3 }, {})], [edge("src", "u1")]),
      draft([src(), rc("rc1"), inv("u9", {})]),
      draft([inv("u1", {}, {})]),
      draft([src(), { ...src(), id: "src2" }]),
      draft([]),
      draft([{ id: "u1", kind: "mfbLowpass" }]), // params left out entirely
    ];
    for (const d of cases) {
      const r = validateDraft(JSON.parse(JSON.stringify(d)));
      expect(r.ok, JSON.stringify(r.ok ? "" : r.errors)).toBe(true);
    }
  });

  it("fills the document-level defaults but leaves params as typed", () => {
    const r = validateDraft(draft([inv("u1", { r1: 1e3 }, {})]));
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.draft.analysis.points).toBe(600);
    expect(r.draft.tolerances).toEqual({ resistor: 0.01, capacitor: 0.05 });
    expect(r.draft.notes).toBe("");
    expect(r.draft.nodes[0].params).toEqual({ r1: 1e3 });
    expect(validateDraft(draft([{ id: "u1", kind: "rcHighpass" }])).ok && true).toBe(true);
  });

  it("still refuses every present field that is wrong in type or limit", () => {
    const d = draft([src({ fLow: 200 }), inv("u1", { r1: -1 }, { rails: { low: 1, high: 0 } }), adc("a", { bits: 0 })]);
    d.analysis = { points: 1 };
    const r = validateDraft(d);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors.map((e) => e.path).sort()).toEqual(
        ["analysis.points", "nodes[0].params.fHigh", "nodes[1].params.r1", "nodes[1].rails.high", "nodes[2].params.bits"].sort(),
      );
    }
  });

  it("refuses what the editor must never produce: duplicate ids, dangling edges, loops, second inputs, edges into a source or out of an ADC", () => {
    const cases: [Doc, string, RegExp][] = [
      [draft([rc("a"), rc("a")]), "nodes[1].id", /repeats the id/],
      [draft([rc("a")], [edge("a", "b")]), "edges[0].to", /names no node/],
      [draft([rc("a"), rc("b")], [edge("a", "b"), edge("b", "a")]), "edges", /form a loop/],
      [draft([rc("a"), rc("b"), rc("c")], [edge("a", "c"), edge("b", "c")]), "edges[1].to", /second input/],
      [draft([src(), rc("a")], [edge("a", "src")]), "edges[0].to", /into the source/],
      [draft([adc("x"), rc("a")], [edge("x", "a")]), "edges[0].from", /leaves the ADC/],
      [draft([inv("u1", {}, { part: "p1" })]), "nodes[0].part", /names no part/],
      [draft([rc("a", { r: 1, c: 1, x: 2 })]), "nodes[0].params.x", /is not a field/],
      [draft([{ id: "u1", kind: "opamp" }]), "nodes[0].kind", /not a stage kind/],
    ];
    for (const [d, path, message] of cases) {
      const r = validateDraft(d);
      expect(r.ok, path).toBe(false);
      if (!r.ok) expect(r.errors.find((e) => e.path === path)?.message, JSON.stringify(r.errors)).toMatch(message);
    }
  });

  it("accepts every complete chain", () => {
    expect(validateDraft(exampleChain()).ok).toBe(true);
  });
});

describe("completeSubchain", () => {
  const ids = (r: ReturnType<typeof completeSubchain>) => r.chain?.nodes.map((n) => n.id) ?? null;
  const issueFor = (r: ReturnType<typeof completeSubchain>, path: string) => r.issues.find((i) => i.path === path)?.message;

  it("returns a complete chain unchanged with no issues", () => {
    const r = completeSubchain(exampleChain());
    expect(r.issues).toEqual([]);
    expect(r.chain).toEqual(exampleChain());
  });

  it("keeps the complete paths of a fan-out and leaves out the unfinished one, saying why", () => {
    const d = draft(
      [src(), inv("u1"), adc("a1"), inv("u2", { r1: 1e3 }), adc("a2")],
      [edge("src", "u1"), edge("u1", "a1"), edge("src", "u2"), edge("u2", "a2")],
    );
    const r = completeSubchain(d);
    expect(ids(r)).toEqual(["src", "u1", "a1"]);
    expect(r.chain!.edges).toEqual([edge("src", "u1"), edge("u1", "a1")]);
    expect(issueFor(r, "nodes[3]")).toMatch(/"u2" is not complete yet: params.r2 is required/);
    expect(issueFor(r, "nodes[4]")).toMatch(/"a2" follows "u2", which is not complete yet/);
  });

  it("lets a path stop at an op-amp stage whose successors are unfinished (its output is an ideal source)", () => {
    const d = draft([src(), inv("u1"), inv("u2", {}, {})], [edge("src", "u1"), edge("u1", "u2")]);
    const r = completeSubchain(d);
    expect(ids(r)).toEqual(["src", "u1"]);
    expect(issueFor(r, "nodes[2]")).toMatch(/"u2" is not complete yet/);
  });

  it("leaves out a passive section whose load is unknown, and climbs a passive ladder", () => {
    // src → u1 → rcA → rcB → u2(incomplete): both RC sections are loaded by what they feed.
    const d = draft(
      [src(), inv("u1"), rc("rcA"), rc("rcB"), inv("u2", { r1: 1e3 })],
      [edge("src", "u1"), edge("u1", "rcA"), edge("rcA", "rcB"), edge("rcB", "u2")],
    );
    const r = completeSubchain(d);
    expect(ids(r)).toEqual(["src", "u1"]);
    expect(issueFor(r, "nodes[3]")).toMatch(/"rcB" feeds "u2", which is left out, so the load on "rcB" is not known yet/);
    expect(issueFor(r, "nodes[2]")).toMatch(/"rcA" feeds "rcB", which is left out/);
  });

  it("keeps a passive section whose every load is complete", () => {
    const d = draft([src(), inv("u1"), rc("rcA"), adc("a")], [edge("src", "u1"), edge("u1", "rcA"), edge("rcA", "a")]);
    expect(ids(completeSubchain(d))).toEqual(["src", "u1", "rcA", "a"]);
  });

  it("analyses nothing when a source with resistance feeds something unfinished, and something when it has none", () => {
    const nodes = [src({ resistance: 100 }), inv("u1"), inv("u2", {})];
    const edges = [edge("src", "u1"), edge("src", "u2")];
    const r = completeSubchain(draft(nodes, edges));
    expect(r.chain).toBeNull();
    expect(r.issues.map((i) => i.message).join(" ")).toMatch(/has resistance and feeds a stage that is not complete/);
    const ideal = completeSubchain(draft([src(), inv("u1"), inv("u2", {})], edges));
    expect(ids(ideal)).toEqual(["src", "u1"]);
  });

  it("lists loose nodes and ignores a second source", () => {
    const d = draft([src(), inv("u1"), rc("loose"), { ...src(), id: "src2" }], [edge("src", "u1")]);
    const r = completeSubchain(d);
    expect(ids(r)).toEqual(["src", "u1"]);
    expect(issueFor(r, "nodes[2]")).toMatch(/"loose" is not connected to the source "src"/);
    expect(issueFor(r, "nodes")).toMatch(/has 2 sources; .* only what follows "src" is analysed/);
  });

  it("gives null with a reason when there is no source or the source is incomplete", () => {
    expect(completeSubchain(draft([inv("u1")])).chain).toBeNull();
    const bad = completeSubchain(draft([src({ fHigh: undefined }), inv("u1")], [edge("src", "u1")]));
    expect(bad.chain).toBeNull();
    expect(issueFor(bad, "nodes[0]")).toMatch(/source "src" is not complete yet: params.fHigh is required/);
    // A lone complete source is already a complete chain (a path of one node), as at the complete level.
    const alone = completeSubchain(draft([src()]));
    expect(ids(alone)).toEqual(["src"]);
  });

  it("gives the validation errors of a draft that is not valid", () => {
    const r = completeSubchain(draft([rc("a"), rc("a")]));
    expect(r.chain).toBeNull();
    expect(r.issues[0].path).toBe("nodes[1].id");
    expect(completeSubchain(null).chain).toBeNull();
  });

  it("always returns a chain that validates at the complete level", () => {
    const d = draft(
      [src(), rc("r0"), inv("u1", { r1: 1e3, r2: 2e3 }), inv("u2", { r1: 5 }), adc("a")],
      [edge("src", "r0"), edge("r0", "u1"), edge("u1", "u2"), edge("u1", "a")],
    );
    const r = completeSubchain(d);
    expect(ids(r)).toEqual(["src", "r0", "u1", "a"]);
    expect(validateChain(r.chain).ok).toBe(true);
  });
});
