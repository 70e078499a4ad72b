/**
 * DC operating point as intervals (chain-format.md, "DC operating point as intervals").
 *
 * Every DC figure is linear in the chain's DC sources: the source's dc (± dcSpread), each stage's vref,
 * each high-pass vbias, each op-amp's ±vos (in series with its (+) input) and ±ib at each of its inputs.
 * The transfer of each source to each point is the fast path's DC limit (s → 0, capacitors open), so all
 * of them act on the network as driven (source resistance, loading, finite aol). With the signed terms
 * fixed and each ± term free in sign independently, the set of reachable voltages is exactly
 *   [nominal − Σ|c_k|·x_k, nominal + Σ|c_k|·x_k].
 * An integrator's output has no DC operating point: every point with a non-zero DC transfer from it
 * (its `drift` source) is unbounded, reported as null.
 * Volts throughout.
 */
import type { Chain, Interval, Part } from "../chain/types";
import type { CompiledChain, TransferSource } from "./compile-chain";
import { chainSource, commonModeError, sourceSignal } from "./sensors";

/** One named term of a DC interval, used to say what drives a stage toward a limit. */
export interface DcTerm {
  /** "source-dc" | "reference" | "offset" */
  cause: "source-dc" | "reference" | "offset";
  /** node the term comes from and a short description */
  nodeId: string;
  what: string;
  /** signed value for fixed terms; half-width for ± terms */
  value: number;
  symmetric: boolean;
}

export interface DcPoint {
  interval: Interval | null;
  terms: DcTerm[];
  /** DC transfer from the source EMF (null when unbounded) */
  gainFromEmf: number | null;
  /** integrators that leave this point unbounded */
  driftFrom: string[];
}

export interface OperatingPoint {
  /** per node index: its output (ADC: its input pin) */
  out: DcPoint[];
  /** per node index: the (+) pin of an op-amp stage (null for other kinds) */
  plus: (DcPoint | null)[];
  /** the stage's own DC transfer (dcGain), null for integrators or when not finite */
  stageGain: (number | null)[];
}

function partOf(chain: Chain, nodeId: string): Part | undefined {
  const node = chain.nodes.find((n) => n.id === nodeId);
  const key = node && "part" in node ? node.part : null;
  return key ? chain.parts[key] : undefined;
}

/** Nominal value (fixed-sign terms) or half-width (± terms) that a transfer source carries at DC. */
export function dcValue(chain: Chain, s: TransferSource): { value: number; symmetric: boolean; cause: DcTerm["cause"]; what: string } | null {
  const node = chain.nodes.find((n) => n.id === s.nodeId)!;
  switch (s.type) {
    case "emf":
      return null; // handled separately (dc and dcSpread)
    case "passive-r":
      if (node.kind !== "rcHighpass" || node.params.vbias === 0) return null;
      return { value: node.params.vbias, symmetric: false, cause: "reference", what: "vbias" };
    case "vcm": {
      // the common-mode voltage of the pair feeding this stage (sensors.ts)
      const v = sourceSignal(chainSource(chain)).vcm;
      return v === 0 ? null : { value: v, symmetric: false, cause: "reference", what: "common-mode voltage" };
    }
    case "cm-error": {
      const v = commonModeError(chain, node);
      return v === 0 ? null : { value: v, symmetric: true, cause: "offset", what: "common-mode error" };
    }
    case "vref": {
      const v = "vref" in node.params ? (node.params as { vref: number }).vref : 0;
      return v === 0 ? null : { value: v, symmetric: false, cause: "reference", what: "vref" };
    }
    case "en": {
      const vos = partOf(chain, s.nodeId)?.vos ?? 0;
      return vos === 0 ? null : { value: vos, symmetric: true, cause: "offset", what: "offset voltage" };
    }
    case "in+":
    case "in-": {
      const ib = partOf(chain, s.nodeId)?.ib ?? 0;
      return ib === 0
        ? null
        : { value: ib, symmetric: true, cause: "offset", what: `bias current at (${s.type === "in+" ? "+" : "−"})` };
    }
    default:
      return null;
  }
}

