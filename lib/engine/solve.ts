/**
 * From targets to parts: for one stage kind, search standard (E-series) values that meet stated targets —
 * passband gain, corner or f0 and Q, an input-impedance floor, a capacitor ceiling — and rank them.
 *
 * Method, per kind (design equations; the analysis forms are those of ideal.ts and chain-format.md):
 * - inverting, lossy integrator: |K| = r2/r1; lossy integrator corner f = 1/(2π·r2·c2). Walk r1 (or c2)
 *   over the series, solve the other parts, snap each to its two neighbours in the series.
 * - non-inverting: K = 1 + rf/rg (K = 1 is a follower, rf = rg = null). Walk rg, solve rf, snap.
 * - rcLowpass, rcHighpass, integrator: f = 1/(2π·r·c) (the integrator's f is its unity-gain frequency
 *   1/(2π·r1·c2)). Walk c over the capacitor series under the ceiling, solve r, snap.
 * - unity-gain Sallen-Key low-pass: ω0² = 1/(r1·r2·c1·c2), Q = √(r1r2c1c2)/(c2(r1 + r2)) (the standard
 *   textbook analysis, e.g. Franco, *Design with Operational Amplifiers and Analog Integrated Circuits*,
 *   ch. 3 [MEMORY for the chapter]; re-derived in shared references.md §6). For each capacitor pair,
 *   r1 + r2 = 1/(Q·ω0·c2) and r1·r2 = 1/(ω0²·c1·c2), so r1 and r2 are the two roots of
 *   x² − (r1 + r2)·x + r1·r2 = 0, real only when c1/c2 ≥ 4Q² [DERIVED from the two equations above].
 * - MFB low-pass: K = r2/r1, ω0² = 1/(r2·r3·c1·c2), Q = √(r2r3c1c2)/(c2(r2 + r3 + r2r3/r1)) (same
 *   textbook, references.md §7). With r1 = r2/K the damping term is c2(r2 + (1 + K)·r3), so r2 solves
 *   x² − x/(Q·ω0·c2) + (1 + K)/(ω0²·c1·c2) = 0, real only when c1/c2 ≥ 4Q²(1 + K) [DERIVED].
 * Every snapped set is then re-evaluated exactly: f0 and Q by `idealCharacteristics` (the engine's own
 * figures), the gain by the ideal DC (or high-frequency) gain, the input impedance by its ideal closed form.
 *
 * Sensitivity: the classical S_x^y = ∂ln y/∂ln x of f0, Q and gain to every part, by central differences
 * in ln x (step 1e-4, error of order 1e-8). Ranking: sets meeting every target first; among them by the
 * worst relative error rounded up to the next 0.25 % step, then by the total |S| (robust sets first), then
 * by the largest resistor (smaller resistors: less Johnson noise and bias-current error — common practice).
 *
 * Defaults (common practice, all changeable): resistors 1 kΩ … 1 MΩ (below, the op-amp output is loaded;
 * above, noise, bias currents and stray capacitance grow), capacitors 100 pF … 1 µF from E12, resistors
 * from E24, 2 % allowed error on each target.
 */
import { CHAIN_FORMAT, type Chain, type ChainNode, type NodeKind } from "../chain/types";
import { compileChain } from "./compile-chain";
import { E_SERIES, neighbours, type ESeries } from "../units/eseries";
import { TWO_PI } from "./constants";
import { idealCharacteristics } from "./ideal";

export type SolvableKind =
  | "inverting"
  | "noninverting"
  | "lossyIntegrator"
  | "integrator"
  | "rcLowpass"
  | "rcHighpass"
  | "sallenKeyLowpass"
  | "mfbLowpass"
  | "sallenKeyHighpass"
  | "mfbHighpass";

export type TargetName = "gain" | "f0" | "q";

export interface SolveTargets {
  /** magnitude of the passband gain, V/V (DC for low-pass and gain stages) */
  gain?: number | null;
  /** Hz: corner of a first-order stage, f0 of a second-order one, unity-gain frequency of an integrator */
  f0?: number | null;
  q?: number | null;
  /** ohms: the smallest |Zin| allowed over frequency */
  minInputImpedance?: number | null;
  /** farads: capacitor ceiling (default 1 µF) */
  maxCapacitance?: number | null;
  /** farads: capacitor floor (default 100 pF) */
  minCapacitance?: number | null;
  /** ohms (default 1 kΩ … 1 MΩ) */
  minResistance?: number | null;
  maxResistance?: number | null;
  /** resistor series (default E24) */
  series?: ESeries;
  /** capacitor series (default E12) */
  capacitorSeries?: ESeries;
  /** allowed relative error of each stated target (default 0.02) */
  tolerance?: number;
  /** how many sets to return (default 8) */
  limit?: number;
}

