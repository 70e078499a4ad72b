/**
 * The design report's spread summary. The report runs one seeded spread over the chain's own
 * `tolerances` when it is built (lib/engine/spread.ts, REPORT_SPREAD: 200 builds, seed 1, uniform within
 * each part's tolerance), so every printed report of a revision shows the same figures and says how they
 * were made. This module only picks from the engine's result what a reviewer reads on paper: per stage
 * the DC gain, corner or f0, Q and worst margin (nominal, 5–95 % and min/max over the builds) with the
 * share of builds in which it clips; the share of builds that clip anywhere; the worst margin any build
 * reached; and the parts whose tolerance moves a figure most. Nothing is recomputed here. Pure.
 */
import type { Chain, ChainNode } from "../chain/types";
import { runSpread, type SpreadMetric, type SpreadOptions, type SpreadSensitivity, type SpreadStat } from "../engine/spread";

/** Builds, seed and envelope grid of the report's spread (the grid only feeds the envelope, not shown). */
export const REPORT_SPREAD = { trials: 200, seed: 1, points: 40, distribution: "uniform" } as const satisfies SpreadOptions;
/** Parts listed under "moves most". */
export const REPORT_TOP_PARTS = 6;

export interface FigureSpread {
  metric: SpreadMetric;
  nominal: number | null;
  p5: number;
  p95: number;
  min: number;
  max: number;
  /** builds with a finite value */
  count: number;
}

export interface StageSpread {
  id: string;
  kind: ChainNode["kind"];
  label?: string;
  /** in the order DC gain, f0, Q, worst margin; only those the stage has */
  figures: FigureSpread[];
  clipShare: number;
}

export interface SpreadSummary {
  trials: number;
  seed: number;
  distribution: "uniform" | "normal";
  /** parts that vary, and the tolerances they were drawn from */
  parts: number;
  tolerances: { resistor: number; capacitor: number; overrides: number };
  stages: StageSpread[];
  clipCount: number;
  clipShare: number;
  /** the smallest margin any build reached, and where (V) */
  worstMargin: { nodeId: string; min: number; p5: number } | null;
  /** the node with the smallest nominal margin: the margin sensitivities refer to it */
  criticalNode: string | null;
  /** the engine's sensitivities, largest relative effect (|S|·t of DC gain, f0 or Q) first */
  top: SpreadSensitivity[];
  /** the part that moves the critical node's worst margin most, when one does */
  marginPart: SpreadSensitivity | null;
}

const FIGURES: SpreadMetric[] = ["dcGain", "f0", "q", "margin"];

function figure(metric: SpreadMetric, s: SpreadStat | null): FigureSpread | null {
  if (!s || s.count === 0) return null;
  return { metric, nominal: s.nominal, p5: s.p5, p95: s.p95, min: s.min, max: s.max, count: s.count };
}

const relativeEffect = (s: SpreadSensitivity) => Math.max(s.effect.dcGain ?? 0, s.effect.f0 ?? 0, s.effect.q ?? 0);

export function spreadSummary(chain: Chain, opts: SpreadOptions = REPORT_SPREAD, topN = REPORT_TOP_PARTS): SpreadSummary {
  const r = runSpread(chain, opts);
  const stages: StageSpread[] = r.stages.map((st) => ({
    id: st.id,
    kind: st.kind,
    ...(st.label ? { label: st.label } : {}),
    figures: FIGURES.map((m) => figure(m, st[m])).filter((f): f is FigureSpread => f !== null),
    clipShare: st.clipShare,
  }));
  let worstMargin: SpreadSummary["worstMargin"] = null;
  for (const st of r.stages) {
    const m = st.margin;
    if (m && m.count > 0 && (worstMargin === null || m.min < worstMargin.min)) worstMargin = { nodeId: st.id, min: m.min, p5: m.p5 };
  }
  const top = r.sensitivity
    .filter((s) => relativeEffect(s) > 0)
    .sort((a, b) => relativeEffect(b) - relativeEffect(a))
    .slice(0, topN);
  const byMargin = r.sensitivity.filter((s) => (s.effect.margin ?? 0) > 0).sort((a, b) => b.effect.margin! - a.effect.margin!);
  const overrides = chain.tolerances.overrides ?? {};
  return {
    trials: r.trials,
    seed: r.seed,
    distribution: r.distribution,
    parts: r.parts.length,
    tolerances: { resistor: chain.tolerances.resistor, capacitor: chain.tolerances.capacitor, overrides: r.parts.filter((p) => overrides[p.key] !== undefined).length },
    stages,
    clipCount: r.clipCount,
    clipShare: r.clipShare,
    worstMargin,
    criticalNode: r.criticalNode,
    top,
    marginPart: byMargin[0] ?? null,
  };
}

/** The summary, or why the engine could not run the spread on this chain (the report says so instead). */
export function reportSpread(chain: Chain): { ok: true; summary: SpreadSummary } | { ok: false; reason: string } {
  try {
    return { ok: true, summary: spreadSummary(chain) };
  } catch (e) {
    return { ok: false, reason: e instanceof Error ? e.message : String(e) };
  }
}
