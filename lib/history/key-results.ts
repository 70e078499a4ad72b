/**
 * The few figures a reviewer compares between two revisions: for each signal path, the DC gain from
 * the source to its end, the corner (or natural) frequency of every stage, and the worst margin to a
 * rail; and for the whole chain its worst headroom status. Computed with the engine on the part of
 * the document that is complete (a draft's unfinished paths are left out and said so).
 */
import { completeSubchain } from "@/lib/chain/schema";
import type { AnalysisResult, StageStatus } from "@/lib/chain/types";
import { analyzeChain } from "@/lib/engine";
import { formatQuantity } from "@/lib/units";

export interface PathKeyResults {
  /** id of the node the path ends at (normally an ADC) */
  end: string;
  /** source EMF → path end at DC, V/V; null when unbounded (an integrator without a DC path) */
  dcGain: number | null;
  /** every stage's corner or natural frequency, Hz, in path order */
  corners: Array<{ id: string; f0: number }>;
  /**
   * the smallest distance, in volts, from a stage's peak output interval (or the ADC's) to the edge
   * of its usable range; negative when it crosses it; null when no stage gives a figure
   */
  worstMarginV: number | null;
  worstMarginAt: string | null;
  status: StageStatus | null;
}

export interface KeyResults {
  /** null when no part of the document could be analysed */
  paths: PathKeyResults[];
  worstStatus: StageStatus | null;
  /** why nothing, or only part, was analysed */
  note: string | null;
}

const ORDER: StageStatus[] = ["ok", "tight", "clip"];

function worse(a: StageStatus | null, b: StageStatus | null | undefined): StageStatus | null {
  if (!b) return a;
  if (!a) return b;
  return ORDER.indexOf(b) > ORDER.indexOf(a) ? b : a;
}

/** Margin of an interval inside [low, high]: min(high − max, min − low), V. */
function margin(peak: { min: number; max: number } | null | undefined, range: { low: number; high: number } | undefined): number | null {
  if (!peak || !range) return null;
  const m = Math.min(range.high - peak.max, peak.min - range.low);
  return Number.isFinite(m) ? m : null;
}

/** Key results from an analysis result (kept apart from the engine call so it can be tested on its own). */
export function keyResultsOf(result: AnalysisResult, note: string | null = null): KeyResults {
  let worstStatus: StageStatus | null = null;
  const paths = result.paths.map((p): PathKeyResults => {
    let status: StageStatus | null = null;
    let worstMarginV: number | null = null;
    let worstMarginAt: string | null = null;
    let product: number | null = 1;
    const corners: PathKeyResults["corners"] = [];
    for (const s of p.stages) {
      status = worse(status, s.status);
      if (s.dcGain === null || product === null) product = null;
      else product *= s.dcGain;
      if (typeof s.f0 === "number" && Number.isFinite(s.f0)) corners.push({ id: s.id, f0: s.f0 });
      const m = margin(s.peakOut, s.usable);
      if (m !== null && (worstMarginV === null || m < worstMarginV)) {
        worstMarginV = m;
        worstMarginAt = s.id;
      }
    }
    const adc = p.adc;
    if (adc) {
      status = worse(status, adc.status);
      const stageAtAdc = p.stages.find((s) => s.id === adc.id);
      const m = margin(stageAtAdc?.peakOut, stageAtAdc?.usable);
      if (m !== null && (worstMarginV === null || m < worstMarginV)) {
        worstMarginV = m;
        worstMarginAt = adc.id;
      }
    }
    worstStatus = worse(worstStatus, status);
    // The ADC's own figure includes the source's loading by the first stage; prefer it where there is one.
    const dcGain = adc ? adc.pathDcGain : product;
    return { end: p.nodes[p.nodes.length - 1] ?? "", dcGain, corners, worstMarginV, worstMarginAt, status };
  });
  return { paths, worstStatus, note };
}

/** Analyse what is complete in a document and return its key results. Never throws. */
export function keyResults(document: unknown): KeyResults {
  const { chain, issues } = completeSubchain(document);
  if (!chain) return { paths: [], worstStatus: null, note: issues.length ? "nothing in this revision is complete enough to analyse" : "no stages yet" };
  try {
    const note = issues.length ? `${issues.length} unfinished node${issues.length === 1 ? "" : "s"} left out of the analysis` : null;
    return keyResultsOf(analyzeChain(chain), note);
  } catch (e) {
    return { paths: [], worstStatus: null, note: `the analysis failed (${e instanceof Error ? e.message : String(e)})` };
  }
}

export interface KeyResultChange {
  path: string;
  figure: string;
  old: string;
  new: string;
}

const fmtGain = (g: number | null | undefined) => (g === undefined ? "—" : g === null ? "unbounded" : `${formatQuantity(g, "none", 4)} V/V`);
const fmtHz = (f: number | undefined) => (f === undefined ? "—" : formatQuantity(f, "hertz", 4));
const fmtMargin = (m: number | null | undefined, at: string | null | undefined) =>
  m === undefined ? "—" : m === null ? "no figure" : `${formatQuantity(m, "volt", 3)}${at ? ` at ${at}` : ""}`;

/**
 * Key results side by side, one row per path and figure, old and new in engineering notation. Rows
 * whose text is equal are left out, so an empty list means the key results did not change.
 */
export function diffKeyResults(before: KeyResults, after: KeyResults): KeyResultChange[] {
  const out: KeyResultChange[] = [];
  const byEnd = (k: KeyResults) => new Map(k.paths.map((p) => [p.end, p]));
  const a = byEnd(before);
  const b = byEnd(after);
  const push = (path: string, figure: string, o: string, n: string) => {
    if (o !== n) out.push({ path, figure, old: o, new: n });
  };
  for (const end of new Set([...a.keys(), ...b.keys()])) {
    const pa = a.get(end);
    const pb = b.get(end);
    push(end, "DC gain", fmtGain(pa?.dcGain), fmtGain(pb?.dcGain));
    const ca = new Map(pa?.corners.map((c) => [c.id, c.f0]));
    const cb = new Map(pb?.corners.map((c) => [c.id, c.f0]));
    for (const id of new Set([...ca.keys(), ...cb.keys()])) push(end, `corner of ${id}`, fmtHz(ca.get(id)), fmtHz(cb.get(id)));
    push(end, "worst margin", fmtMargin(pa?.worstMarginV, pa?.worstMarginAt), fmtMargin(pb?.worstMarginV, pb?.worstMarginAt));
    push(end, "status", pa?.status ?? "—", pb?.status ?? "—");
  }
  return out;
}
