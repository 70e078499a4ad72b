/**
 * Frequency grids and the two numerical reductions done on them: the maximum of a response over a band
 * and the integral of a density over a band. Frequencies in Hz at this level (they are band limits given
 * by the user); integration is done in u = ln f.
 */
import { DC_BAND_DECADES, PEAK_POINTS_PER_DECADE } from "./constants";

/** n log-spaced points from a to b inclusive; both ends exact. a, b > 0. */
export function logGrid(a: number, b: number, n: number): Float64Array {
  const out = new Float64Array(n);
  if (n === 1) {
    out[0] = a;
    return out;
  }
  const la = Math.log(a);
  const step = (Math.log(b) - la) / (n - 1);
  for (let i = 0; i < n; i++) out[i] = Math.exp(la + i * step);
  out[0] = a;
  out[n - 1] = b;
  return out;
}

/**
 * Dense grid over a band [lo, hi] with exact limits, PEAK_POINTS_PER_DECADE per decade (at least 33
 * points). lo = 0 puts f = 0 first, then a log grid from hi·10^−DC_BAND_DECADES. lo = hi gives one point.
 */
export function bandGrid(lo: number, hi: number, perDecade = PEAK_POINTS_PER_DECADE): Float64Array {
  if (!(hi > lo)) return Float64Array.of(lo);
  if (lo === 0) {
    const start = hi * 10 ** -DC_BAND_DECADES;
    const g = bandGrid(start, hi, perDecade);
    const out = new Float64Array(g.length + 1);
    out.set(g, 1);
    return out;
  }
  // the difference of logs, not log of the ratio: hi/lo overflows to Infinity for a subnormal lo (found by tests/fuzz)
  const decades = Math.log10(hi) - Math.log10(lo);
  return logGrid(lo, hi, Math.max(33, Math.ceil(decades * perDecade) + 1));
}

export interface BandPeak {
  /** largest value found (may be Infinity or NaN when a sample was not finite) */
  value: number;
  /** frequency where it is reached, Hz */
  f: number;
}

/**
 * The best sample of a band and the bracket to refine it in (ln f of its two neighbours), or no bracket
 * when there is nothing to refine: a sample that is not finite (returned as is), fewer than three
 * samples, or a best sample next to f = 0 (the log search cannot start there; the samples are dense).
 */
interface BestSample {
  peak: BandPeak;
  best: number;
  search: { a: number; b: number } | null;
}

function bestSample(grid: Float64Array, values: ArrayLike<number>): BestSample {
  let best = 0;
  for (let i = 0; i < grid.length; i++) {
    const v = values[i];
    if (!Number.isFinite(v)) return { peak: { value: v, f: grid[i] }, best: i, search: null };
    if (v > values[best]) best = i;
  }
  const peak = { value: values[best], f: grid[best] };
  if (grid.length < 3) return { peak, best, search: null };
  const lo = grid[Math.max(0, best - 1)];
  const hi = grid[Math.min(grid.length - 1, best + 1)];
  if (!(lo > 0)) return { peak, best, search: null };
  return { peak, best, search: { a: Math.log(lo), b: Math.log(hi) } };
}

/**
 * Golden-section search for the maximum over a band, as a state machine: `next()` gives the frequency
 * (Hz) to evaluate, or null when done, and `feed(value)` hands its value back. Samples on `grid` (values
 * given) pick the best sample; the search then runs in ln f between its neighbours until the bracket
 * is under 1e-10 (relative, 80 steps at most; near a smooth maximum the value then agrees with the true peak to about 1e-20, far below rounding). The band limits are grid points, so an edge maximum is
 * exact. A non-finite sample is returned as is (the caller reports it). Written as a stepper so that
 * many searches can share one evaluation per step (`bandMaxMany`) and give the same numbers as one
 * search alone (`bandMax`).
 */
