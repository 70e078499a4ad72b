/**
 * The editor's working copy of a chain: the draft level of chain-format.md.
 * Every field present is valid in type, but params, rails and edges may still be missing while the user
 * sketches. The store only ever holds values that passed the inspector's parsing; text that does not parse
 * lives in the form, never here.
 */
import type { AnalysisSettings, Edge, NodeKind, Part, Position, Rails, Tolerances } from "@/lib/chain/types";
import { CHAIN_FORMAT, OPAMP_KINDS, isSourceKind } from "@/lib/chain/types";

export type ParamValue = number | string | null;

export interface DraftNode {
  id: string;
  kind: NodeKind;
  label?: string;
  params: Record<string, ParamValue | undefined>;
  /** op-amp stages: key into parts; null/absent = ideal */
  part?: string | null;
  /** op-amp stages: required for a complete chain, absent while not typed yet */
  rails?: Rails;
  position?: Position;
}

export interface DraftDoc {
  format: typeof CHAIN_FORMAT;
  name: string;
  notes?: string;
  analysis?: Partial<AnalysisSettings>;
  tolerances?: Partial<Tolerances>;
  parts: Record<string, Part>;
  nodes: DraftNode[];
  edges: Edge[];
}

export function isOpAmpKind(kind: NodeKind): boolean {
  return (OPAMP_KINDS as readonly string[]).includes(kind);
}

export function emptyDoc(name = "Untitled chain"): DraftDoc {
  return { format: CHAIN_FORMAT, name, notes: "", parts: {}, nodes: [], edges: [] };
}

/** Normalise anything the server hands back into the editor's draft shape (missing arrays become empty). */
export function toDraftDoc(input: unknown): DraftDoc {
  const d = (input && typeof input === "object" ? input : {}) as Partial<DraftDoc>;
  return {
    ...d,
    format: CHAIN_FORMAT,
    name: typeof d.name === "string" && d.name.length > 0 ? d.name : "Untitled chain",
    parts: d.parts && typeof d.parts === "object" ? d.parts : {},
    nodes: Array.isArray(d.nodes) ? d.nodes.map((n) => ({ ...n, params: { ...(n.params ?? {}) } })) : [],
    edges: Array.isArray(d.edges) ? d.edges : [],
  };
}

const ID_PREFIX: Record<NodeKind, string> = {
  source: "src",
  inverting: "u",
  noninverting: "u",
  lossyIntegrator: "u",
  integrator: "u",
  sallenKeyLowpass: "u",
  mfbLowpass: "u",
  sallenKeyHighpass: "u",
  mfbHighpass: "u",
  rcLowpass: "rc",
  rcHighpass: "rc",
  adc: "adc",
  bridge: "src",
  photodiode: "src",
  piezo: "src",
  thermocouple: "src",
  transimpedance: "u",
  chargeAmp: "u",
  differenceAmp: "u",
  inAmp: "u",
};

/** A fresh node id for `kind` that no id in `taken` uses: `u1`, `u2`, `rc1`, `adc1`, `src` (then `src2`). */
export function nextNodeId(kind: NodeKind, taken: Iterable<string>): string {
  const used = new Set(taken);
  const prefix = ID_PREFIX[kind];
  if (isSourceKind(kind) && !used.has("src")) return "src";
  for (let i = 1; ; i++) {
    const id = `${prefix}${i}`;
    if (!used.has(id)) return id;
  }
}

/** A fresh part key (`p1`, `p2`, …). */
export function nextPartKey(taken: Iterable<string>): string {
  const used = new Set(taken);
  for (let i = 1; ; i++) if (!used.has(`p${i}`)) return `p${i}`;
}

/** The last rails typed in the chain, used to pre-fill a new op-amp stage (never a silent default). */
export function lastUsedRails(doc: DraftDoc): Rails | undefined {
  for (let i = doc.nodes.length - 1; i >= 0; i--) {
    const r = doc.nodes[i].rails;
    if (r && Number.isFinite(r.low) && Number.isFinite(r.high)) return { ...r };
  }
  return undefined;
}

export function incomingEdge(doc: DraftDoc, nodeId: string): Edge | undefined {
  return doc.edges.find((e) => e.to === nodeId);
}
