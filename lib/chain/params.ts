/**
 * The params of every stage kind, as chain-format.md "Stage kinds" lists them: unit, limit, whether the
 * param is required in a complete chain, and the default the schema fills in when it is absent.
 * The schema for both levels is built from this one table, and the editor may read it too.
 */
import type { NodeKind, Safety } from "./types";
import { FARADS, OHMS, VOLTS, type NumberRule } from "./fields";

export interface ParamSpec {
  /** numeric params */
  rule?: NumberRule;
  /** word params (the source's safety) */
  words?: readonly string[];
  /** free-text params (the source's unit), up to this many characters */
  maxLength?: number;
  /** required in a complete chain (a draft may leave any param out) */
  required: boolean;
  /** filled in when absent from a complete chain; with none, an optional param stays absent */
  default?: number | string | null;
}

/** Longest unit name a source may give (`unit`, e.g. "kg", "°C", "m/s²"). */
export const SOURCE_UNIT_LENGTH = 16;

export const SAFETY_VALUES: readonly Safety[] = ["low-voltage", "mains-connected", "body-connected"];

const req = (rule: NumberRule): ParamSpec => ({ rule, required: true });
const opt = (rule: NumberRule, dflt: number | null): ParamSpec => ({ rule, required: false, default: dflt });

const VREF = opt(VOLTS, 0);
/** The optional gain network of the Sallen-Key sections (gain 1 + rf/rg; both null: unity gain). */
const GAIN_RF = opt({ ...OHMS, nullMeans: "unity gain (the output tied to (−))" }, null);
const GAIN_RG = opt({ ...OHMS, nullMeans: "unity gain (no resistor from (−) to vref)" }, null);
const SAFETY: ParamSpec = { words: SAFETY_VALUES, required: false, default: "low-voltage" };
// Absent, null (sensitivity) or "" (unit) all mean none declared; the schema fills in nothing.
const SENSITIVITY: ParamSpec = {
  rule: { ...VOLTS, unit: "none", note: "(the source's output unit, V, A or C, per unit of the measurand; not 0)", nullMeans: "no declared sensitivity" },
  required: false,
};
const UNIT: ParamSpec = { maxLength: SOURCE_UNIT_LENGTH, required: false };

