/**
 * The only door to the code under test: `analyzeChain` from the public engine entry
 * (`@/lib/engine`), plus small lookups into its `chainwright.analysis/1` result.
 */
import { analyzeChain } from "@/lib/engine";
import type { AnalysisResult, AnalysisWarning, AnalyzeOptions, Chain, PathResult, StageResult } from "@/lib/chain/types";

/** analyzeChain with `freqs` (an array) or full options. */
export function analyze(chain: Chain, opts?: number[] | AnalyzeOptions): AnalysisResult {
  if (Array.isArray(opts)) return analyzeChain(chain, { freqs: opts });
  return analyzeChain(chain, opts);
}

/** The path whose last node is `endId`. */
export function pathTo(result: AnalysisResult, endId: string): PathResult {
  const p = result.paths.find((q) => q.nodes[q.nodes.length - 1] === endId);
  if (!p) throw new Error(`no path ends at ${endId}; paths: ${result.paths.map((q) => q.nodes.join("→")).join(", ")}`);
  return p;
}

export function stageOf(result: AnalysisResult, id: string): StageResult {
  for (const p of result.paths) {
    const s = p.stages.find((x) => x.id === id);
    if (s) return s;
  }
  throw new Error(`no stage ${id} in the result`);
}

export function warningsOf(result: AnalysisResult, code: string, nodeId?: string): AnalysisWarning[] {
  return result.warnings.filter((w) => w.code === code && (nodeId === undefined || w.nodeId === nodeId));
}

/** Response of the path ending at endId, evaluated at exactly `freqs`. */
export function responseOf(chain: Chain, endId: string, freqs: number[]) {
  const r = analyze(chain, freqs);
  return pathTo(r, endId).response;
}

/** Every number in a message, in volts where an SI prefix and a V follow it ("510 mV" → 0.51). */
export function numbersIn(message: string): number[] {
  const out: number[] = [];
  const re = /(-?\d+(?:\.\d+)?(?:e[-+]?\d+)?)\s*(p|n|µ|u|m|k)?/gi;
  const scale: Record<string, number> = { p: 1e-12, n: 1e-9, µ: 1e-6, u: 1e-6, m: 1e-3, k: 1e3 };
  for (const m of message.matchAll(re)) {
    const v = Number(m[1]);
    out.push(v);
    if (m[2]) out.push(v * (scale[m[2]] ?? scale[m[2].toLowerCase()] ?? 1));
  }
  return out;
}

/** Walk a JSON-like value and list the paths of every non-finite number. */
export function nonFinitePaths(value: unknown, path = "$"): string[] {
  if (typeof value === "number") return Number.isFinite(value) ? [] : [path];
  if (Array.isArray(value)) return value.flatMap((v, i) => nonFinitePaths(v, `${path}[${i}]`));
  if (value && typeof value === "object") return Object.entries(value).flatMap(([k, v]) => nonFinitePaths(v, `${path}.${k}`));
  return [];
}
