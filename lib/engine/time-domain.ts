/**
 * Time-domain runs: a sampled EMF at the source pushed through every node of the chain, each op-amp
 * held inside its usable output swing and limited to its slew rate.
 *
 * Network. The same model as the frequency engine (compile-chain.ts): every op-amp output and the EMF
 * are ideal voltage sources, each driving a net of passive L-sections loaded by the exact input
 * admittances of the stages they feed. Each node's voltage is a linear function of its net's driver
 * only, so a node is one rational transfer from that driver:
 *   - a passive section (or the source resistance): the product of the loaded section transfers
 *     T = G/(G + Y + YL) from the driver down to it;
 *   - an op-amp stage: its closed-form H = vo/den (stage-models.ts, finite gain included) times the
 *     loaded transfer from its driver to its input point.
 * These are the fast path's per-node loaded transfers with the same L-section formula and the same stage
 * polynomials, kept as polynomials in s instead of evaluated at s = jω (`loadedTransfers`; the tests hold
 * them to the fast path's sweep). Denominators are kept as lists of factors so that the load denominator
 * of a point, which reappears in the numerator of the section above it, cancels exactly.
 *
 * Discretisation: the bilinear transform s = K·(z − 1)/(z + 1) with K = ωw/tan(ωw·T/2), pre-warped at the
 * stage's dominant pole ωw (the slowest non-zero pole; no warping, K = 2/T, when that pole is above
 * 0.45·fs). Why this one: it maps the left half-plane onto the inside of the unit circle, so a stable
 * analog stage stays stable at any sample rate; it maps the whole jω axis once onto the unit circle, so
 * the response is compressed in frequency but never aliased (finite-GBW poles far above fs do no harm);
 * and with pre-warping the discrete response equals the analog one exactly at ωw, where a stage's shape
 * matters most. Equivalently it is the trapezoidal rule on the stage's state equations: the input is
 * taken as linear between samples (a step between samples n−1 and n acts at their midpoint).
 * Each transfer is factored into its poles and zeros (roots.ts) and run as a cascade of first- and
 * second-order sections in transposed direct form II, which keeps poles near z = 1 (heavy
 * oversampling) accurate where one high-order difference equation would not be.
 *
 * Limits. After its linear response, each op-amp output is limited to a change of slewRate·T per sample
 * and then clamped to its usable swing [rails.low + swingLow, rails.high − swingHigh]; the clamped
 * output is what the next net sees. The linear part of the stage does not see the clamp (no model of
 * an op-amp's internal saturation or recovery delay): after a clip, the output rejoins the linear
 * response as soon as that is back inside the band. Nodes are run one after another over the whole
 * record: a stage depends only on the nodes above it, so this equals running sample by sample.
 *
 * Operating point. Signals are run as deviations from the nominal DC operating point (the same DC
 * transfers as dc.ts: source dc, vref, vbias; the ± offset terms are not included). Filter states start
 * in steady state for the first input sample, so a recording that starts away from the source's dc
 * starts settled there. An integrator has no DC operating point: it starts at its (+) pin level as if
 * held in reset until t = 0, integrates the change of its input from the first sample on, and what it
 * feeds DC-coupled is taken from there.
 *
 * Units: seconds, hertz at the edges, volts; ω in rad/s inside.
 */
import { sourceSignal } from "./sensors";
import type { Chain, ChainNode, NodeKind, Part, Rails } from "../chain/types";
import { compileChain, type CompiledChain } from "./compile-chain";
import { TWO_PI } from "./constants";
import { dcValue } from "./dc";
import { add, mul, ONE, poly, scale, ZERO, type Poly } from "./poly";
import { polyRoots } from "./roots";
import { isOpAmpKind } from "./topology";

/** Largest record the engine accepts (samples). */
export const MAX_SAMPLES = 1_000_000;

// ---------------------------------------------------------------------------------------------------
// rationals with factored denominators

/** k·∏num / ∏den; factors are shared by reference so that equal ones cancel exactly. */
export interface Rational {
  k: number;
  num: Poly[];
  den: Poly[];
}

