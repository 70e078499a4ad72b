/**
 * Live analysis of the draft while the user edits, in two tiers:
 *
 * - the quick tier, on every edit: the part of the draft that is complete (completeSubchain), the
 *   engine's analysis for DC intervals, signal peaks, status and warnings, and the engine's compiled
 *   fast sweep for the plot curves of every node (cumulative and each stage on its own);
 * - the full tier, when the user pauses: the complete analysis with noise, which fills in the figures
 *   that need it (SNR, ENOB, noise contributions).
 *
 * Noise integration is most of the engine's time (it carries every resistor and op-amp noise source
 * through its own transfer function over a dense grid), so the quick tier asks the engine to skip it
 * (`noise: false`) and for a one-point response (the curves come from the fast sweep); none of the
 * headroom figures depend on either. Both tiers are pure functions; the workspace runs them in web
 * workers (analysis.worker.ts) so typing never waits for them.
 */
import type { AdcResult, AnalysisResult, AnalysisWarning, Chain, ChainIssue, StageResult } from "@/lib/chain/types";
import { completeSubchain } from "@/lib/chain/schema";
import { analyzeChain, compileChain } from "@/lib/engine";
import type { DraftDoc } from "./draft";

/** Complex response of every analysed node on the plot grid (re/im over the source EMF). */
export interface LiveCurves {
  f: Float64Array;
  /** node id → index into the arrays below */
  index: Record<string, number>;
  cumRe: Float64Array[];
  cumIm: Float64Array[];
  indRe: Float64Array[];
  indIm: Float64Array[];
}

export interface QuickTier {
  chain: Chain | null;
  issues: ChainIssue[];
  result: AnalysisResult | null;
  curves: LiveCurves | null;
  ms: number;
  /** where the time went, ms: the complete part of the draft, the engine's analysis, the curves */
  steps?: { subchain: number; analysis: number; curves: number };
  error: string | null;
}

export interface FullTier {
  result: AnalysisResult | null;
  ms: number;
  error: string | null;
}

export interface LiveAnalysis {
  /** the document this analysis belongs to (by reference) */
  doc: DraftDoc;
  /** the store's revision of that document */
  rev: number;
  /** the part of the draft complete enough to analyse */
  chain: Chain | null;
  /** why the rest is not analysed yet */
  issues: ChainIssue[];
  /** the quick tier's result (no noise figures) */
  result: AnalysisResult | null;
  /** the full analysis of this same document, once it has run */
  full: AnalysisResult | null;
  curves: LiveCurves | null;
  stageById: Record<string, StageResult>;
  /** converter figures; snrDb and enob are null until the full analysis of this document is in */
  adcById: Record<string, AdcResult>;
  warningsByNode: Record<string, AnalysisWarning[]>;
  /** the warnings to list: the full analysis's when it matches this document, else the quick tier's */
  warnings: AnalysisWarning[];
  /** for nodes left out of the analysis: why, in words */
  reasonById: Record<string, string>;
  /** source → sink paths of the analysed chain */
  paths: string[][];
  /** wall time of the quick tier, ms */
  ms: number;
  /** an engine failure, in words (never expected; shown rather than swallowed) */
  error: string | null;
}

/** Log-spaced grid of n points from a to b (Hz), ends exact. */
export function logGrid(a: number, b: number, n: number): Float64Array {
  const out = new Float64Array(n);
  const la = Math.log10(a);
  const step = n > 1 ? (Math.log10(b) - la) / (n - 1) : 0;
  for (let k = 0; k < n; k++) out[k] = 10 ** (la + k * step);
  out[0] = a;
  if (n > 1) out[n - 1] = b;
  return out;
}

let lastGrid: { a: number; b: number; n: number; f: Float64Array } | null = null;

/**
 * The plot grid, the same array while fMin, fMax and points stay as they were (an edit rarely changes
 * them): the plot then keeps its x values, and curves can be compared with the previous ones.
 */
function plotGrid(a: number, b: number, n: number): Float64Array {
  if (!lastGrid || lastGrid.a !== a || lastGrid.b !== b || lastGrid.n !== n) lastGrid = { a, b, n, f: logGrid(a, b, n) };
  return lastGrid.f;
}

/** The plot curves of every node of a complete chain, through the engine's fast path. */
export function computeCurves(chain: Chain): LiveCurves {
  const cc = compileChain(chain);
  const { fMin, fMax, points } = chain.analysis;
  const f = plotGrid(fMin, fMax, points);
  const sw = cc.sweep(f);
  const index: Record<string, number> = {};
  cc.nodeIds.forEach((id, i) => (index[id] = i));
  return { f, index, cumRe: sw.cumRe, cumIm: sw.cumIm, indRe: sw.indRe, indIm: sw.indIm };
}

const errText = (e: unknown) => (e instanceof Error ? e.message : String(e));

/** Headroom, status, warnings and curves; no noise. */
export function quickTier(doc: DraftDoc): QuickTier {
  const t0 = performance.now();
  const out: QuickTier = { chain: null, issues: [], result: null, curves: null, ms: 0, error: null };
  try {
    const sub = completeSubchain(doc);
    const t1 = performance.now();
    out.chain = sub.chain;
    out.issues = sub.issues;
    if (sub.chain) {
      out.result = analyzeChain(sub.chain, { freqs: [sub.chain.analysis.fMin], noise: false });
      const t2 = performance.now();
      out.curves = computeCurves(sub.chain);
      out.steps = { subchain: t1 - t0, analysis: t2 - t1, curves: performance.now() - t2 };
    }
  } catch (e) {
    out.error = errText(e);
  }
  out.ms = performance.now() - t0;
  return out;
}