class GoldenSearch {
  peak: BandPeak;
  private state = 0; // 0 wants f1, 1 wants f2, 2 between steps, 4 wants the new point's value, 3 done
  private a = 0;
  private b = 0;
  private x1 = 0;
  private x2 = 0;
  private f1 = 0;
  private f2 = 0;
  private it = 0;
  /** which of x1 (true) or x2 the pending value is for, while iterating */
  private wantX1 = false;
  private static readonly G = (Math.sqrt(5) - 1) / 2;

  /** `tol`: the bracket (in ln f, relative) at which the search stops; 1e-10 unless told */
  constructor(
    start: BestSample,
    private readonly tol = 1e-10,
  ) {
    this.peak = start.peak;
    if (!start.search) {
      this.state = 3;
      return;
    }
    const g = GoldenSearch.G;
    this.a = start.search.a;
    this.b = start.search.b;
    this.x1 = this.b - g * (this.b - this.a);
    this.x2 = this.a + g * (this.b - this.a);
  }

  /** The next frequency to evaluate (Hz), or null when the search is over. Call `feed` before asking again. */
  next(): number | null {
    switch (this.state) {
      case 0:
        return Math.exp(this.x1);
      case 1:
        return Math.exp(this.x2);
      case 2:
        if (!(this.it < 80 && this.b - this.a > this.tol * Math.max(1, Math.abs(this.a)))) {
          this.finish();
          return null;
        }
        this.narrow();
        this.state = 4;
        return Math.exp(this.wantX1 ? this.x1 : this.x2);
      case 4:
        return Math.exp(this.wantX1 ? this.x1 : this.x2);
      default:
        return null;
    }
  }

  /** The value at the frequency `next()` gave. */
  feed(v: number): void {
    if (this.state === 0) {
      this.f1 = v;
      this.state = 1;
    } else if (this.state === 1) {
      this.f2 = v;
      this.state = 2;
    } else if (this.state === 4) {
      if (this.wantX1) this.f1 = v;
      else this.f2 = v;
      this.it++;
      this.state = 2;
    }
  }

  /** Keeps the better of the two inner points inside the bracket and places the new one. */
  private narrow(): void {
    const g = GoldenSearch.G;
    if (this.f1 >= this.f2) {
      this.b = this.x2;
      this.x2 = this.x1;
      this.f2 = this.f1;
      this.x1 = this.b - g * (this.b - this.a);
      this.wantX1 = true;
    } else {
      this.a = this.x1;
      this.x1 = this.x2;
      this.f1 = this.f2;
      this.x2 = this.a + g * (this.b - this.a);
      this.wantX1 = false;
    }
  }

  private finish(): void {
    this.state = 3;
    if (this.f1 > this.peak.value) this.peak = { value: this.f1, f: Math.exp(this.x1) };
    if (this.f2 > this.peak.value) this.peak = { value: this.f2, f: Math.exp(this.x2) };
  }
}


/**
 * Brent's method for the maximum in the same bracket as GoldenSearch (Brent, "Algorithms for Minimization
 * without Derivatives", 1973, ch. 5; cited from memory, in the arrangement of Numerical Recipes' `brent`):
 * parabolic steps through the three best points so far, with a golden-section step whenever the parabola
 * would leave the bracket or not shrink fast enough. The first parabola goes through the best grid sample
 * and its two neighbours, whose values are known. Near a smooth maximum it converges superlinearly, so
 * it needs about a third of the golden search's evaluations for the same bracket; it stops once the
 * bracket around the best point is under `tol` (ln f, relative, as GoldenSearch) and returns the best
 * value seen (the grid's best sample included). Same stepper shape as GoldenSearch (`next`/`feed`).
 */