/** Params per kind, in the order chain-format.md gives them. */
export const PARAM_SPECS: Readonly<Record<NodeKind, Readonly<Record<string, ParamSpec>>>> = {
  source: {
    dc: req(VOLTS),
    dcSpread: opt({ unit: "volt", bound: "nonNegative" }, 0),
    amplitude: req({ unit: "volt", bound: "nonNegative" }),
    fLow: req({ unit: "hertz", bound: "nonNegative" }),
    fHigh: req({ unit: "hertz", bound: "positive" }),
    resistance: opt({ unit: "ohm", bound: "nonNegative" }, 0),
    noiseDensity: opt({ unit: "V/√Hz", bound: "nonNegative" }, 0),
    safety: { words: SAFETY_VALUES, required: false, default: "low-voltage" },
    // Absent, null (sensitivity) or "" (unit) all mean none declared; the schema fills in nothing.
    sensitivity: { rule: { ...VOLTS, note: "per unit of the measurand, not 0", nullMeans: "no declared sensitivity" }, required: false },
    unit: { maxLength: SOURCE_UNIT_LENGTH, required: false },
  },
  inverting: { r1: req(OHMS), r2: req(OHMS), vref: VREF },
  noninverting: {
    // rf is required as soon as rg is given (a gain stage); see crossParamIssues.
    rf: opt({ ...OHMS, nullMeans: "no feedback resistor (a follower)" }, null),
    rg: opt({ ...OHMS, nullMeans: "a follower" }, null),
    vref: VREF,
  },
  lossyIntegrator: { r1: req(OHMS), r2: req(OHMS), c2: req(FARADS), vref: VREF },
  integrator: { r1: req(OHMS), c2: req(FARADS), vref: VREF },
  rcLowpass: { r: req(OHMS), c: req(FARADS) },
  rcHighpass: { c: req(FARADS), r: req(OHMS), vbias: opt(VOLTS, 0) },
  sallenKeyLowpass: { r1: req(OHMS), r2: req(OHMS), c1: req(FARADS), c2: req(FARADS), rf: GAIN_RF, rg: GAIN_RG, vref: VREF },
  mfbLowpass: { r1: req(OHMS), r2: req(OHMS), r3: req(OHMS), c1: req(FARADS), c2: req(FARADS), vref: VREF },
  // filters: high-pass sections
  sallenKeyHighpass: { c1: req(FARADS), c2: req(FARADS), r1: req(OHMS), r2: req(OHMS), rf: GAIN_RF, rg: GAIN_RG, vref: VREF },
  mfbHighpass: { c1: req(FARADS), c2: req(FARADS), c3: req(FARADS), r1: req(OHMS), r2: req(OHMS), vref: VREF },
  // ---- sensor sources (issue 14): sensitivity and unit as on `source`, in the source's own output unit
  bridge: {
    excitation: req({ unit: "volt", bound: "positive" }),
    fullScale: req({ unit: "none", bound: "positive", note: "(V per V of excitation: 0.002 is 2 mV/V)" }),
    loadLow: opt({ unit: "none", bound: "any", range: { min: -1, max: 1 }, note: "(a fraction of full scale)" }, 0),
    loadHigh: opt({ unit: "none", bound: "any", range: { min: -1, max: 1 }, note: "(a fraction of full scale)" }, 1),
    offset: opt({ unit: "none", bound: "nonNegative", note: "(± zero balance, V per V of excitation)" }, 0),
    resistance: req(OHMS),
    vcm: opt({ ...VOLTS, nullMeans: "half the excitation" }, null),
    fLow: opt({ unit: "hertz", bound: "nonNegative" }, 0),
    fHigh: req({ unit: "hertz", bound: "positive" }),
    noiseDensity: opt({ unit: "V/√Hz", bound: "nonNegative" }, 0),
    safety: SAFETY,
    sensitivity: SENSITIVITY,
    unit: UNIT,
  },
  photodiode: {
    dc: opt({ unit: "ampere", bound: "nonNegative" }, 0),
    dcSpread: opt({ unit: "ampere", bound: "nonNegative" }, 0),
    amplitude: req({ unit: "ampere", bound: "nonNegative" }),
    fLow: req({ unit: "hertz", bound: "nonNegative" }),
    fHigh: req({ unit: "hertz", bound: "positive" }),
    capacitance: req(FARADS),
    shuntResistance: req(OHMS),
    darkCurrent: opt({ unit: "ampere", bound: "nonNegative" }, 0),
    noiseDensity: opt({ unit: "A/√Hz", bound: "nonNegative" }, 0),
    safety: SAFETY,
    sensitivity: SENSITIVITY,
    unit: UNIT,
  },
  piezo: {
    amplitude: req({ unit: "none", bound: "nonNegative", note: "(coulombs, peak)" }),
    fLow: req({ unit: "hertz", bound: "nonNegative" }),
    fHigh: req({ unit: "hertz", bound: "positive" }),
    capacitance: req(FARADS),
    leakage: req(OHMS),
    safety: SAFETY,
    sensitivity: SENSITIVITY,
    unit: UNIT,
  },
  thermocouple: {
    seebeck: req({ unit: "none", bound: "positive", note: "(V/K, the mean over tLow..tHigh)" }),
    tLow: req({ unit: "none", bound: "any", note: "(°C)" }),
    tHigh: req({ unit: "none", bound: "any", note: "(°C)" }),
    tCold: opt({ unit: "none", bound: "any", note: "(°C)" }, 25),
    coldJunctionError: opt({ unit: "none", bound: "nonNegative", note: "(± kelvin)" }, 0),
    leadResistance: opt({ unit: "ohm", bound: "nonNegative" }, 0),
    vcm: opt(VOLTS, 0),
    fHigh: req({ unit: "hertz", bound: "positive" }),
    safety: SAFETY,
    sensitivity: SENSITIVITY,
    unit: UNIT,
  },
  // ---- front-end stages (issue 14)
  transimpedance: { rf: req(OHMS), cf: opt({ unit: "farad", bound: "nonNegative" }, 0), vref: VREF, cin: opt({ unit: "farad", bound: "nonNegative" }, 0) },
  chargeAmp: { cf: req(FARADS), rf: req(OHMS), vref: VREF, cin: opt({ unit: "farad", bound: "nonNegative" }, 0) },
  differenceAmp: { r1: req(OHMS), r2: req(OHMS), r3: req(OHMS), r4: req(OHMS), vref: VREF },
  inAmp: {
    rg: req(OHMS),
    rf: opt(OHMS, 25e3),
    rd: opt(OHMS, 10e3),
    vref: VREF,
    cmrrDb: opt({ unit: "dB", bound: "positive", nullMeans: "no common-mode error beyond the resistor model" }, null),
  },
  adc: {
    bits: req({ unit: "none", bound: "positive", integer: { min: 1, max: 32 } }),
    sampleRate: req({ unit: "hertz", bound: "positive" }),
    vinLow: req(VOLTS),
    vinHigh: req(VOLTS),
    inputResistance: opt({ ...OHMS, nullMeans: "an infinite input resistance" }, null),
  },
};