export interface ResolvedTargets {
  gain: number | null;
  f0: number | null;
  q: number | null;
  minInputImpedance: number | null;
  maxCapacitance: number;
  minCapacitance: number;
  minResistance: number;
  maxResistance: number;
  series: ESeries;
  capacitorSeries: ESeries;
  tolerance: number;
  limit: number;
}

export type SolvedParams = Record<string, number | null>;

export interface Figures {
  gain: number | null;
  f0: number | null;
  q: number | null;
  /** ohms, min |Zin| over frequency; null means unbounded (ideal non-inverting input) */
  inputImpedance: number | null;
}

export interface SolvedSet {
  /** only the solved params (resistors and capacitors) */
  params: SolvedParams;
  achieved: Figures;
  /** signed relative error (achieved/target − 1) of each stated target */
  errors: Partial<Record<TargetName, number>>;
  worstError: number;
  /** S_x^y for y in f0, q, gain and x every non-null solved part; absent when y is not defined */
  sensitivity: Partial<Record<TargetName, Record<string, number>>>;
  /** Σ|S| over every figure that is stated as a target */
  sensitivityTotal: number;
  meets: boolean;
}

export interface SolveResult {
  kind: SolvableKind;
  targets: ResolvedTargets;
  /** sets meeting every target, best first */
  sets: SolvedSet[];
  /** when no set meets the targets: the closest sets that satisfy every hard constraint, best first */
  nearest: SolvedSet[];
  /** null when `sets` is not empty; otherwise a plain sentence naming the constraint that stops it */
  problem: string | null;
  /** how many candidate sets were evaluated */
  evaluated: number;
}

/** Targets each kind needs (all of them must be given). */
export const SOLVE_TARGETS: Readonly<Record<SolvableKind, readonly TargetName[]>> = {
  inverting: ["gain"],
  noninverting: ["gain"],
  lossyIntegrator: ["gain", "f0"],
  integrator: ["f0"],
  rcLowpass: ["f0"],
  rcHighpass: ["f0"],
  sallenKeyLowpass: ["gain", "f0", "q"],
  mfbLowpass: ["gain", "f0", "q"],
  sallenKeyHighpass: ["gain", "f0", "q"],
  mfbHighpass: ["gain", "f0", "q"],
};

/** Kinds whose gain target may be left out: it then means 1 (the unity-gain Sallen-Key). */
const GAIN_DEFAULTS_TO_ONE = new Set<SolvableKind>(["sallenKeyLowpass", "sallenKeyHighpass"]);

/** The params a solve sets, per kind (everything else — vref, vbias, rails, part — is kept). */
export const SOLVED_PARAMS: Readonly<Record<SolvableKind, readonly string[]>> = {
  inverting: ["r1", "r2"],
  noninverting: ["rf", "rg"],
  lossyIntegrator: ["r1", "r2", "c2"],
  integrator: ["r1", "c2"],
  rcLowpass: ["r", "c"],
  rcHighpass: ["r", "c"],
  sallenKeyLowpass: ["r1", "r2", "c1", "c2", "rf", "rg"],
  mfbLowpass: ["r1", "r2", "r3", "c1", "c2"],
  sallenKeyHighpass: ["c1", "c2", "r1", "r2", "rf", "rg"],
  mfbHighpass: ["c1", "c2", "c3", "r1", "r2"],
};

export const isSolvableKind = (k: NodeKind | string): k is SolvableKind => k in SOLVE_TARGETS;

const TARGET_WORDS: Record<TargetName, string> = { gain: "gain", f0: "f0", q: "Q" };
/** errors are compared in steps of this size before sensitivity decides (part tolerances dwarf it) */
const ERROR_STEP = 2.5e-3;
const SENS_STEP = 1e-4;

