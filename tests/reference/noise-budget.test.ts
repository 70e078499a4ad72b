/**
 * The noise-budget figures of the analysis (lib/engine/analyze.ts noiseBudgetFigures and aliasFigures):
 * contribution shares, densities of the largest contributors, input-referred noise, the alias curve and
 * the bands that fold. Values from references.md where it has them, else derived from a stated formula.
 */
import { describe, expect, it } from "vitest";
import { analyzeChain } from "@/lib/engine";
import { adc, makeChain, noninverting, rcLowpass, source } from "./support/chain-builders";
import { near } from "./support/checks";

type Top = { nodeId: string; element: string; density: (number | null)[] };

describe("noise budget", () => {
  // a 10 kΩ source into a gain of 10 (rf 9k, rg 1k, ideal op-amp with en), flat to fMax
  const chain = makeChain({
    nodes: [source({ resistance: 1e4, amplitude: 0.1, fLow: 1, fHigh: 1000 }), noninverting("g", { rf: 9e3, rg: 1e3 }, { part: "p" }), adc("adc", { sampleRate: 1e5, bits: 16 })],
    parts: { p: { en: 1e-8 } },
    analysis: { fMax: 1e5, points: 50 },
  });
  const a = analyzeChain(chain);
  const p = a.paths[0];
  const noise = p.noise as typeof p.noise & { bandGain: number; inputReferredRms: number; inputReferredTotalRms: number; inputDensity: (number | null)[]; topDensities: Top[] };

  it("shares of what the converter samples add to one; powers add to the total", () => {
    const shares = p.noise.contributions.reduce((s, c) => s + (c.totalShare as number), 0);
    near(shares, 1, { abs: 1e-12 }, "uncorrelated sources: powers add (references.md §18)");
    const power = p.noise.contributions.reduce((s, c) => s + (c.totalRms as number) ** 2, 0);
    near(Math.sqrt(power), p.noise.totalRms, { rel: 1e-12 }, "uncorrelated sources: powers add");
  });

  it("the source resistance's density at the output is √(4kTR)·G", () => {
    const r = noise.topDensities.find((t) => t.element === "resistance")!;
    // √(4kT·10 kΩ) at 298.15 K with 4kT = 1.6465619974e-20 J (references.md §1), times the gain of 10
    const expected = Math.sqrt(1.6465619974e-20 * 1e4) * 10;
    for (const d of r.density.slice(0, 10)) near(d!, expected, { rel: 1e-9 }, "references.md §1, 4kT at 298.15 K; Johnson noise 4kTR");
  });

  it("densities of every contributor add in power to the total density", () => {
    expect(noise.topDensities.length).toBe(p.noise.contributions.length); // fewer than six sources here
    const total = p.noise.density as (number | null)[];
    total.forEach((t, k) => {
      const sum = noise.topDensities.reduce((s, c) => s + c.density[k]! ** 2, 0);
      near(Math.sqrt(sum), t!, { rel: 1e-12 }, "powers add");
    });
  });

  it("input-referred noise is the output noise over the band gain", () => {
    near(noise.bandGain, 10, { rel: 1e-12 }, "1 + rf/rg (references.md §3)");
    near(noise.inputReferredRms, p.noise.outputRms / 10, { rel: 1e-12 }, "definition: output noise over the signal gain");
    near(noise.inputReferredTotalRms, p.noise.totalRms / 10, { rel: 1e-12 }, "definition");
    near(noise.inputDensity[0]!, (p.noise.density as number[])[0] / 10, { rel: 1e-12 }, "definition, per frequency");
  });

  it("quantisation against analog noise", () => {
    const ad = p.adc!;
    near(p.noise.analogOverQuantDb as number, 20 * Math.log10(p.noise.totalRms / ad.quantNoiseRms), { rel: 1e-12 }, "definition");
  });
});

describe("alias attenuation over frequency", () => {
  const chain = makeChain({
    nodes: [source({ fLow: 0, fHigh: 100 }), rcLowpass("rc", { r: 1e4, c: 1 / (2 * Math.PI * 1e4 * 1e3) }), adc("adc", { sampleRate: 48e3, inputResistance: null })],
    analysis: { fMax: 2e5 },
  });

  it("first-order RC at fc = 1 kHz is 27.6118 dB down at 24 kHz", () => {
    const nz = analyzeChain(chain, { freqs: [24e3] }).paths[0].noise;
    const curve = nz.aliasCurve as { f: number[]; attenuationDb: number[] };
    near(curve.attenuationDb[0], 27.6118, { abs: 5e-5 }, "references.md §13, first-order RC fc = 1 kHz at 24 kHz");
  });

  it("lists the bands that fold into [fLow, fHigh] up to fMax", () => {
    const bands = analyzeChain(chain).paths[0].noise.foldBands as { low: number; high: number; k: number }[];
    // derived: a tone at f lands at |f − k·fs|, inside [0, 100 Hz] for f in [k·fs − 100, k·fs + 100]
    expect(bands.slice(0, 4)).toEqual([
      { k: 1, low: 47_900, high: 48_000 },
      { k: 1, low: 48_000, high: 48_100 },
      { k: 2, low: 95_900, high: 96_000 },
      { k: 2, low: 96_000, high: 96_100 },
    ]);
    expect(bands.every((b) => b.low <= 2e5)).toBe(true);
    expect(bands.length).toBe(8);
  });

  it("takes the band from a sensor source too: a photodiode's 100 Hz band into a TIA folds the same way", () => {
    // the same fold rule (derived as above) with the band of a current source; the TIA only sets the scale
    const sensor = makeChain({
      nodes: [
        { id: "src", kind: "photodiode", params: { dc: 0, dcSpread: 0, amplitude: 1e-6, fLow: 0, fHigh: 100, capacitance: 10e-12, shuntResistance: 1e9, darkCurrent: 0, noiseDensity: 0, safety: "low-voltage" } },
        { id: "tia", kind: "transimpedance", params: { rf: 1e5, cf: 1e-9, vref: 0, cin: 0 }, rails: { low: -5, high: 5 } },
        adc("adc", { sampleRate: 48e3, inputResistance: null }),
      ],
      analysis: { fMax: 2e5 },
    });
    const nz = analyzeChain(sensor).paths[0].noise;
    expect((nz.foldBands as { low: number; high: number }[]).slice(0, 2)).toEqual([
      { k: 1, low: 47_900, high: 48_000 },
      { k: 1, low: 48_000, high: 48_100 },
    ]);
    expect((nz.aliasCurve as { f: number[] }).f.length).toBeGreaterThan(0);
  });
});
