/**
 * What the editor knows about each node kind: its name on the shelf, its fields with units, which are
 * required, and the starting values of a freshly placed node. The engineering meaning of every field is in
 * chain-format.md; this file only describes how the editor presents it.
 */
import type { NodeKind } from "@/lib/chain/types";
import type { QuantityUnit } from "@/lib/units";
import { PARAM_SPECS, type ParamSpec } from "@/lib/chain/params";

export type FieldUnit = Extract<QuantityUnit, "ohm" | "farad" | "volt" | "hertz" | "V/√Hz" | "ampere" | "A/√Hz" | "none">;

/**
 * How the editor presents one param. The rule (unit, limit, whether null means something, whether the
 * param is required, its default) is the schema's own (lib/chain/params.ts), looked up with `paramRule`.
 */
export interface FieldSpec {
  key: string;
  label: string;
  /** offer nearest preferred (E-series) values */
  preferred?: boolean;
}

export interface KindSpec {
  kind: NodeKind;
  /** short name on the shelf and cards */
  title: string;
  /** one line on what it is, for the shelf's tooltip */
  blurb: string;
  opAmp: boolean;
  fields: FieldSpec[];
  /** values of a newly placed node; rails are never pre-set here (they come from the chain's last used) */
  starter: Record<string, number | string | null>;
  /** fields shown on the card, in order, as [param, short name on the card] */
  cardFields: [string, string][];
}

const R = (key: string, label = key): FieldSpec => ({ key, label, preferred: true });
const C = R;
const VREF = (key = "vref"): FieldSpec => ({ key, label: key });

