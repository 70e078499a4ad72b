/**
 * The spread from tolerances at the bring-up sheet's test points: a seeded Monte Carlo over every
 * resistor and capacitor (the same parts, tolerances and builds as the spread tab: lib/engine/spread.ts,
 * each part at nominal·(1 + δ), δ uniform on ±its tolerance), giving per test point the range of the DC
 * nominal and of the AC amplitude at each test frequency over the builds. A range from N builds is what
 * those builds reached, not a guaranteed bound. Pure and deterministic for a given seed.
 */
import type { Chain } from "../chain/types";
import { compileChain } from "../engine";
import { operatingPoint } from "../engine/dc";
import { chainWithFactors, mulberry32, spreadParts } from "../engine/spread";
import type { BringUpSheet } from "./bring-up";

export interface Range {
  min: number;
  max: number;
}

export interface PointSpread {
  nodeId: string;
  /** range of the DC nominal over the builds; null when some build had none (unbounded) */
  dcNominal: Range | null;
  /** per test frequency, range of the AC amplitude (V peak); null where some build had no finite value */
  amplitude: (Range | null)[];
}

export interface BringUpSpread {
  trials: number;
  seed: number;
  parts: number;
  points: PointSpread[];
}

export const BRING_UP_TRIALS = 200;

function widen(r: Range | null | undefined, v: number): Range | null {
  if (r === null || !Number.isFinite(v)) return null;
  if (!r) return { min: v, max: v };
  return { min: Math.min(r.min, v), max: Math.max(r.max, v) };
}

export function bringUpSpread(chain: Chain, sheet: BringUpSheet, trials = BRING_UP_TRIALS, seed = 1): BringUpSpread {
  const parts = spreadParts(chain);
  const rng = mulberry32(seed);
  const freqs = Float64Array.from(sheet.frequencies);
  const dc: (Range | null | undefined)[] = sheet.points.map(() => undefined);
  const ac: (Range | null | undefined)[][] = sheet.points.map(() => sheet.frequencies.map(() => undefined));
  const factor = new Float64Array(parts.length);
  for (let t = 0; t < trials; t++) {
    parts.forEach((p, k) => (factor[k] = 1 + p.tolerance * (2 * rng() - 1)));
    const build = chainWithFactors(chain, parts, factor);
    const cc = compileChain(build);
    const index = new Map(cc.nodeIds.map((id, i) => [id, i]));
    const op = operatingPoint(build, cc);
    const sw = freqs.length ? cc.sweep(freqs) : null;
    sheet.points.forEach((tp, j) => {
      const i = index.get(tp.nodeId)!;
      const iv = op.out[i].interval;
      dc[j] = widen(dc[j], iv ? (iv.min + iv.max) / 2 : NaN);
      for (let k = 0; k < freqs.length; k++) ac[j][k] = widen(ac[j][k], sheet.sourceAmplitude * Math.hypot(sw!.cumRe[i][k], sw!.cumIm[i][k]));
    });
  }
  return {
    trials,
    seed,
    parts: parts.length,
    points: sheet.points.map((tp, j) => ({ nodeId: tp.nodeId, dcNominal: dc[j] ?? null, amplitude: ac[j].map((r) => r ?? null) })),
  };
}