export function resolveTargets(t: SolveTargets): ResolvedTargets {
  const pos = (v: number | null | undefined) => (typeof v === "number" && Number.isFinite(v) && v > 0 ? v : null);
  const pick = (v: number | null | undefined, d: number) => pos(v) ?? d;
  return {
    gain: pos(t.gain),
    f0: pos(t.f0),
    q: pos(t.q),
    minInputImpedance: pos(t.minInputImpedance),
    maxCapacitance: pick(t.maxCapacitance, 1e-6),
    minCapacitance: pick(t.minCapacitance, 100e-12),
    minResistance: pick(t.minResistance, 1e3),
    maxResistance: pick(t.maxResistance, 1e6),
    series: t.series && E_SERIES[t.series] ? t.series : "E24",
    capacitorSeries: t.capacitorSeries && E_SERIES[t.capacitorSeries] ? t.capacitorSeries : "E12",
    tolerance: pick(t.tolerance, 0.02),
    limit: Math.max(1, Math.min(50, Math.round(pick(t.limit, 8)))),
  };
}

// ---------------------------------------------------------------------------------------------------
// Figures of a set (ideal op-amp)

function asNode(kind: SolvableKind, params: SolvedParams): ChainNode {
  return { id: "solve", kind, params, rails: { low: -1, high: 1 } } as unknown as ChainNode;
}

const num = (p: SolvedParams, k: string) => p[k] as number;

/** |passband gain|: DC for low-pass and gain stages, high-frequency for the high-pass section. */
export function passbandGain(kind: SolvableKind, p: SolvedParams): number | null {
  switch (kind) {
    case "inverting":
    case "lossyIntegrator":
    case "mfbLowpass":
      return num(p, "r2") / num(p, "r1");
    case "noninverting":
    case "sallenKeyLowpass":
    case "sallenKeyHighpass":
      return p.rf == null || p.rg == null ? 1 : 1 + num(p, "rf") / num(p, "rg");
    case "mfbHighpass":
      return num(p, "c1") / num(p, "c2"); // H(∞) = −c1/c2
    case "rcLowpass":
    case "rcHighpass":
      return 1;
    case "integrator":
      return null;
  }
}

const FREQ_DECADES = 3;
const FREQ_PER_DECADE = 40;

/** min over f of |Zin(j2πf)| from the ideal closed forms; the resistive limit is included. */
export function inputImpedance(kind: SolvableKind, p: SolvedParams): number | null {
  switch (kind) {
    case "noninverting":
      return null; // ideal (+) input draws no current
    case "inverting":
    case "lossyIntegrator":
    case "integrator":
      return num(p, "r1"); // r1 into a virtual ground at every frequency
    case "rcLowpass":
    case "rcHighpass":
      return num(p, "r"); // |r + 1/(jωc)| ≥ r, the limit at high frequency (unloaded section)
    case "sallenKeyLowpass":
      if (p.rf != null && p.rg != null) return engineInputImpedance(kind, p);
      break;
    case "mfbLowpass":
      break;
    case "sallenKeyHighpass":
    case "mfbHighpass":
      return engineInputImpedance(kind, p);
  }
  const { f0 } = idealCharacteristics(asNode(kind, p));
  const r1 = num(p, "r1");
  let min = r1; // both tend to r1 as f → ∞
  const n = 2 * FREQ_DECADES * FREQ_PER_DECADE;
  for (let i = 0; i <= n; i++) {
    const w = TWO_PI * (f0 as number) * 10 ** (i / FREQ_PER_DECADE - FREQ_DECADES);
    let zr: number;
    let zi: number;
    if (kind === "sallenKeyLowpass") {
      // Zin = den/(s·c2·(1 + s·r2·c1)), den = 1 + s·c2(r1 + r2) + s²·r1r2c1c2 [DERIVED: Iin = (Vin − VA)/r1,
      // VA = Vo(1 + s·r2·c2), Vo = Vin/den]
      const { r2, c1, c2 } = p as Record<string, number>;
      const nr = 1 - w * w * r1 * r2 * c1 * c2;
      const ni = w * c2 * (r1 + r2);
      const dr = -w * w * c2 * r2 * c1;
      const di = w * c2;
      const m = dr * dr + di * di;
      zr = (nr * dr + ni * di) / m;
      zi = (ni * dr - nr * di) / m;
    } else {
      // Zin = r1/(1 + H·s·c2·r3), H = −(r2/r1)/den [DERIVED: VA = −Vo·s·c2·r3 at the virtual ground]
      const { r2, r3, c1, c2 } = p as Record<string, number>;
      const dr = 1 - w * w * c1 * c2 * r2 * r3;
      const di = w * c2 * (r2 + r3 + (r2 * r3) / r1);
      // 1 + H·s·c2·r3 = (den − (r2/r1)·s·c2·r3)/den
      const ar = dr;
      const ai = di - (r2 / r1) * w * c2 * r3;
      const m = ar * ar + ai * ai;
      zr = (r1 * (dr * ar + di * ai)) / m;
      zi = (r1 * (di * ar - dr * ai)) / m;
    }
    min = Math.min(min, Math.hypot(zr, zi));
  }
  return min;
}