function cancel(r: Rational): Rational {
  const num = [...r.num];
  const den: Poly[] = [];
  for (const d of r.den) {
    const at = num.indexOf(d);
    if (at >= 0) num.splice(at, 1);
    else den.push(d);
  }
  let k = r.k;
  const fold = (list: Poly[], up: boolean) =>
    list.filter((p) => {
      if (p.length > 1) return true;
      k = up ? k * p[0] : k / p[0];
      return false;
    });
  const n2 = fold(num, true);
  const d2 = fold(den, false);
  return { k, num: n2, den: d2 };
}

const times = (a: Rational, b: Rational): Rational => cancel({ k: a.k * b.k, num: [...a.num, ...b.num], den: [...a.den, ...b.den] });

const expand = (list: Poly[]): Poly => (list.length ? mul(...list) : ONE);

/** Sum of admittances over one denominator (the product of all their factors). */
function sum(list: Rational[]): Rational | null {
  if (!list.length) return null;
  const den = list.flatMap((r) => r.den);
  const terms = list.map((r, i) => scale(mul(expand(r.num), ...list.filter((_, j) => j !== i).flatMap((x) => x.den)), r.k));
  return { k: 1, num: [add(...terms)], den };
}

// ---------------------------------------------------------------------------------------------------
// loaded transfers per node

/** What drives a node in the time domain and the rational from that driver to the node's output. */
export interface NodePlan {
  index: number;
  id: string;
  kind: NodeKind;
  /** node index of the driver (an op-amp output or a zero-resistance source), −1 for the EMF */
  driver: number;
  /** null: the node's voltage is its driver's (zero-resistance source) or its input pin's (ADC) */
  transfer: Rational | null;
}

/**
 * The rational transfer of every node from its net's driver, loading included (see the file comment).
 * ADC nodes carry the voltage of their input point and have no transfer of their own.
 */
export function loadedTransfers(cc: CompiledChain): NodePlan[] {
  const { topology, models, kinds } = cc;
  const nodes = topology.nodes;
  const n = nodes.length;
  const EMF = -1;
  const src = nodes[0];
  const srcR = src.kind === "source" ? src.params.resistance : 0;
  // a sensor source is a driver here (its legs or shunt live in the stage it feeds), except a photodiode or
  // piezo element wired into voltage stages (a Norton section), which this engine does not model yet
  if ((src.kind === "photodiode" || src.kind === "piezo") && !["transimpedance", "chargeAmp"].includes(kinds[topology.children[0][0]] ?? ""))
    throw new Error("time domain: a photodiode or piezo element wired straight into a voltage stage is not modelled here yet; put a transimpedance or charge amplifier first");
  const isDriver = (p: number) => (p === EMF ? true : p === 0 ? srcR === 0 : isOpAmpKind(kinds[p]));
  const inPoint = (i: number) => (i === 0 ? EMF : topology.parent[i]);
  const kidsOf = (p: number) => (p === EMF ? (srcR > 0 ? [0] : []) : topology.children[p]);

  const section = (i: number): { g: Poly; y: Poly } | null => {
    const node = nodes[i];
    if (node.kind === "rcLowpass") return { g: poly(1 / node.params.r), y: poly(0, node.params.c) };
    if (node.kind === "rcHighpass") return { g: poly(0, node.params.c), y: poly(1 / node.params.r) };
    if (node.kind === "source" && srcR > 0) return { g: poly(1 / srcR), y: ZERO };
    return null;
  };

  const yin: (Rational | null | undefined)[] = new Array(n);
  const tSec: (Rational | null)[] = new Array(n).fill(null);
  const loadAt = (p: number): Rational | null => sum(kidsOf(p).map(admittance).filter((x): x is Rational => x !== null));
  function admittance(i: number): Rational | null {
    if (yin[i] !== undefined) return yin[i]!;
    const node = nodes[i];
    let out: Rational | null = null;
    const m = models[i];
    if (m) {
      out = m.vin.iin.length === 1 && m.vin.iin[0] === 0 ? null : { k: 1, num: [m.vin.iin], den: [m.den] };
    } else if (node.kind === "adc") {
      out = node.params.inputResistance === null ? null : { k: 1 / node.params.inputResistance, num: [], den: [] };
    } else {
      const sec = section(i);
      if (sec) {
        const load = loadAt(i);
        const nl = load ? scale(expand(load.num), load.k) : ZERO;
        const dlFactors = load ? load.den : [];
        const dl = expand(dlFactors);
        const q = add(mul(add(sec.g, sec.y), dl), nl);
        tSec[i] = cancel({ k: 1, num: [sec.g, ...dlFactors], den: [q] });
        out = { k: 1, num: [mul(sec.g, add(mul(sec.y, dl), nl))], den: [q] };
      }
    }
    yin[i] = out;
    return out;
  }
  // sections bottom-up (children after parents in topology order)
  for (let i = n - 1; i >= 0; i--) admittance(i);

  const driverOf = (p: number): number => (isDriver(p) ? p : driverOf(inPoint(p)));
  const toPoint: (Rational | null)[] = new Array(n).fill(null);
  const fromDriver = (p: number): Rational => {
    const unit: Rational = { k: 1, num: [], den: [] };
    if (isDriver(p)) return unit;
    return toPoint[p]!;
  };
  const plans: NodePlan[] = [];
  for (let i = 0; i < n; i++) {
    const kind = kinds[i];
    const base = { index: i, id: nodes[i].id, kind };
    if (kind === "adc") {
      const p = inPoint(i);
      plans.push({ ...base, driver: driverOf(p), transfer: null });
      continue;
    }
    const up = inPoint(i);
    const m = models[i];
    if (m) {
      const h: Rational = { k: 1, num: [m.vin.vo], den: [m.den] };
      plans.push({ ...base, driver: driverOf(up), transfer: times(h, fromDriver(up)) });
    } else if (i === 0 && srcR === 0) {
      plans.push({ ...base, driver: EMF, transfer: null });
    } else {
      const t = times(tSec[i]!, fromDriver(up));
      toPoint[i] = t;
      plans.push({ ...base, driver: driverOf(up), transfer: t });
    }
  }
  return plans;
}

