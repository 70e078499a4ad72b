/**
 * TypeScript shape of a chain document (`chainwright.chain/1`) after validation
 * and with every default filled in. The zod schema in `schema.ts` produces
 * exactly this; the engine consumes only this. Quantities are SI base units
 * (ohm, farad, volt, ampere, hertz, second, kelvin, V/s, V/√Hz, A/√Hz).
 * See shared chain-format.md for the meaning of every field.
 */

export const CHAIN_FORMAT = "chainwright.chain/1" as const;
export const ANALYSIS_FORMAT = "chainwright.analysis/1" as const;

export type Safety = "low-voltage" | "mains-connected" | "body-connected";

export interface AnalysisSettings {
  fMin: number;
  fMax: number;
  points: number;
  temperatureK: number;
  noiseLow: number;
  /** null means fMax */
  noiseHigh: number | null;
  /** null means the ADC's ideal SNR */
  aliasTargetDb: number | null;
}

export interface Tolerances {
  resistor: number;
  capacitor: number;
  /**
   * Optional per-part tolerances by "nodeId.param" (e.g. "u1.r1": 0.001), each a fraction in [0, 0.5];
   * used by the tolerance spread instead of `resistor` / `capacitor`. Absent = none.
   */
  overrides?: Record<string, number>;
}

/** An op-amp model. Every field optional: missing means ideal in that respect. */
export interface Part {
  label?: string;
  /** gain-bandwidth product, Hz */
  gbw?: number;
  /** open-loop DC gain, V/V (never dB) */
  aol?: number;
  /** V/s */
  slewRate?: number;
  /** input offset voltage magnitude, V */
  vos?: number;
  /** input bias current magnitude, A */
  ib?: number;
  /** input voltage noise density, V/√Hz */
  en?: number;
  /** input current noise density, A/√Hz */
  in?: number;
  /** 1/f corner of en, Hz */
  enCorner?: number;
  /** 1/f corner of in, Hz */
  inCorner?: number;
  /** how close the output gets to the low rail, V */
  swingLow?: number;
  swingHigh?: number;
  /** input common-mode limit relative to the low rail, V (negative: beyond the rail) */
  inputLow?: number;
  inputHigh?: number;
}

export interface Rails {
  low: number;
  high: number;
}

export interface Position {
  x: number;
  y: number;
}

export interface SourceParams {
  dc: number;
  dcSpread: number;
  amplitude: number;
  fLow: number;
  fHigh: number;
  resistance: number;
  noiseDensity: number;
  safety: Safety;
  /**
   * Volts at the source output per unit of the measurand (V/kg, V/°C); absent or null = none declared
   * (the schema fills in no default, so older documents come back unchanged).
   */
  sensitivity?: number | null;
  /** Short name of the measurand's unit ("kg", "°C", "lx"), up to 16 characters; absent or "" = none. */
  unit?: string;
}
export interface InvertingParams { r1: number; r2: number; vref: number }
export interface NonInvertingParams { rf: number | null; rg: number | null; vref: number }
export interface LossyIntegratorParams { r1: number; r2: number; c2: number; vref: number }
export interface IntegratorParams { r1: number; c2: number; vref: number }
export interface RcLowpassParams { r: number; c: number }
export interface RcHighpassParams { c: number; r: number; vbias: number }
/**
 * Sallen-Key low-pass. rf/rg (filters): the optional gain network, rf out→(−), rg (−)→vref, gain
 * K = 1 + rf/rg; both null (the default, and what older documents mean) is the unity-gain stage with the
 * output tied to (−); rf alone is a follower with rf in its feedback. Optional in the type so that code
 * written before they existed still builds; the schema fills in null.
 */
