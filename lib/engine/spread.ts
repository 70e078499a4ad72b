/**
 * Tolerance spread: Monte Carlo over every resistor and capacitor of the chain's stages, worst-case
 * corners from the sign of each sensitivity, and a per-part sensitivity ranking. Pure and deterministic:
 * the same chain, options and seed give the same numbers bit for bit, however the work is split into
 * batches (`startSpread(...).step(n)`), so a worker can stream it and the command line can run it whole.
 *
 * What varies: every ohm or farad param (by PARAM_SPECS) of every node except the path's source (its
 * resistance belongs to the sensor) and converters (their input resistance models the converter). Each
 * value is nominal·(1 + δ) with δ drawn independently per part:
 * - uniform on [−t, t] (standard deviation t/√3, JCGM 100:2008 §4.3.7), or
 * - normal with σ = t/3 (tolerance as 3σ, common practice), truncated to [−t, t] by redrawing, so every
 *   build stays inside its tolerance and the worst case can bracket it (σ of the truncated normal is
 *   0.98658·t/3, from the truncated-normal variance 1 − 2·3·φ(3)/(2Φ(3) − 1)).
 * t is `tolerances.resistor` / `tolerances.capacitor`, or `tolerances.overrides["nodeId.param"]`.
 *
 * Per build (`evaluate`): the response at each path's end (dB) on the plot grid, and per node its DC gain
 * (as analyzeChain's dcGain), ideal f0 and Q, and worst margin: the smallest of the output's distance to
 * its usable range and the (+) input's to its allowed range, both low and high (V; an ADC: its input to
 * [vinLow, vinHigh]). The margins are analyzeChain's operating point and band peaks, evaluated leaner
 * (BuildFigures: Brent's method to 1e-6 in ln f on analyzeChain's band grid; the values agree to ~1e-12).
 * A build clips when some margin is negative or a level is unbounded (an integrator, a pole in band).
 *
 * Envelopes: min and max exactly; the 5 % and 95 % points per frequency by the P² estimator (Jain and
 * Chlamtac, Communications of the ACM 28(10), 1985 — cited from memory), which keeps five markers per
 * quantile instead of every build's curve. Scalar figures keep every build, so their quantiles and
 * histograms are exact.
 *
 * Worst case: relative sensitivities S = ∂ln|y|/∂ln x (∂y/∂ln x for margins, V) by central differences
 * at ±1e-4; for each figure, the corner x·(1 ± sign(S)·t) toward its low and its high end, then evaluated
 * (exact for figures monotone in each part; `outside` counts builds that fell outside, which can happen
 * where a figure is not monotone, e.g. a margin set by a peak that moves in frequency).
 */
import { isSourceKind } from "../chain/types";
import { sourceSignal } from "./sensors";
import { PARAM_SPECS } from "../chain/params";
import type { Chain, ChainNode, Part } from "../chain/types";
import { compileChain, type CompiledChain, type SweepResult } from "./compile-chain";
import { dcInterval, dcTable, dcValue, type DcTable } from "./dc";
import { bandGrid, bandMaxMany, logGrid } from "./grids";
import { magnitude, ratioMagAt } from "./poly";
import { idealCharacteristics } from "./ideal";
import { isOpAmpKind } from "./topology";

export const SPREAD_FORMAT = "chainwright.spread/1" as const;
/** relative step of the central differences */
const SENS_STEP = 1e-4;
/** bracket of the band-peak search in the spread (see the header) */
const PEAK_TOL = 1e-6;
const HIST_BINS = 24;
/** the spread reads responses, never admittances: sweeps work out only the ones they need themselves */
const RESPONSES_ONLY = { admittances: false } as const;

export type SpreadDistribution = "uniform" | "normal";
export type SpreadMetric = "dcGain" | "f0" | "q" | "margin";

export interface SpreadOptions {
  /** number of Monte Carlo builds, 1 to 100,000 */
  trials: number;
  /** 32-bit unsigned seed */
  seed: number;
  distribution?: SpreadDistribution;
  /** points of the envelope grid (log, fMin..fMax); default analysis.points */
  points?: number;
}

/** A part that varies: `key` is "nodeId.param". */
export interface SpreadPart {
  key: string;
  nodeId: string;
  param: string;
  type: "resistor" | "capacitor";
  nominal: number;
  tolerance: number;
}

export interface SpreadStat {
  nominal: number | null;
  /** over the builds with a finite value */
  count: number;
  mean: number;
  sd: number;
  min: number;
  max: number;
  p5: number;
  p50: number;
  p95: number;
  histogram: { lo: number; hi: number; counts: number[] };
}

export interface SpreadStage {
  id: string;
  kind: ChainNode["kind"];
  label?: string;
  dcGain: SpreadStat | null;
  f0: SpreadStat | null;
  q: SpreadStat | null;
  /** worst margin, V */
  margin: SpreadStat | null;
  /** share of builds in which this node clips */
  clipShare: number;
}