/** How each kind is named in messages. */
export const KIND_WORDS: Readonly<Record<NodeKind, string>> = {
  source: "a source",
  inverting: "an inverting stage",
  noninverting: "a non-inverting stage",
  lossyIntegrator: "a lossy integrator",
  integrator: "an integrator",
  rcLowpass: "an RC low-pass",
  rcHighpass: "an RC high-pass",
  sallenKeyLowpass: "a Sallen-Key low-pass",
  mfbLowpass: "an MFB low-pass",
  sallenKeyHighpass: "a Sallen-Key high-pass",
  mfbHighpass: "an MFB high-pass",
  adc: "an ADC",
  bridge: "a bridge sensor",
  photodiode: "a photodiode",
  piezo: "a piezo element",
  thermocouple: "a thermocouple",
  transimpedance: "a transimpedance amplifier",
  chargeAmp: "a charge amplifier",
  differenceAmp: "a difference amplifier",
  inAmp: "an instrumentation amplifier",
};

/** Pairs of params where the first must be strictly below the second, whenever both are present. */
const ORDERED_PARAMS: Partial<Record<NodeKind, readonly [string, string, string][]>> = {
  source: [["fLow", "fHigh", "Hz"]],
  adc: [["vinLow", "vinHigh", "V"]],
  bridge: [["loadLow", "loadHigh", "of full scale"], ["fLow", "fHigh", "Hz"]],
  photodiode: [["fLow", "fHigh", "Hz"]],
  piezo: [["fLow", "fHigh", "Hz"]],
  thermocouple: [["tLow", "tHigh", "°C"]],
};

const SOURCE_KIND_SET = new Set<NodeKind>(["source", "bridge", "photodiode", "piezo", "thermocouple"]);

export interface ParamIssue {
  key: string;
  message: string;
}

/**
 * Rules that tie params of one node together. Orderings apply at both levels when both values are there;
 * "rf is required once rg is given" only makes a chain incomplete, so it applies at the complete level.
 */
export function crossParamIssues(kind: NodeKind, params: Record<string, unknown>, complete: boolean): ParamIssue[] {
  const out: ParamIssue[] = [];
  for (const [lo, hi, unit] of ORDERED_PARAMS[kind] ?? []) {
    const a = params[lo];
    const b = params[hi];
    if (typeof a === "number" && typeof b === "number" && Number.isFinite(a) && Number.isFinite(b) && !(a < b)) {
      out.push({ key: hi, message: `must be above ${lo} (${hi} is ${b} ${unit}, ${lo} is ${a} ${unit})` });
    }
  }
  if (SOURCE_KIND_SET.has(kind) && params.sensitivity === 0) {
    out.push({ key: "sensitivity", message: "must not be 0: give the volts per unit of the measurand, or null for none" });
  }
  if (complete && kind === "noninverting" && typeof params.rg === "number" && (params.rf === null || params.rf === undefined)) {
    out.push({
      key: "rf",
      message: "is required when rg is given (the gain is 1 + rf/rg); leave rg out or null for a follower",
    });
  }
  if (complete && (kind === "sallenKeyLowpass" || kind === "sallenKeyHighpass") && typeof params.rg === "number" && (params.rf === null || params.rf === undefined)) {
    out.push({
      key: "rf",
      message: "is required when rg is given (the section's gain is 1 + rf/rg); leave both out or null for unity gain",
    });
  }
  return out;
}
