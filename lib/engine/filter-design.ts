/**
 * Low-pass filters of order 2…8 (Butterworth, Bessel, Chebyshev with a stated ripple) as cascades of
 * second- and first-order sections, each then solved to standard values by `solveStage`.
 *
 * Pole positions of the normalised prototypes (corner 1 rad/s), computed here, never copied from tables:
 * - Butterworth: poles on the unit circle at angles θk = π(2k + n − 1)/(2n), k = 1…n (the standard
 *   maximally flat construction; any filter-design text). The corner is the −3.0103 dB frequency.
 * - Chebyshev (type I): ε = √(10^(r/10) − 1), a = asinh(1/ε)/n, poles −sinh a·sin φk + j·cosh a·cos φk with
 *   φk = (2k − 1)π/(2n). The corner is the edge of the ripple band (where the gain last leaves it). Each
 *   section is given unity DC gain, so for an even order the ripple lies between 0 and +r dB and the gain at
 *   the corner is 0 dB; for an odd order it lies between −r and 0 dB and the corner is at −r dB.
 * - Bessel (maximally flat delay): roots of the reverse Bessel polynomial θn(s) = Σ (2n−k)!/(2^(n−k)·k!·(n−k)!)·s^k,
 *   found numerically (Durand–Kerner iteration, Newton-polished), then scaled so that |H(j1)| is −3.0103 dB
 *   (the bisection below finds that frequency of the unscaled polynomial).
 * A conjugate pair p, p̄ becomes a section with f0 = |p| and Q = |p|/(2·|Re p|); a real pole a first-order
 * section with its corner at |p|.
 *
 * Section order (stated rule, common practice): the first-order section first, then the second-order
 * sections by ascending Q, so the high-Q sections, whose response peaks near their f0, come last and cannot
 * drive earlier stages into their rails; the overall gain goes on the first section, which raises the
 * signal above the noise of the later sections early while no peaking has yet been applied.
 */
import type { SolvableKind, SolveResult, SolveTargets, SolvedParams } from "./solve";
import { solveStage } from "./solve";

export type FilterResponse = "butterworth" | "bessel" | "chebyshev";
export const FILTER_RESPONSES: readonly FilterResponse[] = ["butterworth", "bessel", "chebyshev"];
export const MIN_ORDER = 2;
export const MAX_ORDER = 8;

type C = [number, number];

export interface PrototypeSection {
  order: 1 | 2;
  /** normalised to the corner (1 rad/s ↔ the corner frequency) */
  f0: number;
  /** null for a first-order section */
  q: number | null;
}

function checkSpec(response: FilterResponse, order: number, rippleDb?: number | null): void {
  if (!FILTER_RESPONSES.includes(response)) throw new RangeError(`response: use one of ${FILTER_RESPONSES.join(", ")}`);
  if (!Number.isInteger(order) || order < MIN_ORDER || order > MAX_ORDER) {
    throw new RangeError(`order: a whole number from ${MIN_ORDER} to ${MAX_ORDER}`);
  }
  if (response === "chebyshev" && !(typeof rippleDb === "number" && rippleDb >= 0.01 && rippleDb <= 3)) {
    throw new RangeError("rippleDb: a Chebyshev filter needs a passband ripple from 0.01 to 3 dB");
  }
}

// --- complex helpers --------------------------------------------------------------------------------
const cmul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const csub = (a: C, b: C): C => [a[0] - b[0], a[1] - b[1]];
const cdiv = (a: C, b: C): C => {
  const m = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / m, (a[1] * b[0] - a[0] * b[1]) / m];
};
/** p(z) by Horner, coefficients ascending */
function peval(c: readonly number[], z: C): C {
  let r: C = [c[c.length - 1], 0];
  for (let i = c.length - 2; i >= 0; i--) r = [r[0] * z[0] - r[1] * z[1] + c[i], r[0] * z[1] + r[1] * z[0]];
  return r;
}
function pderiv(c: readonly number[]): number[] {
  return c.slice(1).map((v, i) => v * (i + 1));
}

