/**
 * Time-domain reference with the odex 2.0.4 ODE solver (Hairer & Wanner's ODEX,
 * Gragg–Bulirsch–Stoer; references.md §16: `new odex.Solver(n)`,
 * `solver.solve(f, x0, y0, x1).y`). Independent of any frequency-domain algebra:
 * the circuit is written as state equations from Kirchhoff's laws by hand.
 */
import { createRequire } from "node:module";

/** The part of odex 2.0.4's API used here (the package ships no declaration file). */
interface OdexSolver {
  absoluteTolerance: number | number[];
  relativeTolerance: number | number[];
  maxSteps: number;
  initialStepSize: number;
  solve(f: (x: number, y: number[]) => number[], x0: number, y0: number[], x1: number): { y: number[]; outcome: number };
}
// Loaded through require so that TypeScript does not type-check odex's own .ts
// source (which it would otherwise resolve next to the .js and reject under strict).
const { Solver } = createRequire(import.meta.url)("odex") as { Solver: new (n: number) => OdexSolver };

export type Rhs = (t: number, y: number[]) => number[];

export function makeSolver(n: number, tol = 1e-11): OdexSolver {
  const s = new Solver(n);
  s.absoluteTolerance = tol;
  s.relativeTolerance = tol;
  s.maxSteps = 200_000;
  s.initialStepSize = 1e-8;
  return s;
}

/** Integrate y' = f(t, y) from t0 to t1; throws if odex did not converge. */
export function integrate(f: Rhs, t0: number, y0: number[], t1: number, tol = 1e-11): number[] {
  const s = makeSolver(y0.length, tol);
  const r = s.solve(f, t0, y0, t1);
  if (r.outcome !== 0) throw new Error(`odex stopped early (outcome ${r.outcome})`);
  return r.y;
}

/**
 * Sine steady state of a linear system driven by u(t) = sin(ωt) (ω = 2πf).
 * `rhs(u)` returns the state derivative for input u; `out(y)` the observed voltage.
 * The system runs for `settle` seconds (transients die out), then over `periods`
 * whole periods while two extra states accumulate ∫y·sin(ωt) and ∫y·cos(ωt).
 * With y = A·sin(ωt + φ) those are A·(T/2)·cos φ and A·(T/2)·sin φ, T the window:
 * the returned {mag, phaseDeg} is the response to the sine (|H| and arg H).
 */
export function sineSteadyState(
  f: number,
  n: number,
  rhs: (t: number, y: number[], u: number) => number[],
  out: (y: number[]) => number,
  settle: number,
  periods = 4,
): { mag: number; phaseDeg: number } {
  const w = 2 * Math.PI * f;
  // align the measurement window to whole periods of the drive
  const t0 = Math.ceil(settle * f) / f;
  const y0 = integrate((t, y) => rhs(t, y, Math.sin(w * t)), 0, new Array(n).fill(0), t0);
  const window = periods / f;
  const aug = (t: number, y: number[]) => {
    const x = y.slice(0, n);
    const d = rhs(t, x, Math.sin(w * t));
    const v = out(x);
    return [...d, v * Math.sin(w * t), v * Math.cos(w * t)];
  };
  const yEnd = integrate(aug, t0, [...y0, 0, 0], t0 + window);
  const si = yEnd[n];
  const co = yEnd[n + 1];
  const mag = (2 / window) * Math.hypot(si, co);
  const phaseDeg = (Math.atan2(co, si) * 180) / Math.PI;
  return { mag, phaseDeg };
}
