/**
 * A measured frequency response set against the computed one: the computed magnitude and phase read at
 * the measured frequencies and the difference, measured − computed, in dB and degrees. Pure (no I/O);
 * the workspace overlays the result on its response plot and offers it as CSV.
 *
 * Interpolation is linear in log10 f between the two computed grid points around each measured
 * frequency: magnitude in dB and phase in degrees are smooth (asymptotically straight) against log f,
 * which is why the grid is logarithmic in the first place. Linear interpolation errs by at most
 * h²/8·max|y''| over a step of h decades (the standard remainder bound of linear interpolation), so a
 * grid of 100 points per decade keeps a first-order corner within about 3·10⁻⁴ dB. Frequencies outside
 * the computed grid are not extrapolated: their computed value and difference are NaN.
 *
 * Phase: the computed phase arrives wrapped to (−180°, 180°]; it is unwrapped along the grid before
 * interpolating (a step of more than 180° between neighbours is taken as a wrap), so a point between
 * −179° and +179° reads near ±180° and not 0°. The difference is wrapped to (−180°, 180°], since a bench
 * instrument's phase may sit any whole turn away from the model's.
 */

/** A response on increasing frequencies: Hz, dB, degrees (wrapped or not). */
export interface ResponseCurve {
  f: ArrayLike<number>;
  db: ArrayLike<number>;
  ph: ArrayLike<number>;
}

export interface ResponseDifference {
  /** the measured frequencies, Hz */
  f: Float64Array;
  measuredDb: Float64Array;
  /** wrapped to (−180, 180] */
  measuredDeg: Float64Array;
  /** the computed response at f; NaN outside the computed grid or next to a non-finite grid value */
  computedDb: Float64Array;
  /** wrapped to (−180, 180] */
  computedDeg: Float64Array;
  /** measured − computed, dB */
  diffDb: Float64Array;
  /** measured − computed, wrapped to (−180, 180] */
  diffDeg: Float64Array;
  /** measured points with a finite difference */
  compared: number;
  /** measured points outside the computed grid */
  outside: number;
  /** root mean square of the finite differences (NaN when none) */
  rmsDb: number;
  rmsDeg: number;
  /** the largest difference by size, with its frequency (null when none) */
  worstDb: { f: number; value: number } | null;
  worstDeg: { f: number; value: number } | null;
}

/** x wrapped to (−180, 180]. */
export function wrapDegrees(x: number): number {
  if (!Number.isFinite(x)) return NaN;
  let y = x - 360 * Math.round(x / 360);
  if (y <= -180) y += 360;
  return y;
}

/**
 * A wrapped phase made continuous: each value moved by whole turns to within 180° of the last finite
 * value before it. Non-finite values stay NaN and the next finite value follows the last finite one.
 */
export function unwrapDegrees(ph: ArrayLike<number>): Float64Array {
  const out = new Float64Array(ph.length);
  let prev = NaN;
  for (let k = 0; k < ph.length; k++) {
    const v = ph[k];
    if (!Number.isFinite(v)) {
      out[k] = NaN;
      continue;
    }
    out[k] = Number.isFinite(prev) ? prev + wrapDegrees(v - prev) : v;
    prev = out[k];
  }
  return out;
}

/** Index i with f[i] ≤ x ≤ f[i + 1] on an increasing grid (x inside [f[0], f[n−1]]). */
function bracket(f: ArrayLike<number>, x: number): number {
  let lo = 0;
  let hi = f.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (f[mid] <= x) lo = mid;
    else hi = mid;
  }
  return lo;
}

/**
 * y at frequency x by linear interpolation in log10 f on the increasing grid f (Hz). Exact at grid
 * points; NaN outside [f[0], f[n−1]], for x ≤ 0, or when a neighbour used is not finite.
 */
export function interpolateLogF(f: ArrayLike<number>, y: ArrayLike<number>, x: number): number {
  const n = f.length;
  if (n === 0 || !(x > 0) || x < f[0] || x > f[n - 1]) return NaN;
  if (n === 1) return y[0];
  const i = Math.min(bracket(f, x), n - 2);
  if (x === f[i]) return Number.isFinite(y[i]) ? y[i] : NaN;
  if (x === f[i + 1]) return Number.isFinite(y[i + 1]) ? y[i + 1] : NaN;
  const t = Math.log(x / f[i]) / Math.log(f[i + 1] / f[i]);
  const v = y[i] + t * (y[i + 1] - y[i]);
  return Number.isFinite(v) ? v : NaN;
}

function worstOf(f: Float64Array, d: Float64Array): { f: number; value: number } | null {
  let best: { f: number; value: number } | null = null;
  for (let k = 0; k < d.length; k++) {
    if (Number.isFinite(d[k]) && (!best || Math.abs(d[k]) > Math.abs(best.value))) best = { f: f[k], value: d[k] };
  }
  return best;
}

function rmsOf(d: Float64Array): number {
  let s = 0;
  let n = 0;
  for (const v of d) {
    if (!Number.isFinite(v)) continue;
    s += v * v;
    n++;
  }
  return n ? Math.sqrt(s / n) : NaN;
}

/** The computed response read at each measured frequency, and measured − computed. */
export function compareResponses(measured: ResponseCurve, computed: ResponseCurve): ResponseDifference {
  const n = measured.f.length;
  const f = Float64Array.from(measured.f);
  const measuredDb = Float64Array.from(measured.db);
  const measuredDeg = Float64Array.from(measured.ph, wrapDegrees);
  const computedDb = new Float64Array(n);
  const computedDeg = new Float64Array(n);
  const diffDb = new Float64Array(n);
  const diffDeg = new Float64Array(n);
  const cph = unwrapDegrees(computed.ph);
  const fLo = computed.f.length ? computed.f[0] : Infinity;
  const fHi = computed.f.length ? computed.f[computed.f.length - 1] : -Infinity;
  let outside = 0;
  let compared = 0;
  for (let k = 0; k < n; k++) {
    if (!(f[k] >= fLo && f[k] <= fHi)) outside++;
    const db = interpolateLogF(computed.f, computed.db, f[k]);
    const ph = interpolateLogF(computed.f, cph, f[k]);
    computedDb[k] = db;
    computedDeg[k] = wrapDegrees(ph);
    diffDb[k] = measuredDb[k] - db;
    diffDeg[k] = wrapDegrees(measured.ph[k] - ph);
    if (Number.isFinite(diffDb[k]) && Number.isFinite(diffDeg[k])) compared++;
  }
  return {
    f,
    measuredDb,
    measuredDeg,
    computedDb,
    computedDeg,
    diffDb,
    diffDeg,
    compared,
    outside,
    rmsDb: rmsOf(diffDb),
    rmsDeg: rmsOf(diffDeg),
    worstDb: worstOf(f, diffDb),
    worstDeg: worstOf(f, diffDeg),
  };
}