/** Value of a rational at s = jω (ω rad/s), for the tests and the diagnostics. */
export function rationalAt(r: Rational, w: number): [number, number] {
  let re = r.k;
  let im = 0;
  const ev = (p: Poly): [number, number] => {
    let a = p[p.length - 1];
    let b = 0;
    for (let k = p.length - 2; k >= 0; k--) {
      const t = p[k] - b * w;
      b = a * w;
      a = t;
    }
    return [a, b];
  };
  for (const p of r.num) {
    const [a, b] = ev(p);
    [re, im] = [re * a - im * b, re * b + im * a];
  }
  for (const p of r.den) {
    const [a, b] = ev(p);
    const d = a * a + b * b;
    [re, im] = [(re * a + im * b) / d, (im * a - re * b) / d];
  }
  return [re, im];
}

// ---------------------------------------------------------------------------------------------------
// discretisation

/** A cascade of sections b0 + b1·z⁻¹ + b2·z⁻² over 1 + a1·z⁻¹ + a2·z⁻², 5 numbers per section. */
export interface DiscreteFilter {
  /** b0, b1, b2, a1, a2 per section; the overall gain is in the first section */
  sos: Float64Array;
  sections: number;
  /** Hz at which the discrete response equals the analog one exactly (null: no pre-warping) */
  warpHz: number | null;
  /** a pole at s = 0 (an integrator): no DC steady state */
  integrates: boolean;
  /** a pole in the right half-plane: the stage is unstable on its own */
  unstable: boolean;
  /** analog poles, rad/s (for diagnostics) */
  poles: { re: number; im: number }[];
}

interface Cx {
  re: number;
  im: number;
}

/** Real coefficients [c1, c2] of ∏(1 − r·z⁻¹) for one real root or a conjugate pair (c2 = 0 for one). */
type Group = { c1: number; c2: number; roots: Cx[] };

