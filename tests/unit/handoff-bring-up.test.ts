/**
 * Bring-up sheet from the demo chains, checked against the engine's own results (operating point,
 * path response), the independent complex.js path, and closed forms worked by hand.
 */
import { describe, expect, it } from "vitest";
import { analyzeChain, referenceResponse } from "@/lib/engine";
import { buildBringUpSheet, defaultTestFrequencies } from "@/lib/handoff/bring-up";
import { analysed, demo } from "./handoff-support";

describe("buildBringUpSheet", () => {
  it("has a test point for every stage output and the converter input, in signal order", () => {
    const { chain, result } = analysed(demo().hull);
    const sheet = buildBringUpSheet(chain, result, [100]);
    expect(sheet.points.map((p) => `${p.tp}:${p.nodeId}`)).toEqual(["TP1:ca", "TP2:gain", "TP3:aa", "TP4:adc"]);
    expect(sheet.points[3].where).toMatch(/input pin of converter/);
    expect(sheet.sourceAmplitude).toBe((chain.nodes[0].params as { amplitude: number }).amplitude);
  });

  it("takes the DC interval from the engine's operating point, nominal at its middle", () => {
    for (const chain of Object.values(demo())) {
      const result = analyzeChain(chain);
      const sheet = buildBringUpSheet(chain, result, [10]);
      const stages = new Map(result.paths.flatMap((p) => p.stages.map((s) => [s.id, s.dcOut])));
      for (const tp of sheet.points) {
        const want = tp.kind === "adc" ? result.paths.find((p) => p.adc?.id === tp.nodeId)!.adc!.dcIn : stages.get(tp.nodeId);
        expect(tp.dcInterval).toEqual(want);
        expect(tp.dcNominal).toBeCloseTo((tp.dcInterval!.min + tp.dcInterval!.max) / 2, 12);
      }
    }
  });

  it("DC nominal of the turbidity TIA matches −rf·(light + dark current) + vref·(1 + rf/rsh)", () => {
    const { chain, result } = analysed(demo().turbidity);
    const tp = buildBringUpSheet(chain, result, []).points.find((p) => p.nodeId === "tia")!;
    // derived from the transimpedance formula Vo = −rf·I with vref on (+) seen through the noise gain
    // 1 + rf/rsh (the photodiode's shunt from (−) to ground); the demo part's finite open-loop gain
    // (1e6) moves it by about 1e-6 of itself. The ± terms (offset, bias current) are symmetric about it.
    const pd = chain.nodes.find((n) => n.id === "pd")!.params as { dc: number; darkCurrent: number; shuntResistance: number };
    const tia = chain.nodes.find((n) => n.id === "tia")!.params as { rf: number; vref: number };
    const want = -tia.rf * (pd.dc + pd.darkCurrent) + tia.vref * (1 + tia.rf / pd.shuntResistance);
    expect(Math.abs(tp.dcNominal! / want - 1)).toBeLessThan(1e-5);
    expect(tp.status).toBe("ok");
  });

  it("AC at the charge amplifier matches −s·rf/(1 + s·rf·cf) worked by hand", () => {
    const { chain, result } = analysed(demo().hull);
    const f = 2;
    const tp = buildBringUpSheet(chain, result, [f]).points[0];
    // the charge amplifier's closed form (lib/chain/README.md, "Sensor sources and front-end stages"),
    // per coulomb of sensor charge; the piezo's own capacitance and leakage sit at the virtual ground and
    // only enter through the op-amp's finite gain (noise gain 1 + C/cf = 2 against A(2 Hz) ≈ 5e5)
    const { rf, cf } = chain.nodes.find((n) => n.id === "ca")!.params as { rf: number; cf: number };
    const q = (chain.nodes[0].params as { amplitude: number }).amplitude;
    const w = 2 * Math.PI * f;
    const gain = (w * rf) / Math.hypot(1, w * rf * cf);
    expect(Math.abs(tp.ac[0].gain! / gain - 1)).toBeLessThan(1e-4);
    expect(Math.abs(tp.ac[0].amplitude! / (q * gain) - 1)).toBeLessThan(1e-4);
    // −j·ω·rf/(1 + j·ω·rf·cf): −90° less the pole's atan(ω·rf·cf)
    expect(tp.ac[0].phaseDeg!).toBeCloseTo(-90 - (Math.atan(w * rf * cf) * 180) / Math.PI, 2);
  });

  it("the converter's AC figures equal the engine's path response at the same frequencies", () => {
    for (const chain of Object.values(demo())) {
      const freqs = defaultTestFrequencies(chain);
      const result = analyzeChain(chain);
      const at = analyzeChain(chain, { freqs }).paths[0].response;
      const adc = buildBringUpSheet(chain, result, freqs).points.find((p) => p.kind === "adc")!;
      adc.ac.forEach((ac, k) => {
        expect(20 * Math.log10(ac.gain!)).toBeCloseTo(at.magDb[k]!, 9);
        expect(ac.phaseDeg!).toBeCloseTo(at.phaseDeg[k]!, 9);
      });
    }
  });

  it("every intermediate point agrees with the independent complex.js path to 1e-9", () => {
    for (const chain of Object.values(demo())) {
      const freqs = [0.5, 7, 300];
      const sheet = buildBringUpSheet(chain, analyzeChain(chain), freqs);
      const ref = referenceResponse(chain, freqs);
      for (const tp of sheet.points) {
        tp.ac.forEach((ac, k) => {
          const c = ref.get(tp.nodeId)!.cum[k]!;
          expect(Math.abs(ac.gain! - c.abs()) / c.abs()).toBeLessThan(1e-9);
          const dphi = Math.abs(((ac.phaseDeg! - (c.arg() * 180) / Math.PI + 540) % 360) - 180);
          expect(dphi).toBeLessThan(1e-7);
        });
      }
    }
  });

  it("default test frequencies sit in the source band; bad ones are refused", () => {
    const { hull, ballast } = demo();
    expect(defaultTestFrequencies(hull)).toEqual([2, 63, 2000]);
    // band from DC: a tenth of the top instead of 0
    expect(defaultTestFrequencies(ballast)).toEqual([1, 3.2, 10]);
    const r = analyzeChain(hull);
    expect(() => buildBringUpSheet(hull, r, [0])).toThrow(/positive number of hertz/);
    expect(() => buildBringUpSheet(hull, r, [Number.NaN])).toThrow(RangeError);
  });
});
