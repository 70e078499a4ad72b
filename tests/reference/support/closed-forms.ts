/**
 * Closed-form transfer functions, written out from the formulas quoted beside each
 * function (chain-format.md "Stage kinds" and references.md §2–§7). They are evaluated
 * with mathjs complex numbers at s = j·2π·f.
 */
import { cx, type Cx } from "./cx";

const ONE = cx(1, 0);

export function sAt(f: number): Cx {
  return cx(0, 2 * Math.PI * f);
}

/** 1/(1 + sRC): first-order low-pass, references.md §2 (Horowitz & Hill ch. 1 [MEMORY]). */
export function rcLowpassH(r: number, c: number, f: number): Cx {
  return ONE.div(ONE.add(sAt(f).mul(r * c)));
}

/** sRC/(1 + sRC): first-order high-pass, references.md §2. */
export function rcHighpassH(r: number, c: number, f: number): Cx {
  const x = sAt(f).mul(r * c);
  return x.div(ONE.add(x));
}

/** Two equal loaded RC sections: 1/(1 + 3sRC + (sRC)²), chain-format.md "Loading is exact". */
export function rcLadder2H(r: number, c: number, f: number): Cx {
  const x = sAt(f).mul(r * c);
  return ONE.div(ONE.add(x.mul(3)).add(x.mul(x)));
}

/** −R2/R1, ideal inverting stage (chain-format.md table; references.md §3). */
export function invertingH(r1: number, r2: number): Cx {
  return cx(-r2 / r1, 0);
}

/** 1 + Rf/Rg, ideal non-inverting stage (chain-format.md table; references.md §3). */
export function noninvertingH(rf: number, rg: number): Cx {
  return cx(1 + rf / rg, 0);
}

/** −(R2/R1)/(1 + sR2C2), lossy integrator, references.md §5. */
export function lossyIntegratorH(r1: number, r2: number, c2: number, f: number): Cx {
  return cx(-r2 / r1, 0).div(ONE.add(sAt(f).mul(r2 * c2)));
}

/** −1/(sR1C2), integrator (chain-format.md table). */
export function integratorH(r1: number, c2: number, f: number): Cx {
  return cx(-1, 0).div(sAt(f).mul(r1 * c2));
}

/** 1/(1 + s·c2(r1 + r2) + s²·r1r2c1c2), unity-gain Sallen-Key, chain-format.md labels (references.md §6). */
export function sallenKeyH(r1: number, r2: number, c1: number, c2: number, f: number): Cx {
  const s = sAt(f);
  return ONE.div(ONE.add(s.mul(c2 * (r1 + r2))).add(s.mul(s).mul(r1 * r2 * c1 * c2)));
}

/** −(r2/r1)/(1 + s·c2(r2 + r3 + r2r3/r1) + s²·c1c2r2r3), MFB low-pass, chain-format.md labels (references.md §7). */
export function mfbH(r1: number, r2: number, r3: number, c1: number, c2: number, f: number): Cx {
  const s = sAt(f);
  return cx(-r2 / r1, 0).div(ONE.add(s.mul(c2 * (r2 + r3 + (r2 * r3) / r1))).add(s.mul(s).mul(c1 * c2 * r2 * r3)));
}

/** A(s) = A0/(1 + s·A0/(2π·GBW)), the single-pole op-amp (references.md §4). */
export function opAmpGain(a0: number, gbw: number, f: number): Cx {
  return cx(a0, 0).div(ONE.add(sAt(f).mul(a0 / (2 * Math.PI * gbw))));
}

/** Non-inverting with finite A: A/(1 + Aβ), β = rg/(rf + rg) (references.md §4, Sedra & Smith ch. 2 [MEMORY]). */
export function noninvertingFiniteH(rf: number, rg: number, a: Cx): Cx {
  const beta = rg / (rf + rg);
  return a.div(ONE.add(a.mul(beta)));
}

/** Inverting with finite A: −(Rf/Rg)·Aβ/(1 + Aβ) (references.md §4, Sedra & Smith Eq. (2.5) [MEMORY]). */
export function invertingFiniteH(rg: number, rf: number, a: Cx): Cx {
  const beta = rg / (rf + rg);
  const ab = a.mul(beta);
  return cx(-rf / rg, 0).mul(ab).div(ONE.add(ab));
}

/** Sallen-Key with finite A (references.md §6, SymPy nodal): A/[(A+1) + s(A·Cb(R1+R2) + CaR1 + Cb(R1+R2)) + s²(A+1)R1R2CaCb]. */
export function sallenKeyFiniteH(r1: number, r2: number, ca: number, cb: number, a: Cx, f: number): Cx {
  const s = sAt(f);
  const ap1 = a.add(ONE);
  const d = ap1
    .add(s.mul(a.mul(cb * (r1 + r2)).add(cx(ca * r1 + cb * (r1 + r2), 0))))
    .add(s.mul(s).mul(ap1).mul(r1 * r2 * ca * cb));
  return a.div(d);
}

/** Second-order section figures: f0 = 1/(2π√(R1R2C1C2)), Q = √(R1R2C1C2)/(C2(R1+R2)) (references.md §6). */
export function sallenKeyF0Q(r1: number, r2: number, c1: number, c2: number) {
  const t = Math.sqrt(r1 * r2 * c1 * c2);
  return { f0: 1 / (2 * Math.PI * t), q: t / (c2 * (r1 + r2)) };
}

/** f0 = 1/(2π√(R2R3C1C2)), Q = √(R2R3C1C2)/(C2(R2 + R3 + R2R3/R1)) (references.md §7). */
export function mfbF0Q(r1: number, r2: number, r3: number, c1: number, c2: number) {
  const t = Math.sqrt(r2 * r3 * c1 * c2);
  return { f0: 1 / (2 * Math.PI * t), q: t / (c2 * (r2 + r3 + (r2 * r3) / r1)) };
}