function groupsOf(roots: Cx[], what: string): Group[] {
  const reals = roots.filter((r) => r.im === 0).sort((a, b) => a.re - b.re);
  const upper = roots.filter((r) => r.im > 0);
  if (upper.length !== roots.filter((r) => r.im < 0).length) throw new Error(`time domain: ${what} do not come in conjugate pairs`);
  const groups: Group[] = upper.map((r) => ({ c1: -2 * r.re, c2: r.re * r.re + r.im * r.im, roots: [r, { re: r.re, im: -r.im }] }));
  for (let k = 0; k < reals.length; k += 2) {
    const a = reals[k].re;
    if (k + 1 < reals.length) {
      const b = reals[k + 1].re;
      groups.push({ c1: -(a + b), c2: a * b, roots: [reals[k], reals[k + 1]] });
    } else groups.push({ c1: -a, c2: 0, roots: [reals[k]] });
  }
  return groups;
}

/**
 * Bilinear transform of a rational at sample rate fs, pre-warped at its dominant pole (file comment).
 * `warpHz` overrides the warping frequency.
 */
export function discretise(r: Rational, fs: number, warpHz?: number): DiscreteFilter {
  const zeros: Cx[] = [];
  const poles: Cx[] = [];
  let k = r.k;
  for (const p of r.num) {
    const rt = polyRoots(p);
    k *= p[p.length - 1];
    for (let j = 0; j < rt.re.length; j++) zeros.push({ re: rt.re[j], im: rt.im[j] });
  }
  for (const p of r.den) {
    const rt = polyRoots(p);
    k /= p[p.length - 1];
    for (let j = 0; j < rt.re.length; j++) poles.push({ re: rt.re[j], im: rt.im[j] });
  }
  // cancel pole-zero pairs that coincide (exactly at 0, or to rounding elsewhere)
  for (let i = poles.length - 1; i >= 0; i--) {
    const p = poles[i];
    const mag = Math.hypot(p.re, p.im);
    const j = zeros.findIndex((z) => Math.hypot(z.re - p.re, z.im - p.im) <= 1e-9 * mag || (mag === 0 && z.re === 0 && z.im === 0));
    if (j >= 0) {
      zeros.splice(j, 1);
      poles.splice(i, 1);
    }
  }
  if (zeros.length > poles.length) throw new Error("time domain: a stage transfer with more zeros than poles cannot be sampled");
  const T = 1 / fs;
  let wW = Infinity;
  for (const p of poles) {
    const m = Math.hypot(p.re, p.im);
    if (m > 0 && m < wW) wW = m;
  }
  if (warpHz !== undefined) wW = TWO_PI * warpHz;
  const warped = Number.isFinite(wW) && wW < 0.45 * TWO_PI * fs;
  const K = warped ? wW / Math.tan((wW * T) / 2) : 2 * fs;
  // (s − r) = (K − r)·(1 − zr·z⁻¹)·z/(z + 1), zr = (K + r)/(K − r)
  let gr = k;
  let gi = 0;
  const mapRoot = (x: Cx, up: boolean): Cx => {
    const ar = K - x.re;
    const ai = -x.im;
    if (up) [gr, gi] = [gr * ar - gi * ai, gr * ai + gi * ar];
    else {
      const d = ar * ar + ai * ai;
      [gr, gi] = [(gr * ar + gi * ai) / d, (gi * ar - gr * ai) / d];
    }
    const br = K + x.re;
    const bi = x.im;
    const d = ar * ar + ai * ai;
    const zr = (br * ar + bi * ai) / d;
    const zi = (bi * ar - br * ai) / d;
    // a real root stays real; keep the sign of the imaginary part for pairing
    return { re: zr, im: x.im === 0 ? 0 : zi };
  };
  const zz = zeros.map((z) => mapRoot(z, true));
  const zp = poles.map((p) => mapRoot(p, false));
  for (let j = zeros.length; j < poles.length; j++) zz.push({ re: -1, im: 0 });
  const g = gr;
  const pg = groupsOf(zp, "poles");
  const zg = groupsOf(zz, "zeros");
  // pair each pole group with the nearest zero group of the same size (closest to the unit circle first)
  const dist = (a: Group, b: Group) => Math.min(...a.roots.flatMap((x) => b.roots.map((y) => Math.hypot(x.re - y.re, x.im - y.im))));
  const radius = (a: Group) => Math.max(...a.roots.map((x) => Math.hypot(x.re, x.im)));
  pg.sort((a, b) => radius(b) - radius(a));
  const free = [...zg];
  const sos = new Float64Array(5 * Math.max(1, pg.length));
  if (!pg.length) sos[0] = g; // a pure gain
  pg.forEach((p, s) => {
    let best = -1;
    for (let j = 0; j < free.length; j++) {
      if (free[j].roots.length !== p.roots.length) continue;
      if (best < 0 || dist(p, free[j]) < dist(p, free[best])) best = j;
    }
    const z = best >= 0 ? free.splice(best, 1)[0] : { c1: 0, c2: 0, roots: [] };
    const gain = s === 0 ? g : 1;
    sos.set([gain, gain * z.c1, gain * z.c2, p.c1, p.c2], 5 * s);
  });
  return {
    sos,
    sections: Math.max(1, pg.length),
    warpHz: warped ? wW / TWO_PI : null,
    integrates: poles.some((p) => p.re === 0 && p.im === 0),
    unstable: poles.some((p) => p.re > 1e-9 * Math.hypot(p.re, p.im)),
    poles,
  };
}

