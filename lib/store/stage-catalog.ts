/**
 * What the editor knows about each node kind: its name on the shelf, its fields with units, which are
 * required, and the starting values of a freshly placed node. The engineering meaning of every field is in
 * chain-format.md; this file only describes how the editor presents it.
 */
import type { NodeKind } from "@/lib/chain/types";
import type { QuantityUnit } from "@/lib/units";
import { PARAM_SPECS, type ParamSpec } from "@/lib/chain/params";

export type FieldUnit = Extract<QuantityUnit, "ohm" | "farad" | "volt" | "hertz" | "V/√Hz" | "none">;

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
  "adc",
];

/** The schema's rule for a param (unit, limit, required, default). */
export function paramRule(kind: NodeKind, key: string): ParamSpec | undefined {
  return PARAM_SPECS[kind][key];
}

/** The unit a param is typed in. */
export function paramUnit(kind: NodeKind, key: string): FieldUnit {
  const u = PARAM_SPECS[kind][key]?.rule?.unit;
  return (u === "ohm" || u === "farad" || u === "volt" || u === "hertz" || u === "V/√Hz" ? u : "none") as FieldUnit;
}