/** Gain, f0, Q and (unless `withImpedance` is false, when it is left null) the input-impedance floor. */
/**
 * min |Zin| over f0/1000 … 1000·f0 (40 points per decade) from the engine's own input admittance
 * (compileChain, ideal op-amp), for the kinds without a closed form here. For a high-pass section |Zin|
 * keeps falling above f0 (the input capacitor), so the floor then holds up to 1000·f0.
 */
function engineInputImpedance(kind: SolvableKind, p: SolvedParams): number {
  const node = { id: "u", kind, params: { rf: null, rg: null, ...p, vref: 0 }, rails: { low: -1, high: 1 } } as unknown as ChainNode;
  const src = { id: "s", kind: "source", params: { dc: 0, dcSpread: 0, amplitude: 1, fLow: 1, fHigh: 2, resistance: 0, noiseDensity: 0, safety: "low-voltage" } } as ChainNode;
  const chain: Chain = {
    format: CHAIN_FORMAT,
    name: "solve",
    notes: "",
    analysis: { fMin: 1, fMax: 2, points: 2, temperatureK: 300, noiseLow: 1, noiseHigh: null, aliasTargetDb: null },
    tolerances: { resistor: 0, capacitor: 0 },
    parts: {},
    nodes: [src, node],
    edges: [{ from: "s", to: "u" }],
  };
  const f0 = idealCharacteristics(node).f0 as number;
  const n = 2 * FREQ_DECADES * FREQ_PER_DECADE;
  const freqs = new Float64Array(n + 1).map((_, i) => f0 * 10 ** (i / FREQ_PER_DECADE - FREQ_DECADES));
  const cc = compileChain(chain);
  const sw = cc.sweep(freqs);
  const k = cc.nodeIds.indexOf("u");
  let min = Infinity;
  for (let i = 0; i <= n; i++) min = Math.min(min, 1 / Math.hypot(sw.yRe[k][i], sw.yIm[k][i]));
  return min;
}

export function figuresOf(kind: SolvableKind, p: SolvedParams, withImpedance = true): Figures {
  const ideal = idealCharacteristics(asNode(kind, p));
  return { gain: passbandGain(kind, p), f0: ideal.f0, q: ideal.q, inputImpedance: withImpedance ? inputImpedance(kind, p) : null };
}

/** S_x^y = ∂ln y/∂ln x for every non-null solved part x and y in gain, f0, q (where defined). */
export function sensitivities(kind: SolvableKind, p: SolvedParams): SolvedSet["sensitivity"] {
  const out: SolvedSet["sensitivity"] = {};
  const base = figuresOf(kind, p, false);
  for (const x of SOLVED_PARAMS[kind]) {
    const v = p[x];
    if (v == null) continue;
    const up = figuresOf(kind, { ...p, [x]: v * Math.exp(SENS_STEP) }, false);
    const dn = figuresOf(kind, { ...p, [x]: v * Math.exp(-SENS_STEP) }, false);
    for (const y of ["gain", "f0", "q"] as const) {
      const a = up[y];
      const b = dn[y];
      if (base[y] == null || a == null || b == null) continue;
      const s = (Math.log(a) - Math.log(b)) / (2 * SENS_STEP);
      (out[y] ??= {})[x] = Math.abs(s) < 1e-7 ? 0 : s;
    }
  }
  return out;
}

// ---------------------------------------------------------------------------------------------------
// Search

/** All series values in [lo, hi], ascending. */
export function seriesValues(series: ESeries, lo: number, hi: number): number[] {
  const out: number[] = [];
  if (!(lo > 0 && hi >= lo)) return out;
  for (let d = Math.floor(Math.log10(lo)) - 1; d <= Math.ceil(Math.log10(hi)); d++) {
    for (const m of E_SERIES[series]) {
      const v = Number(`${m}e${d}`);
      if (v >= lo * (1 - 1e-12) && v <= hi * (1 + 1e-12)) out.push(v);
    }
  }
  return out;
}