export interface SpreadCorner {
  nodeId: string;
  metric: SpreadMetric;
  nominal: number | null;
  /** the figure evaluated at the corner toward its low end, and toward its high end */
  low: number | null;
  high: number | null;
  /** per part key: −1, 0 or +1 (toward −t, nominal, +t) for the low corner; the high corner is its mirror */
  lowCorner: Record<string, -1 | 0 | 1>;
  /** builds so far whose figure lies outside [low, high] (beyond 1e-9 relative) */
  outside: number;
}

export interface SpreadSensitivity {
  key: string;
  nodeId: string;
  param: string;
  type: "resistor" | "capacitor";
  tolerance: number;
  /** ∂ln|y|/∂ln x of its own node's dcGain, f0, Q (null where the node has none) */
  dcGain: number | null;
  f0: number | null;
  q: number | null;
  /** ∂(worst margin)/∂ln x of the critical node, V (null without one) */
  margin: number | null;
  /** |S|·t: how far the part's tolerance moves each figure (relative; margin in V) */
  effect: { dcGain: number | null; f0: number | null; q: number | null; margin: number | null };
}

export interface SpreadEnvelope {
  end: string;
  nominal: (number | null)[];
  min: (number | null)[];
  max: (number | null)[];
  p5: (number | null)[];
  p95: (number | null)[];
}

export interface SpreadResult {
  format: typeof SPREAD_FORMAT;
  seed: number;
  distribution: SpreadDistribution;
  trials: number;
  /** builds evaluated so far */
  done: number;
  complete: boolean;
  parts: SpreadPart[];
  response: { f: number[]; paths: SpreadEnvelope[] };
  stages: SpreadStage[];
  /** builds in which any node clips, and their share */
  clipCount: number;
  clipShare: number;
  /** node with the smallest nominal margin (the margin sensitivities refer to it) */
  criticalNode: string | null;
  sensitivity: SpreadSensitivity[];
  worstCase: SpreadCorner[];
}

// ---------------------------------------------------------------------------------------------------------
// Random numbers

/**
 * mulberry32 (Tommy Ettinger's 32-bit generator, public domain; from memory): a 32-bit state advanced by
 * a Weyl step and mixed; uniform on [0, 1) with 2^−32 resolution. Small, fast and the same on every engine.
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** One relative deviation δ within ±t (see the header for both distributions). */
function draw(rng: () => number, t: number, distribution: SpreadDistribution): number {
  if (distribution === "uniform") return t * (2 * rng() - 1);
  for (;;) {
    // Box–Muller, cosine branch only; 1 − u keeps the logarithm finite
    const z = Math.sqrt(-2 * Math.log(1 - rng())) * Math.cos(2 * Math.PI * rng());
    if (Math.abs(z) <= 3) return (t * z) / 3;
  }
}

// ---------------------------------------------------------------------------------------------------------
// Streaming quantile (P², Jain and Chlamtac 1985)

/**
 * P² estimators of one quantile at many points at once (struct of arrays, five markers per point).
 * The desired marker positions n′ depend only on how many observations a point has had, so they are kept
 * once per count for all points (`desired`, filled by the same repeated additions of dn), not per point.
 */
export class P2Quantiles {
  private readonly q: Float64Array;
  private readonly n: Float64Array;
  private readonly count: Int32Array;
  private readonly dn: number[];
  /** n′ of markers 1–3 after an observation that found `c` before it: entries 3c … 3c + 2 (c ≥ 5) */
  private desired = new Float64Array(0);
  /** counts filled in `desired` so far (entries up to 3·filled) */
  private filled = 0;

  constructor(
    readonly p: number,
    readonly size: number,
  ) {
    this.q = new Float64Array(5 * size);
    this.n = new Float64Array(5 * size);
    this.count = new Int32Array(size);
    this.dn = [0, p / 2, p, (1 + p) / 2, 1];
  }

  /** Extends `desired` to count c: n′ starts at (2p, 4p, 2 + 2p) with the fifth observation, then adds dn each time. */
  private desiredUpTo(c: number): void {
    if (c < this.filled) return;
    let t = this.desired;
    if (3 * (c + 1) > t.length) {
      const grown = new Float64Array(Math.max(3 * (c + 1), 2 * t.length, 3 * 64));
      grown.set(t.subarray(0, 3 * this.filled));
      this.desired = t = grown;
    }
    const p = this.p;
    const d1 = this.dn[1];
    const d2 = this.dn[2];
    const d3 = this.dn[3];
    for (let k = this.filled; k <= c; k++) {
      if (k < 5) continue;
      // the n′ an observation at count k works with: after k = 4 it is the starting value, then + dn per observation
      const prev1 = k === 5 ? 2 * p : t[3 * (k - 1)];
      const prev2 = k === 5 ? 4 * p : t[3 * (k - 1) + 1];
      const prev3 = k === 5 ? 2 + 2 * p : t[3 * (k - 1) + 2];
      t[3 * k] = prev1 + d1;
      t[3 * k + 1] = prev2 + d2;
      t[3 * k + 2] = prev3 + d3;
    }
    this.filled = c + 1;
  }

