/**
 * Builders for complete `chainwright.chain/1` documents (every default filled in),
 * written for the reference tests only. They deliberately do not import anything
 * from lib/engine or lib/chain/schema so that the reference side stays independent
 * of the code under test; only the shared types are used.
 *
 * Defaults follow chain-format.md: analysis 0.1 Hz … 1 MHz, 600 points, 298.15 K,
 * noise from 0.1 Hz to fMax; tolerances 1 % / 5 %; op-amp rails ±15 V unless given.
 */
import type {
  AdcNode,
  AdcParams,
  BridgeNode,
  BridgeParams,
  ChargeAmpNode,
  DifferenceAmpNode,
  InAmpNode,
  PhotodiodeNode,
  PhotodiodeParams,
  PiezoNode,
  PiezoParams,
  ThermocoupleNode,
  ThermocoupleParams,
  TransimpedanceNode,
  AnalysisSettings,
  Chain,
  ChainNode,
  Edge,
  IntegratorNode,
  InvertingNode,
  LossyIntegratorNode,
  MfbHighpassNode,
  MfbLowpassNode,
  NonInvertingNode,
  Part,
  Rails,
  RcHighpassNode,
  RcLowpassNode,
  SallenKeyHighpassNode,
  SallenKeyLowpassNode,
  SourceNode,
  SourceParams,
} from "@/lib/chain/types";

export const DEFAULT_ANALYSIS: AnalysisSettings = {
  fMin: 0.1,
  fMax: 1e6,
  points: 600,
  temperatureK: 298.15,
  noiseLow: 0.1,
  noiseHigh: null,
  aliasTargetDb: null,
};

export const DEFAULT_RAILS: Rails = { low: -15, high: 15 };

/** Op-amp placement options shared by every op-amp stage builder. */
export interface OpAmpOpts {
  part?: string | null;
  rails?: Rails;
  label?: string;
}

export function source(params: Partial<SourceParams> = {}, id = "src"): SourceNode {
  return {
    id,
    kind: "source",
    params: {
      dc: 0,
      dcSpread: 0,
      amplitude: 1,
      fLow: 1,
      fHigh: 1000,
      resistance: 0,
      noiseDensity: 0,
      safety: "low-voltage",
      ...params,
    },
  };
}

function opAmpBase(id: string, o: OpAmpOpts) {
  return {
    id,
    ...(o.label !== undefined ? { label: o.label } : {}),
    part: o.part ?? null,
    rails: o.rails ?? DEFAULT_RAILS,
  };
}

export function inverting(id: string, p: { r1: number; r2: number; vref?: number }, o: OpAmpOpts = {}): InvertingNode {
  return { ...opAmpBase(id, o), kind: "inverting", params: { vref: 0, ...p } };
}

export function noninverting(
  id: string,
  p: { rf: number | null; rg: number | null; vref?: number },
  o: OpAmpOpts = {},
): NonInvertingNode {
  return { ...opAmpBase(id, o), kind: "noninverting", params: { vref: 0, ...p } };
}

export function lossyIntegrator(
  id: string,
  p: { r1: number; r2: number; c2: number; vref?: number },
  o: OpAmpOpts = {},
): LossyIntegratorNode {
  return { ...opAmpBase(id, o), kind: "lossyIntegrator", params: { vref: 0, ...p } };
}

export function integrator(id: string, p: { r1: number; c2: number; vref?: number }, o: OpAmpOpts = {}): IntegratorNode {
  return { ...opAmpBase(id, o), kind: "integrator", params: { vref: 0, ...p } };
}

export function sallenKey(
  id: string,
  p: { r1: number; r2: number; c1: number; c2: number; rf?: number | null; rg?: number | null; vref?: number },
  o: OpAmpOpts = {},
): SallenKeyLowpassNode {
  return { ...opAmpBase(id, o), kind: "sallenKeyLowpass", params: { vref: 0, ...p } };
}

// filters: the high-pass sections (lib/chain/README.md, "Filter sections")
export function sallenKeyHighpass(
  id: string,
  p: { c1: number; c2: number; r1: number; r2: number; rf?: number | null; rg?: number | null; vref?: number },
  o: OpAmpOpts = {},
): SallenKeyHighpassNode {
  return { ...opAmpBase(id, o), kind: "sallenKeyHighpass", params: { rf: null, rg: null, vref: 0, ...p } };
}

export function mfbHighpass(
  id: string,
  p: { c1: number; c2: number; c3: number; r1: number; r2: number; vref?: number },
  o: OpAmpOpts = {},
): MfbHighpassNode {
  return { ...opAmpBase(id, o), kind: "mfbHighpass", params: { vref: 0, ...p } };
}

export function mfb(
  id: string,
  p: { r1: number; r2: number; r3: number; c1: number; c2: number; vref?: number },
  o: OpAmpOpts = {},
): MfbLowpassNode {
  return { ...opAmpBase(id, o), kind: "mfbLowpass", params: { vref: 0, ...p } };
}

