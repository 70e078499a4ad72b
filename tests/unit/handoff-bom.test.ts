/**
 * Bill of materials from the demo chains: every resistor and capacitor of every stage is listed once
 * with its value as designed, designators follow the signal, standard values come from the E-series the
 * tolerance calls for, and op-amps are grouped by model.
 */
import { describe, expect, it } from "vitest";
import { buildBom, seriesForTolerance } from "@/lib/handoff/bom";
import { demo, withParams } from "./handoff-support";

describe("buildBom on the demo chains", () => {
  it("lists the hull chain's parts in signal order with R and C numbered separately", () => {
    const { hull } = demo();
    const bom = buildBom(hull);
    expect(bom.lines.map((l) => `${l.ref}=${l.nodeId}.${l.param}`)).toEqual([
      "C1=ca.cf", "R1=ca.rf", "R2=gain.rf", "R3=gain.rg", "R4=aa.r1", "R5=aa.r2", "C2=aa.c1", "C3=aa.c2",
    ]);
    // values straight from the document
    for (const l of bom.lines) {
      const node = hull.nodes.find((n) => n.id === l.nodeId)!;
      expect(l.value).toBe((node.params as unknown as Record<string, number>)[l.param]);
      expect(l.tolerance).toBe(l.type === "resistor" ? hull.tolerances.resistor : hull.tolerances.capacitor);
    }
  });

  it("leaves out the sensor's own shunt and capacitance, the converter's input and voltage params", () => {
    const { turbidity } = demo();
    const bom = buildBom(turbidity);
    expect(bom.lines.some((l) => l.nodeId === "pd" || l.nodeId === "adc")).toBe(false);
    expect(bom.lines.some((l) => l.param === "vref")).toBe(false);
    // tia rf cf (its cin is the op-amp's, no part), mfb r1 r2 r3 c1 c2, rc r c
    expect(bom.lines.some((l) => l.param === "cin")).toBe(false);
    expect(bom.lines.filter((l) => l.type === "resistor")).toHaveLength(5);
    expect(bom.lines.filter((l) => l.type === "capacitor")).toHaveLength(4);
  });

  it("groups equal values, counting each designator once", () => {
    const { turbidity } = demo();
    const bom = buildBom(turbidity);
    const tenK = bom.groups.find((g) => g.type === "resistor" && g.value === 10e3)!;
    // R1 is the TIA's 800k; the MFB's three 10k follow
    expect(tenK.refs).toEqual(["R2", "R3", "R4"]);
    expect(tenK.quantity).toBe(3);
    expect(bom.groups.reduce((n, g) => n + g.quantity, 0)).toBe(bom.lines.length);
    const all = bom.groups.flatMap((g) => g.refs).sort();
    expect(all).toEqual(bom.lines.map((l) => l.ref).sort());
  });

  it("groups op-amps by part model with U designators", () => {
    const { hull, turbidity } = demo();
    expect(buildBom(hull).opAmps).toEqual([
      expect.objectContaining({ part: "cmos", refs: ["U1", "U2", "U3"], quantity: 3 }),
    ]);
    const t = buildBom(turbidity).opAmps;
    expect(t.map((g) => [g.part, g.refs])).toEqual([["cmos", ["U1"]], ["gp", ["U2"]]]);
    expect(t[0].model).toContain("Precision CMOS");
  });

  it("an instrumentation amplifier is three op-amps, two rf and four rd (its topology in lib/chain/README.md)", () => {
    const { ballast } = demo();
    const amp = ballast.nodes.find((n) => n.kind === "inAmp")!;
    const bom = buildBom(ballast);
    const mine = bom.lines.filter((l) => l.nodeId === amp.id);
    expect(mine.map((l) => l.param)).toEqual(["rg", "rf#1", "rf#2", "rd#1", "rd#2", "rd#3", "rd#4"]);
    for (const l of mine) expect(l.value).toBe((amp.params as unknown as Record<string, number>)[l.param.replace(/#\d$/, "")]);
    const g = bom.opAmps.find((x) => x.stages.some((t) => t.includes(`(${amp.id})`)))!;
    // the in-amp's three and the low-pass's one: designators run on without gaps
    expect(bom.opAmps.flatMap((x) => x.refs)).toEqual(["U1", "U2", "U3", "U4"]);
    expect(g.refs).toHaveLength(3);
  });

  it("an override of an in-amp's rd applies to all four of its resistors", () => {
    const { ballast } = demo();
    const amp = ballast.nodes.find((n) => n.kind === "inAmp")!;
    const copy = structuredClone(ballast);
    (copy.tolerances as { overrides?: Record<string, number> }).overrides = { [`${amp.id}.rd`]: 0.0001 };
    const rd = buildBom(copy).lines.filter((l) => l.nodeId === amp.id && l.param.startsWith("rd"));
    expect(rd.map((l) => l.tolerance)).toEqual([0.0001, 0.0001, 0.0001, 0.0001]);
  });

  it("a TIA's cin (the op-amp's input capacitance) is no part even when set", () => {
    const { turbidity } = demo();
    const tia = turbidity.nodes.find((n) => n.kind === "transimpedance")!;
    const bom = buildBom(withParams(turbidity, tia.id, { cin: 7e-12 }));
    expect(bom.lines.filter((l) => l.nodeId === tia.id).map((l) => l.param)).toEqual(["rf", "cf"]);
  });

  it("a stage with no model is listed as an ideal op-amp, not dropped", () => {
    const { hull } = demo();
    const copy = structuredClone(hull);
    for (const n of copy.nodes) if ("part" in n) n.part = null;
    const g = buildBom(copy).opAmps;
    expect(g).toHaveLength(1);
    expect(g[0]).toMatchObject({ part: null, quantity: 3 });
    expect(g[0].model).toMatch(/ideal/);
  });

  it("a follower's absent rf and rg are no parts", () => {
    const { hull } = demo();
    const follower = withParams(hull, "gain", { rf: null, rg: null });
    expect(buildBom(follower).lines.some((l) => l.nodeId === "gain")).toBe(false);
  });
});

describe("per-part tolerances", () => {
  it("a part's own tolerance wins over the chain's, and picks its series", () => {
    const { hull } = demo();
    const copy = structuredClone(hull);
    (copy.tolerances as { overrides?: Record<string, number> }).overrides = { "aa.r1": 0.05 };
    const lines = buildBom(copy).lines;
    expect(lines.find((l) => l.ref === "R4")).toMatchObject({ tolerance: 0.05, series: "E24" });
    expect(lines.find((l) => l.ref === "R5")).toMatchObject({ tolerance: 0.01, series: "E96" });
  });
});

describe("nearest standard values", () => {
  it("pairs the tolerance with its E-series (IEC 60063 table, from memory)", () => {
    expect(seriesForTolerance(0.001)).toBe("E96");
    expect(seriesForTolerance(0.01)).toBe("E96");
    expect(seriesForTolerance(0.02)).toBe("E48");
    expect(seriesForTolerance(0.05)).toBe("E24");
    expect(seriesForTolerance(0.1)).toBe("E12");
    expect(seriesForTolerance(0.2)).toBe("E6");
  });

  it("rounds an off-series value to the series of its tolerance", () => {
    const { hull } = demo();
    // 4.8 kΩ lies between E96 4.75k and 4.87k: ln(4.8/4.75) = 0.0105 < ln(4.87/4.8) = 0.0144 → 4.75k.
    const oneP = withParams(hull, "aa", { r1: 4.8e3 });
    expect(buildBom(oneP).lines.find((l) => l.ref === "R4")!.standard).toBeCloseTo(4.75e3, 6);
    // at 5 % (E24: 4.7k, 5.1k) the same value rounds to 4.7k
    const fiveP = structuredClone(oneP);
    fiveP.tolerances.resistor = 0.05;
    const line = buildBom(fiveP).lines.find((l) => l.ref === "R4")!;
    expect(line.series).toBe("E24");
    expect(line.standard).toBeCloseTo(4.7e3, 6);
    // 33 nF at 5 % is already E24
    const c = withParams(hull, "aa", { c1: 33e-9 });
    expect(buildBom(c).lines.find((l) => l.ref === "C2")!.standard).toBeCloseTo(33e-9, 18);
  });
});