/** Every value of a series from 1e-15 to 1e15, ascending, built as lib/units does (4.7e3 is exactly 4700). */
const tables = new Map<ESeries, number[]>();
function table(series: ESeries): number[] {
  let t = tables.get(series);
  if (!t) {
    t = [];
    for (let d = -15; d <= 15; d++) for (const m of E_SERIES[series]) t.push(Number(`${m}e${d}`));
    tables.set(series, t);
  }
  return t;
}

/** The one or two series values next to x (the same as lib/units `neighbours`, by binary search). */
function snaps(x: number, series: ESeries): number[] {
  if (!(x > 0 && Number.isFinite(x))) return [];
  const t = table(series);
  if (x < t[0] || x > t[t.length - 1]) {
    const { below, above } = neighbours(x, series);
    return below === above ? [below] : [below, above];
  }
  let lo = 0;
  let hi = t.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (t[mid] <= x) lo = mid;
    else hi = mid;
  }
  for (const i of [lo, hi]) if (Math.abs(t[i] - x) <= 1e-12 * x) return [t[i]];
  return [t[lo], t[hi]];
}

/** Every combination of one choice per key. */
function combos(choices: Record<string, (number | null)[]>): SolvedParams[] {
  let out: SolvedParams[] = [{}];
  for (const [k, vs] of Object.entries(choices)) {
    const next: SolvedParams[] = [];
    for (const o of out) for (const v of vs) next.push({ ...o, [k]: v });
    out = next;
  }
  return out;
}

/** Candidate sets of standard values for a kind (hard ranges are checked afterwards, not here). */
function candidates(kind: SolvableKind, t: ResolvedTargets): SolvedParams[] {
  const R = t.series;
  const caps = seriesValues(t.capacitorSeries, t.minCapacitance, t.maxCapacitance);
  // only the inverting stage's walked resistor (r1) is its input resistance
  const rFloor = Math.max(t.minResistance, kind === "inverting" ? (t.minInputImpedance ?? 0) : 0);
  const res = seriesValues(R, rFloor, t.maxResistance);
  const out: SolvedParams[] = [];
  const w0 = TWO_PI * (t.f0 ?? NaN);
  const K = t.gain ?? NaN;
  switch (kind) {
    case "inverting":
      for (const r1 of res) out.push(...combos({ r1: [r1], r2: snaps(K * r1, R) }));
      break;
    case "noninverting":
      if (Math.abs(K - 1) < 1e-12) out.push({ rf: null, rg: null });
      else if (K > 1) for (const rg of res) out.push(...combos({ rf: snaps((K - 1) * rg, R), rg: [rg] }));
      break;
    case "rcLowpass":
    case "rcHighpass":
      for (const c of caps) out.push(...combos({ r: snaps(1 / (w0 * c), R), c: [c] }));
      break;
    case "integrator":
      for (const c2 of caps) out.push(...combos({ r1: snaps(1 / (w0 * c2), R), c2: [c2] }));
      break;
    case "lossyIntegrator":
      for (const c2 of caps) {
        for (const r2 of snaps(1 / (w0 * c2), R)) out.push(...combos({ r1: snaps(r2 / K, R), r2: [r2], c2: [c2] }));
      }
      break;
    case "sallenKeyLowpass":
      if (Math.abs(K - 1) > 1e-12) {
        out.push(...sallenKeyWithGain(kind, t, caps, res));
        break;
      }
    // falls through: the unity-gain Sallen-Key shares the MFB's search
    case "mfbLowpass": {
      const Q = t.q ?? NaN;
      const k1 = kind === "mfbLowpass" ? 1 + K : 1;
      for (const c1 of caps) {
        for (const c2 of caps) {
          if (c1 / c2 < 4 * Q * Q * k1 * (1 - 1e-12)) continue;
          const S = 1 / (Q * w0 * c2);
          const P = (k1 * 1) / (w0 * w0 * c1 * c2);
          const disc = Math.sqrt(Math.max(0, S * S - 4 * P));
          for (const x of new Set([(S + disc) / 2, (S - disc) / 2])) {
            if (kind === "sallenKeyLowpass") {
              // x and P/x are r1 and r2 in either order (f0 and Q are symmetric in them)
              out.push(...combos({ r1: snaps(x, R), r2: snaps(P / x, R), c1: [c1], c2: [c2], rf: [null], rg: [null] }));
            } else {
              // x is r2; r3 = 1/(ω0²·c1·c2·r2); r1 = r2/K
              const r3 = 1 / (w0 * w0 * c1 * c2 * x);
              out.push(...combos({ r1: snaps(x / K, R), r2: snaps(x, R), r3: snaps(r3, R), c1: [c1], c2: [c2] }));
            }
          }
        }
      }
      break;
    }
    case "sallenKeyHighpass":
      out.push(...sallenKeyWithGain(kind, t, caps, res));
      break;
    case "mfbHighpass": {
      // |K| = c1/c2, ω0² = 1/(r1r2c2c3), Q = √(r1r2c2c3)/(r1(c1 + c2 + c3)) ⇒ r1 = 1/(Q·ω0·(c1 + c2 + c3)),
      // r2 = 1/(ω0²·r1·c2·c3) [DERIVED from the analysis form of ideal.ts]
      const Q = t.q ?? NaN;
      for (const c2 of caps) {
        for (const c1 of snaps(K * c2, t.capacitorSeries)) {
          if (c1 > t.maxCapacitance * (1 + 1e-12) || c1 < t.minCapacitance * (1 - 1e-12)) continue;
          for (const c3 of caps) {
            const r1 = 1 / (Q * w0 * (c1 + c2 + c3));
            const r2 = 1 / (w0 * w0 * r1 * c2 * c3);
            out.push(...combos({ c1: [c1], c2: [c2], c3: [c3], r1: snaps(r1, R), r2: snaps(r2, R) }));
          }
        }
      }
      break;
    }
  }
  return out;
}

