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
    expect(sheet.points.map((p) => `${p.tp}:${p.nodeId}`)).toEqual(["TP1:ac", "TP2:gain", "TP3:aa", "TP4:adc"]);
    expect(sheet.points[3].where).toMatch(/input pin of converter/);
    expect(sheet.sourceAmplitude).toBe(0.5);
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

  it("DC nominal of the turbidity gain stage matches −dc·r2/(r1 + source resistance)", () => {
    const { chain, result } = analysed(demo().turbidity);
    const tp = buildBringUpSheet(chain, result, []).points.find((p) => p.nodeId === "inv")!;
    // derived from the inverting-amplifier formula with the 1 kΩ source in series with r1; the finite
    // open-loop gain of the demo part moves it by well under 1e-4
    expect(tp.dcNominal!).toBeCloseTo((-0.5 * 20e3) / (10e3 + 1e3), 4);
    expect(tp.status).toBe("ok");
  });

  it("AC at the AC-coupling node matches s·r·c/(1 + s·(r + rs)·c) worked by hand", () => {
    const { chain, result } = analysed(demo().hull);
    const f = 2;
    const tp = buildBringUpSheet(chain, result, [f]).points[0];
    const w = 2 * Math.PI * f;
    const a = w * 100e3 * 1e-6;
    const b = w * (100e3 + 100) * 1e-6;
    const gain = a / Math.hypot(1, b);
    expect(tp.ac[0].gain!).toBeCloseTo(gain, 9);
    expect(tp.ac[0].amplitude!).toBeCloseTo(0.5 * gain, 9);
    expect(tp.ac[0].phaseDeg!).toBeCloseTo(90 - (Math.atan(b) * 180) / Math.PI, 6);
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
