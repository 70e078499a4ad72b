import { describe, expect, it } from "vitest";
import { analyzeChain } from "@/lib/engine";
import { adviseGainStaging } from "@/lib/engine/gain-staging";
import type { Chain, ChainNode } from "@/lib/chain/types";
import { ballastPressure, hullVibration, turbidityPhotodiode } from "@/db/seed-data/chains";
import { validateChain } from "@/lib/chain/schema";
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

  it("the ballast bridge: the in-amp's reference takes the bridge's DC out, so it keeps half its gain", () => {
    // Seeded demo: a bridge whose DC is 10 mV (half load of 20 mV full scale) ± 3 mV zero balance, 10 mV
    // of signal, into an in-amp of 500 on ±5 V rails → 5 V ± 1.5 V at DC, a clip.
    // By hand: converter window ±3.2768 V (margin 10 %); the DC spread reaches the converter (no
    // high-pass), so the gain needed is 3.2768/(0.003 + 0.010) = 252.06. The in-amp's window is
    // ±(4.98 − 0.996) = ±3.984 V (swing 0.02 V, margin 10 % of 9.96 V): room for 3.984/0.013 = 306; its
    // input stage, at vcm ± g·Vd/2 = 0 ± g·0.023/2, allows 2·3.984/0.023 = 346. So the in-amp takes it all.
    // Its reference adds at unity (Vo = g·Vd + vref): centring at 0 V needs vref = −0.010·g ≈ −2.5 V.
    // rg = 2·rf/(g − 1) rounds up to the next E96 value and the check against the engine (the part's
    // offset times g) may take a little more off, so g lands a few per cent under 252.06.
    const a = adviseGainStaging(ballastPressure as Chain);
    expect(a.current.clips).toContain("gain");
    expect(a.problem).toBeNull();
    expect(a.advised.clips).toEqual([]);
    const n = a.chain.nodes.find((x) => x.id === "gain")! as Extract<ChainNode, { kind: "inAmp" }>;
    const g = 1 + (2 * n.params.rf) / n.params.rg;
    expect(g).toBeLessThanOrEqual(252.06);
    expect(g).toBeGreaterThan(252.06 * 0.95);
    // the reference is set for the planned gain, before rg is rounded to a standard value
    expect(Math.abs(n.params.vref / (-0.01 * g) - 1)).toBeLessThan(0.05);
    expect(a.advised.rangeUse!).toBeGreaterThan(0.75);
    const res = analyzeChain(a.chain);
    expect(res.warnings.filter((w) => w.code === "inamp-common-mode")).toEqual([]);
    expect(a.edits.find((e) => e.id === "gain")!.summary).toMatch(/gain 500 → 2[45]\d(\.\d+)?, vref 0 V → -2\.\d+ V/);
  });

  it("a fixed TIA's DC, −rf·I + vref, is what the next stage's reference is set against", () => {
    // By hand: 1 µA ± 0.1 µA of photocurrent, 0.5 µA peak, into 100 kΩ with vref 0.5 V (ideal op-amp, a
    // 1 TΩ shunt, so the noise gain on vref is 1 + 1e-7): TIA output 0.4 V ± 10 mV, 50 mV peak. Then an
    // inverting stage into a 0–5 V converter: window 0.5…4.5 V (centre 2.5 V, half-width 2 V), gain needed
    // 2/(0.01 + 0.05) = 33.33, and 2.5 = −g·0.4 + (1 + g)·vref gives vref = (2.5 + 13.33)/34.33 = 0.461 V.
    // Taking the TIA's input (1 µA) for its output would give vref ≈ 0.073 V instead.
    const doc = {
      format: "chainwright.chain/1",
      name: "TIA then gain",
      nodes: [
        { id: "pd", kind: "photodiode", params: { dc: 1e-6, dcSpread: 0.1e-6, amplitude: 0.5e-6, fLow: 1, fHigh: 100, capacitance: 10e-12, shuntResistance: 1e12 } },
        { id: "tia", kind: "transimpedance", params: { rf: 100e3, cf: 10e-12, vref: 0.5 }, rails: { low: 0, high: 5 } },
        { id: "inv", kind: "inverting", params: { r1: 10e3, r2: 10e3, vref: 0 }, rails: { low: 0, high: 5 } },
        { id: "adc", kind: "adc", params: { bits: 12, sampleRate: 10e3, vinLow: 0, vinHigh: 5 } },
      ],
      edges: [{ from: "pd", to: "tia" }, { from: "tia", to: "inv" }, { from: "inv", to: "adc" }],
    };
    const v = validateChain(doc);
    if (!v.ok) throw new Error(JSON.stringify(v.errors));
    const a = adviseGainStaging(v.chain);
    expect(a.problem).toBeNull();
    const n = a.chain.nodes.find((x) => x.id === "inv")! as Extract<ChainNode, { kind: "inverting" }>;
    const g = n.params.r2 / n.params.r1;
    expect(Math.abs(g / 33.33 - 1)).toBeLessThan(0.012);
    expect(n.params.vref).toBeCloseTo((2.5 + 0.4 * g) / (1 + g), 2);
    expect(a.advised.rangeUse!).toBeGreaterThan(0.78);
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