/** The two best standard (rf, rg) pairs for K = 1 + rf/rg (smallest error, then smallest rf). */
function gainPairs(K: number, res: number[], R: ESeries): { rf: number; rg: number }[] {
  const pairs: { rf: number; rg: number; e: number }[] = [];
  for (const rg of res) for (const rf of snaps((K - 1) * rg, R)) if (rf <= res[res.length - 1] && rf >= res[0]) pairs.push({ rf, rg, e: Math.abs((1 + rf / rg) / K - 1) });
  pairs.sort((a, b) => a.e - b.e || a.rf - b.rf);
  return pairs.slice(0, 2);
}

/**
 * Sallen-Key with a gain network (K = 1 + rf/rg), low-pass or high-pass. With r1·r2 = P = 1/(ω0²c1c2) and
 * b1 = 1/(Q·ω0) [DERIVED from the forms in ideal.ts]:
 *   low-pass  b1 = r1(c2 + c1(1 − K)) + r2·c2  ⇒ (c2 + c1(1 − K))·r1² − b1·r1 + P·c2 = 0,
 *   high-pass b1 = r1(c1 + c2) + r2·c2(1 − K)  ⇒ (c1 + c2)·r1² − b1·r1 + P·c2(1 − K) = 0;
 * every positive root gives r1, then r2 = P/r1. The K of each standard pair is used exactly.
 */
function sallenKeyWithGain(kind: "sallenKeyLowpass" | "sallenKeyHighpass", t: ResolvedTargets, caps: number[], res: number[]): SolvedParams[] {
  const out: SolvedParams[] = [];
  const R = t.series;
  const K = t.gain as number;
  const Q = t.q as number;
  const w0 = TWO_PI * (t.f0 as number);
  const pairs: ({ rf: number; rg: number } | { rf: null; rg: null })[] = Math.abs(K - 1) < 1e-12 ? [{ rf: null, rg: null }] : gainPairs(K, res, R);
  for (const pair of pairs) {
    const k = pair.rf == null ? 1 : 1 + pair.rf / pair.rg;
    for (const c1 of caps) {
      for (const c2 of caps) {
        const P = 1 / (w0 * w0 * c1 * c2);
        const b1 = 1 / (Q * w0);
        const a = kind === "sallenKeyLowpass" ? c2 + c1 * (1 - k) : c1 + c2;
        const c = kind === "sallenKeyLowpass" ? P * c2 : P * c2 * (1 - k);
        const roots: number[] = [];
        if (Math.abs(a) < 1e-30) roots.push(c / b1);
        else {
          const d = b1 * b1 - 4 * a * c;
          if (d < 0) continue;
          roots.push((b1 + Math.sqrt(d)) / (2 * a), (b1 - Math.sqrt(d)) / (2 * a));
        }
        for (const r1 of roots) {
          if (!(r1 > 0)) continue;
          out.push(...combos({ r1: snaps(r1, R), r2: snaps(P / r1, R), c1: [c1], c2: [c2], rf: [pair.rf], rg: [pair.rg] }));
        }
      }
    }
  }
  return out;
}

