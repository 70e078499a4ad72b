import { DEMO_PARTS } from "./parts";

/**
 * Demo chains for the invented company Keelwater Instruments (marine sensing). Each document
 * is a complete `chainwright.chain/1` chain (checked by the seed and by tests/unit/db-seed).
 * Values are SI base units. Design notes per chain explain what the demo is meant to show.
 */

/**
 * Hull vibration: an accelerometer with a voltage output, AC-coupled and re-biased to mid-supply
 * on a single 5 V rail, gain of 2, second-order anti-alias low-pass, 12-bit ADC at 20 kS/s.
 * High-pass corner 1/(2π·100 kΩ·1 µF) ≈ 1.6 Hz; Sallen-Key f0 ≈ 2.3 kHz, Q ≈ 0.73.
 */
export const hullVibration = {
  format: "chainwright.chain/1",
  name: "Hull vibration channel, aft bay",
  notes: "Voltage-output accelerometer on the aft bulkhead. Single 5 V supply, mid-rail bias of 2.5 V.",
  analysis: { fMin: 0.1, fMax: 1e5, points: 500, temperatureK: 298.15, noiseLow: 1, noiseHigh: null, aliasTargetDb: null },
  tolerances: { resistor: 0.01, capacitor: 0.05 },
  parts: { cmos: DEMO_PARTS.precisionCmosRr },
  nodes: [
    {
      id: "accel",
      kind: "source",
      label: "Accelerometer",
      params: { dc: 0, dcSpread: 0.005, amplitude: 0.5, fLow: 2, fHigh: 2000, resistance: 100, noiseDensity: 50e-9, safety: "low-voltage" },
      position: { x: 0, y: 0 },
    },
    {
      id: "ac",
      kind: "rcHighpass",
      label: "AC coupling to mid-rail",
      params: { c: 1e-6, r: 100e3, vbias: 2.5 },
      position: { x: 220, y: 0 },
    },
    {
      id: "gain",
      kind: "noninverting",
      label: "Gain ×2",
      params: { rf: 10e3, rg: 10e3, vref: 2.5 },
      part: "cmos",
      rails: { low: 0, high: 5 },
      position: { x: 440, y: 0 },
    },
    {
      id: "aa",
      kind: "sallenKeyLowpass",
      label: "Anti-alias",
      params: { r1: 10e3, r2: 10e3, c1: 10e-9, c2: 4.7e-9, vref: 2.5 },
      part: "cmos",
      rails: { low: 0, high: 5 },
      position: { x: 660, y: 0 },
    },
    {
      id: "adc",
      kind: "adc",
      label: "ADC",
      params: { bits: 12, sampleRate: 20000, vinLow: 0, vinHigh: 5, inputResistance: null },
      position: { x: 880, y: 0 },
    },
  ],
  edges: [
    { from: "accel", to: "ac" },
    { from: "ac", to: "gain" },
    { from: "gain", to: "aa" },
    { from: "aa", to: "adc" },
  ],
};

/**
 * Ballast tank pressure: a strain-gauge bridge read through a non-inverting gain of 500.
 * The bridge's 12 mV ± 3 mV zero offset times 500 is 6 V ± 1.5 V at DC, beyond the ±5 V
 * rails before any pressure signal arrives: this chain shows a stage that clips at DC.
 * (The cure: remove the offset before the gain, or take less gain in the first stage.)
 */
