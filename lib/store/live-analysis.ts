/**
 * Live analysis of the draft while the user edits: the part of the draft that is complete
 * (completeSubchain) goes through the engine's full analysis for the figures and warnings, and through the
 * engine's compiled fast sweep for the plot curves of every node (cumulative and each stage on its own).
 *
 * Pure and synchronous; the workspace decides when to run it (see the driver below and the benchmark).
 */
import type { AdcResult, AnalysisResult, AnalysisWarning, Chain, ChainIssue, StageResult } from "@/lib/chain/types";
import { completeSubchain } from "@/lib/chain/schema";
import { analyzeChain, compileChain } from "@/lib/engine";
import type { DraftDoc } from "./draft";

/** Magnitude (dB) and phase (degrees, wrapped to (−180, 180]) of every analysed node on the plot grid. */
export interface LiveCurves {
  f: Float64Array;
  /** node id → index into the arrays below */
  index: Record<string, number>;
  cumDb: Float64Array[];
  cumPh: Float64Array[];
  indDb: Float64Array[];
  indPh: Float64Array[];
}

export interface LiveAnalysis {
  /** the document this analysis belongs to (by reference) */
  doc: DraftDoc;
  /** the part of the draft complete enough to analyse */
  chain: Chain | null;
  /** why the rest is not analysed yet */
  issues: ChainIssue[];
  result: AnalysisResult | null;
  curves: LiveCurves | null;
  stageById: Record<string, StageResult>;
  adcById: Record<string, AdcResult>;
  warningsByNode: Record<string, AnalysisWarning[]>;
  /** for nodes left out of the analysis: why, in words */
  reasonById: Record<string, string>;
  /** source → sink paths of the analysed chain */
  paths: string[][];
  /** wall time of the analysis, ms */
  ms: number;
  /** an engine failure, in words (never expected; shown rather than swallowed) */
  error: string | null;
}

const RAD_TO_DEG = 180 / Math.PI;

function toDbPhase(re: Float64Array, im: Float64Array, db: Float64Array, ph: Float64Array) {
  for (let k = 0; k < re.length; k++) {
    const m = Math.hypot(re[k], im[k]);
    db[k] = m > 0 && Number.isFinite(m) ? 20 * Math.log10(m) : NaN;
    let p = Math.atan2(im[k], re[k]) * RAD_TO_DEG;
    if (p <= -180) p += 360;
    ph[k] = Number.isFinite(p) ? p : NaN;
  }
}

/** Log-spaced grid of n points from a to b (Hz). */
export function logGrid(a: number, b: number, n: number): Float64Array {
  const out = new Float64Array(n);
  const la = Math.log10(a);
  const step = n > 1 ? (Math.log10(b) - la) / (n - 1) : 0;
  for (let k = 0; k < n; k++) out[k] = 10 ** (la + k * step);
  out[0] = a;
  if (n > 1) out[n - 1] = b;
  return out;
}

/** The plot curves of every node of a complete chain, through the engine's fast path. */
export function computeCurves(chain: Chain): LiveCurves {
  const cc = compileChain(chain);
  const { fMin, fMax, points } = chain.analysis;
  const f = logGrid(fMin, fMax, points);
  const sw = cc.sweep(f);
  const n = cc.nodeIds.length;
  const curves: LiveCurves = { f, index: {}, cumDb: [], cumPh: [], indDb: [], indPh: [] };
  for (let i = 0; i < n; i++) {
    curves.index[cc.nodeIds[i]] = i;
    const cd = new Float64Array(f.length), cp = new Float64Array(f.length), id = new Float64Array(f.length), ip = new Float64Array(f.length);
    toDbPhase(sw.cumRe[i], sw.cumIm[i], cd, cp);
    toDbPhase(sw.indRe[i], sw.indIm[i], id, ip);
    curves.cumDb.push(cd);
    curves.cumPh.push(cp);
    curves.indDb.push(id);
    curves.indPh.push(ip);
  }
  return curves;
}

const NODE_PATH = /^nodes\[(\d+)\]/;

export function analyseDraft(doc: DraftDoc): LiveAnalysis {
  const t0 = performance.now();
  const out: LiveAnalysis = {
    doc,
    chain: null,
    issues: [],
    result: null,
    curves: null,
    stageById: {},
    adcById: {},
    warningsByNode: {},
    reasonById: {},
    paths: [],
    ms: 0,
    error: null,
  };
  try {
    const sub = completeSubchain(doc);
    out.chain = sub.chain;
    out.issues = sub.issues;
    for (const issue of sub.issues) {
      const m = NODE_PATH.exec(issue.path);
      const id = m ? doc.nodes[Number(m[1])]?.id : undefined;
      if (id && !out.reasonById[id]) out.reasonById[id] = issue.message;
    }
    for (const issue of sub.issues) {
      // Issues phrased about a node by id ("u2" is not complete yet…) also explain that node.
      for (const n of doc.nodes) if (!out.reasonById[n.id] && issue.message.includes(`"${n.id}"`)) out.reasonById[n.id] = issue.message;
    }
    if (sub.chain) {
      const result = analyzeChain(sub.chain);
      out.result = result;
      out.curves = computeCurves(sub.chain);
      for (const p of result.paths) {
        out.paths.push(p.nodes);
        for (const s of p.stages) out.stageById[s.id] ??= s;
        if (p.adc) out.adcById[p.adc.id] ??= p.adc;
      }
      for (const w of result.warnings) (out.warningsByNode[w.nodeId] ??= []).push(w);
    }
  } catch (e) {
    out.error = e instanceof Error ? e.message : String(e);
  }
  out.ms = performance.now() - t0;
  return out;
}
