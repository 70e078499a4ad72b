/**
 * Standard values: every resistor and capacitor of the chain's stages (the parts the tolerance spread
 * varies) moved to the nearest value of an E series (IEC 60063; nearest by ratio, lib/units/eseries.ts),
 * the whole chain or one part, with the analysis before and after so the change can be previewed
 * (values, each stage's gain, corner or f0, Q, worst margin and status) before it is applied. Pure.
 */
import type { AnalysisResult, Chain, StageResult } from "../chain/types";
import { nearestPreferred, type ESeries } from "../units/eseries";
import { analyzeChain } from "./analyze";
import { chainWithFactors, spreadParts } from "./spread";

export type SnapSeries = Extract<ESeries, "E12" | "E24" | "E48" | "E96">;

export interface SnapChange {
  key: string;
  nodeId: string;
  param: string;
  type: "resistor" | "capacitor";
  from: number;
  to: number;
  /** to/from − 1 */
  change: number;
}

export interface SnapFigures {
  dcGain: number | null;
  f0: number | null;
  q: number | null;
  /** smallest output margin to the usable range (V), op-amp stages and converters */
  margin: number | null;
  status: string | null;
}

export interface SnapStage {
  id: string;
  before: SnapFigures;
  after: SnapFigures;
}

export interface SnapPlan {
  series: SnapSeries;
  /** parts whose value changes (already standard ones are left out) */
  changes: SnapChange[];
  stages: SnapStage[];
  chain: Chain;
}

function figures(chain: Chain, r: AnalysisResult): Map<string, SnapFigures> {
  const out = new Map<string, SnapFigures>();
  for (const p of r.paths) {
    for (const s of p.stages as StageResult[]) {
      const m = s.margins as { low: number; high: number } | null | undefined;
      out.set(s.id, { dcGain: s.dcGain, f0: s.f0, q: s.q, margin: m ? Math.min(m.low, m.high) : null, status: s.status ?? null });
    }
    const node = p.adc ? chain.nodes.find((n) => n.id === p.adc!.id) : undefined;
    if (p.adc && node?.kind === "adc") {
      const pk = p.adc.peakIn as { min: number; max: number } | null;
      const margin = pk ? Math.min(pk.min - node.params.vinLow, node.params.vinHigh - pk.max) : null;
      out.set(p.adc.id, { dcGain: p.adc.pathDcGain, f0: null, q: null, margin, status: p.adc.status });
    }
  }
  return out;
}

/**
 * The plan for snapping to `series`: every part, or only `key` ("nodeId.param"). Throws RangeError for an
 * unknown key. The analysis runs without noise (the figures shown do not need it).
 */
export function snapPlan(chain: Chain, series: SnapSeries, key?: string): SnapPlan {
  const parts = spreadParts(chain);
  if (key !== undefined && !parts.some((p) => p.key === key)) throw new RangeError(`${key} is not a resistor or capacitor of the chain`);
  const factor = new Float64Array(parts.length).fill(1);
  const changes: SnapChange[] = [];
  parts.forEach((p, k) => {
    if (key !== undefined && p.key !== key) return;
    const to = nearestPreferred(p.nominal, series);
    if (Math.abs(to / p.nominal - 1) < 1e-12) return;
    factor[k] = to / p.nominal;
    changes.push({ key: p.key, nodeId: p.nodeId, param: p.param, type: p.type, from: p.nominal, to, change: to / p.nominal - 1 });
  });
  // exact standard values in the new document (not nominal·factor, which may round off the last digit)
  const next = chainWithFactors(chain, parts, factor);
  const exact = next.nodes.map((n) => {
    const mine = changes.filter((c) => c.nodeId === n.id);
    if (!mine.length) return n;
    const params = { ...(n.params as unknown as Record<string, unknown>) };
    for (const c of mine) params[c.param] = c.to;
    return { ...n, params } as unknown as typeof n;
  });
  const after: Chain = { ...next, nodes: exact };
  const fb = figures(chain, analyzeChain(chain, { noise: false, points: 2 }));
  const fa = figures(after, analyzeChain(after, { noise: false, points: 2 }));
  const stages: SnapStage[] = [...fb.keys()].map((id) => ({ id, before: fb.get(id)!, after: fa.get(id)! }));
  return { series, changes, stages, chain: after };
}