class BrentSearch {
  peak: BandPeak;
  private done = false;
  private a = 0;
  private b = 0;
  // x: best point so far, w: second best, v: the one before (ln f), with their values (negated: minimised)
  private x = 0;
  private w = 0;
  private v = 0;
  private fx = 0;
  private fw = 0;
  private fv = 0;
  private d = 0;
  private e = 0;
  private u = 0;
  private it = 0;
  /** +1 / −1 while the probe inside the lower / upper band limit is pending, else 0 */
  private edge = 0;
  private static readonly CGOLD = 0.381966011250105;

  /** the grid and its values: the best sample's neighbours seed the first parabola */
  constructor(grid: Float64Array, values: ArrayLike<number>, start: BestSample, private readonly tol = 1e-10) {
    this.peak = start.peak;
    if (!start.search) {
      this.done = true;
      return;
    }
    const i = start.best;
    this.a = start.search.a;
    this.b = start.search.b;
    this.x = Math.log(grid[i]);
    this.fx = -values[i];
    if (i === 0 || i === grid.length - 1) {
      // best at a band limit: one probe just inside says which way the function goes there; falling, the
      // limit is the maximum of the bracket (as for the golden search, the function is taken to have one
      // maximum between two samples), rising, the probe starts Brent's search
      this.edge = i === 0 ? 1 : -1;
      this.u = this.x + this.edge * this.tol * Math.max(1, Math.abs(this.x));
      this.w = this.v = Math.log(grid[i === 0 ? 1 : i - 1]);
      this.fw = this.fv = -values[i === 0 ? 1 : i - 1];
      return;
    }
    // the neighbours seed the first parabola (an edge sample has one neighbour: it stands for both)
    const left = Math.max(0, i - 1);
    const right = Math.min(grid.length - 1, i + 1);
    const [wi, vi] = values[left] >= values[right] ? [left, right] : [right, left];
    this.w = Math.log(grid[wi]);
    this.fw = -values[wi];
    this.v = Math.log(grid[vi]);
    this.fv = -values[vi];
    // as if the last two steps had spanned the bracket, so the first parabola is tried at once
    this.d = this.e = this.b - this.a;
    this.plan();
  }

  /** Picks the next point u, or ends the search. */
  private plan(): void {
    const { a, b, x, w, v, fx, fw, fv } = this;
    const xm = 0.5 * (a + b);
    const tol1 = (this.tol * Math.max(1, Math.abs(x))) / 4;
    const tol2 = 2 * tol1;
    if (this.it >= 80 || Math.abs(x - xm) <= tol2 - 0.5 * (b - a)) {
      this.finish();
      return;
    }
    let golden = true;
    if (Math.abs(this.e) > tol1 && x !== w && x !== v && w !== v) {
      let r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      q = Math.abs(q);
      const etemp = this.e;
      r = this.d;
      if (!(Math.abs(p) >= Math.abs(0.5 * q * etemp) || p <= q * (a - x) || p >= q * (b - x))) {
        this.e = r;
        this.d = p / q;
        const u = x + this.d;
        if (u - a < tol2 || b - u < tol2) this.d = xm - x >= 0 ? tol1 : -tol1;
        golden = false;
      }
    }
    if (golden) {
      this.e = x >= xm ? a - x : b - x;
      this.d = BrentSearch.CGOLD * this.e;
    }
    this.u = Math.abs(this.d) >= tol1 ? x + this.d : x + (this.d >= 0 ? tol1 : -tol1);
  }

  next(): number | null {
    return this.done ? null : Math.exp(this.u);
  }

  feed(value: number): void {
    if (this.done) return;
    const u = this.u;
    const fu = -value;
    this.it++;
    if (this.edge) {
      this.edge = 0;
      if (!(fu < this.fx)) {
        this.finish();
        return;
      }
      // rising: the probe becomes the best point and Brent's search goes on from there (the limit is w)
      this.d = this.e = this.b - this.a;
    }
    if (fu <= this.fx) {
      if (u >= this.x) this.a = this.x;
      else this.b = this.x;
      this.v = this.w;
      this.fv = this.fw;
      this.w = this.x;
      this.fw = this.fx;
      this.x = u;
      this.fx = fu;
    } else {
      if (u < this.x) this.a = u;
      else this.b = u;
      if (fu <= this.fw || this.w === this.x) {
        this.v = this.w;
        this.fv = this.fw;
        this.w = u;
        this.fw = fu;
      } else if (fu <= this.fv || this.v === this.x || this.v === this.w) {
        this.v = u;
        this.fv = fu;
      }
    }
    this.plan();
  }

