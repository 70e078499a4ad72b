/**
 * The load-cell template: a new user's channel fills most of the 0–4.096 V converter with no stage
 * clipping, and pushing the in-amp gain shows which check fires. Figures derived from the template's own
 * values: ±(10 mV + 2 mV) × (1 + 2·25 kΩ/rg) around the converter's mid-scale 2.048 V.
 */
import { describe, expect, it } from "vitest";
import { findTemplate } from "@/lib/templates";
import { validateChain } from "@/lib/chain/schema";
import { analyzeChain } from "@/lib/engine";
import { adviseGainStaging } from "@/lib/engine/gain-staging";
import type { Chain } from "@/lib/chain/types";

function chainWithRg(rg?: number): Chain {
  const doc = findTemplate("load-cell")!.make();
  if (rg !== undefined) doc.nodes.find((n) => n.id === "u1")!.params.rg = rg;
  const v = validateChain(doc);
  if (!v.ok) throw new Error(JSON.stringify(v.errors));
  return v.chain;
}

describe("load-cell template", () => {
  it("uses most of the converter's range with every stage and the converter ok", () => {
    const r = analyzeChain(chainWithRg());
    const path = r.paths[0];
    const g = 1 + 50e3 / 412;
    const adc = path.adc!;
    // ±12 mV worst-case differential (full load either way plus the zero balance), gain g, unity MFB
    // the signal alone takes 2·12 mV·g of 4.096 V; the part's offsets and the in-amp's CMRR widen it a little
    const signalShare = (2 * 0.012 * g) / 4.096;
    expect(adc.rangeUse!).toBeGreaterThan(signalShare);
    expect(adc.rangeUse!).toBeLessThan(signalShare + 0.03);
    expect(adc.rangeUse!).toBeGreaterThan(0.7);
    expect(adc.status).toBe("ok");
    for (const st of path.stages) expect(st.status, st.id).toBe("ok");
    // centred on mid-scale: 2·2.274 − 2.5 = 2.048 V
    const mid = ((adc.peakIn as { min: number; max: number }).min + (adc.peakIn as { min: number; max: number }).max) / 2;
    expect(mid).toBeCloseTo(2.048, 3);
    expect(r.warnings.filter((w) => ["rail-clip", "adc-range", "inamp-common-mode", "input-range"].includes(w.code))).toEqual([]);
  });

  it("with the gain pushed to ~186 the converter's range check fires first, naming the input", () => {
    const r = analyzeChain(chainWithRg(270));
    expect(r.paths[0].adc!.status).toBe("clip");
    const codes = r.warnings.map((w) => w.code);
    expect(codes).toContain("adc-range");
    expect(codes).not.toContain("inamp-common-mode");
    expect(r.warnings.find((w) => w.code === "adc-range")!.message).toMatch(/adc1: the input reaches/);
  });

  it("with far more gain the in-amp's own output and its internal nodes run out of swing", () => {
    const r = analyzeChain(chainWithRg(50));
    const codes = r.warnings.filter((w) => w.nodeId === "u1").map((w) => w.code);
    expect(codes).toContain("rail-clip");
    expect(codes).toContain("inamp-common-mode");
    expect(r.paths[0].stages.find((s) => s.id === "u1")!.status).toBe("clip");
  });
});

describe("load-cell template with the gain plan", () => {
  it("from too little or too much in-amp gain, the plan reaches most of the range with every stage ok", () => {
    // the advisor's own target (70 % range use, 10 % margins) checked by an independent engine run
    for (const rg of [1000, 412, 270, 50]) {
      const a = adviseGainStaging(chainWithRg(rg));
      expect(a.problem, `rg ${rg}`).toBeNull();
      expect(a.edits.some((e) => e.id === "u1" && "rg" in e.params), `rg ${rg}`).toBe(true);
      const r = analyzeChain(a.chain);
      const path = r.paths[0];
      for (const st of path.stages) expect(st.status, `rg ${rg}: ${st.id}`).toBe("ok");
      expect(path.adc!.status).toBe("ok");
      expect(path.adc!.rangeUse!).toBeGreaterThanOrEqual(0.7);
      expect(r.warnings.filter((w) => ["rail-clip", "adc-range", "inamp-common-mode", "input-range"].includes(w.code))).toEqual([]);
    }
  });
});

describe("turbidity TIA template", () => {
  it("keeps its loop stable with cf = 10 pF, and the stability check fires without it", () => {
    const doc = findTemplate("turbidity-tia")!.make();
    const v = validateChain(doc);
    if (!v.ok) throw new Error(JSON.stringify(v.errors));
    const r = analyzeChain(v.chain);
    const tia = r.paths[0].stages.find((s) => s.id === "u1")! as unknown as { stability: { phaseMarginDeg: number } };
    expect(tia.stability.phaseMarginDeg).toBeGreaterThan(45);
    expect(r.warnings.some((w) => w.code === "tia-stability")).toBe(false);
    doc.nodes.find((n) => n.id === "u1")!.params.cf = 0;
    const bare = validateChain(doc);
    if (!bare.ok) throw new Error("invalid");
    expect(analyzeChain(bare.chain).warnings.some((w) => w.code === "tia-stability")).toBe(true);
  });
});