/** The discrete filter's response at f Hz, H(e^{j2πf/fs}) as [re, im]. */
export function discreteAt(f: DiscreteFilter, fHz: number, fs: number): [number, number] {
  const th = (TWO_PI * fHz) / fs;
  const c1 = Math.cos(th);
  const s1 = -Math.sin(th);
  const c2 = Math.cos(2 * th);
  const s2 = -Math.sin(2 * th);
  let re = 1;
  let im = 0;
  for (let s = 0; s < f.sections; s++) {
    const [b0, b1, b2, a1, a2] = f.sos.subarray(5 * s, 5 * s + 5);
    const nr = b0 + b1 * c1 + b2 * c2;
    const ni = b1 * s1 + b2 * s2;
    const dr = 1 + a1 * c1 + a2 * c2;
    const di = a1 * s1 + a2 * s2;
    const d = dr * dr + di * di;
    const hr = (nr * dr + ni * di) / d;
    const hi = (ni * dr - nr * di) / d;
    [re, im] = [re * hr - im * hi, re * hi + im * hr];
  }
  return [re, im];
}

/**
 * Runs the cascade over x − offset into y (may be the same array as x only if offset is 0), every
 * section started in steady state for the first input sample (zero state for an integrator).
 */
export function runFilter(f: DiscreteFilter, x: Float64Array, offset: number, y: Float64Array): void {
  const n = x.length;
  let u0 = n ? x[0] - offset : 0;
  if (f.integrates) {
    offset += u0;
    u0 = 0;
  }
  for (let s = 0; s < f.sections; s++) {
    const o = 5 * s;
    const b0 = f.sos[o], b1 = f.sos[o + 1], b2 = f.sos[o + 2], a1 = f.sos[o + 3], a2 = f.sos[o + 4];
    const dc = 1 + a1 + a2;
    const y0 = u0 === 0 || dc === 0 ? 0 : (u0 * (b0 + b1 + b2)) / dc;
    let s2 = u0 === 0 ? 0 : b2 * u0 - a2 * y0;
    let s1 = u0 === 0 ? 0 : b1 * u0 - a1 * y0 + s2;
    const src = s === 0 ? x : y;
    const off = s === 0 ? offset : 0;
    for (let i = 0; i < n; i++) {
      const xi = src[i] - off;
      const yi = b0 * xi + s1;
      s1 = b1 * xi - a1 * yi + s2;
      s2 = b2 * xi - a2 * yi;
      y[i] = yi;
    }
    u0 = y0;
  }
}

// ---------------------------------------------------------------------------------------------------
// stimuli

export type Stimulus =
  | { kind: "step"; at: number; amplitude: number }
  | { kind: "pulse"; at: number; width: number; amplitude: number }
  | { kind: "burst"; at: number; frequency: number; cycles: number; amplitude: number }
  | { kind: "chirp"; at: number; duration: number; f1: number; f2: number; amplitude: number };

