/**
 * Characteristic frequency and quality factor of a stage's IDEAL response (infinite op-amp gain,
 * passive sections unloaded), as chain-format.md asks for `f0` and `q`. Hz at this edge.
 *
 * - first order, −(r2/r1)/(1 + s·r2·c2), 1/(1 + s·r·c), s·r·c/(1 + s·r·c): f0 = 1/(2π·τ), q = null
 * - integrator −1/(s·r1·c2): no corner; f0 is its unity-gain frequency 1/(2π·r1·c2), q = null
 * - second order 1/(1 + s/(Q·ω0) + s²/ω0²): f0 = ω0/2π and Q read off the denominator
 *   (references.md §6 and §7: Sallen-Key ω0 = 1/√(r1r2c1c2), Q = √(r1r2c1c2)/(c2(r1 + r2));
 *   MFB ω0 = 1/√(r2r3c1c2), Q = √(r2r3c1c2)/(c2(r2 + r3 + r2r3/r1)))
 * - Sallen-Key with gain K = 1 + rf/rg (derived from its nodal equations): ω0 = 1/√(r1r2c1c2),
 *   low-pass Q = √(r1r2c1c2)/((r1 + r2)·c2 + r1·c1·(1 − K)), high-pass (c1 Vin→A, c2 A→(+), r1 A→out,
 *   r2 (+)→vref) Q = √(r1r2c1c2)/(r1·(c1 + c2) + r2·c2·(1 − K)); q null when that denominator is ≤ 0
 *   (the section oscillates)
 * - MFB high-pass (c1 in, r1 A→vref, c2 A→out, c3 A→(−), r2 (−)→out): ω0 = 1/√(r1r2c2c3),
 *   Q = √(r1r2c2c3)/(r1·(c1 + c2 + c3))
 * - transimpedance −rf/(1 + s·rf·cf) and charge amplifier −s·rf/(1 + s·rf·cf) per coulomb (lib/chain/README.md):
 *   first order, f0 = 1/(2π·rf·cf) (the TIA's feedback pole, the charge amplifier's low corner), q = null;
 *   both null when cf is 0 (a TIA with no feedback capacitor has no ideal corner)
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

/** K = 1 + rf/rg of a Sallen-Key section (1 without rf or rg). */
export function sallenKeyGain(p: { rf?: number | null; rg?: number | null }): number {
  return p.rf != null && p.rg != null ? 1 + p.rf / p.rg : 1;
}

/** Q = √(r1r2c1c2)/b1 of a second-order denominator 1 + b1·s + b2·s²; null when b1 ≤ 0 (unstable or undamped). */
const qOf = (t: number, b1: number): number | null => (b1 > 0 ? t / b1 : null);

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
      const k = sallenKeyGain(node.params);
      // b1 = (r1 + r2)·c2 + r1·c1·(1 − K); ≤ 0 means the section oscillates (no finite positive Q)
      return { f0: 1 / (TWO_PI * t), q: qOf(t, (r1 + r2) * c2 + r1 * c1 * (1 - k)), order: 2 };
    }
    // filters: the high-pass sections (derived from their nodal equations; see stage-models.ts)
    case "sallenKeyHighpass": {
      const { r1, r2, c1, c2 } = node.params;
      const t = Math.sqrt(r1 * r2 * c1 * c2);
      const k = sallenKeyGain(node.params);
      return { f0: 1 / (TWO_PI * t), q: qOf(t, r1 * (c1 + c2) + r2 * c2 * (1 - k)), order: 2 };
    }
    case "mfbHighpass": {
      const { r1, r2, c1, c2, c3 } = node.params;
      const t = Math.sqrt(r1 * r2 * c2 * c3);
      return { f0: 1 / (TWO_PI * t), q: t / (r1 * (c1 + c2 + c3)), order: 2 };
    }
    case "mfbLowpass": {
      const { r1, r2, r3, c1, c2 } = node.params;
      const t = Math.sqrt(r2 * r3 * c1 * c2);
      return { f0: 1 / (TWO_PI * t), q: t / (c2 * (r2 + r3 + (r2 * r3) / r1)), order: 2 };
    }
    case "transimpedance":
    case "chargeAmp": {
      const { rf, cf } = node.params;
      return rf > 0 && cf > 0 ? { f0: 1 / (TWO_PI * rf * cf), q: null, order: 1 } : { f0: null, q: null, order: 0 };
    }
    default:
      return { f0: null, q: null, order: 0 };
  }
}
