/**
 * Figures the design report draws that are not tables of their own: each path's responses (every stage's
 * cascade from the source, on the analysis grid) and what the plots mark. Pure.
 */
import type { AnalysisResult, Chain } from "../chain/types";
import { isSourceKind } from "../chain/types";
import { compileChain, magnitudeDbLabel, sourceSignal, transferPerUnit } from "../engine";
import { gainPhase, nodeTitle } from "./order";

export interface CurveSet {
  /** the node that ends the path */
  end: string;
  title: string;
  f: number[];
  series: { id: string; name: string; db: (number | null)[]; ph: (number | null)[]; emphasis: boolean }[];
  band: { fLow: number; fHigh: number } | null;
  sampleRate: number | null;
  /** the magnitude axis: "dB", or "dB re 1 V/A" / "dB re 1 V/C" from a current or charge source */
  magnitudeAxis: string;
}

export function pathCurves(chain: Chain, result: AnalysisResult): CurveSet[] {
  const cc = compileChain(chain);
  const index = new Map(cc.nodeIds.map((id, i) => [id, i]));
  const byId = new Map(chain.nodes.map((n) => [n.id, n]));
  return result.paths.map((path) => {
    const f = path.response.f;
    const sw = cc.sweep(Float64Array.from(f));
    const end = path.nodes[path.nodes.length - 1];
    const series = path.nodes.slice(1).map((id) => {
      const i = index.get(id)!;
      const db: (number | null)[] = [];
      const ph: (number | null)[] = [];
      for (let k = 0; k < f.length; k++) {
        const { gain, phaseDeg } = gainPhase(sw.cumRe[i][k], sw.cumIm[i][k]);
        db.push(gain ? 20 * Math.log10(gain) : null);
        ph.push(gain ? phaseDeg : null);
      }
      return { id, name: nodeTitle(byId.get(id)!), db, ph, emphasis: id === end };
    });
    const src = byId.get(path.nodes[0]);
    const signal = src && isSourceKind(src.kind) ? sourceSignal(src) : null;
    const endNode = byId.get(end);
    return {
      end,
      title: `${path.nodes.map((id) => byId.get(id)?.label ?? id).join(" → ")}`,
      f,
      series,
      band: signal ? { fLow: signal.fLow, fHigh: signal.fHigh } : null,
      sampleRate: endNode?.kind === "adc" ? endNode.params.sampleRate : null,
      magnitudeAxis: magnitudeDbLabel(signal ? transferPerUnit(signal.output) : "V"),
    };
  });
}

/** The sources whose connection calls for the safety cautions, with what it is. */
export function safetyCalls(chain: Chain): { nodeId: string; name: string; safety: "mains-connected" | "body-connected" }[] {
  const out: { nodeId: string; name: string; safety: "mains-connected" | "body-connected" }[] = [];
  for (const n of chain.nodes) {
    const s = (n.params as unknown as Record<string, unknown>).safety;
    if (s === "mains-connected" || s === "body-connected") out.push({ nodeId: n.id, name: nodeTitle(n), safety: s });
  }
  return out;
}