export interface SallenKeyLowpassParams { r1: number; r2: number; c1: number; c2: number; rf?: number | null; rg?: number | null; vref: number }
export interface MfbLowpassParams { r1: number; r2: number; r3: number; c1: number; c2: number; vref: number }
// --- filters: high-pass sections (Sallen-Key and multiple feedback) ---
/** Sallen-Key high-pass: c1 Vin→A, c2 A→(+), r1 A→out, r2 (+)→vref; rf/rg as in SallenKeyLowpassParams. */
export interface SallenKeyHighpassParams { c1: number; c2: number; r1: number; r2: number; rf?: number | null; rg?: number | null; vref: number }
/** MFB high-pass: c1 Vin→A, r1 A→vref, c2 A→out, c3 A→(−), r2 (−)→out, (+) at vref. */
export interface MfbHighpassParams { c1: number; c2: number; c3: number; r1: number; r2: number; vref: number }
// --- end filters ---
// ---- sensor sources and the front-end stages that serve them (issue 14; chain-format.md "Sensor sources")
/** Full-bridge sensor (load cell, pressure bridge): a differential voltage pair around a common mode. */
export interface BridgeParams {
  /** excitation across the bridge, V */
  excitation: number;
  /** rated output at full scale, V per V of excitation (0.002 is 2 mV/V) */
  fullScale: number;
  /** the measured range as fractions of full scale (−1..1), low < high */
  loadLow: number;
  loadHigh: number;
  /** ± zero-balance spread, V per V of excitation */
  offset: number;
  /** output resistance of the bridge (equal arms: the arm resistance), Ω */
  resistance: number;
  /** common-mode voltage of the output pair, V; null = excitation/2 */
  vcm: number | null;
  fLow: number;
  fHigh: number;
  noiseDensity: number;
  safety: Safety;
  sensitivity?: number | null;
  unit?: string;
}
/** Photodiode: a current source with its junction capacitance and shunt resistance (Norton form). */
export interface PhotodiodeParams {
  /** DC photocurrent (ambient light included), A */
  dc: number;
  dcSpread: number;
  /** signal current, A peak */
  amplitude: number;
  fLow: number;
  fHigh: number;
  /** junction capacitance, F */
  capacitance: number;
  shuntResistance: number;
  /** dark current, A (adds to the DC and to the shot noise) */
  darkCurrent: number;
  /** extra current noise, A/√Hz (shot and shunt noise are computed) */
  noiseDensity: number;
  safety: Safety;
  sensitivity?: number | null;
  unit?: string;
}
/** Piezo element: a charge source with its capacitance and leakage resistance. */
export interface PiezoParams {
  /** signal charge, C peak */
  amplitude: number;
  fLow: number;
  fHigh: number;
  capacitance: number;
  leakage: number;
  safety: Safety;
  sensitivity?: number | null;
  unit?: string;
}
/** Thermocouple: a differential EMF seebeck·(t − tCold) with its lead resistance. */
export interface ThermocoupleParams {
  /** mean Seebeck coefficient over [tLow, tHigh], V/K */
  seebeck: number;
  /** measured hot-junction range, °C */
  tLow: number;
  tHigh: number;
  /** cold-junction (reference) temperature, °C */
  tCold: number;
  /** ± error of the cold-junction compensation, K */
  coldJunctionError: number;
  /** resistance of each lead, Ω */
  leadResistance: number;
  /** common-mode bias the front end gives the floating junction, V */
  vcm: number;
  fHigh: number;
  safety: Safety;
  sensitivity?: number | null;
  unit?: string;
}
/** Transimpedance amplifier: the sensor current into (−), rf ∥ cf feedback, (+) at vref. */
export interface TransimpedanceParams { rf: number; cf: number; vref: number; cin: number }
/** Charge amplifier: the same circuit, cf sets the gain (V per C) and rf the DC path. */
export interface ChargeAmpParams { cf: number; rf: number; vref: number; cin: number }
/** Four-resistor difference amplifier: (−) input via r1 (r2 feedback), (+) input via r3 onto r4 to vref. */
export interface DifferenceAmpParams { r1: number; r2: number; r3: number; r4: number; vref: number }
/** Three-op-amp instrumentation amplifier: gain 1 + 2·rf/rg, a unity difference stage of four rd to vref. */
export interface InAmpParams { rg: number; rf: number; rd: number; vref: number; cmrrDb: number | null }

export interface AdcParams {
  bits: number;
  sampleRate: number;
  vinLow: number;
  vinHigh: number;
  /** null means infinite */
  inputResistance: number | null;
}

interface NodeBase {
  id: string;
  label?: string;
  position?: Position;
}
interface OpAmpNodeBase extends NodeBase {
  /** key into Chain.parts; null or absent = ideal op-amp */
  part?: string | null;
  rails: Rails;
}

