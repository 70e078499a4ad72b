/**
 * Starting points for a new chain: a blank sheet and a few plain example chains from our invented
 * scenario (Keelwater Instruments' sensors on a work boat). They are complete, valid chain documents; the
 * user edits them like any other chain. Op-amp models are generic classes with typical figures, no real part.
 */
import type { Part } from "@/lib/chain/types";
import { CHAIN_FORMAT } from "@/lib/chain/types";
import type { DraftDoc } from "@/lib/store/draft";

export interface ChainTemplate {
  key: string;
  title: string;
  summary: string;
  /** a fresh copy each call, so a page never edits the shared object */
  make(): DraftDoc;
}

const GENERAL_BIPOLAR: Part = {
  label: "General-purpose bipolar (class figures)",
  gbw: 1e6, aol: 2e5, slewRate: 5e5, vos: 1e-3, ib: 8e-8,
  en: 2e-8, in: 5e-13, enCorner: 10, inCorner: 100,
  swingLow: 1.5, swingHigh: 1.5, inputLow: 2, inputHigh: 2,
};

const LOW_NOISE_BIPOLAR: Part = {
  label: "Low-noise bipolar (class figures)",
  gbw: 1e7, aol: 1e6, slewRate: 3e6, vos: 5e-5, ib: 2e-8,
  en: 4e-9, in: 6e-13, enCorner: 3, inCorner: 150,
  swingLow: 1.2, swingHigh: 1.2, inputLow: 1.5, inputHigh: 1.5,
};

const RRIO_CMOS: Part = {
  label: "Rail-to-rail CMOS (class figures)",
  gbw: 2e6, aol: 3e5, slewRate: 1e6, vos: 1.5e-4, ib: 1e-12,
  en: 2e-8, in: 1e-15, enCorner: 100, inCorner: 0,
  swingLow: 0.02, swingHigh: 0.02, inputLow: -0.1, inputHigh: -0.1,
};

const BASE_ANALYSIS = { fMin: 0.1, fMax: 1e6, points: 600 };