  /** Adds observation x at point j (non-finite values are skipped). */
  add(j: number, x: number): void {
    if (!Number.isFinite(x)) return;
    const c = this.count[j];
    if (c >= 5) this.desiredUpTo(c);
    this.put(j, x);
  }

  /** Adds xs[j] at every point j (non-finite values skipped): one observation of the whole curve. */
  addAll(xs: ArrayLike<number>): void {
    const { count, size } = this;
    let most = 0;
    for (let j = 0; j < size; j++) if (count[j] > most) most = count[j];
    if (most >= 5) this.desiredUpTo(most);
    for (let j = 0; j < size; j++) {
      const x = xs[j];
      if (Number.isFinite(x)) this.put(j, x);
    }
  }

  /** One finite observation at point j (`desired` already covers its count). */
  private put(j: number, x: number): void {
    const { q, n } = this;
    const o = 5 * j;
    const c = this.count[j]++;
    if (c < 5) {
      // the first five are kept sorted
      let i = c;
      while (i > 0 && q[o + i - 1] > x) {
        q[o + i] = q[o + i - 1];
        i--;
      }
      q[o + i] = x;
      if (c === 4) for (let m = 0; m < 5; m++) n[o + m] = m;
      return;
    }
    // the cell k that x falls in, and the positions of the markers above it moved up by one; the markers
    // are in order, so the cell is the count of inner markers at or below x (no data-dependent loops)
    let k: number;
    if (x < q[o]) {
      q[o] = x;
      k = 0;
    } else if (x >= q[o + 4]) {
      q[o + 4] = x;
      k = 3;
    } else {
      k = 0;
      while (k < 3 && x >= q[o + k + 1]) k++;
    }
    for (let m = k + 1; m < 5; m++) n[o + m] += 1;
    const t = this.desired;
    const w = 3 * c - 1;
    for (let m = 1; m <= 3; m++) {
      const d = t[w + m] - n[o + m];
      const up = n[o + m + 1] - n[o + m];
      const down = n[o + m - 1] - n[o + m];
      if ((d >= 1 && up > 1) || (d <= -1 && down < -1)) {
        const s = d > 0 ? 1 : -1;
        const qm = q[o + m];
        const qa = q[o + m + 1];
        const qb = q[o + m - 1];
        const na = n[o + m + 1];
        const nb = n[o + m - 1];
        const nm = n[o + m];
        const para = qm + (s / (na - nb)) * ((nm - nb + s) * ((qa - qm) / (na - nm)) + (na - nm - s) * ((qm - qb) / (nm - nb)));
        if (qb < para && para < qa) q[o + m] = para;
        else q[o + m] = qm + (s * (q[o + m + s] - qm)) / (n[o + m + s] - nm);
        n[o + m] += s;
      }
    }
  }

  /** The estimate at point j (exact from the sorted values while fewer than five; NaN with none). */
  value(j: number): number {
    const c = this.count[j];
    const o = 5 * j;
    if (c === 0) return NaN;
    if (c < 5) return this.q[o + Math.min(c - 1, Math.round(this.p * (c - 1)))];
    return this.q[o + 2];
  }
}

// ---------------------------------------------------------------------------------------------------------
// Parts and builds

/** Every resistor and capacitor that varies, in document order. */
export function spreadParts(chain: Chain): SpreadPart[] {
  const out: SpreadPart[] = [];
  const sourceId = chain.nodes.find((n) => isSourceKind(n.kind))?.id;
  const overrides = chain.tolerances.overrides ?? {};
  for (const node of chain.nodes) {
    if (node.id === sourceId || node.kind === "adc") continue;
    const specs = PARAM_SPECS[node.kind] ?? {};
    const params = node.params as unknown as Record<string, unknown>;
    for (const [param, spec] of Object.entries(specs)) {
      const unit = spec.rule?.unit;
      if (unit !== "ohm" && unit !== "farad") continue;
      const v = params[param];
      if (typeof v !== "number" || !(v > 0)) continue;
      const type = unit === "ohm" ? "resistor" : "capacitor";
      const key = `${node.id}.${param}`;
      const tolerance = overrides[key] ?? (type === "resistor" ? chain.tolerances.resistor : chain.tolerances.capacitor);
      out.push({ key, nodeId: node.id, param, type, nominal: v, tolerance });
    }
  }
  return out;
}

/** The chain with part k at nominal·factor[k] (a new document; the base is not touched). */
export function chainWithFactors(base: Chain, parts: SpreadPart[], factor: ArrayLike<number>): Chain {
  const changed = new Map<string, Record<string, number>>();
  parts.forEach((p, k) => {
    const rec = changed.get(p.nodeId) ?? {};
    rec[p.param] = p.nominal * factor[k];
    changed.set(p.nodeId, rec);
  });
  const nodes = base.nodes.map((n) => {
    const c = changed.get(n.id);
    return c ? ({ ...n, params: { ...n.params, ...c } } as ChainNode) : n;
  });
  return { ...base, nodes };
}

/** Figures of one build, per node in topology order (NaN = none). */
interface Figures {
  dcGain: Float64Array;
  f0: Float64Array;
  q: Float64Array;
  margin: Float64Array;
  clip: Uint8Array;
}

