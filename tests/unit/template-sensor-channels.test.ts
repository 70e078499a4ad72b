/**
 * The hull-vibration and ballast-bridge templates start from a sensor source and its front end (a piezo
 * into a charge amplifier, a bridge into an in-amp): a newcomer's channel analyses with every stage and the
 * converter ok, uses most of the converter, and keeps more than the 10 % spare that marks a stage "tight"
 * (the contract's rule of thumb, common practice). Expected figures are derived from the templates' own
 * values with the ideal forms in lib/chain/README.md ("Sensor sources and front-end stages"):
 * a charge amplifier gives −1/cf above 1/(2π·rf·cf); an in-amp 1 + 2·rf/rg; a bridge's differential output
 * spans excitation·fullScale·[loadLow, loadHigh] ± excitation·offset; non-inverting gain 1 + rf/rg.
 */
import { describe, expect, it } from "vitest";
import { findTemplate } from "@/lib/templates";
import { validateChain } from "@/lib/chain/schema";
import { analyzeChain } from "@/lib/engine";
import type { Chain } from "@/lib/chain/types";
import type { DraftDoc } from "@/lib/store/draft";

function chainOf(key: string, edit?: (doc: DraftDoc) => void): Chain {
  const doc = findTemplate(key)!.make();
  edit?.(doc);
  const v = validateChain(doc);
  if (!v.ok) throw new Error(JSON.stringify(v.errors));
  return v.chain;
}

/** The template's numeric params of one node, as written in lib/templates. */
const paramsOf = (key: string, id: string) => findTemplate(key)!.make().nodes.find((n) => n.id === id)!.params as Record<string, number>;

type Range = { min: number; max: number };
type Stage = { id: string; status?: string; acPeak: number; dcGain: number | null; peakOut: Range; usable?: { low: number; high: number }; lowCorner?: number };

function analysed(key: string, edit?: (doc: DraftDoc) => void) {
  const result = analyzeChain(chainOf(key, edit));
  const path = result.paths[0];
  return { result, path, adc: path.adc!, stages: path.stages as unknown as Stage[] };
}

/** The smallest distance of a peak interval to its range, as a share of that range. */
const spareShare = (peak: Range, low: number, high: number) => Math.min(peak.min - low, high - peak.max) / (high - low);

const ALARMS = ["rail-clip", "rail-tight", "input-range", "adc-range", "adc-tight", "inamp-common-mode", "charge-corner", "tia-stability", "tia-bandwidth", "slew"];

/** Every op-amp stage ok with over 12 % of its usable swing to spare, and no check but the alias one speaks. */
function expectClear(a: ReturnType<typeof analysed>): void {
  expect(a.adc.status).toBe("ok");
  for (const s of a.stages.filter((x) => x.status)) {
    expect(s.status, s.id).toBe("ok");
    expect(spareShare(s.peakOut, s.usable!.low, s.usable!.high), s.id).toBeGreaterThan(0.12);
  }
  expect(a.result.warnings.filter((w) => ALARMS.includes(w.code))).toEqual([]);
}

describe("sensor templates", () => {
  it.each([
    ["hull-vibration", "piezo", "ca1", "chargeAmp"],
    ["ballast-bridge", "bridge", "u1", "inAmp"],
  ])("%s starts from a %s wired straight into its front end %s (%s)", (key, sourceKind, stageId, stageKind) => {
    const doc = findTemplate(key)!.make();
    expect(doc.nodes[0].kind).toBe(sourceKind);
    expect(doc.nodes.find((n) => n.id === stageId)!.kind).toBe(stageKind);
    expect(doc.edges).toContainEqual({ from: doc.nodes[0].id, to: stageId });
  });
});