const keyOf = (p: SolvedParams) => JSON.stringify(p);

function rankKey(s: SolvedSet): [number, number, number, number] {
  const maxR = Math.max(0, ...Object.entries(s.params).filter(([k, v]) => k.startsWith("r") && v != null).map(([, v]) => v as number));
  return [s.meets ? 0 : 1, Math.ceil(s.worstError / ERROR_STEP - 1e-9), s.sensitivityTotal, maxR];
}
const rankCache = new WeakMap<SolvedSet, [number, number, number, number]>();
function cachedKey(s: SolvedSet) {
  let k = rankCache.get(s);
  if (!k) rankCache.set(s, (k = rankKey(s)));
  return k;
}
function compareSets(a: SolvedSet, b: SolvedSet): number {
  const ka = cachedKey(a);
  const kb = cachedKey(b);
  for (let i = 0; i < ka.length; i++) {
    const d = ka[i] - kb[i];
    if (Math.abs(d) > 1e-9) return d;
  }
  return 0;
}

const fmt = (x: number) => Number(x.toPrecision(4)).toString();

function evaluateSet(kind: SolvableKind, t: ResolvedTargets, params: SolvedParams, withImpedance = true): SolvedSet {
  const achieved = figuresOf(kind, params, withImpedance);
  const errors: SolvedSet["errors"] = {};
  let worst = 0;
  for (const y of SOLVE_TARGETS[kind]) {
    const target = t[y] as number;
    const got = achieved[y];
    const e = got == null ? Infinity : got / target - 1;
    errors[y] = e;
    worst = Math.max(worst, Math.abs(e));
  }
  const meets = worst <= t.tolerance * (1 + 1e-9);
  const set: SolvedSet = { params, achieved, errors, worstError: worst, sensitivity: {}, sensitivityTotal: 0, meets };
  return set;
}

function withSensitivity(kind: SolvableKind, set: SolvedSet): SolvedSet {
  const sensitivity = sensitivities(kind, set.params);
  let total = 0;
  for (const y of SOLVE_TARGETS[kind]) for (const s of Object.values(sensitivity[y] ?? {})) total += Math.abs(s);
  return { ...set, sensitivity, sensitivityTotal: total };
}

/**
 * Ranked standard-value sets for `kind` meeting `targets`. Never throws on user input: a missing or
 * impossible target comes back as `problem` with the constraint named.
 */