function partOf(chain: Chain, node: ChainNode): Part | undefined {
  const key = "part" in node ? node.part : null;
  return key ? chain.parts[key] : undefined;
}

const num = (x: number | null | undefined) => (x === null || x === undefined || !Number.isFinite(x) ? NaN : x);

function newFigures(n: number): Figures {
  return {
    dcGain: new Float64Array(n),
    f0: new Float64Array(n),
    q: new Float64Array(n),
    margin: new Float64Array(n),
    clip: new Uint8Array(n),
  };
}

/**
 * The figures of a build, set up once per run and evaluated for each build loaded into `cc` (`retune`).
 * The same numbers as analyzeChain's operating point and band peaks (bandFigures), computed leaner:
 * - what does not vary between builds is read once: the source's signal, each stage's usable and
 *   allowed ranges, the DC value every transfer source carries (only a common-mode error depends on
 *   resistor values, and is read again per build), the band grid and the searches over it;
 * - the DC intervals without their term lists (`dcInterval`, the same sums in the same order);
 * - magnitudes by √(re² + im²) instead of Math.hypot (`magnitude`, within about one rounding);
 * - the band peaks on analyzeChain's own grid (so the same sample is the best one), refined by Brent's
 *   method instead of golden section (`bandMaxMany(…, "brent")`), stopped at PEAK_TOL in ln f; its value
 *   agrees with analyzeChain's 1e-10 golden search to ~1e-12 relative at a smooth peak
 *   (tests/reference/spread-peaks.test.ts holds the margins of several chains to it);
 * - sweep buffers and value arrays kept from build to build.
 * `order[i]` is the index in the chain's node list of topology node i (the builds keep the base's order).
 */
class BuildFigures {
  private readonly n: number;
  private readonly amp: number;
  private readonly grid: Float64Array;
  /** per search: its node, and whether it is the (+) pin's peak (else the node's output) */
  private readonly searchNode: Int32Array;
  private readonly searchPlus: Uint8Array;
  private readonly searches: { grid: Float64Array; values: Float64Array }[];
  private readonly table: DcTable;
  private readonly cmError: number[];
  private readonly re: Float64Array;
  private readonly im: Float64Array;
  /** per node: usable output range and allowed (+) range (op-amp stages), or the ADC's input window */
  private readonly outLow: Float64Array;
  private readonly outHigh: Float64Array;
  private readonly inLow: Float64Array;
  private readonly inHigh: Float64Array;
  private readonly gain: Float64Array;
  private readonly plusGain: Float64Array;
  private bandSweep: SweepResult | undefined;
  private readonly stepSweeps: (SweepResult | undefined)[] = [];

  constructor(
    private readonly cc: CompiledChain,
    private readonly order: Int32Array,
  ) {
    const chain = cc.chain;
    const nodes = cc.topology.nodes;
    const n = nodes.length;
    this.n = n;
    const src = nodes[0];
    if (!isSourceKind(src.kind)) throw new Error("chain must start at its source");
    const sig = sourceSignal(src);
    this.amp = sig.amplitude;
    this.grid = bandGrid(sig.fLow, sig.fHigh);
    const node: number[] = [];
    const plus: number[] = [];
    this.outLow = new Float64Array(n).fill(NaN);
    this.outHigh = new Float64Array(n).fill(NaN);
    this.inLow = new Float64Array(n).fill(NaN);
    this.inHigh = new Float64Array(n).fill(NaN);
    nodes.forEach((x, i) => {
      if (x.kind === "adc") {
        this.outLow[i] = x.params.vinLow;
        this.outHigh[i] = x.params.vinHigh;
      } else if (isOpAmpKind(x.kind)) {
        const st = x as Extract<ChainNode, { rails: unknown }>;
        const part = partOf(chain, x);
        this.outLow[i] = st.rails.low + (part?.swingLow ?? 0);
        this.outHigh[i] = st.rails.high - (part?.swingHigh ?? 0);
        this.inLow[i] = st.rails.low + (part?.inputLow ?? 0);
        this.inHigh[i] = st.rails.high - (part?.inputHigh ?? 0);
      } else return;
      // the band peaks the margins need: the output of op-amp stages and converters, the (+) pin of stages
      node.push(i);
      plus.push(0);
      // a (+) pin tied to vref has no signal (V+/Vin = 0): its peak is 0 without a search
      if (cc.models[i]?.vin.p.some((c) => c !== 0)) {
        node.push(i);
        plus.push(1);
      }
    });
    this.searchNode = Int32Array.from(node);
    this.searchPlus = Uint8Array.from(plus);
    this.searches = node.map(() => ({ grid: this.grid, values: new Float64Array(this.grid.length) }));
    this.table = dcTable(chain, cc);
    this.cmError = cc.sources.flatMap((x, k) => (x.type === "cm-error" ? [k] : []));
    this.re = new Float64Array(cc.sources.length);
    this.im = new Float64Array(cc.sources.length);
    this.gain = new Float64Array(n);
    this.plusGain = new Float64Array(n);
  }

