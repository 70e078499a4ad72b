/**
 * Roots of a real polynomial (ascending coefficients, as in poly.ts) by the Aberth–Ehrlich
 * simultaneous iteration, with the variable scaled so that the roots sit near the unit circle
 * (x = s/σ, σ = |c0/cn|^(1/n)), then each root polished by Newton steps on the unscaled polynomial.
 * Exact zero low-order coefficients are exact roots at 0 and are returned as such (an integrator's s).
 * Used by the time-domain engine to factor each stage's transfer function; degrees there stay small
 * (a stage's closed form of degree ≤ 3 times the loaded sections of its net).
 */
import type { Poly } from "./poly";

export interface Roots {
  re: Float64Array;
  im: Float64Array;
}

/** p(x) and p'(x) at a complex x (Horner). */
function evalWithDerivative(c: ArrayLike<number>, xr: number, xi: number): [number, number, number, number] {
  let pr = c[c.length - 1];
  let pi = 0;
  let dr = 0;
  let di = 0;
  for (let k = c.length - 2; k >= 0; k--) {
    // d = d·x + p; p = p·x + c
    const ndr = dr * xr - di * xi + pr;
    const ndi = dr * xi + di * xr + pi;
    dr = ndr;
    di = ndi;
    const npr = pr * xr - pi * xi + c[k];
    const npi = pr * xi + pi * xr;
    pr = npr;
    pi = npi;
  }
  return [pr, pi, dr, di];
}

export function polyRoots(p: Poly): Roots {
  let hi = p.length - 1;
  while (hi > 0 && p[hi] === 0) hi--;
  let lo = 0;
  while (lo < hi && p[lo] === 0) lo++;
  const deg = hi - lo;
  const re = new Float64Array(hi);
  const im = new Float64Array(hi);
  // lo exact roots at 0 stay 0
  if (deg === 0) return { re, im };
  const c = Array.from(p.slice(lo, hi + 1));
  if (deg === 1) {
    re[lo] = -c[0] / c[1];
    return { re, im };
  }
  if (deg === 2) {
    // stable quadratic formula
    const [a0, a1, a2] = [c[0], c[1], c[2]];
    const disc = a1 * a1 - 4 * a2 * a0;
    if (disc >= 0) {
      const q = -0.5 * (a1 + Math.sign(a1 || 1) * Math.sqrt(disc));
      re[lo] = q / a2;
      re[lo + 1] = q === 0 ? 0 : a0 / q;
    } else {
      re[lo] = re[lo + 1] = -a1 / (2 * a2);
      im[lo] = Math.sqrt(-disc) / (2 * a2);
      im[lo + 1] = -im[lo];
    }
    return { re, im };
  }
  const sigma = Math.pow(Math.abs(c[0] / c[deg]), 1 / deg);
  const q = c.map((v, k) => v * Math.pow(sigma, k));
  const lead = q[deg];
  for (let k = 0; k <= deg; k++) q[k] /= lead;
  const zr = new Float64Array(deg);
  const zi = new Float64Array(deg);
  for (let k = 0; k < deg; k++) {
    const a = (2 * Math.PI * k) / deg + 0.4;
    zr[k] = Math.cos(a);
    zi[k] = Math.sin(a);
  }
  for (let iter = 0; iter < 500; iter++) {
    let moved = 0;
    for (let k = 0; k < deg; k++) {
      const [pr, pi, dr, di] = evalWithDerivative(q, zr[k], zi[k]);
      // ratio = p/p'
      const dd = dr * dr + di * di;
      if (dd === 0) continue;
      const rr = (pr * dr + pi * di) / dd;
      const ri = (pi * dr - pr * di) / dd;
      // sum of 1/(z_k − z_j)
      let sr = 0;
      let si = 0;
      for (let j = 0; j < deg; j++) {
        if (j === k) continue;
        const ar = zr[k] - zr[j];
        const ai = zi[k] - zi[j];
        const aa = ar * ar + ai * ai;
        sr += ar / aa;
        si += -ai / aa;
      }
      // w = ratio / (1 − ratio·sum)
      const br = 1 - (rr * sr - ri * si);
      const bi = -(rr * si + ri * sr);
      const bb = br * br + bi * bi;
      const wr = (rr * br + ri * bi) / bb;
      const wi = (ri * br - rr * bi) / bb;
      zr[k] -= wr;
      zi[k] -= wi;
      moved = Math.max(moved, Math.hypot(wr, wi) / Math.max(1e-300, Math.hypot(zr[k], zi[k])));
    }
    if (moved < 1e-15) break;
  }
  for (let k = 0; k < deg; k++) {
    let xr = zr[k] * sigma;
    let xi = zi[k] * sigma;
    for (let it = 0; it < 3; it++) {
      const [pr, pi, dr, di] = evalWithDerivative(c, xr, xi);
      const dd = dr * dr + di * di;
      if (dd === 0) break;
      const sr = (pr * dr + pi * di) / dd;
      const si = (pi * dr - pr * di) / dd;
      if (!Number.isFinite(sr) || !Number.isFinite(si)) break;
      xr -= sr;
      xi -= si;
    }
    // a real polynomial's roots are real or come in conjugate pairs; snap numerically real ones
    if (Math.abs(xi) <= 1e-10 * Math.hypot(xr, xi)) xi = 0;
    re[lo + k] = xr;
    im[lo + k] = xi;
  }
  return { re, im };
}
