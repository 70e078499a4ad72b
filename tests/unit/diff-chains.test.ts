import { describe, expect, it } from "vitest";
import { diffChains, hasChanges, summarizeDiff } from "@/lib/history/diff";

const base = () => ({
  format: "chainwright.chain/1",
  name: "Channel",
  notes: "",
  parts: { p1: { label: "Precision CMOS", gbw: 1e6 } },
  nodes: [
    { id: "src", kind: "source", params: { dc: 0.2, amplitude: 0.05, fLow: 1, fHigh: 200 }, position: { x: 0, y: 0 } },
    { id: "u1", kind: "lossyIntegrator", params: { r1: 10_000, r2: 100_000, c2: 1e-8 }, part: "p1", rails: { low: -5, high: 5 }, position: { x: 200, y: 0 } },
    { id: "adc", kind: "adc", params: { bits: 16, sampleRate: 2000, vinLow: -4.096, vinHigh: 4.096 } },
  ],
  edges: [
    { from: "src", to: "u1" },
    { from: "u1", to: "adc" },
  ],
});

describe("diffChains", () => {
  it("reports no change between equal documents", () => {
    const d = diffChains(base(), base());
    expect(hasChanges(d)).toBe(false);
    expect(summarizeDiff(d)).toBe("no change");
  });

  it("writes a changed resistor's old and new value in engineering notation", () => {
    const after = base();
    (after.nodes[1].params as unknown as Record<string, number>).r2 = 47_000;
    const d = diffChains(base(), after);
    expect(d.stages).toEqual([{ id: "u1", kind: "lossyIntegrator", label: null, change: "changed", values: [{ field: "r2", old: "100 kΩ", new: "47.0 kΩ" }] }]);
    expect(summarizeDiff(d)).toBe("u1: r2 100 kΩ → 47.0 kΩ");
  });

  it("lists added and removed stages with every value, and connection changes", () => {
    const after = base();
    after.nodes.splice(2, 0, { id: "lp", kind: "rcLowpass", params: { r: 4700, c: 1e-7 } } as never);
    after.edges = [
      { from: "src", to: "u1" },
      { from: "u1", to: "lp" },
      { from: "lp", to: "adc" },
    ];
    const d = diffChains(base(), after);
    const added = d.stages.find((s) => s.id === "lp")!;
    expect(added.change).toBe("added");
    expect(added.values).toEqual([
      { field: "r", old: "—", new: "4.70 kΩ" },
      { field: "c", old: "—", new: "100 nF" },
    ]);
    expect(d.edges.added).toEqual([
      { from: "u1", to: "lp" },
      { from: "lp", to: "adc" },
    ]);
    expect(d.edges.removed).toEqual([{ from: "u1", to: "adc" }]);
    const gone = diffChains(after, base()).stages.find((s) => s.id === "lp")!;
    expect(gone.change).toBe("removed");
    expect(gone.values[0]).toEqual({ field: "r", old: "4.70 kΩ", new: "—" });
  });

  it("keeps a stage that only moved out of the changes", () => {
    const after = base();
    after.nodes[1].position = { x: 260, y: 40 };
    const d = diffChains(base(), after);
    expect(hasChanges(d)).toBe(false);
    expect(d.moved).toEqual(["u1"]);
    expect(summarizeDiff(d)).toBe("Moved 1 stage");
  });

  it("compares rails, the chosen part and the part's figures", () => {
    const after = base();
    after.nodes[1].rails = { low: -12, high: 12 };
    after.parts.p1.gbw = 10e6;
    const d = diffChains(base(), after);
    expect(d.stages[0].values).toEqual([
      { field: "rails.low", old: "-5.00 V", new: "-12.0 V" },
      { field: "rails.high", old: "5.00 V", new: "12.0 V" },
    ]);
    expect(d.parts).toEqual([{ key: "p1", label: "Precision CMOS", change: "changed", values: [{ field: "gbw", old: "1.00 MHz", new: "10.0 MHz" }] }]);
  });

  it("names analysis settings and tolerances (tolerances as percentages)", () => {
    const a = { ...base(), analysis: { fMax: 1e6 }, tolerances: { resistor: 0.01 } };
    const b = { ...base(), analysis: { fMax: 1e5 }, tolerances: { resistor: 0.001 } };
    expect(diffChains(a, b).settings).toEqual([
      { field: "analysis.fMax", old: "1.00 MHz", new: "100 kHz" },
      { field: "tolerances.resistor", old: "1 %", new: "0.1 %" },
    ]);
  });

  it("counts instead of listing when many values change, and stays within 240 characters", () => {
    const after = base();
    Object.assign(after.nodes[1].params, { r1: 1, r2: 2, c2: 3e-9 });
    Object.assign(after.nodes[0].params, { dc: 0.3 });
    expect(summarizeDiff(diffChains(base(), after))).toBe("Changed 4 values in src, u1");
    const many = base();
    many.nodes = Array.from({ length: 80 }, (_, i) => ({ id: `stage_with_a_long_id_${i}`, kind: "rcLowpass", params: { r: 1000, c: 1e-9 } })) as never;
    expect(summarizeDiff(diffChains(base(), many)).length).toBeLessThanOrEqual(240);
  });

  it("treats anything that is not a document as an empty one", () => {
    const d = diffChains(null, base());
    expect(d.stages.map((s) => s.change)).toEqual(["added", "added", "added"]);
  });
});
