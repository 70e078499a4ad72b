import { describe, expect, it } from "vitest";
import { analyzeChain } from "@/lib/engine";
import { adviseGainStaging } from "@/lib/engine/gain-staging";
import type { Chain, ChainNode } from "@/lib/chain/types";
import { ballastPressure, hullVibration, turbidityPhotodiode } from "@/db/seed-data/chains";
import { adc, line, rails, source } from "./engine-fixtures";

const gainOf = (chain: Chain, id: string) => {
  const n = chain.nodes.find((x) => x.id === id)! as Extract<ChainNode, { kind: "noninverting" }>;
  return n.params.rf == null || n.params.rg == null ? 1 : 1 + n.params.rf / n.params.rg;
};

describe("gain-staging advisor: hand-worked cases", () => {
  it("one non-inverting stage into a ±4.096 V converter fills 80 % of the range", () => {
    // By hand: margin 10 % → converter window ±(4.096 − 0.8192) = ±3.2768 V. Source 10 mV peak, no DC.
    // Gain needed 3.2768/0.01 = 327.68; the stage's window (±5 V ideal rails, less 1 V margin) is ±4 V,
    // room for 400, so it takes all 327.68. Range use = 2·0.01·327.68/8.192 = 0.8 exactly, less the
    // snapping error of E96 values (≤ 1 %), and never above 0.8 (the margin).
    const chain = line([
      source("src", { amplitude: 0.01, fLow: 10, fHigh: 1000 }),
      { id: "g", kind: "noninverting", params: { rf: 10e3, rg: 10e3, vref: 0 }, rails: rails(-5, 5) } as ChainNode,
      adc("adc", { vinLow: -4.096, vinHigh: 4.096 }),
    ]);
    const a = adviseGainStaging(chain);
    expect(a.problem).toBeNull();
    expect(a.current.rangeUse).toBeCloseTo(2 * 0.01 * 2 / 8.192, 9);
    expect(a.advised.rangeUse!).toBeGreaterThan(0.79);
    expect(a.advised.rangeUse!).toBeLessThanOrEqual(0.8 + 1e-9);
    expect(gainOf(a.chain, "g")).toBeGreaterThan(327.68 * 0.99);
    expect(a.edits.map((e) => e.id)).toEqual(["g"]);
  });

  it("the ballast bridge: the DC offset is removed by a reference shift, not by less gain", () => {
    // Seeded demo: 12 mV ± 3 mV offset, 10 mV signal, ×500 on ±5 V rails → 6 V ± 1.5 V at DC, a clip.
    // By hand: converter window ±3.2768 V (margin 10 %); the DC spread reaches the converter (no high-pass),
    // so the gain needed is 3.2768/(0.003 + 0.010) = 252.06. The first stage's window is ±(4.98 − 0.996)
    // = ±3.984 V (swing 0.02 V, margin 10 % of 9.96 V), room for 3.984/0.013 = 306 > 252, so the first stage
    // takes it all. Centring its output at 0 V: 0 = g·0.012 − (g − 1)·vref → vref = 0.012·g/(g − 1)
    // = 12.05 mV. The −1 low-pass keeps its gain and centres at 0 with vref 0. Range use 0.8.
    const a = adviseGainStaging(ballastPressure as Chain);
    expect(a.current.clips).toContain("gain");
    expect(a.problem).toBeNull();
    expect(a.advised.clips).toEqual([]);
    const g = gainOf(a.chain, "gain");
    expect(Math.abs(g / 252.06 - 1)).toBeLessThan(0.012);
    const vref = (a.chain.nodes.find((n) => n.id === "gain")!.params as { vref: number }).vref;
    expect(vref).toBeCloseTo((0.012 * g) / (g - 1), 4);
    expect(a.advised.rangeUse!).toBeGreaterThan(0.78);
    expect(a.edits.find((e) => e.id === "gain")!.summary).toMatch(/gain 500 → 2[45]\d(\.\d+)?, vref 0 V → 12\.\d+ mV/);
  });

  it("an inverting gain stage on a single 5 V supply gets its reference moved to centre the converter", () => {
    // By hand: source 1 V ± 0.1 V DC, 0.2 V peak; inverting ×−1 with vref 0 on 0…5 V rails puts the output at
    // −1 V: a clip. Converter 0…5 V, margin 10 % → window 0.5…4.5 V (half-width 2 V, centre 2.5 V). Gain
    // needed 2/(0.1 + 0.2) = 6.667. Output centre 2.5 V = −g·1 + (1 + g)·vref → vref = (2.5 + 6.667)/7.667
    // = 1.196 V.
    const chain = line([
      source("src", { dc: 1, dcSpread: 0.1, amplitude: 0.2, fLow: 1, fHigh: 100 }),
      { id: "inv", kind: "inverting", params: { r1: 10e3, r2: 10e3, vref: 0 }, rails: rails(0, 5) } as ChainNode,
      adc("adc", { vinLow: 0, vinHigh: 5 }),
    ]);
    const a = adviseGainStaging(chain);
    expect(a.current.clips).toContain("inv");
    expect(a.problem).toBeNull();
    const n = a.chain.nodes.find((x) => x.id === "inv")! as Extract<ChainNode, { kind: "inverting" }>;
    const g = n.params.r2 / n.params.r1;
    expect(Math.abs(g / 6.667 - 1)).toBeLessThan(0.012);
    expect(n.params.vref).toBeCloseTo((2.5 + g) / (1 + g), 3);
    expect(a.advised.rangeUse!).toBeGreaterThan(0.78);
  });

  it("says which stage's rails stop the range use", () => {
    // ±1 V rails (window ±0.8 V) and a unity follower-only path after it: 10 mV × 80 = 0.8 V at most, so the
    // converter (±4.096 V) sees at most 1.6 V of its 8.192 V: range use 0.195 < 0.7.
    const chain = line([
      source("src", { amplitude: 0.01, fLow: 10, fHigh: 1000 }),
      { id: "g", kind: "noninverting", params: { rf: 10e3, rg: 10e3, vref: 0 }, rails: rails(-1, 1), label: "Small rails" } as ChainNode,
      adc("adc", { vinLow: -4.096, vinHigh: 4.096 }),
    ]);
    const a = adviseGainStaging(chain);
    expect(a.advised.clips).toEqual([]);
    expect(a.advised.rangeUse!).toBeLessThan(0.2);
    expect(a.problem).toMatch(/range use reaches only 19\.\d %.*Small rails's rails/);
  });

  it("refuses bad options and a path without a converter", () => {
    expect(() => adviseGainStaging(ballastPressure as Chain, { margin: 0.6 })).toThrow(/margin/);
    expect(() => adviseGainStaging(ballastPressure as Chain, { adcId: "nope" })).toThrow(/adcId/);
  });
});

describe("gain-staging advisor on the seeded demo chains", () => {
  for (const [name, chain] of [
    ["hull vibration", hullVibration],
    ["ballast pressure", ballastPressure],
    ["turbidity", turbidityPhotodiode],
  ] as const) {
    it(`${name}: no stage clips at DC or in band, range use at least the 70 % target`, () => {
      const a = adviseGainStaging(chain as Chain);
      expect(a.problem).toBeNull();
      // independent re-analysis of the advised chain
      const res = analyzeChain(a.chain);
      const p = res.paths.find((x) => x.nodes[x.nodes.length - 1] === a.adcId)!;
      for (const st of p.stages) if (st.status) expect(st.status, st.id).not.toBe("clip");
      expect(p.adc!.status).not.toBe("clip");
      expect(res.warnings.filter((w) => w.code === "rail-clip" || w.code === "adc-range")).toEqual([]);
      expect(p.adc!.rangeUse!).toBeGreaterThanOrEqual(0.7);
      expect(p.adc!.rangeUse!).toBeGreaterThanOrEqual(Math.min(0.7, a.current.rangeUse ?? 0));
    });
  }
});
