/**
 * Complex numbers for the reference code: mathjs's `complex()` (so that the nodal
 * matrices go straight into `math.lusolve`), typed with complex.js's class, which is
 * what mathjs builds its complex numbers on (mathjs's own typings omit the methods).
 */
import { complex } from "mathjs";
import type { Complex as Cx } from "complex.js";

export type { Cx };

export function cx(re: number, im = 0): Cx {
  return complex(re, im) as unknown as Cx;
}

export function cabs(z: Cx): number {
  return z.abs();
}
