import { describe, expect, it } from "vitest";
import { analyseDraft, assembleLive, computeCurves, fullTier, keepCurves, quickTier } from "@/lib/store/live-analysis";
import { dbPhase } from "@/components/plots/plot-data";
import { findTemplate, TEMPLATES } from "@/lib/templates";
import { analyzeChain } from "@/lib/engine";
import { validateChain } from "@/lib/chain/schema";
import type { DraftDoc } from "@/lib/store/draft";

const bridge = () => findTemplate("ballast-bridge")!.make();

describe("quickTier", () => {
  for (const t of TEMPLATES.filter((x) => x.key !== "blank")) {
    it(`${t.key}: gives the same headroom, status and warnings as the full analysis`, () => {
      const doc = t.make();
      const q = quickTier(doc);
      const full = fullTier(doc).result!;
      expect(q.error).toBeNull();
      const strip = (r: typeof full) => r.paths.map((p) => ({ nodes: p.nodes, stages: p.stages, adc: p.adc && { ...p.adc, snrDb: 0, enob: 0 } }));
      expect(strip(q.result!)).toEqual(strip(full));
      expect(q.result!.warnings.filter((w) => w.code !== "noise-band")).toEqual(full.warnings.filter((w) => w.code !== "noise-band"));
    });
  }

  it("leaves the noise figures to the full tier: skipped, with no SNR or ENOB", () => {
    const q = quickTier(bridge());
    const path = q.result!.paths[0];
    expect(path.noise.skipped).toBe(true);
    expect(path.noise.contributions).toEqual([]);
    expect(path.adc!.snrDb).toBeNull();
    expect(path.adc!.enob).toBeNull();
    const full = fullTier(bridge()).result!.paths[0];
    expect(full.noise.skipped).toBeUndefined();
    expect(full.noise.totalRms).toBeGreaterThan(0);
  });

  it("draws curves whose cascade to the ADC is the engine's own path response", () => {
    const doc = bridge();
    const q = quickTier(doc);
    const chain = validateChain(doc);
    if (!chain.ok) throw new Error("template invalid");
    const ref = analyzeChain(chain.chain).paths[0].response;
    const c = q.curves!;
    const { db, ph } = dbPhase(c.cumRe[c.index.adc1], c.cumIm[c.index.adc1]);
    expect(c.f.length).toBe(ref.f.length);
    for (let k = 0; k < ref.f.length; k += 37) {
      expect(c.f[k]).toBeCloseTo(ref.f[k], 6);
      expect(db[k]).toBeCloseTo(ref.magDb[k]!, 6);
      expect(Math.abs(((ph[k] - ref.phaseDeg[k]! + 540) % 360) - 180)).toBeLessThan(1e-6);
    }
  });

  it("analyses the complete part of a half-drawn chain and says why the rest waits", () => {
    const doc: DraftDoc = bridge();
    delete doc.nodes[2].params.c2; // u2 loses its capacitor
    const live = analyseDraft(doc);
    expect(live.stageById.u1).toBeDefined();
    expect(live.stageById.u2).toBeUndefined();
    expect(live.reasonById.u2).toMatch(/c2/);
    expect(live.reasonById.adc1).toBeTruthy();
  });
});

describe("assembleLive", () => {
  it("holds back SNR and ENOB until the full analysis of the same draft is in", () => {
    const doc = bridge();
    const q = quickTier(doc);
    const early = assembleLive(doc, 1, q, null);
    expect(early.adcById.adc1.snrDb).toBeNull();
    expect(early.adcById.adc1.enob).toBeNull();
    const stale = assembleLive(doc, 1, q, { doc: bridge(), tier: fullTier(doc) });
    expect(stale.adcById.adc1.snrDb).toBeNull();
    const ready = assembleLive(doc, 1, q, { doc, tier: fullTier(doc) });
    expect(ready.adcById.adc1.snrDb).toBeGreaterThan(40);
    expect(ready.adcById.adc1.enob).toBeGreaterThan(6);
  });

  it("keeps the objects of figures that did not change, so only the changed cards render again", () => {
    const doc = bridge();
    const first = analyseDraft(doc);
    const edited = { ...doc, nodes: doc.nodes.map((n) => (n.id === "rc1" ? { ...n, params: { ...n.params, r: 2.2e3 } } : n)) };
    const second = assembleLive(edited, 2, quickTier(edited), null, first);
    expect(second.stageById.u1).toBe(first.stageById.u1); // upstream of the edit: same figures, same object
    expect(second.stageById.rc1).not.toBe(first.stageById.rc1);
    expect(second.stageById.rc1.f0).not.toBe(first.stageById.rc1.f0);
    // the same draft again (the full analysis arriving): the whole index stays as it was
    const again = assembleLive(edited, 2, quickTier(edited), null, second);
    expect(again.stageById).toBe(second.stageById);
  });

  it("flags the clipping stage of a chain with a large DC gain", () => {
    const doc = bridge();
    // the in-amp's reference back at 0 V: its gain of 135 carries the bridge's 10 mV ± 3 mV mid-scale
    // through as 0.9 to 1.8 V at DC, still fine on ±12 V
    doc.nodes[1].params.vref = 0;
    doc.nodes[2].params.r2 = 100e3; // then ×10: −18 to −9 V at DC, and the signal peak takes it past −10.5 V
    const live = analyseDraft(doc);
    expect(live.stageById.u1.status).toBe("ok");
    expect(live.stageById.u2.status).toBe("clip");
    expect(live.warningsByNode.u2.some((w) => w.code === "rail-clip")).toBe(true);
  });
});

describe("keepCurves", () => {
  it("keeps the arrays of curves an edit left alone and takes the new ones for the rest", () => {
    const doc = bridge();
    const chain = validateChain(doc);
    if (!chain.ok) throw new Error("template does not validate");
    const before = computeCurves(chain.chain);
    // the last gain stage changes: everything before it keeps its response
    const ids = Object.keys(before.index);
    const last = doc.nodes.filter((n) => n.kind !== "source" && n.kind !== "adc").at(-1)!;
    const editedDoc = { ...doc, nodes: doc.nodes.map((n) => (n.id === last.id ? { ...n, params: { ...n.params, ...bump(n.params) } } : n)) };
    const edited = validateChain(editedDoc);
    if (!edited.ok) throw new Error("edited template does not validate");
    const after = computeCurves(edited.chain);
    const kept = keepCurves(before, after)!;
    expect(kept).not.toBe(before);
    const li = before.index[last.id];
    expect(kept.indRe[li]).toBe(after.indRe[li]);
    expect(kept.indRe[li]).not.toBe(before.indRe[li]);
    const upstream = ids.filter((id) => id !== last.id && before.index[id] < li);
    expect(upstream.length).toBeGreaterThan(0);
    for (const id of upstream) {
      const i = before.index[id];
      expect(kept.cumRe[i]).toBe(before.cumRe[i]);
      expect(kept.indIm[i]).toBe(before.indIm[i]);
    }
    // values are those of the new sweep everywhere
    for (const id of ids) expect(Array.from(kept.cumRe[kept.index[id]])).toEqual(Array.from(after.cumRe[after.index[id]]));
    // nothing changed at all: the previous object itself
    expect(keepCurves(before, computeCurves(chain.chain))).toBe(before);
  });
});

/** A parameter change that keeps the stage valid: resistor values scaled by 1.5. */
function bump(params: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(params)) if (/^r/.test(k) && typeof v === "number") out[k] = v * 1.5;
  return out;
}