export const STIMULUS_KINDS = ["step", "pulse", "burst", "chirp"] as const;

/**
 * The EMF in volts: `offset` (the source's dc by default) plus the stimulus, at n samples of rate fs.
 * The chirp sweeps logarithmically from f1 to f2 over its duration (equal time per decade), then stops.
 */
export function stimulusWave(st: Stimulus, fs: number, n: number, offset = 0): Float64Array {
  if (!(n >= 1 && n <= MAX_SAMPLES && Number.isInteger(n))) throw new Error(`samples: between 1 and ${MAX_SAMPLES}`);
  const out = new Float64Array(n).fill(offset);
  const T = 1 / fs;
  const first = Math.max(0, Math.ceil(st.at * fs - 1e-9));
  for (let i = first; i < n; i++) {
    const t = i * T - st.at;
    let v = 0;
    switch (st.kind) {
      case "step":
        v = st.amplitude;
        break;
      case "pulse":
        v = t < st.width ? st.amplitude : 0;
        break;
      case "burst":
        v = t < st.cycles / st.frequency ? st.amplitude * Math.sin(TWO_PI * st.frequency * t) : 0;
        break;
      case "chirp": {
        if (t >= st.duration) break;
        const ratio = st.f2 / st.f1;
        const phase =
          ratio === 1 ? TWO_PI * st.f1 * t : (TWO_PI * st.f1 * st.duration * (Math.pow(ratio, t / st.duration) - 1)) / Math.log(ratio);
        v = st.amplitude * Math.sin(phase);
        break;
      }
    }
    out[i] += v;
  }
  return out;
}

// ---------------------------------------------------------------------------------------------------
// the run

/** A stretch of samples [start, end) where a limit acted. */
export interface ClipSpan {
  start: number;
  end: number;
  side: "low" | "high" | "slew";
  /** the most extreme value the linear response asked for in the span (slew: the largest step, V) */
  peak: number;
}

export interface NodeTrace {
  id: string;
  kind: NodeKind;
  label?: string;
  /** volts at the node's output (ADC: its input pin), one per sample */
  v: Float64Array;
  /** nominal DC operating point, V */
  baseline: number;
  rails: Rails | null;
  /** op-amp: usable output swing; ADC: its input range; null otherwise */
  band: { low: number; high: number } | null;
  /** clamped stretches (op-amp) or out-of-range stretches (ADC input, not clamped) */
  clips: ClipSpan[];
  /** stretches where the slew rate limited the output */
  slews: ClipSpan[];
  /** true when more spans happened than are listed */
  spansTruncated: boolean;
  /** samples outside the band in total */
  clippedSamples: number;
  warpHz: number | null;
  sections: number;
  unstable: boolean;
}

export interface WaveformRun {
  sampleRate: number;
  samples: number;
  emf: Float64Array;
  nodes: NodeTrace[];
}

export interface RunOptions {
  sampleRate: number;
  /** false: no clamp and no slew limit (the linear response) */
  limits?: boolean;
  /** most spans kept per node and kind (default 1000) */
  maxSpans?: number;
}

const partFor = (chain: Chain, node: ChainNode): Part | undefined => {
  const key = "part" in node ? node.part : null;
  return key ? chain.parts[key] : undefined;
};

/** Nominal DC of every node's output (ADC: input pin), integrators at their (+) pin (file comment). */
export function nominalOperatingPoint(chain: Chain, cc: CompiledChain): Float64Array {
  const n = cc.nodeIds.length;
  const m = cc.sources.length;
  const re = new Float64Array(m);
  const im = new Float64Array(m);
  const src = cc.topology.nodes[0];
  const emfDc = sourceSignal(src).dc;
  const fixed = new Float64Array(m);
  const driftNode = new Int32Array(m).fill(-1);
  cc.sources.forEach((s, k) => {
    if (s.type === "emf") fixed[k] = emfDc;
    else if (s.type === "drift") driftNode[k] = s.node;
    else {
      const v = dcValue(chain, s);
      if (v && !v.symmetric) fixed[k] = v.value;
    }
  });
  const base = new Float64Array(n);
  cc.setFrequency(0);
  const level = (i: number, plus: boolean) => {
    cc.transfersTo(i, plus, re, im);
    let v = 0;
    for (let k = 0; k < m; k++) {
      if (re[k] === 0) continue;
      if (driftNode[k] >= 0) {
        if (driftNode[k] !== i) v += re[k] * base[driftNode[k]];
      } else v += re[k] * fixed[k];
    }
    return v;
  };
  for (let i = 0; i < n; i++) base[i] = level(i, cc.kinds[i] === "integrator");
  return base;
}

