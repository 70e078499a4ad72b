import type { Part } from "../chain/types";
import { TWO_PI } from "./constants";
import { poly, type Poly } from "./poly";

/**
 * Open-loop gain of an op-amp as a ratio of polynomials A(s) = n(s)/d(s), so that every closed-loop
 * formula can be written without dividing by A (ideal op-amps are d ≡ 0, no special case):
 *
 * - aol and gbw: A(s) = aol/(1 + s·aol/ωt), ωt = 2π·gbw  →  n = aol·ωt, d = ωt + aol·s
 * - gbw only:    A(s) = ωt/s                          →  n = ωt,     d = s
 * - aol only:    A(s) = aol (flat)                     →  n = aol,    d = 1
 * - neither:     A = ∞ (ideal)                         →  n = 1,      d = 0
 *
 * Single-pole model as in Sedra & Smith, Microelectronic Circuits, ch. 2 (from memory; see
 * references.md §4). A figure given as 0 is taken literally: zero gain (n = 0, d = 1).
 * s in rad/s; n and d are dimensionless apart from the common factor, which cancels.
 */
export interface OpenLoop {
  n: Poly;
  d: Poly;
  /** true when the part says nothing about gain (ideal op-amp) */
  ideal: boolean;
  /** true when aol or gbw is given as 0 */
  degenerate: boolean;
}

export function openLoop(part: Part | null | undefined): OpenLoop {
  const aol = part?.aol;
  const gbw = part?.gbw;
  const hasAol = typeof aol === "number";
  const hasGbw = typeof gbw === "number";
  if ((hasAol && aol === 0) || (hasGbw && gbw === 0)) {
    return { n: poly(0), d: poly(1), ideal: false, degenerate: true };
  }
  if (hasAol && hasGbw) {
    const wt = TWO_PI * gbw;
    return { n: poly(aol * wt), d: poly(wt, aol), ideal: false, degenerate: false };
  }
  if (hasGbw) return { n: poly(TWO_PI * gbw), d: poly(0, 1), ideal: false, degenerate: false };
  if (hasAol) return { n: poly(aol), d: poly(1), ideal: false, degenerate: false };
  return { n: poly(1), d: poly(0), ideal: true, degenerate: false };
}