/** The complete analysis, noise included. */
export function fullTier(doc: DraftDoc): FullTier {
  const t0 = performance.now();
  try {
    const sub = completeSubchain(doc);
    return { result: sub.chain ? analyzeChain(sub.chain) : null, ms: performance.now() - t0, error: null };
  } catch (e) {
    return { result: null, ms: performance.now() - t0, error: errText(e) };
  }
}

const NODE_PATH = /^nodes\[(\d+)\]/;

/** `next`, or `prev` when the two hold the same values: unchanged figures keep their object. */
function keep<T>(prev: T | undefined, next: T): T {
  return prev !== undefined && JSON.stringify(prev) === JSON.stringify(next) ? prev : next;
}

const CURVE_KEYS = ["cumRe", "cumIm", "indRe", "indIm"] as const;

function sameArray(a: Float64Array, b: Float64Array | undefined): boolean {
  if (!b || a.length !== b.length) return false;
  for (let k = 0; k < a.length; k++) if (a[k] !== b[k] && !(Number.isNaN(a[k]) && Number.isNaN(b[k]))) return false;
  return true;
}

/**
 * `next` with every array that holds the same values as its counterpart in `prev` (same grid, same node)
 * replaced by that counterpart, and `prev` itself when nothing changed. Editing one stage changes the
 * curves from it on, not those before it: the plot then recomputes and redraws only what moved.
 */
export function keepCurves(prev: LiveCurves | null | undefined, next: LiveCurves | null): LiveCurves | null {
  if (!prev || !next || !sameArray(next.f, prev.f)) return next;
  const out: LiveCurves = { f: prev.f, index: next.index, cumRe: [], cumIm: [], indRe: [], indIm: [] };
  let changed = Object.keys(prev.index).length !== Object.keys(next.index).length;
  for (const [id, i] of Object.entries(next.index)) {
    const j = prev.index[id];
    if (j !== i) changed = true;
    for (const key of CURVE_KEYS) {
      const old = j === undefined ? undefined : prev[key][j];
      const same = old !== undefined && sameArray(next[key][i], old);
      out[key][i] = same ? old : next[key][i];
      if (!same) changed = true;
    }
  }
  return changed ? out : prev;
}

/** The previous map when it holds the very same objects under the same keys. */
function keepMap<T>(prev: Record<string, T> | undefined, next: Record<string, T>): Record<string, T> {
  if (!prev) return next;
  const keys = Object.keys(next);
  if (keys.length !== Object.keys(prev).length) return next;
  return keys.every((k) => prev[k] === next[k]) ? prev : next;
}

/**
 * Index the tiers' results for the workspace. `full` is used only when it belongs to `doc`. With `prev`
 * (the analysis on screen), stage and converter figures that did not change keep their objects, so only
 * the cards whose figures moved render again.
 */
export function assembleLive(
  doc: DraftDoc,
  rev: number,
  quick: QuickTier,
  full: { doc: DraftDoc; tier: FullTier } | null,
  prev?: LiveAnalysis | null,
): LiveAnalysis {
  const fullResult = full && full.doc === doc ? full.tier.result : null;
  const out: LiveAnalysis = {
    doc,
    rev,
    chain: quick.chain,
    issues: quick.issues,
    result: quick.result,
    full: fullResult,
    curves: keepCurves(prev?.curves, quick.curves),
    stageById: {},
    adcById: {},
    warningsByNode: {},
    warnings: [],
    reasonById: {},
    paths: [],
    ms: quick.ms,
    error: quick.error ?? (full && full.doc === doc ? full.tier.error : null),
  };
  for (const issue of quick.issues) {
    const m = NODE_PATH.exec(issue.path);
    const id = m ? doc.nodes[Number(m[1])]?.id : undefined;
    if (id && !out.reasonById[id]) out.reasonById[id] = issue.message;
  }
  for (const issue of quick.issues) {
    // Issues about a node by id ("u2" is not complete yet…) explain that node too.
    for (const n of doc.nodes) if (!out.reasonById[n.id] && issue.message.includes(`"${n.id}"`)) out.reasonById[n.id] = issue.message;
  }
  const r = quick.result;
  if (r) {
    const fullAdc = new Map<string, AdcResult>();
    for (const p of fullResult?.paths ?? []) if (p.adc) fullAdc.set(p.adc.id, p.adc);
    for (const p of r.paths) {
      out.paths.push(p.nodes);
      for (const s of p.stages) out.stageById[s.id] ??= keep(prev?.stageById[s.id], s);
      if (p.adc && !out.adcById[p.adc.id]) {
        const f = fullAdc.get(p.adc.id);
        out.adcById[p.adc.id] = keep(prev?.adcById[p.adc.id], { ...p.adc, snrDb: f ? f.snrDb : null, enob: f ? f.enob : null });
      }
    }
    out.stageById = keepMap(prev?.stageById, out.stageById);
    out.adcById = keepMap(prev?.adcById, out.adcById);
    out.warnings = fullResult ? fullResult.warnings : r.warnings;
    for (const w of out.warnings) (out.warningsByNode[w.nodeId] ??= []).push(w);
  }
  return out;
}

/** Both tiers at once, synchronously (tests, and browsers without workers). */
export function analyseDraft(doc: DraftDoc, rev = 0): LiveAnalysis {
  return assembleLive(doc, rev, quickTier(doc), { doc, tier: fullTier(doc) });
}
