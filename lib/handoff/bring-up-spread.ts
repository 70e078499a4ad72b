/**
 * The spread from tolerances at the bring-up sheet's test points: a seeded Monte Carlo over every
 * resistor and capacitor (the same parts, tolerances and builds as the spread tab: lib/engine/spread.ts,
 * each part at nominal·(1 + δ), δ uniform on ±its tolerance, drawn from the same generator in the same
 * order, so build k here is build k of `runSpread` with the same seed), giving per test point:
 * - the range of the DC nominal over the builds (what the part values alone move),
 * - the DC reading over the builds: each build's engine interval (source DC spread, op-amp offsets and
 *   bias currents) joined over all builds, so the widest level a meter should show,
 * - the range of the AC amplitude at each test frequency.
 * A range from N builds is what those builds reached, not a guaranteed bound. Pure and deterministic
 * for a given seed; the cost is one compile, operating point and sweep at the test frequencies per build.
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
  /** lowest interval minimum to highest interval maximum over the builds; null when some build had none */
  dcInterval: Range | null;
  /** per test frequency, range of the AC amplitude (V peak); null where some build had no finite value */
  amplitude: (Range | null)[];
}

export interface BringUpSpread {
  trials: number;
  seed: number;
  /** how δ is drawn (the bring-up spread always draws uniformly) */
  distribution: "uniform";
  /** parts that vary */
  parts: number;
  /** the chain's tolerances the builds were drawn from, and how many parts have their own */
  tolerances: { resistor: number; capacitor: number; overrides: number };
  points: PointSpread[];
}

/** Builds per sheet: about 50–80 ms for the demo chains, so a page or a download can afford it. */
export const BRING_UP_TRIALS = 200;
export const BRING_UP_SEED = 1;

function widen(r: Range | null | undefined, lo: number, hi = lo): Range | null {
  if (r === null || !Number.isFinite(lo) || !Number.isFinite(hi)) return null;
  if (!r) return { min: lo, max: hi };
  return { min: Math.min(r.min, lo), max: Math.max(r.max, hi) };
}

export function bringUpSpread(chain: Chain, sheet: BringUpSheet, trials = BRING_UP_TRIALS, seed = BRING_UP_SEED): BringUpSpread {
  if (!Number.isInteger(trials) || trials < 1) throw new RangeError(`trials must be a positive integer (found ${trials})`);
  const parts = spreadParts(chain);
  const rng = mulberry32(seed);
  const freqs = Float64Array.from(sheet.frequencies);
  const dc: (Range | null | undefined)[] = sheet.points.map(() => undefined);
  const dcIv: (Range | null | undefined)[] = sheet.points.map(() => undefined);
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
      dcIv[j] = widen(dcIv[j], iv ? iv.min : NaN, iv ? iv.max : NaN);
      for (let k = 0; k < freqs.length; k++) ac[j][k] = widen(ac[j][k], sheet.sourceAmplitude * Math.hypot(sw!.cumRe[i][k], sw!.cumIm[i][k]));
    });
  }
  const { resistor, capacitor, overrides } = chain.tolerances;
  return {
    trials,
    seed,
    distribution: "uniform",
    parts: parts.length,
    tolerances: { resistor, capacitor, overrides: parts.filter((p) => overrides?.[p.key] !== undefined).length },
    points: sheet.points.map((tp, j) => ({
      nodeId: tp.nodeId,
      dcNominal: dc[j] ?? null,
      dcInterval: dcIv[j] ?? null,
      amplitude: ac[j].map((r) => r ?? null),
    })),
  };
}

/** The sheet with its spread attached (what the pages, the CSV and the JSON answer carry). */
export function withSpread(chain: Chain, sheet: BringUpSheet, trials = BRING_UP_TRIALS, seed = BRING_UP_SEED): BringUpSheet {
  return { ...sheet, spread: bringUpSpread(chain, sheet, trials, seed) };
}
