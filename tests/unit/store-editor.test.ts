import { describe, expect, it } from "vitest";
import { createEditorStore } from "@/lib/store/editor-store";
import { emptyDoc } from "@/lib/store/draft";
import { LAYOUT } from "@/lib/store/graph";

const fresh = (readOnly = false) => createEditorStore({ doc: emptyDoc("T"), chainId: "c1", version: 1, readOnly });

describe("createEditorStore: adding and connecting", () => {
  it("adds nodes with starter params, selects the new one, and refuses a second source", () => {
    const s = fresh();
    const a = s.getState().actions;
    expect(a.addNode("source")).toBe("src");
    const u1 = a.addNode("lossyIntegrator")!;
    expect(s.getState().selected).toEqual([u1]);
    expect(s.getState().doc.nodes[1].params.r2).toBe(100e3);
    expect(a.addNode("source")).toBeNull();
    expect(s.getState().notice).toMatch(/exactly one/);
  });

  it("leaves rails empty on the first op-amp stage, then pre-fills the last rails typed", () => {
    const s = fresh();
    const a = s.getState().actions;
    const u1 = a.addNode("inverting")!;
    expect(s.getState().doc.nodes[0].rails).toBeUndefined();
    a.setRails(u1, { low: -12, high: 12 });
    const u2 = a.addNode("noninverting")!;
    expect(s.getState().doc.nodes.find((n) => n.id === u2)!.rails).toEqual({ low: -12, high: 12 });
  });

  it("connects by the graph rules and reports a refusal as a notice", () => {
    const s = fresh();
    const a = s.getState().actions;
    a.addNode("source");
    const u1 = a.addNode("inverting")!;
    expect(a.connect("src", u1).ok).toBe(true);
    expect(a.connect(u1, "src").ok).toBe(false);
    expect(s.getState().doc.edges).toEqual([{ from: "src", to: u1 }]);
    expect(s.getState().notice).toBeTruthy();
  });
});

describe("createEditorStore: undo and redo", () => {
  it("undoes and redoes structural edits one by one", () => {
    const s = fresh();
    const a = s.getState().actions;
    a.addNode("source");
    a.addNode("adc");
    a.connect("src", "adc1");
    expect(s.getState().doc.edges).toHaveLength(1);
    a.undo();
    expect(s.getState().doc.edges).toHaveLength(0);
    a.undo();
    expect(s.getState().doc.nodes.map((n) => n.id)).toEqual(["src"]);
    a.redo();
    a.redo();
    expect(s.getState().doc.edges).toHaveLength(1);
  });

  it("folds typing into one field into a single undo step", () => {
    const s = fresh();
    const a = s.getState().actions;
    const u1 = a.addNode("inverting")!;
    a.setParam(u1, "r2", 1e3);
    a.setParam(u1, "r2", 4.7e3);
    a.setParam(u1, "r2", 47e3);
    a.setParam(u1, "r1", 2e3);
    a.undo();
    expect(s.getState().doc.nodes[0].params).toMatchObject({ r1: 10e3, r2: 47e3 });
    a.undo();
    expect(s.getState().doc.nodes[0].params.r2).toBe(10e3);
  });

  it("drops the redo branch after a new edit", () => {
    const s = fresh();
    const a = s.getState().actions;
    a.addNode("source");
    a.undo();
    a.addNode("adc");
    a.redo();
    expect(s.getState().doc.nodes.map((n) => n.id)).toEqual(["adc1"]);
  });
});

describe("createEditorStore: delete, duplicate, paste", () => {
  it("deletes selected nodes with their edges", () => {
    const s = fresh();
    const a = s.getState().actions;
    a.addNode("source");
    const u1 = a.addNode("inverting")!;
    a.connect("src", u1);
    a.select([u1]);
    a.deleteSelection();
    expect(s.getState().doc.nodes.map((n) => n.id)).toEqual(["src"]);
    expect(s.getState().doc.edges).toEqual([]);
  });

  it("deletes a selected edge only", () => {
    const s = fresh();
    const a = s.getState().actions;
    a.addNode("source");
    const u1 = a.addNode("inverting")!;
    a.connect("src", u1);
    a.select([], [`src->${u1}`]);
    a.deleteSelection();
    expect(s.getState().doc.nodes).toHaveLength(2);
    expect(s.getState().doc.edges).toEqual([]);
  });

  it("duplicates a selection and pastes a fragment copied from another chain", () => {
    const s1 = fresh();
    const a1 = s1.getState().actions;
    const u1 = a1.addNode("lossyIntegrator")!;
    a1.setParam(u1, "r2", 220e3);
    a1.select([u1]);
    a1.duplicateSelection();
    expect(s1.getState().doc.nodes.map((n) => n.id)).toEqual(["u1", "u2"]);
    expect(s1.getState().selected).toEqual(["u2"]);
    const clip = a1.copySelection();
    const s2 = fresh();
    s2.getState().actions.paste(clip);
    expect(s2.getState().doc.nodes[0]).toMatchObject({ kind: "lossyIntegrator", params: { r2: 220e3 } });
  });
});