  /** |V+/Vin| of op-amp stage i at ω (rad/s) */
  private plusRatio(i: number, w: number): number {
    const model = this.cc.models[i]!;
    return ratioMagAt(model.vin.p, model.den, w, magnitude);
  }

  /** Band peaks of the loaded build into `gain` and `plusGain` (NaN where not finite). */
  private bandPeaks(): void {
    const { cc, grid, searches, searchNode, searchPlus } = this;
    const parent = cc.topology.parent;
    const sw = (this.bandSweep = cc.sweep(grid, this.bandSweep, RESPONSES_ONLY));
    for (let j = 0; j < searches.length; j++) {
      const i = searchNode[j];
      const values = searches[j].values;
      if (searchPlus[j]) {
        const re = sw.cumRe[parent[i]];
        const im = sw.cumIm[parent[i]];
        for (let k = 0; k < grid.length; k++) values[k] = magnitude(re[k], im[k]) * this.plusRatio(i, sw.omega[k]);
      } else {
        const re = sw.cumRe[i];
        const im = sw.cumIm[i];
        for (let k = 0; k < grid.length; k++) values[k] = magnitude(re[k], im[k]);
      }
    }
    const peaks = bandMaxMany(
      searches,
      (freqs, which, out, count) => {
        // a sweep of the `count` frequencies asked for, with buffers kept per count
        const st = (this.stepSweeps[count] = cc.sweep(freqs.subarray(0, count), this.stepSweeps[count], RESPONSES_ONLY));
        for (let c = 0; c < count; c++) {
          const j = which[c];
          const i = searchNode[j];
          const at = searchPlus[j] ? parent[i] : i;
          const m = magnitude(st.cumRe[at][c], st.cumIm[at][c]);
          out[c] = searchPlus[j] ? m * this.plusRatio(i, st.omega[c]) : m;
        }
      },
      PEAK_TOL,
      "brent",
    );
    for (let j = 0; j < searches.length; j++) (searchPlus[j] ? this.plusGain : this.gain)[searchNode[j]] = num(peaks[j].value);
  }

  /** Evaluates the build loaded into `cc` into `f`. */
  evaluate(f: Figures): void {
    const { cc, n, amp, table, re, im } = this;
    const chain = cc.chain;
    for (const k of this.cmError) table.values[k] = dcValue(chain, cc.sources[k]);
    f.dcGain.fill(NaN);
    f.f0.fill(NaN);
    f.q.fill(NaN);
    f.margin.fill(NaN);
    f.clip.fill(0);
    this.bandPeaks();
    cc.setFrequency(0);
    for (let i = 1; i < n; i++) {
      const node = chain.nodes[this.order[i]];
      const kind = node.kind;
      const h = cc.stageAt(i).hRe;
      f.dcGain[i] = kind === "integrator" || kind === "adc" || !Number.isFinite(h) ? NaN : h;
      const ideal = idealCharacteristics(node);
      f.f0[i] = num(ideal.f0);
      f.q[i] = num(ideal.q);
      if (kind !== "adc" && !isOpAmpKind(kind)) continue;
      cc.transfersTo(i, false, re, im);
      const dc = dcInterval(table, cc, re);
      const gain = this.gain[i];
      const acPeak = amp * gain;
      if (kind === "adc") {
        if (!dc || !Number.isFinite(gain)) f.clip[i] = 1;
        else {
          const m = Math.min(dc.min - acPeak - this.outLow[i], this.outHigh[i] - (dc.max + acPeak));
          f.margin[i] = m;
          if (m < 0) f.clip[i] = 1;
        }
        continue;
      }
      if (kind === "integrator") f.clip[i] = 1;
      cc.transfersTo(i, true, re, im);
      const plus = dcInterval(table, cc, re);
      const plusGain = this.plusGain[i];
      const plusAc = amp * plusGain;
      if (!dc || !Number.isFinite(gain) || !plus || !Number.isFinite(plusGain)) {
        f.clip[i] = 1;
        continue;
      }
      const m = Math.min(
        dc.min - acPeak - this.outLow[i],
        this.outHigh[i] - (dc.max + acPeak),
        plus.min - plusAc - this.inLow[i],
        this.inHigh[i] - (plus.max + plusAc),
      );
      f.margin[i] = m;
      if (m < 0) f.clip[i] = 1;
    }
  }
}

const METRICS: SpreadMetric[] = ["dcGain", "f0", "q", "margin"];

// ---------------------------------------------------------------------------------------------------------
// Statistics

