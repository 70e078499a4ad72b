/**
 * Characteristic frequency and quality factor of a stage's IDEAL response (infinite op-amp gain,
 * passive sections unloaded), as chain-format.md asks for `f0` and `q`. Hz at this edge.
 *
 * - first order, −(r2/r1)/(1 + s·r2·c2), 1/(1 + s·r·c), s·r·c/(1 + s·r·c): f0 = 1/(2π·τ), q = null
 * - integrator −1/(s·r1·c2): no corner; f0 is its unity-gain frequency 1/(2π·r1·c2), q = null
 * - second order 1/(1 + s/(Q·ω0) + s²/ω0²): f0 = ω0/2π and Q read off the denominator
 *   (references.md §6 and §7: Sallen-Key ω0 = 1/√(r1r2c1c2), Q = √(r1r2c1c2)/(c2(r1 + r2));
 *   MFB ω0 = 1/√(r2r3c1c2), Q = √(r2r3c1c2)/(c2(r2 + r3 + r2r3/r1)))
 * - gain stages, source, ADC: no frequency dependence, both null
 */
import type { ChainNode } from "../chain/types";
import { TWO_PI } from "./constants";

export interface IdealCharacteristics {
  /** Hz */
  f0: number | null;
  q: number | null;
  /** order of the ideal response's denominator */
  order: 0 | 1 | 2;
}

export function idealCharacteristics(node: ChainNode): IdealCharacteristics {
  switch (node.kind) {
    case "lossyIntegrator":
      return { f0: 1 / (TWO_PI * node.params.r2 * node.params.c2), q: null, order: 1 };
    case "integrator":
      return { f0: 1 / (TWO_PI * node.params.r1 * node.params.c2), q: null, order: 1 };
    case "rcLowpass":
    case "rcHighpass":
      return { f0: 1 / (TWO_PI * node.params.r * node.params.c), q: null, order: 1 };
    case "sallenKeyLowpass": {
      const { r1, r2, c1, c2 } = node.params;
      const t = Math.sqrt(r1 * r2 * c1 * c2);
      return { f0: 1 / (TWO_PI * t), q: t / (c2 * (r1 + r2)), order: 2 };
    }
    case "mfbLowpass": {
      const { r1, r2, r3, c1, c2 } = node.params;
      const t = Math.sqrt(r2 * r3 * c1 * c2);
      return { f0: 1 / (TWO_PI * t), q: t / (c2 * (r2 + r3 + (r2 * r3) / r1)), order: 2 };
    }
    default:
      return { f0: null, q: null, order: 0 };
  }
}
