import { DEMO_PARTS } from "./parts";

/**
 * Demo chains for the invented company Keelwater Instruments (marine sensing). Each document
 * is a complete `chainwright.chain/1` chain (checked by the seed and by tests/unit/db-seed).
 * Values are SI base units. Design notes per chain explain what the demo is meant to show.
 */

/**
 * Hull vibration: a piezoelectric accelerometer (charge output, 0.5 nC peak in its 2 Hz–2 kHz band) into
 * a charge amplifier on a single 5 V rail with its reference at mid-supply, gain of 2, second-order
 * anti-alias low-pass, 12-bit ADC at 20 kS/s. Charge gain −1/cf = −1 V/nC; the charge amplifier's low
 * corner 1/(2π·1 GΩ·1 nF) ≈ 0.16 Hz sits well under the band; Sallen-Key f0 ≈ 2.3 kHz, Q ≈ 0.73.
 */
export const hullVibration = {
  format: "chainwright.chain/1",
  name: "Hull vibration channel, aft bay",
  notes:
    "Piezoelectric accelerometer on the aft bulkhead, read as a charge (about 5 pC/g, ±100 g). Single 5 V supply; the charge amplifier's reference is at mid-rail (2.5 V), so no AC coupling is needed after it.",
  analysis: { fMin: 0.1, fMax: 1e5, points: 500, temperatureK: 298.15, noiseLow: 1, noiseHigh: null, aliasTargetDb: null },
  tolerances: { resistor: 0.01, capacitor: 0.05 },
  parts: { cmos: DEMO_PARTS.precisionCmosRr },
  nodes: [
    {
      id: "accel",
      kind: "piezo",
      label: "Accelerometer",
      params: { amplitude: 0.5e-9, fLow: 2, fHigh: 2000, capacitance: 1e-9, leakage: 100e9, safety: "low-voltage" },
      position: { x: 0, y: 0 },
    },
    {
      id: "ca",
      kind: "chargeAmp",
      label: "Charge amplifier",
      params: { cf: 1e-9, rf: 1e9, vref: 2.5, cin: 0 },
      part: "cmos",
      rails: { low: 0, high: 5 },
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
    { from: "accel", to: "ca" },
    { from: "ca", to: "gain" },
    { from: "gain", to: "aa" },
    { from: "aa", to: "adc" },
  ],
};

/**
 * Ballast tank pressure: a 350 Ω strain-gauge bridge (2 mV/V at 10 V excitation across the ±5 V rails,
 * so its common mode is 0 V) read through an instrumentation amplifier with all the gain, 500, in one
 * stage. Half-scale pressure gives 10 mV, the zero balance ±3 mV: ×500 that is 5 V ± 1.5 V at DC, at and
 * beyond the +5 V rail before the pressure moves at all, and the in-amp's input stage runs out of swing
 * too: this chain shows a stage that clips at DC. (The cure: less gain and the in-amp's reference moved
 * to take the bridge's DC out; the gain plan finds 250.5 and −2.5 V.)
 */
export const ballastPressure = {
  format: "chainwright.chain/1",
  name: "Ballast tank pressure bridge",
  notes: "350 Ω bridge, 20 mV full scale (2 mV/V at 10 V), ±3 mV zero balance. First attempt: all the gain in one stage.",
  analysis: { fMin: 0.01, fMax: 1e4, points: 400, temperatureK: 298.15, noiseLow: 0.1, noiseHigh: null, aliasTargetDb: null },
  tolerances: { resistor: 0.001, capacitor: 0.05 },
  parts: { cmos: DEMO_PARTS.precisionCmosRr, gp: DEMO_PARTS.gpBipolar },
  nodes: [
    {
      id: "bridge",
      kind: "bridge",
      label: "Pressure bridge",
      params: { excitation: 10, fullScale: 0.002, loadLow: 0, loadHigh: 1, offset: 3e-4, resistance: 350, vcm: 0, fLow: 0, fHigh: 10, noiseDensity: 0, safety: "low-voltage" },
      position: { x: 0, y: 0 },
    },
    {
      id: "gain",
      kind: "inAmp",
      label: "Bridge in-amp ×500",
      params: { rg: 100, rf: 24.95e3, rd: 10e3, vref: 0, cmrrDb: 100 },
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
 * Turbidity: the forward-scatter photodiode as a current (1.25 µA ± 0.125 µA of scattered light, 0.5 µA
 * peak of change, 100 pF, 200 MΩ shunt) into a transimpedance amplifier of 800 kΩ ∥ 470 pF (−0.8 V/µA,
 * signal corner ≈ 420 Hz), then a multiple-feedback low-pass (gain −1, f0 ≈ 156 Hz, Q ≈ 0.72) that
 * restores the sign, and a passive RC before a 12-bit ADC at 500 S/s. Rails ±5 V.
 */
export const turbidityPhotodiode = {
  format: "chainwright.chain/1",
  name: "Turbidity photodiode channel",
  notes: "Forward-scatter turbidity probe in the intake sea chest. The photodiode works into a virtual ground (photoconductive, no bias), so its capacitance only matters for the TIA's loop.",
  analysis: { fMin: 0.01, fMax: 1e4, points: 400, temperatureK: 298.15, noiseLow: 0.1, noiseHigh: null, aliasTargetDb: null },
  tolerances: { resistor: 0.01, capacitor: 0.05 },
  parts: { gp: DEMO_PARTS.gpBipolar, cmos: DEMO_PARTS.precisionCmosRr },
  nodes: [
    {
      id: "pd",
      kind: "photodiode",
      label: "Photodiode",
      params: { dc: 1.25e-6, dcSpread: 0.125e-6, amplitude: 0.5e-6, fLow: 0.1, fHigh: 50, capacitance: 100e-12, shuntResistance: 200e6, darkCurrent: 1e-9, noiseDensity: 0, safety: "low-voltage" },
      position: { x: 0, y: 0 },
    },
    {
      id: "tia",
      kind: "transimpedance",
      label: "TIA 800 kΩ",
      params: { rf: 800e3, cf: 470e-12, vref: 0, cin: 0 },
      part: "cmos",
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
    { from: "pd", to: "tia" },
    { from: "tia", to: "mfb" },
    { from: "mfb", to: "rc" },
    { from: "rc", to: "adc" },
  ],
};
