/**
 * Adaptive Simpson quadrature (Lyness' classic recursive form with the Richardson
 * correction (S2 − S1)/15), for the reference noise integrals of references.md §11
 * (references.md §16 suggests integrating |H|² this way in the tests themselves).
 *
 * The vector form integrates several non-negative integrands that share their
 * evaluation points (one nodal solve per frequency serves every noise source); the
 * error test is made on their sum.
 */

type VecFn = (x: number) => number[];

function add(a: number[], b: number[]): number[] {
  return a.map((v, i) => v + b[i]);
}
function sum(a: number[]): number {
  return a.reduce((s, v) => s + v, 0);
}
function simpson(h: number, fa: number[], fm: number[], fb: number[]): number[] {
  return fa.map((v, i) => (h / 6) * (v + 4 * fm[i] + fb[i]));
}

/**
 * ∫_a^b f(x) dx for a vector-valued f, to an absolute tolerance `tol` on the sum of
 * the components. maxDepth bounds the recursion (each level halves the interval).
 */
export function adaptiveSimpsonVec(f: VecFn, a: number, b: number, tol: number, maxDepth = 40): number[] {
  const fa = f(a);
  const fb = f(b);
  const m = (a + b) / 2;
  const fm = f(m);
  const whole = simpson(b - a, fa, fm, fb);
  const rec = (a: number, b: number, fa: number[], fm: number[], fb: number[], whole: number[], tol: number, depth: number): number[] => {
    const m = (a + b) / 2;
    const lm = (a + m) / 2;
    const rm = (m + b) / 2;
    const flm = f(lm);
    const frm = f(rm);
    const left = simpson(m - a, fa, flm, fm);
    const right = simpson(b - m, fm, frm, fb);
    const both = add(left, right);
    const err = sum(both) - sum(whole);
    if (depth <= 0 || Math.abs(err) <= 15 * tol) return both.map((v, i) => v + (v - whole[i]) / 15);
    return add(rec(a, m, fa, flm, fm, left, tol / 2, depth - 1), rec(m, b, fm, frm, fb, right, tol / 2, depth - 1));
  };
  return rec(a, b, fa, fm, fb, whole, tol, maxDepth);
}

/** Scalar adaptive Simpson, ∫_a^b f(x) dx to absolute tolerance tol. */
export function adaptiveSimpson(f: (x: number) => number, a: number, b: number, tol: number, maxDepth = 40): number {
  return adaptiveSimpsonVec((x) => [f(x)], a, b, tol, maxDepth)[0];
}

/**
 * ∫_lo^hi g(f) df over a log axis (u = ln f, df = f·du), which suits densities that
 * span decades. Relative tolerance `rel` is turned into an absolute one by a coarse
 * first estimate, then refined.
 */
export function integrateLogVec(g: VecFn, lo: number, hi: number, rel = 1e-8): number[] {
  const h = (u: number) => {
    const f = Math.exp(u);
    return g(f).map((v) => v * f);
  };
  const a = Math.log(lo);
  const b = Math.log(hi);
  // Coarse estimate on 32 panels to scale the tolerance; panels also stop early
  // convergence on a narrow peak that a 3-point start could miss.
  const panels = 32;
  let coarse = 0;
  const edges = Array.from({ length: panels + 1 }, (_, i) => a + ((b - a) * i) / panels);
  for (let i = 0; i < panels; i++) coarse += sum(simpson(edges[i + 1] - edges[i], h(edges[i]), h((edges[i] + edges[i + 1]) / 2), h(edges[i + 1])));
  const tol = Math.max(Math.abs(coarse) * rel, 1e-300) / panels;
  let total: number[] | null = null;
  for (let i = 0; i < panels; i++) {
    const part = adaptiveSimpsonVec(h, edges[i], edges[i + 1], tol, 30);
    total = total ? add(total, part) : part;
  }
  return total!;
}