/** All roots of a real polynomial (ascending coefficients, degree ≥ 1) by Durand–Kerner, Newton-polished. */
export function polyRoots(coeffs: readonly number[]): C[] {
  const n = coeffs.length - 1;
  const lead = coeffs[n];
  const c = coeffs.map((v) => v / lead);
  const radius = 1 + Math.max(...c.slice(0, n).map(Math.abs)); // Cauchy bound
  let z: C[] = Array.from({ length: n }, (_, k) => {
    const a = (2 * Math.PI * k) / n + 0.4;
    return [radius * 0.5 * Math.cos(a), radius * 0.5 * Math.sin(a)] as C;
  });
  for (let iter = 0; iter < 2000; iter++) {
    let change = 0;
    const next = z.map((zi, i) => {
      let den: C = [1, 0];
      for (let j = 0; j < n; j++) if (j !== i) den = cmul(den, csub(zi, z[j]));
      const step = cdiv(peval(c, zi), den);
      change = Math.max(change, Math.hypot(step[0], step[1]) / Math.max(1, Math.hypot(zi[0], zi[1])));
      return csub(zi, step);
    });
    z = next;
    if (change < 1e-15) break;
  }
  const d = pderiv(c);
  return z.map((zi) => {
    let r = zi;
    for (let k = 0; k < 3; k++) {
      const dv = peval(d, r);
      if (Math.hypot(dv[0], dv[1]) === 0) break;
      r = csub(r, cdiv(peval(c, r), dv));
    }
    return r;
  });
}

/** Coefficients (ascending) of the reverse Bessel polynomial θn(s). */
export function besselPolynomial(n: number): number[] {
  const fact = (k: number) => {
    let f = 1;
    for (let i = 2; i <= k; i++) f *= i;
    return f;
  };
  return Array.from({ length: n + 1 }, (_, k) => fact(2 * n - k) / (2 ** (n - k) * fact(k) * fact(n - k)));
}

/** Poles (left half-plane) of the normalised prototype, corner at 1 rad/s. */
export function prototypePoles(response: FilterResponse, order: number, rippleDb?: number | null): C[] {
  checkSpec(response, order, rippleDb);
  const n = order;
  if (response === "butterworth") {
    return Array.from({ length: n }, (_, i) => {
      const th = (Math.PI * (2 * (i + 1) + n - 1)) / (2 * n);
      return [Math.cos(th), Math.sin(th)] as C;
    });
  }
  if (response === "chebyshev") {
    const eps = Math.sqrt(10 ** ((rippleDb as number) / 10) - 1);
    const a = Math.asinh(1 / eps) / n;
    return Array.from({ length: n }, (_, i) => {
      const phi = ((2 * (i + 1) - 1) * Math.PI) / (2 * n);
      return [-Math.sinh(a) * Math.sin(phi), Math.cosh(a) * Math.cos(phi)] as C;
    });
  }
  const coeffs = besselPolynomial(n);
  const roots = polyRoots(coeffs);
  // |θn(0)/θn(jω)|² = ½ → the −3 dB frequency of the unscaled polynomial (monotone in ω), by bisection
  const mag2 = (w: number) => {
    const v = peval(coeffs, [0, w]);
    return (coeffs[0] * coeffs[0]) / (v[0] * v[0] + v[1] * v[1]);
  };
  let lo = 1e-3;
  let hi = 1e3;
  for (let i = 0; i < 200; i++) {
    const mid = Math.sqrt(lo * hi);
    if (mag2(mid) > 0.5) lo = mid;
    else hi = mid;
  }
  const w3 = Math.sqrt(lo * hi);
  return roots.map(([re, im]) => [re / w3, im / w3] as C);
}