describe("createEditorStore: parts", () => {
  it("adds, copies and removes parts; a removed part leaves its stages ideal", () => {
    const s = fresh();
    const a = s.getState().actions;
    const u1 = a.addNode("inverting")!;
    const p = a.addPart({ label: "M", gbw: 1e6 })!;
    a.setPart(u1, p);
    const copy = a.copyPart(p)!;
    expect(s.getState().doc.parts[copy]).toEqual({ label: "M (copy)", gbw: 1e6 });
    a.removePart(p);
    expect(s.getState().doc.nodes[0].part).toBeNull();
    expect(s.getState().doc.parts[p]).toBeUndefined();
  });
});

describe("createEditorStore: save states", () => {
  it("goes unsaved on edit and saved when the saved draft is still current", () => {
    const s = fresh();
    const a = s.getState().actions;
    expect(s.getState().save).toBe("saved");
    a.addNode("source");
    expect(s.getState().save).toBe("unsaved");
    a.markSaving();
    const sent = s.getState().doc;
    a.markSaved(2, sent);
    expect(s.getState()).toMatchObject({ save: "saved", version: 2 });
  });

  it("stays unsaved when the user edited while the save was under way", () => {
    const s = fresh();
    const a = s.getState().actions;
    a.addNode("source");
    a.markSaving();
    const sent = s.getState().doc;
    a.addNode("adc");
    a.markSaved(2, sent);
    expect(s.getState().save).toBe("unsaved");
  });

  it("keeps the conflict state until the user chooses", () => {
    const s = fresh();
    const a = s.getState().actions;
    a.addNode("source");
    a.markConflict({ serverVersion: 5 });
    a.addNode("adc");
    expect(s.getState().save).toBe("conflict");
  });
});

describe("createEditorStore: read-only", () => {
  it("ignores every edit", () => {
    const s = createEditorStore({ doc: { ...emptyDoc("R"), nodes: [{ id: "src", kind: "source", params: {} }] }, readOnly: true });
    const a = s.getState().actions;
    const before = s.getState().doc;
    a.addNode("adc");
    a.select(["src"]);
    a.deleteSelection();
    a.setParam("src", "dc", 1);
    a.tidy();
    a.paste({ format: "chainwright.fragment/1", nodes: [{ id: "x", kind: "adc", params: {} }], edges: [], parts: {} });
    expect(s.getState().doc).toBe(before);
    expect(s.getState().save).toBe("saved");
  });
});

describe("createEditorStore: adding after a node", () => {
  it("places the new node right of the given one and connects it when the rules allow", () => {
    const s = fresh();
    const a = s.getState().actions;
    a.addNode("source", { x: 0, y: 0 });
    const u1 = a.addNode("lossyIntegrator", undefined, { after: "src" })!;
    const rc = a.addNode("rcLowpass", undefined, { after: u1 })!;
    const adc = a.addNode("adc", undefined, { after: rc })!;
    expect(s.getState().doc.edges).toEqual([
      { from: "src", to: u1 },
      { from: u1, to: rc },
      { from: rc, to: adc },
    ]);
    expect(s.getState().doc.nodes.find((n) => n.id === u1)!.position).toEqual({ x: LAYOUT.columnGap, y: 0 });
    // Nothing follows an ADC: the next node is placed but left unconnected.
    const loose = a.addNode("inverting", undefined, { after: adc })!;
    expect(s.getState().doc.edges.some((e) => e.to === loose)).toBe(false);
  });

  it("puts a second branch below the first", () => {
    const s = fresh();
    const a = s.getState().actions;
    a.addNode("source", { x: 0, y: 0 });
    a.addNode("adc", undefined, { after: "src" });
    const second = a.addNode("inverting", undefined, { after: "src" })!;
    expect(s.getState().doc.nodes.find((n) => n.id === second)!.position).toEqual({ x: LAYOUT.columnGap, y: LAYOUT.rowGap });
    // the source feeds both (fan-out)
    expect(s.getState().doc.edges.filter((e) => e.from === "src")).toHaveLength(2);
  });
});
