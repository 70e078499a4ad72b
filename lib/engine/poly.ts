/**
 * Real polynomials in the Laplace variable s, stored as ascending coefficient arrays:
 * p(s) = c[0] + c[1]·s + c[2]·s² + …  (s in rad/s, coefficients in whatever unit the product carries).
 * The engine builds every stage's transfer functions from these at compile time and evaluates them on
 * the imaginary axis s = jω in the hot loops.
 */

export type Poly = Float64Array;

export const ZERO: Poly = new Float64Array([0]);
export const ONE: Poly = new Float64Array([1]);
/** p(s) = s */
export const S: Poly = new Float64Array([0, 1]);

/**
 * Buffers for the polynomials built while a pool is in use (`withPolyPool`): the k-th polynomial made
 * takes the k-th buffer of the previous use when its length matches, else a new one that replaces it.
 * Rebuilding the same closed forms with other values (a stage of the same shape, a Monte Carlo build) so
 * makes the same polynomials in the same order into the same buffers: the arithmetic is unchanged, only
 * the allocations go. What was built in the previous use is overwritten, so nothing from it may be kept.
 */
export class PolyPool {
  private readonly bufs: Float64Array[] = [];
  private at = 0;

  /** a buffer of `len` coefficients (contents: whatever the previous use left; callers write every one) */
  take(len: number): Float64Array {
    const b = this.bufs[this.at];
    if (b !== undefined && b.length === len) {
      this.at++;
      return b;
    }
    const fresh = new Float64Array(len);
    this.bufs[this.at++] = fresh;
    return fresh;
  }

  rewind(): void {
    this.at = 0;
  }

  /** buffers held (for tests) */
  get size(): number {
    return this.bufs.length;
  }
}

let pool: PolyPool | null = null;

/** Runs `fn` with every polynomial it builds taken from `p` (rewound first); see PolyPool. */
export function withPolyPool<T>(p: PolyPool, fn: () => T): T {
  const prev = pool;
  pool = p;
  p.rewind();
  try {
    return fn();
  } finally {
    pool = prev;
  }
}

/** scratch for a result before its length is known (the pooled path), its first `len` values zeroed */
let scratch = new Float64Array(16);
function zeroedScratch(len: number): Float64Array {
  if (len > scratch.length) scratch = new Float64Array(2 * len);
  // a loop: typed-array fill costs more than this for a few coefficients
  for (let i = 0; i < len; i++) scratch[i] = 0;
  return scratch;
}

/** The first `len` values of `src` with trailing exact zeros dropped (at least one), as a pooled buffer. */
function pooled(src: Float64Array, len: number): Poly {
  let n = len;
  while (n > 1 && src[n - 1] === 0) n--;
  const out = pool!.take(n);
  for (let i = 0; i < n; i++) out[i] = src[i];
  return out;
}

export function poly(...coeffs: number[]): Poly {
  if (pool) {
    if (!coeffs.length) return pooled(ZERO, 1);
    const t = zeroedScratch(coeffs.length);
    for (let i = 0; i < coeffs.length; i++) t[i] = coeffs[i];
    return pooled(t, coeffs.length);
  }
  return trim(new Float64Array(coeffs.length ? coeffs : [0]));
}

/** Drops trailing exact zeros (keeps at least one coefficient) so degrees stay honest. */
function trim(p: Poly): Poly {
  let n = p.length;
  while (n > 1 && p[n - 1] === 0) n--;
  return n === p.length ? p : p.slice(0, n);
}

export function add(...ps: Poly[]): Poly {
  let len = 1;
  for (const p of ps) len = Math.max(len, p.length);
  const out = pool ? zeroedScratch(len) : new Float64Array(len);
  for (const p of ps) for (let i = 0; i < p.length; i++) out[i] += p[i];
  return pool ? pooled(out, len) : trim(out);
}

export function scale(p: Poly, k: number): Poly {
  const out = pool ? zeroedScratch(p.length) : new Float64Array(p.length);
  for (let i = 0; i < p.length; i++) out[i] = p[i] * k;
  return pool ? pooled(out, p.length) : trim(out);
}

export function mul(...ps: Poly[]): Poly {
  let acc: Poly = ONE;
  for (const p of ps) {
    const len = acc.length + p.length - 1;
    // pooled: the product in the scratch (no operand is ever the scratch), then into its own buffer
    const out = pool ? zeroedScratch(len) : new Float64Array(len);
    for (let i = 0; i < acc.length; i++) {
      const a = acc[i];
      if (a === 0) continue;
      for (let j = 0; j < p.length; j++) out[i + j] += a * p[j];
    }
    acc = pool ? pooled(out, len) : trim(out);
  }
  return acc;
}

export function isZero(p: Poly): boolean {
  for (let i = 0; i < p.length; i++) if (p[i] !== 0) return false;
  return true;
}

/**
 * Value of num(s)/den(s) as s → 0, from the lowest-order coefficients (exact cancellation of common
 * factors of s, e.g. an ideal integrator's input admittance s·c2/(s·c2·r1) → 1/r1).
 * Returns ±Infinity when the ratio has a pole at s = 0 and NaN when both are identically zero.
 */
export function limitAtZero(num: Poly, den: Poly): number {
  let k = 0;
  while (k < den.length && den[k] === 0) k++;
  if (k === den.length) return NaN;
  for (let j = 0; j < Math.min(k, num.length); j++) {
    if (num[j] !== 0) return num[j] > 0 === den[k] > 0 ? Infinity : -Infinity;
  }
  return k < num.length ? num[k] / den[k] : 0;
}

/**
 * num(jω)/den(jω) as [re, im]; at ω = 0 the limit of limitAtZero (imaginary part 0).
 * For one-off evaluations outside the hot loops.
 */
export function ratioAt(num: Poly, den: Poly, w: number): [number, number] {
  if (w === 0) return [limitAtZero(num, den), 0];
  // Horner at s = jω, written out for both polynomials (no closure: this runs per point in band searches)
  let nr = num[num.length - 1];
  let ni = 0;
  for (let k = num.length - 2; k >= 0; k--) {
    const r = num[k] - ni * w;
    ni = nr * w;
    nr = r;
  }
  let dr = den[den.length - 1];
  let di = 0;
  for (let k = den.length - 2; k >= 0; k--) {
    const r = den[k] - di * w;
    di = dr * w;
    dr = r;
  }
  const inv = 1 / (dr * dr + di * di);
  return [(nr * dr + ni * di) * inv, (ni * dr - nr * di) * inv];
}

/** |num(jω)/den(jω)|, as ratioAt without the array (for per-point loops). */
export function ratioMagAt(num: Poly, den: Poly, w: number, abs: (re: number, im: number) => number = Math.hypot): number {
  if (w === 0) return Math.abs(limitAtZero(num, den));
  let nr = num[num.length - 1];
  let ni = 0;
  for (let k = num.length - 2; k >= 0; k--) {
    const r = num[k] - ni * w;
    ni = nr * w;
    nr = r;
  }
  let dr = den[den.length - 1];
  let di = 0;
  for (let k = den.length - 2; k >= 0; k--) {
    const r = den[k] - di * w;
    di = dr * w;
    dr = r;
  }
  return abs(nr, ni) / abs(dr, di);
}

/**
 * |re + j·im| as √(re² + im²), an order of magnitude faster than Math.hypot; Math.hypot only where the
 * squares would overflow or lose precision to underflow. Agrees with Math.hypot to about one rounding.
 */
export function magnitude(re: number, im: number): number {
  const p = re * re + im * im;
  return p > 1e-290 && p < 1e290 ? Math.sqrt(p) : Math.hypot(re, im);
}