function spansOf(
  flags: Int8Array,
  lin: Float64Array,
  code: number,
  side: ClipSpan["side"],
  max: number,
): { spans: ClipSpan[]; truncated: boolean; total: number } {
  const spans: ClipSpan[] = [];
  let truncated = false;
  let total = 0;
  for (let i = 0; i < flags.length; ) {
    if (flags[i] !== code) {
      i++;
      continue;
    }
    let j = i;
    let peak = lin[i];
    while (j < flags.length && flags[j] === code) {
      const v = lin[j];
      if (side === "high" ? v > peak : side === "low" ? v < peak : Math.abs(v) > Math.abs(peak)) peak = v;
      j++;
    }
    total += j - i;
    if (spans.length < max) spans.push({ start: i, end: j, side, peak });
    else truncated = true;
    i = j;
  }
  return { spans, truncated, total };
}

/** A compiled plan for one chain and sample rate: run it on any number of records. */
export interface TimeDomainPlan {
  chain: Chain;
  sampleRate: number;
  plans: NodePlan[];
  filters: (DiscreteFilter | null)[];
  baseline: Float64Array;
  run(emf: Float64Array, opts?: Omit<RunOptions, "sampleRate">): WaveformRun;
}

export function planTimeDomain(chain: Chain, sampleRate: number): TimeDomainPlan {
  if (!(sampleRate > 0 && Number.isFinite(sampleRate))) throw new Error("sampleRate: a positive number of hertz");
  const cc = compileChain(chain);
  const plans = loadedTransfers(cc);
  const filters = plans.map((p) => (p.transfer ? discretise(p.transfer, sampleRate) : null));
  const baseline = nominalOperatingPoint(chain, cc);
  const nodes = cc.topology.nodes;
  const src = nodes[0];
  const emfDc = sourceSignal(src).dc;

  const run = (emf: Float64Array, opts: Omit<RunOptions, "sampleRate"> = {}): WaveformRun => {
    const N = emf.length;
    if (N < 1 || N > MAX_SAMPLES) throw new Error(`samples: between 1 and ${MAX_SAMPLES}, got ${N}`);
    const limits = opts.limits !== false;
    const maxSpans = opts.maxSpans ?? 1000;
    const dt = 1 / sampleRate;
    const out: Float64Array[] = new Array(plans.length);
    const traces: NodeTrace[] = [];
    const flags = new Int8Array(N);
    const lin = new Float64Array(N);
    for (const p of plans) {
      const node = nodes[p.index];
      const inArr = p.driver < 0 ? emf : out[p.driver];
      const inBase = p.driver < 0 ? emfDc : baseline[p.driver];
      const f = filters[p.index];
      let v: Float64Array;
      let band: NodeTrace["band"] = null;
      let rails: Rails | null = null;
      let clips: ClipSpan[] = [];
      let slews: ClipSpan[] = [];
      let truncated = false;
      let clipped = 0;
      if (p.kind === "adc") {
        v = out[cc.topology.parent[p.index]];
      } else if (!f) {
        v = p.driver < 0 ? Float64Array.from(emf) : out[p.driver];
      } else {
        v = new Float64Array(N);
        runFilter(f, inArr, inBase, v);
        const b = baseline[p.index];
        for (let i = 0; i < N; i++) v[i] += b;
      }
      if (isOpAmpKind(p.kind) && "rails" in node) {
        rails = node.rails;
        const part = partFor(chain, node);
        band = { low: node.rails.low + (part?.swingLow ?? 0), high: node.rails.high - (part?.swingHigh ?? 0) };
        if (limits) {
          const step = part?.slewRate !== undefined ? part.slewRate * dt : Infinity;
          lin.set(v);
          flags.fill(0);
          let prev = Math.min(band.high, Math.max(band.low, v[0]));
          for (let i = 0; i < N; i++) {
            const want = v[i];
            let y = want;
            if (i > 0 && y > prev + step) {
              y = prev + step;
              flags[i] = 3;
            } else if (i > 0 && y < prev - step) {
              y = prev - step;
              flags[i] = 3;
            }
            if (y > band.high) {
              y = band.high;
              flags[i] = 1;
            } else if (y < band.low) {
              y = band.low;
              flags[i] = 2;
            }
            if (flags[i] === 3) lin[i] = want - prev; // the step it asked for
            v[i] = y;
            prev = y;
          }
          const hi = spansOf(flags, lin, 1, "high", maxSpans);
          const lo = spansOf(flags, lin, 2, "low", maxSpans);
          const sl = spansOf(flags, lin, 3, "slew", maxSpans);
          clips = [...hi.spans, ...lo.spans].sort((a, c) => a.start - c.start);
          slews = sl.spans;
          truncated = hi.truncated || lo.truncated || sl.truncated;
          clipped = hi.total + lo.total;
        }
      } else if (p.kind === "adc" && node.kind === "adc") {
        band = { low: node.params.vinLow, high: node.params.vinHigh };
        flags.fill(0);
        for (let i = 0; i < N; i++) flags[i] = v[i] > band.high ? 1 : v[i] < band.low ? 2 : 0;
        const hi = spansOf(flags, v, 1, "high", maxSpans);
        const lo = spansOf(flags, v, 2, "low", maxSpans);
        clips = [...hi.spans, ...lo.spans].sort((a, c) => a.start - c.start);
        truncated = hi.truncated || lo.truncated;
        clipped = hi.total + lo.total;
      }
      out[p.index] = v;
      traces.push({
        id: p.id,
        kind: p.kind,
        ...(node.label ? { label: node.label } : {}),
        v,
        baseline: baseline[p.index],
        rails,
        band,
        clips,
        slews,
        spansTruncated: truncated,
        clippedSamples: clipped,
        warpHz: f?.warpHz ?? null,
        sections: f?.sections ?? 0,
        unstable: f?.unstable ?? false,
      });
    }
    return { sampleRate, samples: N, emf, nodes: traces };
  };
  return { chain, sampleRate, plans, filters, baseline, run };
}