  private finish(): void {
    this.done = true;
    if (-this.fx > this.peak.value) this.peak = { value: -this.fx, f: Math.exp(this.x) };
  }
}

/**
 * Maximum of a function over a band, from samples on `grid` (values given) refined by golden-section
 * search in ln f between the neighbours of the best sample (GoldenSearch). The band limits are grid
 * points, so an edge maximum is exact. A non-finite sample is returned as is (the caller reports it).
 */
export function bandMax(grid: Float64Array, values: ArrayLike<number>, fn: (f: number) => number): BandPeak {
  const s = new GoldenSearch(bestSample(grid, values));
  for (let f = s.next(); f !== null; f = s.next()) s.feed(fn(f));
  return s.peak;
}

/**
 * Several `bandMax` searches run side by side: each step asks `evaluate` once for every search still
 * running, with `freqs[j]` the frequency search `which[j]` needs and `out[j]` its value to fill in. The
 * results are those of running each search alone with the same function (the steps do not interact),
 * at the cost of one batched evaluation per step instead of one per point.
 */
export function bandMaxMany(
  searches: { grid: Float64Array; values: ArrayLike<number> }[],
  evaluate: (freqs: Float64Array, which: Int32Array, out: Float64Array, count: number) => void,
  /** bracket at which each search stops (ln f, relative); the default 1e-10 is what analyzeChain uses */
  tol?: number,
  /** the refinement: golden section (analyzeChain) or Brent's method (the spread's builds) */
  method: "golden" | "brent" = "golden",
): BandPeak[] {
  const list = searches.map((s) => {
    const start = bestSample(s.grid, s.values);
    return method === "brent" ? new BrentSearch(s.grid, s.values, start, tol) : new GoldenSearch(start, tol);
  });
  const freqs = new Float64Array(list.length);
  const which = new Int32Array(list.length);
  const out = new Float64Array(list.length);
  for (;;) {
    let count = 0;
    for (let j = 0; j < list.length; j++) {
      const f = list[j].next();
      if (f === null) continue;
      freqs[count] = f;
      which[count] = j;
      count++;
    }
    if (!count) break;
    evaluate(freqs, which, out, count);
    for (let c = 0; c < count; c++) list[which[c]].feed(out[c]);
  }
  return list.map((s) => s.peak);
}

// Gauss–Kronrod 7/15 nodes and weights on [−1, 1] (Kronrod extension of the 7-point Gauss rule).
const XK = [
  0.991455371120812639206854697526329, 0.949107912342758524526189684047851, 0.864864423359769072789712788640926,
  0.741531185599394439863864773280788, 0.58608723546769113029414483825873, 0.405845151377397166906606412076961,
  0.207784955007898467600689403773245, 0,
];
const WK = [
  0.02293532201052922496373200805897, 0.063092092629978553290700663189204, 0.104790010322250183839876322541518,
  0.140653259715525918745189590510238, 0.16900472663926790282658342659855, 0.190350578064785409913256402421014,
  0.204432940075298892414161999234649, 0.209482141084727828012999174891714,
];
const WG = [0.129484966168869693270611432679082, 0.27970539148927666790146777142378, 0.381830050505118944950369775488975, 0.417959183673469387755102040816327];