export function solveStage(kind: SolvableKind, targets: SolveTargets): SolveResult {
  const t = resolveTargets(targets);
  if (GAIN_DEFAULTS_TO_ONE.has(kind) && t.gain == null) t.gain = 1;
  const result = (problem: string | null, sets: SolvedSet[] = [], nearest: SolvedSet[] = [], evaluated = 0): SolveResult => ({
    kind,
    targets: t,
    sets,
    nearest,
    problem,
    evaluated,
  });
  const missing = SOLVE_TARGETS[kind].filter((y) => t[y] == null);
  if (missing.length) {
    return result(`State the ${missing.map((y) => TARGET_WORDS[y]).join(" and ")} target (a positive number) for this stage.`);
  }
  if (t.minResistance > t.maxResistance) return result("The resistor range is empty: its minimum is above its maximum.");
  if (t.minCapacitance > t.maxCapacitance) return result("The capacitor ceiling is below the capacitor floor.");
  if ((kind === "noninverting" || GAIN_DEFAULTS_TO_ONE.has(kind)) && (t.gain as number) < 1 - 1e-12) {
    return result(`A non-inverting stage cannot have a gain below 1 (asked ${fmt(t.gain as number)}); use an inverting stage or a divider.`);
  }
  if (kind !== "noninverting" && kind !== "mfbHighpass" && kind !== "sallenKeyHighpass" && t.minInputImpedance != null && t.minInputImpedance > t.maxResistance) {
    return result(`The input-impedance floor ${fmt(t.minInputImpedance)} Ω is above the largest allowed resistor ${fmt(t.maxResistance)} Ω, and this stage's input impedance is set by a resistor.`);
  }
  if ((kind === "sallenKeyLowpass" && t.gain === 1) || kind === "mfbLowpass") {
    const Q = t.q as number;
    const k1 = kind === "mfbLowpass" ? 1 + (t.gain as number) : 1;
    const need = 4 * Q * Q * k1;
    const caps = seriesValues(t.capacitorSeries, t.minCapacitance, t.maxCapacitance);
    const spread = caps.length ? caps[caps.length - 1] / caps[0] : 0;
    if (spread < need) {
      const form = kind === "mfbLowpass" ? "4Q²(1 + gain)" : "4Q²";
      return result(`Q = ${fmt(Q)} needs c1/c2 ≥ ${form} = ${fmt(need)}, but the capacitor range allows at most ${fmt(spread)}: raise the capacitor ceiling or lower the floor.`);
    }
  }

  const seen = new Set<string>();
  const inRange: SolvedSet[] = [];
  let evaluated = 0;
  let outOfRange = 0;
  let belowFloor = 0;
  let lowestR = Infinity;
  let highestR = 0;
  for (const p of candidates(kind, t)) {
    const key = keyOf(p);
    if (seen.has(key)) continue;
    seen.add(key);
    evaluated++;
    const rs = Object.entries(p).filter(([k, v]) => k.startsWith("r") && v != null).map(([, v]) => v as number);
    if (rs.some((r) => r < t.minResistance * (1 - 1e-12) || r > t.maxResistance * (1 + 1e-12))) {
      outOfRange++;
      for (const r of rs) {
        lowestR = Math.min(lowestR, r);
        highestR = Math.max(highestR, r);
      }
      continue;
    }
    const set = evaluateSet(kind, t, p, t.minInputImpedance != null);
    const z = set.achieved.inputImpedance;
    if (t.minInputImpedance != null && z != null && z < t.minInputImpedance * (1 - 1e-12)) {
      belowFloor++;
      continue;
    }
    inRange.push(set);
  }
  // Sensitivities only where they can decide the ranking: the meeting sets of the best error steps, until
  // those steps hold `limit` sets (ranking is by error step first, so later steps cannot move up).
  inRange.sort(compareSets);
  const meeting = inRange.filter((s) => s.meets);
  let upTo = 0;
  while (upTo < meeting.length && (upTo < t.limit || rankKey(meeting[upTo])[1] === rankKey(meeting[upTo - 1])[1])) upTo++;
  const ranked = meeting.slice(0, upTo).map((s) => withSensitivity(kind, s));
  ranked.sort(compareSets);
  const withZ = (s: SolvedSet): SolvedSet => ({ ...s, achieved: { ...s.achieved, inputImpedance: inputImpedance(kind, s.params) } });
  const sets = ranked.slice(0, t.limit).map(withZ);
  if (sets.length) return result(null, sets, [], evaluated);
  if (inRange.length) {
    const best = inRange[0];
    const worstTarget = SOLVE_TARGETS[kind].reduce((a, b) => (Math.abs(best.errors[a] ?? 0) >= Math.abs(best.errors[b] ?? 0) ? a : b));
    return result(
      `No ${t.series}/${t.capacitorSeries} set is within ±${fmt(t.tolerance * 100)} %: the closest misses ${TARGET_WORDS[worstTarget]} by ${fmt((best.errors[worstTarget] ?? 0) * 100)} %. Allow more error or use a finer series.`,
      [],
      inRange.slice(0, Math.min(3, t.limit)).map((s) => withZ(withSensitivity(kind, s))),
      evaluated,
    );
  }
  if (belowFloor > 0) {
    return result(`Every set that fits the resistor and capacitor ranges has an input impedance below the ${fmt(t.minInputImpedance as number)} Ω floor: lower the floor, or allow smaller capacitors (larger resistors).`, [], [], evaluated);
  }
  if (outOfRange > 0) {
    const side =
      highestR > t.maxResistance && lowestR >= t.minResistance
        ? `needs resistors above ${fmt(t.maxResistance)} Ω: raise the resistor maximum or the capacitor ceiling`
        : lowestR < t.minResistance && highestR <= t.maxResistance
          ? `needs resistors below ${fmt(t.minResistance)} Ω: lower the resistor minimum or the capacitor floor`
          : `cannot keep every resistor between ${fmt(t.minResistance)} Ω and ${fmt(t.maxResistance)} Ω: widen the resistor range or the capacitor range`;
    return result(`With these capacitors the target ${side}.`, [], [], evaluated);
  }
  return result("No candidate values exist for these targets and ranges.", [], [], evaluated);
}

/** A stage's current figures against targets, in the same shape as a solved set (for "current vs solved"). */
export function assessParams(kind: SolvableKind, targets: SolveTargets, params: SolvedParams): SolvedSet {
  return evaluateSet(kind, resolveTargets(targets), params);
}
