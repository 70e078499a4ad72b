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

/** FET inputs: picoamp bias current, so a gigohm feedback resistor (a charge amplifier's DC path) stays near 0 V. */
const LOW_NOISE_JFET: Part = {
  label: "Low-noise FET-input (class figures)",
  gbw: 8e6, aol: 3e5, slewRate: 1.5e7, vos: 5e-4, ib: 5e-12,
  en: 8e-9, in: 3e-15, enCorner: 50, inCorner: 0,
  swingLow: 1.0, swingHigh: 1.0, inputLow: 2.5, inputHigh: 0.5,
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
    summary: "Piezo accelerometer (±200 pC) into a charge amplifier of 330 pF, gain of 4.6, second-order anti-alias, 16-bit ADC on ±4.096 V.",
    make: () => ({
      format: CHAIN_FORMAT,
      name: "Hull vibration channel",
      notes:
        "Keelwater Instruments example: piezo accelerometer on the aft frame, 10 pC/g over ±20 g, 2 Hz to 2 kHz, read as a charge. " +
        "The charge amplifier gives −1/cf = −3.03 V/nC, so ±200 pC is ±0.61 V; its low corner 1/(2π·rf·cf) ≈ 0.48 Hz sits well under the band. " +
        "It needs a FET-input op-amp: a bipolar part's bias current through the 1 GΩ feedback resistor would put its output on a rail. " +
        "The gain of 4.6 brings the peak to about ±2.8 V: two thirds of the converter's range, with a volt to spare inside each stage's ±3.8 V swing.",
      analysis: { ...BASE_ANALYSIS },
      parts: { p1: { ...LOW_NOISE_BIPOLAR }, p2: { ...LOW_NOISE_JFET } },
      nodes: [
        { id: "src", kind: "piezo", label: "Accelerometer", params: { amplitude: 200e-12, fLow: 2, fHigh: 2000, capacitance: 1e-9, leakage: 10e9, safety: "low-voltage", sensitivity: 10e-12, unit: "g" }, position: { x: 40, y: 40 } },
        { id: "ca1", kind: "chargeAmp", label: "Charge amplifier", params: { cf: 330e-12, rf: 1e9, vref: 0, cin: 0 }, part: "p2", rails: { low: -5, high: 5 }, position: { x: 260, y: 40 } },
        { id: "u1", kind: "noninverting", label: "Gain", params: { rf: 36e3, rg: 10e3, vref: 0 }, part: "p1", rails: { low: -5, high: 5 }, position: { x: 480, y: 40 } },
        { id: "u2", kind: "sallenKeyLowpass", label: "Anti-alias", params: { r1: 4.7e3, r2: 4.7e3, c1: 10e-9, c2: 4.7e-9, vref: 0 }, part: "p1", rails: { low: -5, high: 5 }, position: { x: 700, y: 40 } },
        { id: "adc1", kind: "adc", params: { bits: 16, sampleRate: 25e3, vinLow: -4.096, vinHigh: 4.096, inputResistance: null }, position: { x: 920, y: 40 } },
      ],
      edges: [
        { from: "src", to: "ca1" },
        { from: "ca1", to: "u1" },
        { from: "u1", to: "u2" },
        { from: "u2", to: "adc1" },
      ],
    }),
  },
  {
    key: "ballast-bridge",
    title: "Ballast-tank pressure bridge",
    summary: "350 Ω bridge, 20 mV full scale ±3 mV zero balance, in-amp of gain 135 with its reference taking out mid-scale, lossy-integrator low-pass, RC at the converter pin.",
    make: () => ({
      format: CHAIN_FORMAT,
      name: "Ballast-tank pressure bridge",
      notes:
        "Keelwater Instruments example: slow tank pressure, DC to 10 Hz, from a 350 Ω bridge at 10 V excitation (2 mV/V: 0 to 20 mV from empty to full), ±0.3 mV/V zero balance. " +
        "The in-amp's gain 1 + 2·25 kΩ/374 Ω ≈ 135 turns 10 mV ± 13 mV into ±1.75 V once its reference, −1.35 V, takes out the mid-scale 1.35 V, so the ±2.5 V converter sees about 70 % of its range. " +
        "Set the reference to 0 V to see the converter's range check fire: the mid-scale 1.35 V then rides through and takes the input about 0.6 V past −2.5 V.",
      analysis: { ...BASE_ANALYSIS, fMin: 0.01, fMax: 1e5 },
      parts: { p1: { ...GENERAL_BIPOLAR }, p2: { ...LOW_NOISE_BIPOLAR } },
      nodes: [
        { id: "src", kind: "bridge", label: "Pressure bridge", params: { excitation: 10, fullScale: 0.002, loadLow: 0, loadHigh: 1, offset: 3e-4, resistance: 350, vcm: null, fLow: 0, fHigh: 10, noiseDensity: 0, safety: "low-voltage" }, position: { x: 40, y: 40 } },
        { id: "u1", kind: "inAmp", label: "Bridge in-amp", params: { rg: 374, rf: 25e3, rd: 10e3, vref: -1.35, cmrrDb: 100 }, part: "p2", rails: { low: -12, high: 12 }, position: { x: 260, y: 40 } },
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