function statOf(values: Float64Array, count: number, nominal: number): SpreadStat | null {
  // the finite values, sorted as a typed array (numeric, several times faster than an array with a
  // comparator: a partial result at 10,000 builds sorts 44 of these)
  let m = 0;
  const all = new Float64Array(count);
  for (let k = 0; k < count; k++) if (Number.isFinite(values[k])) all[m++] = values[k];
  if (!m) return Number.isFinite(nominal) ? emptyStat(nominal) : null;
  const xs = all.subarray(0, m).sort();
  let mean = 0;
  for (const x of xs) mean += x;
  mean /= m;
  let ss = 0;
  for (const x of xs) ss += (x - mean) * (x - mean);
  const sd = m > 1 ? Math.sqrt(ss / (m - 1)) : 0;
  // quantiles by linear interpolation between order statistics (the usual "type 7" rule)
  const quant = (p: number) => {
    const h = (m - 1) * p;
    const lo = Math.floor(h);
    const hi = Math.min(m - 1, lo + 1);
    return xs[lo] + (h - lo) * (xs[hi] - xs[lo]);
  };
  const lo = xs[0];
  const hi = xs[m - 1];
  const counts = new Array<number>(HIST_BINS).fill(0);
  const width = (hi - lo) / HIST_BINS;
  for (const x of xs) counts[width > 0 ? Math.min(HIST_BINS - 1, Math.floor((x - lo) / width)) : 0]++;
  return {
    nominal: Number.isFinite(nominal) ? nominal : null,
    count: m,
    mean,
    sd,
    min: lo,
    max: hi,
    p5: quant(0.05),
    p50: quant(0.5),
    p95: quant(0.95),
    histogram: { lo, hi, counts },
  };
}

function emptyStat(nominal: number): SpreadStat {
  return { nominal, count: 0, mean: NaN, sd: NaN, min: NaN, max: NaN, p5: NaN, p50: NaN, p95: NaN, histogram: { lo: nominal, hi: nominal, counts: [] } };
}

const orNull = (x: number) => (Number.isFinite(x) ? x : null);

// ---------------------------------------------------------------------------------------------------------
// The run

export interface SpreadRun {
  /** units of work (evaluations) in all, and done so far */
  readonly total: number;
  readonly done: number;
  readonly finished: boolean;
  /** Does up to `units` evaluations; returns true when the whole run is finished. */
  step(units: number): boolean;
  /** The result so far (complete once finished). */
  result(): SpreadResult;
}

export const SPREAD_LIMITS = { trials: { min: 1, max: 100_000 }, points: { min: 2, max: 20_000 } } as const;

/** Checks the options, naming the field: returns a message, or null when they are valid. */
export function spreadOptionsIssue(opts: SpreadOptions): { path: string; message: string } | null {
  const { trials, seed, points, distribution } = opts;
  if (!Number.isInteger(trials) || trials < SPREAD_LIMITS.trials.min || trials > SPREAD_LIMITS.trials.max)
    return { path: "trials", message: `must be an integer from ${SPREAD_LIMITS.trials.min} to ${SPREAD_LIMITS.trials.max}` };
  if (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff) return { path: "seed", message: "must be an integer from 0 to 4294967295" };
  if (points !== undefined && (!Number.isInteger(points) || points < SPREAD_LIMITS.points.min || points > SPREAD_LIMITS.points.max))
    return { path: "points", message: `must be an integer from ${SPREAD_LIMITS.points.min} to ${SPREAD_LIMITS.points.max}` };
  if (distribution !== undefined && distribution !== "uniform" && distribution !== "normal")
    return { path: "distribution", message: 'must be "uniform" or "normal"' };
  return null;
}