/** One call: plan and run. */
export function runWaveform(chain: Chain, emf: Float64Array, opts: RunOptions): WaveformRun {
  return planTimeDomain(chain, opts.sampleRate).run(emf, opts);
}

// ---------------------------------------------------------------------------------------------------
// display

/**
 * Min/max decimation for drawing: samples [from, to) cut into `buckets` runs, each giving its minimum
 * and maximum in time order, so every peak survives however far the record is zoomed out.
 * Returns sample indices (for the time axis) and values, at most 2·buckets points.
 */
export function minMaxDecimate(v: ArrayLike<number>, buckets: number, from = 0, to = v.length): { index: Uint32Array; value: Float64Array } {
  const len = Math.max(0, to - from);
  if (len <= 2 * buckets) {
    const index = new Uint32Array(len);
    const value = new Float64Array(len);
    for (let i = 0; i < len; i++) {
      index[i] = from + i;
      value[i] = v[from + i];
    }
    return { index, value };
  }
  const index = new Uint32Array(2 * buckets);
  const value = new Float64Array(2 * buckets);
  for (let b = 0; b < buckets; b++) {
    const s = from + Math.floor((b * len) / buckets);
    const e = from + Math.floor(((b + 1) * len) / buckets);
    let lo = s;
    let hi = s;
    for (let i = s + 1; i < e; i++) {
      if (v[i] < v[lo]) lo = i;
      if (v[i] > v[hi]) hi = i;
    }
    const [a, c] = lo <= hi ? [lo, hi] : [hi, lo];
    index[2 * b] = a;
    value[2 * b] = v[a];
    index[2 * b + 1] = c;
    value[2 * b + 1] = v[c];
  }
  return { index, value };
}