describe("hull-vibration template (piezo into a charge amplifier)", () => {
  const KEY = "hull-vibration";

  it("turns ±200 pC into ±q/cf, keeps its low corner under the band, and fills two thirds of the converter with every stage ok", () => {
    const a = analysed(KEY);
    const ca = a.stages.find((s) => s.id === "ca1")!;
    const { amplitude: q, fLow } = paramsOf(KEY, "src");
    const { cf, rf } = paramsOf(KEY, "ca1");
    // −1/cf above the corner: 200 pC / 330 pF = 0.606 V
    expect(ca.acPeak).toBeCloseTo(q / cf, 3);
    // the corner 1/(2π·rf·cf) ≈ 0.48 Hz, over a factor 4 below the band's 2 Hz
    const corner = 1 / (2 * Math.PI * rf * cf);
    expect(corner).toBeLessThan(fLow / 4);
    expect(ca.lowCorner!).toBeCloseTo(corner, 3);
    const u1 = paramsOf(KEY, "u1");
    const g = 1 + u1.rf / u1.rg;
    expect(a.stages.find((s) => s.id === "u1")!.dcGain!).toBeCloseTo(g, 3);
    // the signal alone: 2·(q/cf)·g of 8.192 V; the Sallen-Key's slight peaking (Q 0.73) and the offsets add a little
    const signalShare = (2 * (q / cf) * g) / 8.192;
    expect(a.adc.rangeUse!).toBeGreaterThan(signalShare);
    expect(a.adc.rangeUse!).toBeLessThan(signalShare + 0.02);
    expect(a.adc.rangeUse!).toBeGreaterThan(0.6);
    expectClear(a);
  });

  it("needs its FET-input part: a bipolar part's bias current through rf puts the charge amplifier on a rail", () => {
    // 20 nA · 1 GΩ = 20 V at DC, against ±3.8 V of usable swing
    const a = analysed(KEY, (d) => (d.parts!.p2 = { ...d.parts!.p1 }));
    expect(a.stages.find((s) => s.id === "ca1")!.status).toBe("clip");
    const clip = a.result.warnings.find((w) => w.nodeId === "ca1" && w.code === "rail-clip");
    expect(clip?.message).toMatch(/Largest push: the bias current/);
  });
});

describe("ballast-bridge template (bridge into an in-amp)", () => {
  const KEY = "ballast-bridge";

  it("centres the bridge's span on the converter with the in-amp's reference, about 70 % of the range, every stage ok", () => {
    const a = analysed(KEY);
    const src = paramsOf(KEY, "src");
    const ia = paramsOf(KEY, "u1");
    const g = 1 + (2 * ia.rf) / ia.rg;
    expect(a.stages.find((s) => s.id === "u1")!.dcGain!).toBeCloseTo(g, 1);
    // Vd spans 0…20 mV (mid 10 mV, half-span 10 mV) ± 3 mV zero balance
    const mid = (src.excitation * src.fullScale * (src.loadLow + src.loadHigh)) / 2;
    const half = (src.excitation * src.fullScale * (src.loadHigh - src.loadLow)) / 2 + src.excitation * src.offset;
    // the reference takes out the mid-scale to within a few millivolts
    expect(Math.abs(g * mid + ia.vref)).toBeLessThan(0.005);
    const signalShare = (2 * half * g) / 5;
    expect(a.adc.rangeUse!).toBeGreaterThan(signalShare);
    expect(a.adc.rangeUse!).toBeLessThan(signalShare + 0.02);
    expect(a.adc.rangeUse!).toBeGreaterThan(0.65);
    // the converter's own spare: the peak interval against ±2.5 V
    expect(spareShare((a.adc as unknown as { peakIn: Range }).peakIn, -2.5, 2.5)).toBeGreaterThan(0.12);
    expectClear(a);
  });

  it("with the in-amp's reference at 0 V the mid-scale rides through and the converter's range check fires", () => {
    const a = analysed(KEY, (d) => (d.nodes.find((n) => n.id === "u1")!.params.vref = 0));
    expect(a.adc.status).toBe("clip");
    for (const s of a.stages.filter((x) => x.status)) expect(s.status, s.id).toBe("ok");
    expect(a.result.warnings.find((w) => w.code === "adc-range")!.message).toMatch(/adc1: the input reaches -3\.\d+ V/);
  });
});