/** Sections of the prototype in the stated order: first-order first, then ascending Q. */
export function prototypeSections(response: FilterResponse, order: number, rippleDb?: number | null): PrototypeSection[] {
  const poles = prototypePoles(response, order, rippleDb);
  const out: PrototypeSection[] = [];
  const scale = Math.max(...poles.map((p) => Math.hypot(p[0], p[1])));
  for (const [re, im] of poles) {
    const mag = Math.hypot(re, im);
    if (Math.abs(im) <= 1e-9 * scale) out.push({ order: 1, f0: mag, q: null });
    else if (im > 0) out.push({ order: 2, f0: mag, q: mag / (2 * Math.abs(re)) });
  }
  return out.sort((a, b) => (a.q ?? 0) - (b.q ?? 0));
}

/** |H(jω)| of the cascade of unity-DC-gain sections, ω normalised to the corner. */
export function prototypeMagnitude(sections: readonly PrototypeSection[], w: number): number {
  let m = 1;
  for (const s of sections) {
    const x = w / s.f0;
    m /= s.order === 1 ? Math.hypot(1, x) : Math.hypot(1 - x * x, x / (s.q as number));
  }
  return m;
}

// --- design to standard values ------------------------------------------------------------------------

export type SecondOrderKind = "sallenKeyLowpass" | "mfbLowpass";

export interface LowpassSpec {
  response: FilterResponse;
  order: number;
  /** Hz: −3 dB frequency (Butterworth, Bessel) or ripple-band edge (Chebyshev) */
  cornerHz: number;
  rippleDb?: number | null;
  /** magnitude of the overall passband gain (default 1) */
  gain?: number;
  /** how the second-order sections are built (first-order: an active lossy integrator); a Sallen-Key
   * section carrying gain gets the rf/rg network (K = 1 + rf/rg) */
  secondOrder: SecondOrderKind;
  /** series, ranges, floor, tolerance, as for solveStage (gain, f0 and q are set per section) */
  parts?: Omit<SolveTargets, "gain" | "f0" | "q">;
}

export interface DesignedSection {
  /** 1-based position in the cascade */
  position: number;
  kind: SolvableKind;
  order: 1 | 2;
  f0: number;
  q: number | null;
  gain: number;
  solve: SolveResult;
  /** the best set, or null when this section cannot be solved */
  params: SolvedParams | null;
}

export interface LowpassDesign {
  spec: LowpassSpec;
  sections: DesignedSection[];
  rule: string;
  /** null when every section is solved; else which section fails and why */
  problem: string | null;
}

export const SECTION_ORDER_RULE =
  "First-order section first, then second-order sections by ascending Q, so the peaking high-Q sections come last; the overall gain goes on the first section (common practice).";

/** Splits the filter into sections and solves each; throws RangeError naming the field on a bad spec. */
export function designLowpass(spec: LowpassSpec): LowpassDesign {
  checkSpec(spec.response, spec.order, spec.rippleDb);
  if (!(spec.cornerHz > 0 && Number.isFinite(spec.cornerHz))) throw new RangeError("cornerHz: a positive frequency in Hz");
  const gain = spec.gain ?? 1;
  if (!(gain > 0 && Number.isFinite(gain))) throw new RangeError("gain: a positive number (V/V)");
  const proto = prototypeSections(spec.response, spec.order, spec.rippleDb);
  const sections: DesignedSection[] = [];
  let problem: string | null = null;
  proto.forEach((p, i) => {
    const kind: SolvableKind = p.order === 1 ? "lossyIntegrator" : spec.secondOrder;
    const g = i === 0 ? gain : 1;
    const f0 = p.f0 * spec.cornerHz;
    const solve = solveStage(kind, { ...spec.parts, f0, q: p.q, gain: g });
    const params = solve.sets[0]?.params ?? null;
    if (!params && !problem) problem = `Section ${i + 1} (f0 ${Number(f0.toPrecision(4))} Hz${p.q ? `, Q ${p.q.toFixed(3)}` : ""}): ${solve.problem}`;
    sections.push({ position: i + 1, kind, order: p.order, f0, q: p.q, gain: g, solve, params });
  });
  return { spec, sections, rule: SECTION_ORDER_RULE, problem };
}