export function rcLowpass(id: string, p: { r: number; c: number }, label?: string): RcLowpassNode {
  return { id, kind: "rcLowpass", params: { ...p }, ...(label ? { label } : {}) };
}

export function rcHighpass(id: string, p: { r: number; c: number; vbias?: number }, label?: string): RcHighpassNode {
  return { id, kind: "rcHighpass", params: { vbias: 0, ...p }, ...(label ? { label } : {}) };
}

// sensor sources and their front-end stages (lib/chain/README.md, "Sensor sources and front-end stages");
// defaults as in that table

export function bridge(params: Partial<BridgeParams> = {}, id = "src"): BridgeNode {
  return {
    id,
    kind: "bridge",
    params: { excitation: 5, fullScale: 2e-3, loadLow: 0, loadHigh: 1, offset: 0, resistance: 350, vcm: null, fLow: 0, fHigh: 100, noiseDensity: 0, safety: "low-voltage", ...params },
  };
}

export function thermocouple(params: Partial<ThermocoupleParams> = {}, id = "src"): ThermocoupleNode {
  return {
    id,
    kind: "thermocouple",
    params: { seebeck: 41e-6, tLow: 0, tHigh: 400, tCold: 25, coldJunctionError: 0, leadResistance: 0, vcm: 0, fHigh: 10, safety: "low-voltage", ...params },
  };
}

export function photodiode(params: Partial<PhotodiodeParams> = {}, id = "src"): PhotodiodeNode {
  return {
    id,
    kind: "photodiode",
    params: { dc: 0, dcSpread: 0, amplitude: 1e-6, fLow: 1, fHigh: 1e4, capacitance: 1e-10, shuntResistance: 1e9, darkCurrent: 0, noiseDensity: 0, safety: "low-voltage", ...params },
  };
}

export function piezo(params: Partial<PiezoParams> = {}, id = "src"): PiezoNode {
  return {
    id,
    kind: "piezo",
    params: { amplitude: 1e-10, fLow: 1, fHigh: 1e4, capacitance: 1e-9, leakage: 1e10, safety: "low-voltage", ...params },
  };
}

export function transimpedance(id: string, p: { rf: number; cf?: number; cin?: number; vref?: number }, o: OpAmpOpts = {}): TransimpedanceNode {
  return { ...opAmpBase(id, o), kind: "transimpedance", params: { cf: 0, cin: 0, vref: 0, ...p } };
}

export function chargeAmp(id: string, p: { cf: number; rf: number; cin?: number; vref?: number }, o: OpAmpOpts = {}): ChargeAmpNode {
  return { ...opAmpBase(id, o), kind: "chargeAmp", params: { cin: 0, vref: 0, ...p } };
}

export function differenceAmp(id: string, p: { r1: number; r2: number; r3: number; r4: number; vref?: number }, o: OpAmpOpts = {}): DifferenceAmpNode {
  return { ...opAmpBase(id, o), kind: "differenceAmp", params: { vref: 0, ...p } };
}

export function inAmp(id: string, p: { rg: number; rf?: number; rd?: number; vref?: number; cmrrDb?: number | null }, o: OpAmpOpts = {}): InAmpNode {
  return { ...opAmpBase(id, o), kind: "inAmp", params: { rf: 25e3, rd: 10e3, vref: 0, cmrrDb: null, ...p } };
}

export function adc(id: string, p: Partial<AdcParams> = {}): AdcNode {
  return {
    id,
    kind: "adc",
    params: { bits: 16, sampleRate: 1e6, vinLow: -10, vinHigh: 10, inputResistance: null, ...p },
  };
}

/** Edges joining the given ids in a row: a → b → c. */
export function series(...ids: string[]): Edge[] {
  const edges: Edge[] = [];
  for (let i = 1; i < ids.length; i++) edges.push({ from: ids[i - 1], to: ids[i] });
  return edges;
}

/** Edges written as "from>to" strings: links("src>rc", "rc>adc"). */
export function links(...pairs: string[]): Edge[] {
  return pairs.map((p) => {
    const [from, to] = p.split(">");
    return { from, to };
  });
}

export interface ChainSpec {
  nodes: ChainNode[];
  /** default: the nodes joined in the order given */
  edges?: Edge[];
  parts?: Record<string, Part>;
  analysis?: Partial<AnalysisSettings>;
  name?: string;
}

export function makeChain(spec: ChainSpec): Chain {
  return {
    format: "chainwright.chain/1",
    name: spec.name ?? "reference chain",
    notes: "",
    analysis: { ...DEFAULT_ANALYSIS, ...spec.analysis },
    tolerances: { resistor: 0.01, capacitor: 0.05 },
    parts: spec.parts ?? {},
    nodes: spec.nodes,
    edges: spec.edges ?? series(...spec.nodes.map((n) => n.id)),
  };
}

/** Convenience: source → one stage → ADC with wide input range, ideal everything. */
export function single(stage: ChainNode, spec: Omit<ChainSpec, "nodes"> & { src?: Partial<SourceParams> } = {}): Chain {
  return makeChain({ ...spec, nodes: [source(spec.src ?? {}), stage, adc("adc")] });
}