/** Points at which one panel [a, b] (in u = ln f) is sampled: 15 Kronrod nodes. */
function panelNodes(a: number, b: number, out: Float64Array, offset: number): void {
  const c = (a + b) / 2;
  const h = (b - a) / 2;
  for (let k = 0; k < 7; k++) {
    out[offset + k] = Math.exp(c - h * XK[k]);
    out[offset + 14 - k] = Math.exp(c + h * XK[k]);
  }
  out[offset + 7] = Math.exp(c);
}

/**
 * ∫ from fa to fb of several densities S_j(f) df, adaptively: Gauss–Kronrod 7/15 panels in u = ln f
 * (integrand S(e^u)·e^u), bisecting the panels that carry the error until the estimated error of the
 * sum over components is under relTol of its value. `evaluate(freqs, out)` writes S_j(freqs[i]) into
 * out[j][i]. Starts from four panels per decade. Returns one integral per component (units of S·Hz).
 */
export function integrateLog(
  fa: number,
  fb: number,
  components: number,
  evaluate: (freqs: Float64Array, out: Float64Array[]) => void,
  relTol: number,
  maxPanels = 4096,
): Float64Array {
  const result = new Float64Array(components);
  if (!(fb > fa) || !(fa > 0)) return result;
  const ua = Math.log(fa);
  const ub = Math.log(fb);
  // difference of logs: fb/fa overflows for a band of 300+ decades and the panel count became Infinity (tests/fuzz)
  const start = Math.max(2, Math.ceil((Math.log10(fb) - Math.log10(fa)) * 4));
  type Panel = { a: number; b: number; k: Float64Array; err: number };
  let panels: Panel[] = [];
  let pending: { a: number; b: number }[] = [];
  for (let i = 0; i < start; i++) pending.push({ a: ua + ((ub - ua) * i) / start, b: ua + ((ub - ua) * (i + 1)) / start });

  const evalPanels = (list: { a: number; b: number }[]): Panel[] => {
    const freqs = new Float64Array(15 * list.length);
    list.forEach((p, i) => panelNodes(p.a, p.b, freqs, 15 * i));
    const vals = Array.from({ length: components }, () => new Float64Array(freqs.length));
    evaluate(freqs, vals);
    return list.map((p, i) => {
      const h = (p.b - p.a) / 2;
      const k = new Float64Array(components);
      let kt = 0;
      let gt = 0;
      for (let j = 0; j < components; j++) {
        const v = vals[j];
        const o = 15 * i;
        // integrand in u: S(f)·f
        const y = (q: number) => v[o + q] * freqs[o + q];
        let sk = WK[7] * y(7);
        let sg = WG[3] * y(7);
        for (let q = 0; q < 7; q++) {
          const pair = y(q) + y(14 - q);
          sk += WK[q] * pair;
          if (q % 2 === 1) sg += WG[(q - 1) / 2] * pair;
        }
        k[j] = sk * h;
        kt += sk * h;
        gt += sg * h;
      }
      return { a: p.a, b: p.b, k, err: Math.abs(kt - gt) };
    });
  };

  for (let round = 0; round < 40; round++) {
    panels = panels.concat(evalPanels(pending));
    pending = [];
    let total = 0;
    let err = 0;
    for (const p of panels) {
      for (let j = 0; j < components; j++) total += p.k[j];
      err += p.err;
    }
    if (!Number.isFinite(total) || err <= relTol * Math.abs(total) || panels.length >= maxPanels) break;
    const limit = (relTol * Math.abs(total)) / panels.length;
    const keep: Panel[] = [];
    for (const p of panels) {
      if (p.err > limit && panels.length + pending.length < maxPanels) {
        const mid = (p.a + p.b) / 2;
        pending.push({ a: p.a, b: mid }, { a: mid, b: p.b });
      } else keep.push(p);
    }
    if (!pending.length) break;
    panels = keep;
  }
  if (pending.length) panels = panels.concat(evalPanels(pending));
  for (const p of panels) for (let j = 0; j < components; j++) result[j] += p.k[j];
  return result;
}
