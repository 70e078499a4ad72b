/**
 * The example document of chain-format.md ("Document"), verbatim: a vibration channel with one lossy
 * integrator as anti-alias stage in front of a 16-bit converter. Used by tests, and handy as a first
 * template. Returns a fresh copy each call so no caller can change another's.
 */
import type { Chain } from "./types";

export function exampleChain(): Chain {
  return {
    format: "chainwright.chain/1",
    name: "Vibration channel, pump skid 3",
    notes: "free text",
    analysis: { fMin: 0.1, fMax: 1e6, points: 600, temperatureK: 298.15, noiseLow: 0.1, noiseHigh: null, aliasTargetDb: null },
    tolerances: { resistor: 0.01, capacitor: 0.05 },
    parts: {
      p1: {
        label: "Precision CMOS, generic",
        gbw: 1e6,
        aol: 1e5,
        slewRate: 5e5,
        vos: 1e-4,
        ib: 1e-11,
        en: 1.5e-8,
        in: 1e-15,
        enCorner: 0,
        inCorner: 0,
        swingLow: 0.05,
        swingHigh: 0.05,
        inputLow: 0,
        inputHigh: 1.5,
      },
    },
    nodes: [
      {
        id: "src",
        kind: "source",
        params: { dc: 0.2, dcSpread: 0.01, amplitude: 0.05, fLow: 1, fHigh: 200, resistance: 100, noiseDensity: 0, safety: "low-voltage" },
        position: { x: 0, y: 0 },
      },
      {
        id: "u1",
        kind: "lossyIntegrator",
        label: "Anti-alias 1",
        params: { r1: 10000, r2: 100000, c2: 1e-8, vref: 0 },
        part: "p1",
        rails: { low: -5, high: 5 },
      },
      { id: "adc", kind: "adc", params: { bits: 16, sampleRate: 2000, vinLow: -4.096, vinHigh: 4.096, inputResistance: null } },
    ],
    edges: [
      { from: "src", to: "u1" },
      { from: "u1", to: "adc" },
    ],
  };
}