/** Starts a spread over a complete chain; nothing is evaluated until `step`. Throws on invalid options. */
export function startSpread(chain: Chain, opts: SpreadOptions): SpreadRun {
  const issue = spreadOptionsIssue(opts);
  if (issue) throw new RangeError(`${issue.path} ${issue.message}`);
  const distribution = opts.distribution ?? "uniform";
  const trials = opts.trials;
  const cc = compileChain(chain);
  const nodes = cc.topology.nodes;
  const n = nodes.length;
  const parts = spreadParts(chain);
  const P = parts.length;
  const grid = logGrid(chain.analysis.fMin, chain.analysis.fMax, opts.points ?? chain.analysis.points);
  const G = grid.length;
  const ends = cc.paths.map((p) => p.end);
  const rng = mulberry32(opts.seed);
  const order = Int32Array.from(nodes, (x) => chain.nodes.indexOf(x));
  const figures = new BuildFigures(cc, order);
  const evaluate = (into: Figures = newFigures(n)) => {
    figures.evaluate(into);
    return into;
  };
  const buildFigures = newFigures(n);

  // accumulators
  const envMin = ends.map(() => new Float64Array(G).fill(Infinity));
  const envMax = ends.map(() => new Float64Array(G).fill(-Infinity));
  const env5 = ends.map(() => new P2Quantiles(0.05, G));
  const env95 = ends.map(() => new P2Quantiles(0.95, G));
  const series = METRICS.map(() => Array.from({ length: n }, () => new Float64Array(trials)));
  const clipCounts = new Int32Array(n);
  let clipCount = 0;
  let trialsDone = 0;
  let sweep: SweepResult | undefined;

  // nominal
  let nominal: Figures | null = null;
  let nominalDb: Float64Array[] = [];
  const sensUp: Figures[] = [];
  const sensDown: Figures[] = [];
  let corners: { nodeIndex: number; metric: SpreadMetric; signs: Int8Array; low: number; high: number; outside: number }[] = [];
  let cornerPlan: { nodeIndex: number; metric: SpreadMetric; signs: Int8Array }[] | null = null;
  const cornerVals: { low: number; high: number }[] = [];
  let sensitivity: SpreadSensitivity[] = [];
  let critical = -1;

  // every build into the same stage-model buffers (only the values change): see RetuneOptions
  const load = (factor: ArrayLike<number>) => cc.retune(chainWithFactors(chain, parts, factor), { reuse: true });
  const magDb = (sw: SweepResult, e: number, out: Float64Array) => {
    for (let k = 0; k < G; k++) {
      const m = magnitude(sw.cumRe[e][k], sw.cumIm[e][k]);
      out[k] = sw.pole[k] || !(m > 0) || !Number.isFinite(m) ? NaN : 20 * Math.log10(m);
    }
  };
  const metricOf = (f: Figures, m: SpreadMetric) => f[m];
  const dbScratch = new Float64Array(G);

  // the work, as a list of phases counted in evaluations
  const sensUnits = 2 * P;
  let cornerUnits = 0;
  let unit = 0; // evaluations done

  const relSens = (up: number, down: number, nom: number, metric: SpreadMetric) => {
    if (!Number.isFinite(up) || !Number.isFinite(down) || !Number.isFinite(nom)) return NaN;
    const dl = Math.log(1 + SENS_STEP) - Math.log(1 - SENS_STEP);
    if (metric === "margin") return (up - down) / dl;
    if (up === 0 || down === 0) return NaN;
    return (Math.log(Math.abs(up)) - Math.log(Math.abs(down))) / dl;
  };

  const planCorners = () => {
    const plan: { nodeIndex: number; metric: SpreadMetric; signs: Int8Array }[] = [];
    for (let i = 1; i < n; i++) {
      for (const metric of METRICS) {
        const nom = metricOf(nominal!, metric)[i];
        if (!Number.isFinite(nom)) continue;
        const signs = new Int8Array(P);
        let any = false;
        for (let k = 0; k < P; k++) {
          const s = relSens(metricOf(sensUp[k], metric)[i], metricOf(sensDown[k], metric)[i], nom, metric);
          // a relative sensitivity of a negative figure points the other way in value
          const dir = metric === "margin" ? s : s * Math.sign(nom);
          signs[k] = Number.isFinite(dir) && Math.abs(dir) > 1e-9 ? (dir > 0 ? -1 : 1) : 0;
          if (signs[k]) any = true;
        }
        if (any) plan.push({ nodeIndex: i, metric, signs });
      }
    }
    return plan;
  };

  const buildSensitivity = () => {
    // the node with the smallest nominal margin
    let best = Infinity;
    for (let i = 1; i < n; i++) {
      const m = nominal!.margin[i];
      if (Number.isFinite(m) && m < best) {
        best = m;
        critical = i;
      }
    }
    const index = new Map(nodes.map((x, i) => [x.id, i]));
    sensitivity = parts.map((p, k) => {
      const i = index.get(p.nodeId)!;
      const s = (metric: SpreadMetric, at: number) =>
        at < 0 ? null : orNull(relSens(metricOf(sensUp[k], metric)[at], metricOf(sensDown[k], metric)[at], metricOf(nominal!, metric)[at], metric));
      const dcGain = s("dcGain", i);
      const f0 = s("f0", i);
      const q = s("q", i);
      const margin = s("margin", critical);
      const eff = (x: number | null) => (x === null ? null : Math.abs(x) * p.tolerance);
      return {
        key: p.key,
        nodeId: p.nodeId,
        param: p.param,
        type: p.type,
        tolerance: p.tolerance,
        dcGain,
        f0,
        q,
        margin,
        effect: { dcGain: eff(dcGain), f0: eff(f0), q: eff(q), margin: eff(margin) },
      };
    });
  };

  const factors = new Float64Array(P);
  const stepOne = () => {
    if (unit === 0) {
      factors.fill(1);
      load(factors);
      sweep = cc.sweep(grid, sweep, RESPONSES_ONLY);
      nominalDb = ends.map((e) => {
        const out = new Float64Array(G);
        magDb(sweep!, e, out);
        return out;
      });
      nominal = evaluate();
      if (P === 0) {
        cornerPlan = [];
        buildSensitivity();
      }
    } else if (unit <= sensUnits) {
      const k = (unit - 1) >> 1;
      const up = (unit - 1) % 2 === 0;
      factors.fill(1);
      factors[k] = up ? 1 + SENS_STEP : 1 - SENS_STEP;
      load(factors);
      (up ? sensUp : sensDown)[k] = evaluate();
      if (unit === sensUnits) {
        cornerPlan = planCorners();
        cornerUnits = 2 * cornerPlan.length;
        buildSensitivity();
      }
    } else if (unit <= sensUnits + cornerUnits) {
      const c = unit - sensUnits - 1;
      const pl = cornerPlan![c >> 1];
      const high = c % 2 === 1;
      for (let k = 0; k < P; k++) factors[k] = 1 + (high ? -pl.signs[k] : pl.signs[k]) * parts[k].tolerance;
      load(factors);
      const v = metricOf(evaluate(buildFigures), pl.metric)[pl.nodeIndex];
      if (!high) cornerVals.push({ low: v, high: NaN });
      else cornerVals[cornerVals.length - 1].high = v;
      if (unit === sensUnits + cornerUnits) {
        corners = cornerPlan!.map((pl, j) => ({ ...pl, low: cornerVals[j].low, high: cornerVals[j].high, outside: 0 }));
      }
    } else {
      const t = trialsDone;
      for (let k = 0; k < P; k++) factors[k] = 1 + draw(rng, parts[k].tolerance, distribution);
      load(factors);
      sweep = cc.sweep(grid, sweep, RESPONSES_ONLY);
      for (let pi = 0; pi < ends.length; pi++) {
        magDb(sweep, ends[pi], dbScratch);
        const mn = envMin[pi];
        const mx = envMax[pi];
        for (let k = 0; k < G; k++) {
          const v = dbScratch[k];
          if (!Number.isFinite(v)) continue;
          if (v < mn[k]) mn[k] = v;
          if (v > mx[k]) mx[k] = v;
        }
        env5[pi].addAll(dbScratch);
        env95[pi].addAll(dbScratch);
      }
      const fig = evaluate(buildFigures);
      let any = false;
      for (let i = 0; i < n; i++) {
        if (fig.clip[i]) {
          clipCounts[i]++;
          any = true;
        }
      }
      if (any) clipCount++;
      METRICS.forEach((m, mi) => {
        const vals = metricOf(fig, m);
        for (let i = 0; i < n; i++) series[mi][i][t] = vals[i];
      });
      for (const c of corners) {
        const v = metricOf(fig, c.metric)[c.nodeIndex];
        if (!Number.isFinite(v)) continue;
        const lo = Math.min(c.low, c.high);
        const hi = Math.max(c.low, c.high);
        const slack = 1e-9 * Math.max(Math.abs(lo), Math.abs(hi), c.metric === "margin" ? 1e-3 : 0);
        if (!(v >= lo - slack && v <= hi + slack)) c.outside++;
      }
      trialsDone++;
    }
    unit++;
  };

  const totalUnits = () => 1 + sensUnits + (cornerPlan ? cornerUnits : 0) + trials;
  const isFinished = () => cornerPlan !== null && trialsDone >= trials;

  const result = (): SpreadResult => {
    const nom = nominal;
    const stages: SpreadStage[] = [];
    for (let i = 1; i < n; i++) {
      const node = nodes[i];
      const st = (m: SpreadMetric, mi: number) => (nom ? statOf(series[mi][i], trialsDone, metricOf(nom, m)[i]) : null);
      stages.push({
        id: node.id,
        kind: node.kind,
        ...(node.label ? { label: node.label } : {}),
        dcGain: st("dcGain", 0),
        f0: st("f0", 1),
        q: st("q", 2),
        margin: st("margin", 3),
        clipShare: trialsDone ? clipCounts[i] / trialsDone : 0,
      });
    }
    const list = (a: Float64Array | ArrayLike<number>) => Array.from(a, orNull);
    return {
      format: SPREAD_FORMAT,
      seed: opts.seed >>> 0,
      distribution,
      trials,
      done: trialsDone,
      complete: isFinished(),
      parts,
      response: {
        f: Array.from(grid),
        paths: ends.map((e, pi) => ({
          end: nodes[e].id,
          nominal: nominalDb[pi] ? list(nominalDb[pi]) : [],
          min: list(envMin[pi]),
          max: list(envMax[pi]),
          p5: Array.from({ length: G }, (_, k) => orNull(env5[pi].value(k))),
          p95: Array.from({ length: G }, (_, k) => orNull(env95[pi].value(k))),
        })),
      },
      stages,
      clipCount,
      clipShare: trialsDone ? clipCount / trialsDone : 0,
      criticalNode: critical >= 0 ? nodes[critical].id : null,
      sensitivity,
      worstCase: corners.map((c) => {
        const lowCorner: Record<string, -1 | 0 | 1> = {};
        parts.forEach((p, k) => (lowCorner[p.key] = c.signs[k] as -1 | 0 | 1));
        return {
          nodeId: nodes[c.nodeIndex].id,
          metric: c.metric,
          nominal: nom ? orNull(metricOf(nom, c.metric)[c.nodeIndex]) : null,
          low: orNull(c.low),
          high: orNull(c.high),
          lowCorner,
          outside: c.outside,
        };
      }),
    };
  };

  return {
    get total() {
      return totalUnits();
    },
    get done() {
      return unit;
    },
    get finished() {
      return isFinished();
    },
    step(units: number) {
      for (let u = 0; u < units && !isFinished(); u++) stepOne();
      return isFinished();
    },
    result,
  };
}

/** The whole spread in one call (command line, tests). */
export function runSpread(chain: Chain, opts: SpreadOptions): SpreadResult {
  const run = startSpread(chain, opts);
  while (!run.step(1000));
  return run.result();
}
