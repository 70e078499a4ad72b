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
};

/** Pairs of params where the first must be strictly below the second, whenever both are present. */
const ORDERED_PARAMS: Partial<Record<NodeKind, readonly [string, string, string][]>> = {
  source: [["fLow", "fHigh", "Hz"]],
  adc: [["vinLow", "vinHigh", "V"]],
};

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
  if (kind === "source" && params.sensitivity === 0) {
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