export type SourceNode = NodeBase & { kind: "source"; params: SourceParams };
export type InvertingNode = OpAmpNodeBase & { kind: "inverting"; params: InvertingParams };
export type NonInvertingNode = OpAmpNodeBase & { kind: "noninverting"; params: NonInvertingParams };
export type LossyIntegratorNode = OpAmpNodeBase & { kind: "lossyIntegrator"; params: LossyIntegratorParams };
export type IntegratorNode = OpAmpNodeBase & { kind: "integrator"; params: IntegratorParams };
export type RcLowpassNode = NodeBase & { kind: "rcLowpass"; params: RcLowpassParams };
export type RcHighpassNode = NodeBase & { kind: "rcHighpass"; params: RcHighpassParams };
export type SallenKeyLowpassNode = OpAmpNodeBase & { kind: "sallenKeyLowpass"; params: SallenKeyLowpassParams };
export type MfbLowpassNode = OpAmpNodeBase & { kind: "mfbLowpass"; params: MfbLowpassParams };
export type SallenKeyHighpassNode = OpAmpNodeBase & { kind: "sallenKeyHighpass"; params: SallenKeyHighpassParams };
export type MfbHighpassNode = OpAmpNodeBase & { kind: "mfbHighpass"; params: MfbHighpassParams };
export type AdcNode = NodeBase & { kind: "adc"; params: AdcParams };
export type BridgeNode = NodeBase & { kind: "bridge"; params: BridgeParams };
export type PhotodiodeNode = NodeBase & { kind: "photodiode"; params: PhotodiodeParams };
export type PiezoNode = NodeBase & { kind: "piezo"; params: PiezoParams };
export type ThermocoupleNode = NodeBase & { kind: "thermocouple"; params: ThermocoupleParams };
export type TransimpedanceNode = OpAmpNodeBase & { kind: "transimpedance"; params: TransimpedanceParams };
export type ChargeAmpNode = OpAmpNodeBase & { kind: "chargeAmp"; params: ChargeAmpParams };
export type DifferenceAmpNode = OpAmpNodeBase & { kind: "differenceAmp"; params: DifferenceAmpParams };
export type InAmpNode = OpAmpNodeBase & { kind: "inAmp"; params: InAmpParams };

export type ChainNode =
  | SourceNode
  | InvertingNode
  | NonInvertingNode
  | LossyIntegratorNode
  | IntegratorNode
  | RcLowpassNode
  | RcHighpassNode
  | SallenKeyLowpassNode
  | MfbLowpassNode
  | SallenKeyHighpassNode
  | MfbHighpassNode
  | AdcNode
  | BridgeNode
  | PhotodiodeNode
  | PiezoNode
  | ThermocoupleNode
  | TransimpedanceNode
  | ChargeAmpNode
  | DifferenceAmpNode
  | InAmpNode;

export type NodeKind = ChainNode["kind"];
export type OpAmpNode = Extract<ChainNode, { rails: Rails }>;
export type OpAmpKind = OpAmpNode["kind"];
export type PassiveKind = "rcLowpass" | "rcHighpass";

export const NODE_KINDS: readonly NodeKind[] = [
  "source",
  "inverting",
  "noninverting",
  "lossyIntegrator",
  "integrator",
  "rcLowpass",
  "rcHighpass",
  "sallenKeyLowpass",
  "mfbLowpass",
  "sallenKeyHighpass",
  "mfbHighpass",
  "adc",
  "bridge",
  "photodiode",
  "piezo",
  "thermocouple",
  "transimpedance",
  "chargeAmp",
  "differenceAmp",
  "inAmp",
];
export const OPAMP_KINDS: readonly OpAmpKind[] = [
  "inverting",
  "noninverting",
  "lossyIntegrator",
  "integrator",
  "sallenKeyLowpass",
  "mfbLowpass",
  "sallenKeyHighpass",
  "mfbHighpass",
  "transimpedance",
  "chargeAmp",
  "differenceAmp",
  "inAmp",
];

/** Every kind that starts a chain (exactly one per chain). */
export type SourceKind = "source" | "bridge" | "photodiode" | "piezo" | "thermocouple";
export type AnySourceNode = Extract<ChainNode, { kind: SourceKind }>;
export const SOURCE_KINDS: readonly SourceKind[] = ["source", "bridge", "photodiode", "piezo", "thermocouple"];
/** Sources whose output is a differential pair: only a difference or instrumentation amplifier may follow. */
export const DIFFERENTIAL_SOURCE_KINDS: readonly SourceKind[] = ["bridge", "thermocouple"];
/** Sources whose output is a current (photodiode) or a charge (piezo). */
export const CURRENT_SOURCE_KINDS: readonly SourceKind[] = ["photodiode", "piezo"];
/** Stages that take a differential pair, and stages that take a current into a virtual ground. */
export const DIFFERENTIAL_INPUT_KINDS: readonly NodeKind[] = ["differenceAmp", "inAmp"];
export const CURRENT_INPUT_KINDS: readonly NodeKind[] = ["transimpedance", "chargeAmp"];
export const isSourceKind = (k: unknown): k is SourceKind => (SOURCE_KINDS as readonly unknown[]).includes(k);

export interface Edge {
  from: string;
  to: string;
}