export const ballastPressure = {
  format: "chainwright.chain/1",
  name: "Ballast tank pressure bridge",
  notes: "350 Ω bridge, 10 mV full scale. First attempt: all the gain in one stage.",
  analysis: { fMin: 0.01, fMax: 1e4, points: 400, temperatureK: 298.15, noiseLow: 0.1, noiseHigh: null, aliasTargetDb: null },
  tolerances: { resistor: 0.001, capacitor: 0.05 },
  parts: { cmos: DEMO_PARTS.precisionCmosRr, gp: DEMO_PARTS.gpBipolar },
  nodes: [
    {
      id: "bridge",
      kind: "source",
      label: "Pressure bridge",
      params: { dc: 0.012, dcSpread: 0.003, amplitude: 0.01, fLow: 0, fHigh: 10, resistance: 350, noiseDensity: 0, safety: "low-voltage" },
      position: { x: 0, y: 0 },
    },
    {
      id: "gain",
      kind: "noninverting",
      label: "Bridge gain ×500",
      params: { rf: 499e3, rg: 1e3, vref: 0 },
      part: "cmos",
      rails: { low: -5, high: 5 },
      position: { x: 220, y: 0 },
    },
    {
      id: "lp",
      kind: "lossyIntegrator",
      label: "Low-pass 10 Hz",
      params: { r1: 10e3, r2: 10e3, c2: 1.5e-6, vref: 0 },
      part: "gp",
      rails: { low: -12, high: 12 },
      position: { x: 440, y: 0 },
    },
    {
      id: "adc",
      kind: "adc",
      label: "ADC",
      params: { bits: 16, sampleRate: 1000, vinLow: -4.096, vinHigh: 4.096, inputResistance: null },
      position: { x: 660, y: 0 },
    },
  ],
  edges: [
    { from: "bridge", to: "gain" },
    { from: "gain", to: "lp" },
    { from: "lp", to: "adc" },
  ],
};

/**
 * Turbidity: the voltage from a photodiode front end, inverted with gain 2, then a
 * multiple-feedback low-pass (gain −1, f0 ≈ 156 Hz, Q ≈ 0.72) that restores the sign, and a
 * passive RC before a 12-bit ADC at 500 S/s. Rails ±5 V with a general-purpose part.
 */
export const turbidityPhotodiode = {
  format: "chainwright.chain/1",
  name: "Turbidity photodiode channel",
  notes: "Forward-scatter turbidity probe in the intake sea chest.",
  analysis: { fMin: 0.01, fMax: 1e4, points: 400, temperatureK: 298.15, noiseLow: 0.1, noiseHigh: null, aliasTargetDb: null },
  tolerances: { resistor: 0.01, capacitor: 0.05 },
  parts: { gp: DEMO_PARTS.gpBipolar, ln: DEMO_PARTS.lowNoiseBipolar },
  nodes: [
    {
      id: "pd",
      kind: "source",
      label: "Photodiode front end",
      params: { dc: 0.5, dcSpread: 0.05, amplitude: 0.2, fLow: 0.1, fHigh: 50, resistance: 1000, noiseDensity: 0, safety: "low-voltage" },
      position: { x: 0, y: 0 },
    },
    {
      id: "inv",
      kind: "inverting",
      label: "Gain −2",
      params: { r1: 10e3, r2: 20e3, vref: 0 },
      part: "ln",
      rails: { low: -5, high: 5 },
      position: { x: 220, y: 0 },
    },
    {
      id: "mfb",
      kind: "mfbLowpass",
      label: "Low-pass 156 Hz",
      params: { r1: 10e3, r2: 10e3, r3: 10e3, c1: 220e-9, c2: 47e-9, vref: 0 },
      part: "gp",
      rails: { low: -5, high: 5 },
      position: { x: 440, y: 0 },
    },
    {
      id: "rc",
      kind: "rcLowpass",
      label: "ADC input filter",
      params: { r: 1000, c: 100e-9 },
      position: { x: 660, y: 0 },
    },
    {
      id: "adc",
      kind: "adc",
      label: "ADC",
      params: { bits: 12, sampleRate: 500, vinLow: 0, vinHigh: 2.5, inputResistance: null },
      position: { x: 880, y: 0 },
    },
  ],
  edges: [
    { from: "pd", to: "inv" },
    { from: "inv", to: "mfb" },
    { from: "mfb", to: "rc" },
    { from: "rc", to: "adc" },
  ],
};