/** What every transfer source carries at DC (index as `cc.sources`), read from the chain once per evaluation. */
export interface DcTable {
  source: { id: string; dc: number; dcSpread: number };
  /** per transfer source: its dcValue (null for the EMF and for sources that carry nothing) */
  values: (ReturnType<typeof dcValue> | null)[];
}

export function dcTable(chain: Chain, cc: CompiledChain): DcTable {
  const src = chainSource(chain);
  const sig = sourceSignal(src);
  return { source: { id: src.id, dc: sig.dc, dcSpread: sig.dcSpread }, values: cc.sources.map((s) => dcValue(chain, s)) };
}

/**
 * The DC interval at a point from the transfers `re` of every source to it (null when unbounded: an
 * integrator drifts into it, or a transfer is not finite). With `terms`, also lists the terms that make it
 * up (in the order they are summed). `driftFrom`, when given, receives the integrators that drift into it.
 */
export function dcInterval(table: DcTable, cc: CompiledChain, re: Float64Array, terms?: DcTerm[], driftFrom?: string[]): Interval | null {
  let unbounded = false;
  for (let k = 0; k < cc.sources.length; k++) {
    if (cc.sources[k].type === "drift" && re[k] !== 0) {
      unbounded = true;
      driftFrom?.push(cc.sources[k].nodeId);
    }
    if (!Number.isFinite(re[k])) unbounded = true;
  }
  if (unbounded) return null;
  // fixed terms add to the middle, ± terms to the half-width, each in source order
  let mid = 0;
  let half = 0;
  const g = re[0];
  const { id, dc, dcSpread } = table.source;
  if (dc !== 0 && g !== 0) {
    mid += g * dc;
    terms?.push({ cause: "source-dc", nodeId: id, what: "source DC", value: g * dc, symmetric: false });
  }
  if (dcSpread !== 0 && g !== 0) {
    half += Math.abs(g) * dcSpread;
    terms?.push({ cause: "source-dc", nodeId: id, what: "source DC spread", value: Math.abs(g) * dcSpread, symmetric: true });
  }
  for (let k = 1; k < cc.sources.length; k++) {
    if (re[k] === 0) continue;
    const v = table.values[k];
    if (!v) continue;
    const value = v.symmetric ? Math.abs(re[k]) * v.value : re[k] * v.value;
    if (v.symmetric) half += value;
    else mid += value;
    terms?.push({ cause: v.cause, nodeId: cc.sources[k].nodeId, what: v.what, value, symmetric: v.symmetric });
  }
  return { min: mid - half, max: mid + half };
}

function pointFrom(table: DcTable, cc: CompiledChain, re: Float64Array): DcPoint {
  const terms: DcTerm[] = [];
  const driftFrom: string[] = [];
  const interval = dcInterval(table, cc, re, terms, driftFrom);
  if (!interval) return { interval: null, terms: [], gainFromEmf: null, driftFrom };
  return { interval, terms, gainFromEmf: re[0], driftFrom };
}

/** DC intervals of every node output and (+) pin, and every stage's own DC gain. */
export function operatingPoint(chain: Chain, cc: CompiledChain): OperatingPoint {
  const n = cc.nodeIds.length;
  const re = new Float64Array(cc.sources.length);
  const im = new Float64Array(cc.sources.length);
  cc.setFrequency(0);
  const out: DcPoint[] = [];
  const plus: (DcPoint | null)[] = [];
  const stageGain: (number | null)[] = [];
  const table = dcTable(chain, cc);
  for (let i = 0; i < n; i++) {
    cc.transfersTo(i, false, re, im);
    out.push(pointFrom(table, cc, re));
    const model = cc.models[i];
    if (model) {
      cc.transfersTo(i, true, re, im);
      plus.push(pointFrom(table, cc, re));
    } else plus.push(null);
    const kind = cc.kinds[i];
    const h = cc.stageAt(i).hRe;
    stageGain.push(kind === "integrator" || kind === "adc" || i === 0 || !Number.isFinite(h) ? null : h);
  }
  return { out, plus, stageGain };
}