export const STAGE_CATALOG: Record<NodeKind, KindSpec> = {
  source: {
    kind: "source",
    title: "Source",
    blurb: "The sensor: an EMF with its DC level, signal peak and band, behind a resistance",
    opAmp: false,
    fields: [
      { key: "dc", label: "DC level" },
      { key: "dcSpread", label: "DC spread ±" },
      { key: "amplitude", label: "Signal peak" },
      { key: "fLow", label: "Band low" },
      { key: "fHigh", label: "Band high" },
      { key: "resistance", label: "Resistance" },
      { key: "noiseDensity", label: "Noise density" },
      { key: "sensitivity", label: "Sensitivity (V per unit)" },
    ],
    starter: { dc: 0, amplitude: 0.1, fLow: 1, fHigh: 1000, safety: "low-voltage" },
    cardFields: [["dc", "dc"], ["amplitude", "peak"], ["fLow", "fLow"], ["fHigh", "fHigh"]],
  },
  inverting: {
    kind: "inverting",
    title: "Inverting gain",
    blurb: "Gain −r2/r1 with the (+) input at vref",
    opAmp: true,
    fields: [R("r1"), R("r2"), VREF()],
    starter: { r1: 10e3, r2: 10e3 },
    cardFields: [["r1", "r1"], ["r2", "r2"]],
  },
  noninverting: {
    kind: "noninverting",
    title: "Non-inverting gain",
    blurb: "Gain 1 + rf/rg; leave rg empty for a follower",
    opAmp: true,
    fields: [
      R("rf"),
      R("rg"),
      VREF(),
    ],
    starter: { rf: 10e3, rg: 10e3 },
    cardFields: [["rf", "rf"], ["rg", "rg"]],
  },
  lossyIntegrator: {
    kind: "lossyIntegrator",
    title: "Lossy integrator",
    blurb: "Active first-order low-pass: −(r2/r1)/(1 + s·r2·c2)",
    opAmp: true,
    fields: [R("r1"), R("r2"), C("c2"), VREF()],
    starter: { r1: 10e3, r2: 100e3, c2: 10e-9 },
    cardFields: [["r1", "r1"], ["r2", "r2"], ["c2", "c2"]],
  },
  integrator: {
    kind: "integrator",
    title: "Integrator",
    blurb: "−1/(s·r1·c2): no DC feedback path, its output runs to a rail",
    opAmp: true,
    fields: [R("r1"), C("c2"), VREF()],
    starter: { r1: 10e3, c2: 100e-9 },
    cardFields: [["r1", "r1"], ["c2", "c2"]],
  },
  rcLowpass: {
    kind: "rcLowpass",
    title: "RC low-pass",
    blurb: "Passive series r, shunt c; loaded by what it drives",
    opAmp: false,
    fields: [R("r"), C("c")],
    starter: { r: 10e3, c: 10e-9 },
    cardFields: [["r", "r"], ["c", "c"]],
  },
  rcHighpass: {
    kind: "rcHighpass",
    title: "RC high-pass",
    blurb: "Series c, r to vbias: AC coupling",
    opAmp: false,
    fields: [C("c"), R("r"), VREF("vbias")],
    starter: { c: 1e-6, r: 100e3 },
    cardFields: [["c", "c"], ["r", "r"]],
  },
  sallenKeyLowpass: {
    kind: "sallenKeyLowpass",
    title: "Sallen-Key low-pass",
    blurb: "Second-order low-pass; gain 1 + rf/rg, or leave rf and rg empty for unity gain",
    opAmp: true,
    fields: [R("r1"), R("r2"), C("c1"), C("c2"), R("rf"), R("rg"), VREF()],
    starter: { r1: 10e3, r2: 10e3, c1: 22e-9, c2: 10e-9 },
    cardFields: [["r1", "r1"], ["r2", "r2"], ["c1", "c1"], ["c2", "c2"]],
  },
  mfbLowpass: {
    kind: "mfbLowpass",
    title: "MFB low-pass",
    blurb: "Multiple-feedback second-order low-pass, gain −r2/r1",
    opAmp: true,
    fields: [R("r1"), R("r2"), R("r3"), C("c1"), C("c2"), VREF()],
    starter: { r1: 10e3, r2: 10e3, r3: 10e3, c1: 22e-9, c2: 2.2e-9 },
    cardFields: [["r1", "r1"], ["r2", "r2"], ["r3", "r3"], ["c1", "c1"], ["c2", "c2"]],
  },
  // filters: the high-pass sections
  sallenKeyHighpass: {
    kind: "sallenKeyHighpass",
    title: "Sallen-Key high-pass",
    blurb: "Second-order high-pass (c1, c2 in series, r1 to the output, r2 to vref); gain 1 + rf/rg, or empty for unity gain",
    opAmp: true,
    fields: [C("c1"), C("c2"), R("r1"), R("r2"), R("rf"), R("rg"), VREF()],
    // equal capacitors with r2 = 2·r1: Q ≈ 0.707, f0 ≈ 1.02 kHz
    starter: { c1: 10e-9, c2: 10e-9, r1: 11e3, r2: 22e3 },
    cardFields: [["c1", "c1"], ["c2", "c2"], ["r1", "r1"], ["r2", "r2"]],
  },
  mfbHighpass: {
    kind: "mfbHighpass",
    title: "MFB high-pass",
    blurb: "Multiple-feedback second-order high-pass, passband gain −c1/c2",
    opAmp: true,
    fields: [C("c1"), C("c2"), C("c3"), R("r1"), R("r2"), VREF()],
    // equal capacitors with r2 ≈ 4.7·r1: Q ≈ 0.72, f0 ≈ 1.57 kHz, gain −1
    starter: { c1: 10e-9, c2: 10e-9, c3: 10e-9, r1: 4.7e3, r2: 22e3 },
    cardFields: [["c1", "c1"], ["c2", "c2"], ["c3", "c3"], ["r1", "r1"], ["r2", "r2"]],
  },
  // ---- sensor sources and their front-end stages (issue 14)
  bridge: {
    kind: "bridge",
    title: "Bridge sensor",
    blurb: "Load cell or pressure bridge: a differential pair around excitation/2; feeds a difference or instrumentation amplifier",
    opAmp: false,
    fields: [
      { key: "excitation", label: "Excitation" },
      { key: "fullScale", label: "Rated output (V/V)" },
      { key: "loadLow", label: "Range low (of full scale)" },
      { key: "loadHigh", label: "Range high (of full scale)" },
      { key: "offset", label: "Zero balance ± (V/V)" },
      { key: "resistance", label: "Bridge resistance" },
      { key: "vcm", label: "Common mode (empty: half excitation)" },
      { key: "fLow", label: "Band low" },
      { key: "fHigh", label: "Band high" },
      { key: "noiseDensity", label: "Extra noise density" },
      { key: "sensitivity", label: "Sensitivity (V per unit)" },
    ],
    starter: { excitation: 5, fullScale: 0.002, resistance: 350, fHigh: 10, safety: "low-voltage" },
    cardFields: [["excitation", "exc"], ["fullScale", "FS V/V"], ["resistance", "R"]],
  },
  photodiode: {
    kind: "photodiode",
    title: "Photodiode",
    blurb: "A current source with junction capacitance and shunt resistance; best into a transimpedance amplifier",
    opAmp: false,
    fields: [
      { key: "dc", label: "DC photocurrent" },
      { key: "dcSpread", label: "DC spread ±" },
      { key: "amplitude", label: "Signal current peak" },
      { key: "fLow", label: "Band low" },
      { key: "fHigh", label: "Band high" },
      { key: "capacitance", label: "Junction capacitance" },
      { key: "shuntResistance", label: "Shunt resistance" },
      { key: "darkCurrent", label: "Dark current" },
      { key: "noiseDensity", label: "Extra noise density" },
      { key: "sensitivity", label: "Sensitivity (A per unit)" },
    ],
    starter: { amplitude: 1e-6, fLow: 0, fHigh: 1000, capacitance: 50e-12, shuntResistance: 1e9, safety: "low-voltage" },
    cardFields: [["amplitude", "i pk"], ["capacitance", "Cj"], ["shuntResistance", "Rsh"]],
  },
  piezo: {
    kind: "piezo",
    title: "Piezo element",
    blurb: "A charge source with its capacitance and leakage (open-circuit voltage q/C); best into a charge amplifier",
    opAmp: false,
    fields: [
      { key: "amplitude", label: "Signal charge peak (C)" },
      { key: "fLow", label: "Band low" },
      { key: "fHigh", label: "Band high" },
      { key: "capacitance", label: "Capacitance" },
      { key: "leakage", label: "Leakage resistance" },
      { key: "sensitivity", label: "Sensitivity (C per unit)" },
    ],
    starter: { amplitude: 1e-10, fLow: 1, fHigh: 5000, capacitance: 1e-9, leakage: 1e10, safety: "low-voltage" },
    cardFields: [["amplitude", "q pk"], ["capacitance", "C"], ["leakage", "Rleak"]],
  },
  thermocouple: {
    kind: "thermocouple",
    title: "Thermocouple",
    blurb: "A floating differential EMF seebeck·(t − tCold) with lead resistance; needs a common-mode bias",
    opAmp: false,
    fields: [
      { key: "seebeck", label: "Seebeck coefficient (V/K)" },
      { key: "tLow", label: "Range low (°C)" },
      { key: "tHigh", label: "Range high (°C)" },
      { key: "tCold", label: "Cold junction (°C)" },
      { key: "coldJunctionError", label: "Cold-junction error ± (K)" },
      { key: "leadResistance", label: "Lead resistance (each)" },
      { key: "vcm", label: "Common-mode bias" },
      { key: "fHigh", label: "Band high" },
    ],
    starter: { seebeck: 41e-6, tLow: 0, tHigh: 400, fHigh: 10, vcm: 1.25, safety: "low-voltage" },
    cardFields: [["seebeck", "S"], ["tLow", "t lo"], ["tHigh", "t hi"]],
  },
  transimpedance: {
    kind: "transimpedance",
    title: "Transimpedance",
    blurb: "Current to voltage: −rf/(1 + s·rf·cf); takes a photodiode or piezo current straight in",
    opAmp: true,
    fields: [R("rf"), C("cf"), VREF(), { key: "cin", label: "Op-amp input capacitance" }],
    starter: { rf: 100e3, cf: 10e-12 },
    cardFields: [["rf", "rf"], ["cf", "cf"]],
  },
  chargeAmp: {
    kind: "chargeAmp",
    title: "Charge amplifier",
    blurb: "Charge to voltage: −1/cf above its low corner 1/(2π·rf·cf); takes a piezo straight in",
    opAmp: true,
    fields: [C("cf"), R("rf"), VREF(), { key: "cin", label: "Op-amp input capacitance" }],
    starter: { cf: 1e-9, rf: 1e9 },
    cardFields: [["cf", "cf"], ["rf", "rf"]],
  },
  differenceAmp: {
    kind: "differenceAmp",
    title: "Difference amplifier",
    blurb: "Four resistors: (r2/r1)·(V+ − V−) when r4/r3 = r2/r1; takes a bridge or thermocouple pair",
    opAmp: true,
    fields: [R("r1"), R("r2"), R("r3"), R("r4"), VREF()],
    starter: { r1: 10e3, r2: 100e3, r3: 10e3, r4: 100e3 },
    cardFields: [["r1", "r1"], ["r2", "r2"], ["r3", "r3"], ["r4", "r4"]],
  },
  inAmp: {
    kind: "inAmp",
    title: "Instrumentation amp",
    blurb: "Three op-amps, gain 1 + 2·rf/rg onto vref; takes a bridge or thermocouple pair",
    opAmp: true,
    fields: [R("rg"), R("rf", "rf (internal)"), R("rd", "rd (internal)"), VREF(), { key: "cmrrDb", label: "CMRR (dB)" }],
    starter: { rg: 500 },
    cardFields: [["rg", "rg"], ["vref", "ref"]],
  },
  adc: {
    kind: "adc",
    title: "ADC",
    blurb: "The converter's input pin: bits, sample rate, input range",
    opAmp: false,
    fields: [
      { key: "bits", label: "Bits" },
      { key: "sampleRate", label: "Sample rate" },
      { key: "vinLow", label: "Input low" },
      { key: "vinHigh", label: "Input high" },
      { key: "inputResistance", label: "Input resistance" },
    ],
    starter: { bits: 16, sampleRate: 10e3, vinLow: 0, vinHigh: 3.3 },
    cardFields: [["bits", "bits"], ["sampleRate", "fs"], ["vinLow", "in lo"], ["vinHigh", "in hi"]],
  },
};

/** Shelf order: the path a signal usually takes. */
export const SHELF_ORDER: NodeKind[] = [
  "source",
  "noninverting",
  "inverting",
  "lossyIntegrator",
  "integrator",
  "rcHighpass",
  "rcLowpass",
  "sallenKeyLowpass",
  "mfbLowpass",
  "sallenKeyHighpass",
  "mfbHighpass",
  // sensor sources and their front ends after the first nine (which keep their digit shortcuts)
  "bridge",
  "photodiode",
  "piezo",
  "thermocouple",
  "inAmp",
  "differenceAmp",
  "transimpedance",
  "chargeAmp",
  "adc",
];

/** The schema's rule for a param (unit, limit, required, default). */
export function paramRule(kind: NodeKind, key: string): ParamSpec | undefined {
  return PARAM_SPECS[kind][key];
}

/** The unit a param is typed in. */
export function paramUnit(kind: NodeKind, key: string): FieldUnit {
  const u = PARAM_SPECS[kind][key]?.rule?.unit;
  return (u === "ohm" || u === "farad" || u === "volt" || u === "hertz" || u === "V/√Hz" || u === "ampere" || u === "A/√Hz" ? u : "none") as FieldUnit;
}