export const TEMPLATES: ChainTemplate[] = [
  {
    key: "blank",
    title: "Blank sheet",
    summary: "An empty canvas: place a source, stages and a converter from the shelf.",
    make: () => ({ format: CHAIN_FORMAT, name: "New chain", notes: "", parts: {}, nodes: [], edges: [] }),
  },
  {
    key: "hull-vibration",
    title: "Hull vibration channel",
    summary: "Accelerometer behind a charge converter, AC-coupled, gain of about 5, second-order anti-alias, 16-bit ADC.",
    make: () => ({
      format: CHAIN_FORMAT,
      name: "Hull vibration channel",
      notes: "Keelwater Instruments example: accelerometer on the aft frame, 2 Hz to 2 kHz.",
      analysis: { ...BASE_ANALYSIS },
      parts: { p1: { ...LOW_NOISE_BIPOLAR } },
      nodes: [
        { id: "src", kind: "source", label: "Accelerometer", params: { dc: 0, dcSpread: 0.005, amplitude: 0.2, fLow: 2, fHigh: 2000, resistance: 100, noiseDensity: 0, safety: "low-voltage" }, position: { x: 40, y: 40 } },
        { id: "rc1", kind: "rcHighpass", label: "AC coupling", params: { c: 1e-6, r: 100e3, vbias: 0 }, position: { x: 260, y: 40 } },
        { id: "u1", kind: "noninverting", label: "Gain", params: { rf: 39e3, rg: 10e3, vref: 0 }, part: "p1", rails: { low: -5, high: 5 }, position: { x: 480, y: 40 } },
        { id: "u2", kind: "sallenKeyLowpass", label: "Anti-alias", params: { r1: 4.7e3, r2: 4.7e3, c1: 10e-9, c2: 4.7e-9, vref: 0 }, part: "p1", rails: { low: -5, high: 5 }, position: { x: 700, y: 40 } },
        { id: "adc1", kind: "adc", params: { bits: 16, sampleRate: 25e3, vinLow: -4.096, vinHigh: 4.096, inputResistance: null }, position: { x: 920, y: 40 } },
      ],
      edges: [
        { from: "src", to: "rc1" },
        { from: "rc1", to: "u1" },
        { from: "u1", to: "u2" },
        { from: "u2", to: "adc1" },
      ],
    }),
  },
  {
    key: "ballast-bridge",
    title: "Ballast-tank pressure bridge",
    summary: "Bridge with a small offset, gain of 76, lossy-integrator low-pass and an RC at the converter pin.",
    make: () => ({
      format: CHAIN_FORMAT,
      name: "Ballast-tank pressure bridge",
      notes: "Keelwater Instruments example: slow pressure, DC to 10 Hz; the bridge offset rides through the gain.",
      analysis: { ...BASE_ANALYSIS, fMin: 0.01, fMax: 1e5 },
      parts: { p1: { ...GENERAL_BIPOLAR }, p2: { ...LOW_NOISE_BIPOLAR } },
      nodes: [
        { id: "src", kind: "source", label: "Pressure bridge", params: { dc: 0.002, dcSpread: 0.003, amplitude: 0.02, fLow: 0, fHigh: 10, resistance: 350, noiseDensity: 0, safety: "low-voltage" }, position: { x: 40, y: 40 } },
        { id: "u1", kind: "noninverting", label: "Bridge gain", params: { rf: 75e3, rg: 1e3, vref: 0 }, part: "p2", rails: { low: -12, high: 12 }, position: { x: 260, y: 40 } },
        { id: "u2", kind: "lossyIntegrator", label: "Low-pass", params: { r1: 10e3, r2: 10e3, c2: 1e-6, vref: 0 }, part: "p1", rails: { low: -12, high: 12 }, position: { x: 480, y: 40 } },
        { id: "rc1", kind: "rcLowpass", label: "Pin filter", params: { r: 1e3, c: 1e-6 }, position: { x: 700, y: 40 } },
        { id: "adc1", kind: "adc", params: { bits: 16, sampleRate: 1000, vinLow: -2.5, vinHigh: 2.5, inputResistance: null }, position: { x: 920, y: 40 } },
      ],
      edges: [
        { from: "src", to: "u1" },
        { from: "u1", to: "u2" },
        { from: "u2", to: "rc1" },
        { from: "rc1", to: "adc1" },
      ],
    }),
  },
  {
    key: "turbidity-two-channel",
    title: "Turbidity photodiode, two channels",
    summary: "Single 3.3 V supply, AC coupling to mid-rail, then a fork: a wide channel and a filtered channel, each to its own ADC.",
    make: () => ({
      format: CHAIN_FORMAT,
      name: "Turbidity photodiode, two channels",
      notes: "Keelwater Instruments example: modulated LED at a few hundred hertz; the fork keeps a wide-band copy.",
      analysis: { ...BASE_ANALYSIS },
      parts: { p1: { ...RRIO_CMOS } },
      nodes: [
        { id: "src", kind: "source", label: "Photodiode amplifier", params: { dc: 0.5, dcSpread: 0.1, amplitude: 0.05, fLow: 100, fHigh: 1000, resistance: 1000, noiseDensity: 0, safety: "low-voltage" }, position: { x: 40, y: 130 } },
        { id: "rc1", kind: "rcHighpass", label: "To mid-rail", params: { c: 100e-9, r: 100e3, vbias: 1.65 }, position: { x: 260, y: 130 } },
        { id: "u1", kind: "inverting", label: "Gain", params: { r1: 10e3, r2: 47e3, vref: 1.65 }, part: "p1", rails: { low: 0, high: 3.3 }, position: { x: 480, y: 130 } },
        { id: "u2", kind: "mfbLowpass", label: "Anti-alias", params: { r1: 4.7e3, r2: 4.7e3, r3: 4.7e3, c1: 22e-9, c2: 4.7e-9, vref: 1.65 }, part: "p1", rails: { low: 0, high: 3.3 }, position: { x: 700, y: 40 } },
        { id: "adc1", kind: "adc", label: "Filtered", params: { bits: 12, sampleRate: 20e3, vinLow: 0, vinHigh: 3.3, inputResistance: null }, position: { x: 920, y: 40 } },
        { id: "adc2", kind: "adc", label: "Wide", params: { bits: 12, sampleRate: 200e3, vinLow: 0, vinHigh: 3.3, inputResistance: null }, position: { x: 700, y: 220 } },
      ],
      edges: [
        { from: "src", to: "rc1" },
        { from: "rc1", to: "u1" },
        { from: "u1", to: "u2" },
        { from: "u2", to: "adc1" },
        { from: "u1", to: "adc2" },
      ],
    }),
  },
  {
    key: "turbidity-tia",
    title: "Turbidity photodiode into a transimpedance amplifier",
    summary: "The photodiode as a current source (50 pF, 500 MΩ) into a TIA on 3.3 V, AC coupling to mid-rail, MFB anti-alias, 12-bit ADC.",
    make: () => ({
      format: CHAIN_FORMAT,
      name: "Turbidity photodiode, current input",
      notes:
        "Keelwater Instruments example: the forward-scatter photodiode drawn as what it is, a current with its junction capacitance and shunt resistance. " +
        "The TIA's (+) sits at 3.0 V so the output falls with light; rf = 200 kΩ turns 5 µA of ambient and 2 µA of modulated light into about a volt. " +
        "cf = 10 pF is above the suggested √(Cin/(2π·rf·GBW)) ≈ 4.5 pF, so the loop keeps a comfortable phase margin; remove it to see the stability check fire.",
      analysis: { ...BASE_ANALYSIS },
      parts: { p1: { ...RRIO_CMOS } },
      nodes: [
        { id: "src", kind: "photodiode", label: "Photodiode", params: { dc: 5e-6, dcSpread: 0.5e-6, amplitude: 2e-6, fLow: 100, fHigh: 1000, capacitance: 50e-12, shuntResistance: 500e6, darkCurrent: 2e-9, noiseDensity: 0, safety: "low-voltage" }, position: { x: 40, y: 40 } },
        { id: "u1", kind: "transimpedance", label: "TIA", params: { rf: 200e3, cf: 10e-12, vref: 3.0, cin: 0 }, part: "p1", rails: { low: 0, high: 3.3 }, position: { x: 260, y: 40 } },
        { id: "rc1", kind: "rcHighpass", label: "To mid-rail", params: { c: 100e-9, r: 100e3, vbias: 1.65 }, position: { x: 480, y: 40 } },
        { id: "u2", kind: "mfbLowpass", label: "Anti-alias", params: { r1: 4.7e3, r2: 4.7e3, r3: 4.7e3, c1: 22e-9, c2: 4.7e-9, vref: 1.65 }, part: "p1", rails: { low: 0, high: 3.3 }, position: { x: 700, y: 40 } },
        { id: "adc1", kind: "adc", params: { bits: 12, sampleRate: 20e3, vinLow: 0, vinHigh: 3.3, inputResistance: null }, position: { x: 920, y: 40 } },
      ],
      edges: [
        { from: "src", to: "u1" },
        { from: "u1", to: "rc1" },
        { from: "rc1", to: "u2" },
        { from: "u2", to: "adc1" },
      ],
    }),
  },
  {
    key: "load-cell",
    title: "Mooring load cell (bridge into an in-amp)",
    summary: "350 Ω bridge, 10 mV full scale ±2 mV offset, in-amp on one 5 V supply with a mid-supply reference, MFB anti-alias re-centred on the converter, 16-bit 0–4.096 V ADC.",
    make: () => ({
      format: CHAIN_FORMAT,
      name: "Mooring load cell",
      notes:
        "Keelwater Instruments example: a tension/compression load cell on the mooring line, DC to 10 Hz. " +
        "5 V excitation × 2 mV/V = 10 mV at full load either way, ±2 mV zero balance. The in-amp's reference sits at mid-supply (2.5 V) " +
        "so its output has equal room both ways; the anti-alias MFB (gain −1) takes vref = 2.274 V so its output, 2·vref − 2.5 V = 2.048 V at zero load, " +
        "sits at the converter's mid-scale. Gain 1 + 2·25 kΩ/412 Ω ≈ 122 puts ±12 mV at ±1.47 V: about three quarters of the converter's range with room for the offset. " +
        "Make rg smaller to see which check fires first (the converter's range), and much smaller to see the in-amp's internal nodes run out of swing.",
      analysis: { ...BASE_ANALYSIS, fMin: 0.01, fMax: 1e5 },
      parts: { p1: { ...RRIO_CMOS } },
      nodes: [
        { id: "src", kind: "bridge", label: "Load cell", params: { excitation: 5, fullScale: 0.002, loadLow: -1, loadHigh: 1, offset: 4e-4, resistance: 350, vcm: null, fLow: 0, fHigh: 10, noiseDensity: 0, safety: "low-voltage", unit: "kN" }, position: { x: 40, y: 40 } },
        { id: "u1", kind: "inAmp", label: "In-amp", params: { rg: 412, rf: 25e3, rd: 10e3, vref: 2.5, cmrrDb: 100 }, part: "p1", rails: { low: 0, high: 5 }, position: { x: 260, y: 40 } },
        { id: "u2", kind: "mfbLowpass", label: "Anti-alias", params: { r1: 10e3, r2: 10e3, r3: 10e3, c1: 1.8e-6, c2: 390e-9, vref: 2.274 }, part: "p1", rails: { low: 0, high: 5 }, position: { x: 480, y: 40 } },
        { id: "adc1", kind: "adc", params: { bits: 16, sampleRate: 10e3, vinLow: 0, vinHigh: 4.096, inputResistance: null }, position: { x: 700, y: 40 } },
      ],
      edges: [
        { from: "src", to: "u1" },
        { from: "u1", to: "u2" },
        { from: "u2", to: "adc1" },
      ],
    }),
  },
];

export function findTemplate(key: string | null | undefined): ChainTemplate | undefined {
  return TEMPLATES.find((t) => t.key === key);
}