/** A complete chain with defaults applied (what the engine analyses). */
export interface Chain {
  format: typeof CHAIN_FORMAT;
  name: string;
  notes: string;
  analysis: AnalysisSettings;
  tolerances: Tolerances;
  parts: Record<string, Part>;
  nodes: ChainNode[];
  edges: Edge[];
}

/**
 * A node of a draft (chain-format.md: "two levels of validity"): every param present is valid, but any
 * param may be missing, and an op-amp stage may not have its rails yet.
 */
export type DraftChainNode = ChainNode extends infer N
  ? N extends { rails: Rails; params: infer P }
    ? Omit<N, "params" | "rails"> & { params: Partial<P>; rails?: Rails }
    : N extends { params: infer P }
      ? Omit<N, "params"> & { params: Partial<P> }
      : never
  : never;

/** A draft with the document-level defaults applied (notes, analysis, tolerances, parts). */
export interface DraftChain extends Omit<Chain, "nodes"> {
  nodes: DraftChainNode[];
}

/** A validation problem: `path` like `nodes[1].params.r1`, `edges`, `nodes`. */
export interface ChainIssue {
  path: string;
  message: string;
}

// ---------------------------------------------------------------------------
// Analysis result (`chainwright.analysis/1`), see chain-format.md "Analysis result".

export type StageStatus = "ok" | "tight" | "clip";

export type WarningCode =
  | "rail-clip"
  | "rail-tight"
  | "no-dc-path"
  | "input-range"
  | "slew"
  | "adc-range"
  | "alias"
  | "nyquist"
  | "safety"
  | "pole";

export interface AnalysisWarning {
  nodeId: string;
  code: WarningCode | string;
  message: string;
}

export interface Interval {
  min: number;
  max: number;
}

export interface StageResult {
  id: string;
  kind: NodeKind;
  label?: string;
  /** DC gain from the stage's input terminal to its output, V/V; null when unbounded */
  dcGain: number | null;
  /** the stage's own largest |gain| over the source band, as loaded in place (extra field; see lib/engine/README.md) */
  bandGain?: number | null;
  /** Hz */
  f0: number | null;
  q: number | null;
  dcOut: Interval | null;
  /** V peak */
  acPeak: number | null;
  peakOut: Interval | null;
  usable?: { low: number; high: number };
  /** (+) input interval (DC ± AC peak) and its allowed range, op-amp stages only */
  inputRange?: { peak: Interval | null; allowed: { low: number; high: number } };
  /** op-amp stages only */
  status?: StageStatus;
  /** V/s */
  slewNeeded?: number | null;
  slewRate?: number | null;
  [extra: string]: unknown;
}

export interface NoiseContribution {
  /** node id the noise source belongs to ("src" for the source) */
  nodeId: string;
  /** e.g. "r1", "en", "in-", "in+", "source", "resistance" */
  element: string;
  /** V rms at the path's end over [low, high] */
  rms: number;
  /** share of outputRms² (0..1) */
  share: number;
  [extra: string]: unknown;
}

export interface PathNoise {
  /** V rms over [noiseLow, noiseHigh] */
  outputRms: number;
  low: number;
  high: number;
  /** V rms over [noiseLow, fMax] */
  totalRms: number;
  contributions: NoiseContribution[];
  [extra: string]: unknown;
}

export interface AdcResult {
  id: string;
  lsb: number;
  quantNoiseRms: number;
  idealSnrDb: number;
  snrDb: number | null;
  enob: number | null;
  aliasAttenuationDb: number | null;
  pathDcGain: number | null;
  rangeUse: number | null;
  status: StageStatus;
  [extra: string]: unknown;
}

export interface PathResult {
  nodes: string[];
  response: { f: number[]; magDb: (number | null)[]; phaseDeg: (number | null)[] };
  stages: StageResult[];
  noise: PathNoise;
  adc: AdcResult | null;
  [extra: string]: unknown;
}

export interface AnalysisResult {
  format: typeof ANALYSIS_FORMAT;
  engine: string;
  paths: PathResult[];
  warnings: AnalysisWarning[];
  [extra: string]: unknown;
}

export interface AnalyzeOptions {
  /** evaluate the response at exactly these frequencies (Hz) instead of the log grid */
  freqs?: number[];
  /** override analysis.points */
  points?: number;
  /**
   * false skips the noise figures (the workspace's quick live analysis, which fills them in from a full run
   * later): each path's noise comes back with `skipped: true`, zero rms and no contributions, and the ADC's
   * snrDb and enob are null. Nothing else depends on noise. Default true.
   */
  noise?: boolean;
}
