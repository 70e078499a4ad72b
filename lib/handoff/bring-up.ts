/**
 * Bring-up sheet: what a technician should read at every test point of a complete chain: each stage's
 * output and each converter's input pin. Per point: the DC level (nominal and the interval the
 * tolerances of offsets, bias currents and the source's DC spread allow, from the engine's operating
 * point), and the AC amplitude and phase at test frequencies the user picks, for a sine of the source's
 * declared amplitude at that frequency (from the engine's sweep; phase relative to the source EMF).
 * `withSpread` (bring-up-spread.ts) adds the spread of the same figures over builds within the part
 * tolerances. Pure: no I/O.
 */
import { isSourceKind } from "@/lib/chain/types";
import { sourceSignal } from "@/lib/engine/sensors";
import type { AnalysisResult, Chain, ChainNode, Interval, StageStatus } from "../chain/types";
import { compileChain } from "../engine";
import type { BringUpSpread } from "./bring-up-spread";
import { gainPhase, isFeed, nodeTitle, signalOrder } from "./order";

export interface TestPointAc {
  /** Hz */
  f: number;
  /** V peak for the source's amplitude; null where the response is not finite (a pole) */
  amplitude: number | null;
  /** |V(node)/V(source)|, V/V */
  gain: number | null;
  /** degrees in (−180, 180], relative to the source EMF */
  phaseDeg: number | null;
}

export interface TestPoint {
  /** TP1, TP2, … in signal order */
  tp: string;
  nodeId: string;
  kind: ChainNode["kind"];
  /** where to put the probe, in words */
  where: string;
  /** V; null when the level is unbounded (an integrator upstream) */
  dcNominal: number | null;
  dcInterval: Interval | null;
  /** the engine's headroom status for the point, when it has one */
  status: StageStatus | null;
  ac: TestPointAc[];
}

export interface BringUpSheet {
  /** the source's declared amplitude the AC figures are for, V peak */
  sourceAmplitude: number;
  sourceId: string | null;
  frequencies: number[];
  points: TestPoint[];
  /** the spread from tolerances at the same points and frequencies (`withSpread`), when it was run */
  spread?: BringUpSpread;
}

/** Limits on the test frequencies a caller may ask for. */
export const TEST_FREQUENCY_LIMIT = 12;

/**
 * Default test frequencies: three points inside the source band (its low edge or a tenth of its high
 * edge when the band starts at DC, its geometric middle, its high edge), rounded to 2 significant digits
 * so a signal generator can be set to them.
 */
export function defaultTestFrequencies(chain: Chain): number[] {
  const src = chain.nodes.find((n) => isSourceKind(n.kind));
  const p = src ? ({ ...sourceSignal(src) } as unknown as Record<string, unknown>) : {};
  const fHigh = typeof p.fHigh === "number" && p.fHigh > 0 ? p.fHigh : 1000;
  const fLowRaw = typeof p.fLow === "number" ? p.fLow : 0;
  const fLow = fLowRaw > 0 ? fLowRaw : fHigh / 10;
  const mid = Math.sqrt(fLow * fHigh);
  const round2 = (f: number) => Number(f.toPrecision(2));
  return [...new Set([fLow, mid, fHigh].map(round2))].sort((a, b) => a - b);
}

/** Midpoint of an engine DC interval: the engine's intervals are nominal ± the sum of the ± terms. */
export const nominalOf = (iv: Interval | null): number | null => (iv ? (iv.min + iv.max) / 2 : null);

export function buildBringUpSheet(chain: Chain, result: AnalysisResult, frequencies: readonly number[]): BringUpSheet {
  const freqs = [...frequencies];
  for (const f of freqs) if (!(Number.isFinite(f) && f > 0)) throw new RangeError(`test frequency ${f} is not a positive number of hertz`);
  const source = chain.nodes.find((n) => isFeed(chain, n)) ?? null;
  const sp = source ? (source.params as unknown as Record<string, unknown>) : {};
  const sourceAmplitude = typeof sp.amplitude === "number" ? sp.amplitude : 1;

  const cc = compileChain(chain);
  const sw = freqs.length ? cc.sweep(Float64Array.from(freqs)) : null;
  const index = new Map(cc.nodeIds.map((id, i) => [id, i]));

  const stageById = new Map<string, { dcOut: Interval | null; status: StageStatus | null }>();
  const adcById = new Map<string, { dcIn: Interval | null; status: StageStatus | null }>();
  for (const path of result.paths) {
    for (const s of path.stages) stageById.set(s.id, { dcOut: s.dcOut, status: s.status ?? null });
    if (path.adc) adcById.set(path.adc.id, { dcIn: (path.adc.dcIn as Interval | null | undefined) ?? null, status: path.adc.status });
  }

  const points: TestPoint[] = [];
  for (const node of signalOrder(chain)) {
    if (isFeed(chain, node)) continue;
    const isAdc = node.kind === "adc";
    const dc = isAdc ? adcById.get(node.id) : stageById.get(node.id);
    if (!dc) continue; // not on an analysed path
    const dcInterval = isAdc ? (dc as { dcIn: Interval | null }).dcIn : (dc as { dcOut: Interval | null }).dcOut;
    const i = index.get(node.id)!;
    const ac: TestPointAc[] = freqs.map((f, k) => {
      const { gain, phaseDeg } = gainPhase(sw!.cumRe[i][k], sw!.cumIm[i][k]);
      return { f, amplitude: gain === null ? null : sourceAmplitude * gain, gain, phaseDeg };
    });
    points.push({
      tp: `TP${points.length + 1}`,
      nodeId: node.id,
      kind: node.kind,
      where: isAdc ? `input pin of converter ${nodeTitle(node)}` : `output of ${nodeTitle(node)}`,
      dcNominal: nominalOf(dcInterval),
      dcInterval,
      status: dc.status,
      ac,
    });
  }
  return { sourceAmplitude, sourceId: source?.id ?? null, frequencies: freqs, points };
}
