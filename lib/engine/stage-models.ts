/**
 * Closed-form models of the op-amp stage kinds for the fast path.
 *
 * Each stage is a linear network driven by the voltage Vin at its input terminal, with the op-amp as
 * Vo = A(s)·(V+ − V−), A = n/d (see open-loop.ts). Eliminating the internal nodes by hand gives, over one
 * common denominator den(s), the numerators of
 *   - Vo/Vin (the stage's transfer function H),
 *   - Iin/Vin (its input admittance: current drawn from the driving node, exact with finite gain),
 *   - V+/Vin (the voltage at the (+) pin, for the input-range check),
 * and the same three responses to each internal source:
 *   - the Johnson noise voltage of every resistor, in series with it (orientation: `from`→`to` below),
 *   - en (a voltage in series with the (+) input; the offset vos uses the same path),
 *   - in+ / in− (a current drawn by the pin from its node; the bias currents ib use the same path),
 *   - vref (the reference voltage itself; used at DC only).
 * Multiplying through by d keeps ideal op-amps (d ≡ 0) free of division by A: with n = 1, d = 0 every
 * expression reduces to the ideal H(s) of chain-format.md's table. The eliminations were done by nodal
 * analysis of each topology as drawn in that table; the complex.js reference path (reference-path.ts)
 * solves the same networks numerically and the agreement test holds the two to 1e-9.
 * Units: s in rad/s, resistances in ohms, capacitances in farads; Iin/Vin in siemens, V/A for currents.
 */
import type {
  DifferenceAmpParams,
  InAmpParams,
  IntegratorParams,
  InvertingParams,
  LossyIntegratorParams,
  MfbHighpassParams,
  MfbLowpassParams,
  NonInvertingParams,
  OpAmpKind,
  OpAmpNode,
  SallenKeyHighpassParams,
  SallenKeyLowpassParams,
} from "../chain/types";
import type { OpenLoop } from "./open-loop";
import { add, mul, poly, scale, S, ZERO, type Poly } from "./poly";

/**
 * How an internal source enters the network (decides its noise density and DC role). `vcm` is the
 * common-mode voltage of the differential pair a difference or instrumentation amplifier takes;
 * `cm-error` a ± common-mode error referred to that stage's output (resistor tolerance, the in-amp's CMRR).
 */
export type InternalSourceType = "johnson" | "en" | "in+" | "in-" | "vref" | "vcm" | "cm-error";

export interface StageResponse {
  /** numerator of the output voltage */
  vo: Poly;
  /** numerator of the current drawn from the input terminal */
  iin: Poly;
  /** numerator of the (+) pin voltage */
  p: Poly;
}

export interface InternalSource extends StageResponse {
  /** element name used in results: r1, r2, r3, rf, rg, en, in+, in-, vref */
  element: string;
  type: InternalSourceType;
  /** ohms, for Johnson sources */
  resistance?: number;
}

export interface StageModel {
  kind: OpAmpKind;
  den: Poly;
  /** response to the input terminal voltage */
  vin: StageResponse;
  /** internal sources; the last one is always `vref` */
  sources: InternalSource[];
}

const resp = (vo: Poly, iin: Poly, p: Poly): StageResponse => ({ vo, iin, p });
const johnson = (element: string, resistance: number, r: StageResponse): InternalSource => ({
  element,
  type: "johnson",
  resistance,
  ...r,
});
const src = (element: string, type: InternalSourceType, r: StageResponse): InternalSource => ({
  element,
  type,
  ...r,
});
const neg = (p: Poly) => scale(p, -1);

/**
 * The inverting family: r1 Vin→(−), a feedback impedance Z2 = zn/zd from out to (−), (+) at vref.
 * den = d·(r1·zd + zn) + n·r1·zd; H = −n·zn/den (→ −Z2/r1 ideal); Yin = (d + n)·zd/den, exactly
 * 1/(r1 + Z2/(1 + A)) with finite gain. A resistor r2 in the feedback (inverting, lossy integrator) adds
 * its Johnson source with Vo = −n·r1, Iin = −d over den.
 */
function invertingFamily(
  kind: OpAmpKind,
  r1: number,
  zn: Poly,
  zd: Poly,
  r2: number | null,
  { n, d }: OpenLoop,
): StageModel {
  const r1zd = scale(zd, r1);
  const den = add(mul(d, add(r1zd, zn)), mul(n, r1zd));
  const vin = resp(neg(mul(n, zn)), mul(add(d, n), zd), ZERO);
  const enR = resp(mul(n, add(r1zd, zn)), neg(mul(n, zd)), ZERO);
  const sources: InternalSource[] = [johnson("r1", r1, vin)]; // r1: Vin → (−)
  if (r2 !== null) sources.push(johnson("r2", r2, resp(scale(n, -r1), neg(d), ZERO))); // r2: out → (−)
  sources.push(
    src("en", "en", enR),
    src("in-", "in-", resp(mul(n, zn, poly(r1)), mul(d, zn), ZERO)),
    src("vref", "vref", { ...enR, p: den }),
  );
  return { kind, den, vin, sources };
}

/** Inverting stage: Z2 = r2; ideal H = −r2/r1. */
const inverting = ({ r1, r2 }: InvertingParams, ol: OpenLoop) =>
  invertingFamily("inverting", r1, poly(r2), poly(1), r2, ol);

/** Lossy integrator: Z2 = r2 ∥ c2 = r2/(1 + s·c2·r2); ideal H = −(r2/r1)/(1 + s·r2·c2). */
const lossyIntegrator = ({ r1, r2, c2 }: LossyIntegratorParams, ol: OpenLoop) =>
  invertingFamily("lossyIntegrator", r1, poly(r2), poly(1, c2 * r2), r2, ol);

/** Integrator: Z2 = 1/(s·c2); ideal H = −1/(s·r1·c2), a pole at s = 0. */
const integrator = ({ r1, c2 }: IntegratorParams, ol: OpenLoop) =>
  invertingFamily("integrator", r1, poly(1), poly(0, c2), null, ol);

/**
 * Non-inverting stage: Vin→(+), rf out→(−), rg (−)→vref. rf null is a wire (gain 1); rg null is a
 * follower (rf, if given, still joins out to (−) and only carries the (−) pin current).
 * den = d·(rf + rg) + n·rg; H = n·(rf + rg)/den (→ 1 + rf/rg ideal). The input draws only the (+) pin
 * current.
 */
function noninverting({ rf, rg }: NonInvertingParams, { n, d }: OpenLoop): StageModel {
  const sources: InternalSource[] = [];
  if (rg === null) {
    const den = add(d, n);
    if (rf !== null) sources.push(johnson("rf", rf, resp(neg(n), ZERO, ZERO))); // rf: out → (−)
    sources.push(
      src("en", "en", resp(n, ZERO, ZERO)),
      src("in-", "in-", resp(scale(n, rf ?? 0), ZERO, ZERO)),
      src("in+", "in+", resp(ZERO, den, ZERO)),
      src("vref", "vref", resp(ZERO, ZERO, ZERO)),
    );
    return { kind: "noninverting", den, vin: resp(n, ZERO, den), sources };
  }
  const f = rf ?? 0;
  const den = add(scale(d, f + rg), scale(n, rg));
  if (rf !== null) sources.push(johnson("rf", rf, resp(scale(n, -rg), ZERO, ZERO))); // rf: out → (−)
  sources.push(
    johnson("rg", rg, resp(scale(n, -f), ZERO, ZERO)), // rg: vref → (−)
    src("en", "en", resp(scale(n, f + rg), ZERO, ZERO)),
    src("in-", "in-", resp(scale(n, f * rg), ZERO, ZERO)),
    src("in+", "in+", resp(ZERO, den, ZERO)),
    src("vref", "vref", resp(scale(n, -f), ZERO, ZERO)),
  );
  return { kind: "noninverting", den, vin: resp(scale(n, f + rg), ZERO, den), sources };
}

/**
 * Unity-gain Sallen-Key low-pass: r1 Vin→A, r2 A→(+), c1 A→out, c2 (+)→vref, out tied to (−).
 * With Di = 1 + s·c2·(r1 + r2) + s²·r1·r2·c1·c2 (the ideal denominator) and Dx = Di + s·c1·r1:
 * den = d·Dx + n·Di; H = n/den (→ 1/Di ideal). Equivalent to references.md §6's finite-A form.
 */
function sallenKey({ r1, r2, c1, c2 }: SallenKeyLowpassParams, { n, d }: OpenLoop): StageModel {
  const di = poly(1, c2 * (r1 + r2), c1 * c2 * r1 * r2);
  const dx = add(di, poly(0, c1 * r1));
  const den = add(mul(d, dx), mul(n, di));
  const dn = add(d, n);
  const vin = resp(
    n,
    mul(S, add(mul(d, poly(c1 + c2, c1 * c2 * r2)), mul(n, poly(c2, c1 * c2 * r2)))),
    dn,
  );
  const pLoad = poly(r1 + r2, c1 * r1 * r2); // r1 + r2 + s·c1·r1·r2
  const inPlusIin = add(dn, mul(n, poly(0, c1 * r2)));
  return {
    kind: "sallenKeyLowpass",
    den,
    vin,
    sources: [
      johnson("r1", r1, vin), // r1: Vin → A
      johnson(
        "r2",
        r2,
        resp(
          mul(n, poly(1, c1 * r1)),
          mul(S, add(scale(dn, c2), scale(n, -c1))),
          mul(dn, poly(1, c1 * r1)),
        ),
      ), // r2: A → (+)
      src("en", "en", resp(mul(n, dx), neg(mul(n, poly(0, c1), poly(1, c2 * r2))), mul(n, poly(0, c1 * r1)))),
      src("in+", "in+", resp(neg(mul(n, pLoad)), inPlusIin, neg(mul(dn, pLoad)))),
      src(
        "vref",
        "vref",
        resp(mul(n, poly(0, c2), pLoad), neg(mul(poly(0, c2), inPlusIin)), mul(poly(0, c2), dn, pLoad)),
      ),
    ],
  };
}

/**
 * Multiple-feedback low-pass: r1 Vin→A, c1 A→ground, r2 A→out, r3 A→(−), c2 (−)→out, (+) at vref.
 * With Σ = r1r2 + r1r3 + r2r3 and Q2 = c1c2r1r2r3:
 * den = d·(r1 + r2 + s·(c1r1r2 + c2Σ) + s²Q2) + n·(r1 + s·c2Σ + s²Q2); H = −n·r2/den
 * (→ −(r2/r1)/(1 + s·c2·(r2 + r3 + r2r3/r1) + s²·c1c2r2r3) ideal).
 */
function mfb({ r1, r2, r3, c1, c2 }: MfbLowpassParams, { n, d }: OpenLoop): StageModel {
  const sig = r1 * r2 + r1 * r3 + r2 * r3;
  const q2 = c1 * c2 * r1 * r2 * r3;
  const dd = poly(r1 + r2, c1 * r1 * r2 + c2 * sig, q2);
  const den = add(mul(d, dd), mul(n, poly(r1, c2 * sig, q2)));
  const dn = add(d, n);
  const vin = resp(
    scale(n, -r2),
    add(mul(d, poly(1, c1 * r2 + c2 * (r2 + r3), c1 * c2 * r2 * r3)), mul(n, poly(1, c2 * (r2 + r3), c1 * c2 * r2 * r3))),
    ZERO,
  );
  const enR = resp(mul(n, dd), neg(mul(n, poly(1, c2 * (r2 + r3)))), ZERO);
  return {
    kind: "mfbLowpass",
    den,
    vin,
    sources: [
      johnson("r1", r1, vin), // r1: Vin → A
      johnson("r2", r2, resp(scale(n, -r1), neg(add(d, mul(poly(0, c2 * r3), dn))), ZERO)), // r2: out → A
      johnson(
        "r3",
        r3,
        resp(neg(mul(n, poly(r1 + r2, c1 * r1 * r2))), add(n, mul(poly(0, c2 * r2), dn)), ZERO),
      ), // r3: A → (−)
      src("en", "en", enR),
      src("in-", "in-", resp(mul(n, poly(sig, c1 * r1 * r2 * r3)), add(scale(d, r2), scale(n, -r3)), ZERO)),
      src("vref", "vref", { ...enR, p: den }),
    ],
  };
}

// --- filters: Sallen-Key with gain, Sallen-Key high-pass, MFB high-pass ---------------------------------
//
// The closed forms below were obtained by nodal analysis of each topology as drawn (the op-amp row
// d·Vo = n·(V+ + en − V−), every other unknown node by KCL), solved symbolically and expanded so that each
// coefficient is a sum of products of element values with no cancelling terms left (a computer-algebra
// elimination, checked by hand for the ideal H(s) and, for the unity-gain Sallen-Key low-pass, term by
// term against the hand-derived `sallenKey` above). The complex.js path solves the same networks
// numerically and the agreement test holds the two to 1e-9. Gain networks: f = rf (0 when null), g = 1/rg
// (0 when null), k1 = f·g = K − 1 with K = 1 + rf/rg; every polynomial is the nodal one multiplied by rg,
// so rg null is simply g = 0 and rf null as well is the unity-gain section.

/** The gain network of a Sallen-Key section: rf, rg (null: absent) and k1 = K − 1 = rf/rg. */
function gainNetwork(p: { rf?: number | null; rg?: number | null }) {
  const rf = p.rf ?? null;
  const rg = p.rg ?? null;
  const f = rf ?? 0;
  return { hasRf: rf !== null, f, rg, k1: rg === null ? 0 : f / rg };
}

/**
 * Sallen-Key low-pass with gain: r1 Vin→A, r2 A→(+), c1 A→out, c2 (+)→vref, rf out→(−), rg vref→(−).
 * Ideal (n = 1, d = 0): H = K/(1 + s·((r1 + r2)·c2 + r1·c1·(1 − K)) + s²·r1·r2·c1·c2), K = 1 + rf/rg.
 * With finite gain: den = d·K·(1 + s·(r1c1 + r1c2 + r2c2) + s²r1r2c1c2) + n·(ideal denominator).
 */
function sallenKeyGain({ r1, r2, c1, c2, ...gain }: SallenKeyLowpassParams, { n, d }: OpenLoop): StageModel {
  const { hasRf, f, rg, k1 } = gainNetwork(gain);
  const den = add(mul(d, poly(k1 + 1, (k1 + 1) * (c1 * r1 + c2 * r1 + c2 * r2), c1 * c2 * r1 * r2 * (k1 + 1))), mul(n, poly(1, -c1 * k1 * r1 + c2 * r1 + c2 * r2, c1 * c2 * r1 * r2)));
  const vin = resp(
    mul(n, poly(k1 + 1)),
    add(mul(d, poly(0, (c1 + c2) * (k1 + 1), c1 * c2 * r2 * (k1 + 1))), mul(n, poly(0, -c1 * k1 + c2, c1 * c2 * r2))),
    add(mul(d, poly(k1 + 1)), mul(n, poly(1))),
  );
  const sources: InternalSource[] = [];
  sources.push(
    johnson("r1", r1, resp(
      mul(n, poly(k1 + 1)),
      add(mul(d, poly(0, (c1 + c2) * (k1 + 1), c1 * c2 * r2 * (k1 + 1))), mul(n, poly(0, -c1 * k1 + c2, c1 * c2 * r2))),
      add(mul(d, poly(k1 + 1)), mul(n, poly(1))),
    )),
  );
  sources.push(
    johnson("r2", r2, resp(
      mul(n, poly(k1 + 1, c1 * r1 * (k1 + 1))),
      add(mul(d, poly(0, c2 * (k1 + 1))), mul(n, poly(0, -c1 * k1 - c1 + c2))),
      add(mul(d, poly(k1 + 1, c1 * r1 * (k1 + 1))), mul(n, poly(1, c1 * r1))),
    )),
  );
  if (hasRf)
    sources.push(
      johnson("rf", f, resp(
        mul(n, poly(-1, -c1 * r1 - c2 * r1 - c2 * r2, -c1 * c2 * r1 * r2)),
        mul(n, poly(0, c1, c1 * c2 * r2)),
        mul(n, poly(0, -c1 * r1)),
      )),
    );
  if (rg !== null)
    sources.push(
      johnson("rg", rg, resp(
        mul(n, poly(-k1, -k1 * (c1 * r1 + c2 * r1 + c2 * r2), -c1 * c2 * k1 * r1 * r2)),
        mul(n, poly(0, c1 * k1, c1 * c2 * k1 * r2)),
        mul(n, poly(0, -c1 * k1 * r1)),
      )),
    );
  sources.push(
    src("en", "en", resp(
      mul(n, poly(k1 + 1, (k1 + 1) * (c1 * r1 + c2 * r1 + c2 * r2), c1 * c2 * r1 * r2 * (k1 + 1))),
      mul(n, poly(0, -c1 * (k1 + 1), -c1 * c2 * r2 * (k1 + 1))),
      mul(n, poly(0, c1 * r1 * (k1 + 1))),
    )),
  );
  sources.push(
    src("in+", "in+", resp(
      mul(n, poly(-(k1 + 1) * (r1 + r2), -c1 * r1 * r2 * (k1 + 1))),
      add(mul(d, poly(k1 + 1)), mul(n, poly(1, c1 * r2 * (k1 + 1)))),
      add(mul(d, poly(-(k1 + 1) * (r1 + r2), -c1 * r1 * r2 * (k1 + 1))), mul(n, poly(-r1 - r2, -c1 * r1 * r2))),
    )),
  );
  if (hasRf)
    sources.push(
      src("in-", "in-", resp(
        mul(n, poly(f, f * (c1 * r1 + c2 * r1 + c2 * r2), c1 * c2 * f * r1 * r2)),
        mul(n, poly(0, -c1 * f, -c1 * c2 * f * r2)),
        mul(n, poly(0, c1 * f * r1)),
      )),
    );
  sources.push(
    src("vref", "vref", resp(
      mul(n, poly(-k1, -c1 * k1 * r1 + c2 * r1 + c2 * r2, c1 * c2 * r1 * r2)),
      add(mul(d, poly(0, -c2 * (k1 + 1))), mul(n, poly(0, c1 * k1 - c2, -c1 * c2 * r2))),
      add(mul(d, poly(0, c2 * (k1 + 1) * (r1 + r2), c1 * c2 * r1 * r2 * (k1 + 1))), mul(n, poly(0, -c1 * k1 * r1 + c2 * r1 + c2 * r2, c1 * c2 * r1 * r2))),
    )),
  );
  return { kind: "sallenKeyLowpass", den, vin, sources };
}

/**
 * Sallen-Key high-pass: c1 Vin→A, c2 A→(+), r1 A→out, r2 (+)→vref, rf out→(−), rg vref→(−) (both null:
 * the output tied to (−), unity gain). Ideal: H = K·s²·r1r2c1c2/(1 + s·(r1·(c1 + c2) + r2·c2·(1 − K))
 * + s²·r1r2c1c2); at DC the output sits at vref (the capacitors block the input).
 */
function sallenKeyHighpass({ c1, c2, r1, r2, ...gain }: SallenKeyHighpassParams, { n, d }: OpenLoop): StageModel {
  const { hasRf, f, rg, k1 } = gainNetwork(gain);
  const den = add(mul(d, poly(k1 + 1, (k1 + 1) * (c1 * r1 + c2 * r1 + c2 * r2), c1 * c2 * r1 * r2 * (k1 + 1))), mul(n, poly(1, c1 * r1 - c2 * k1 * r2 + c2 * r1, c1 * c2 * r1 * r2)));
  const vin = resp(
    mul(n, poly(0, 0, c1 * c2 * r1 * r2 * (k1 + 1))),
    add(mul(d, poly(0, c1 * (k1 + 1), c1 * c2 * (k1 + 1) * (r1 + r2))), mul(n, poly(0, c1, c1 * c2 * (-k1 * r2 + r1)))),
    add(mul(d, poly(0, 0, c1 * c2 * r1 * r2 * (k1 + 1))), mul(n, poly(0, 0, c1 * c2 * r1 * r2))),
  );
  const sources: InternalSource[] = [];
  sources.push(
    johnson("r1", r1, resp(
      mul(n, poly(0, -c2 * r2 * (k1 + 1))),
      add(mul(d, poly(0, c1 * (k1 + 1), c1 * c2 * r2 * (k1 + 1))), mul(n, poly(0, c1, c1 * c2 * r2))),
      add(mul(d, poly(0, -c2 * r2 * (k1 + 1))), mul(n, poly(0, -c2 * r2))),
    )),
  );
  sources.push(
    johnson("r2", r2, resp(
      mul(n, poly(-k1 - 1, -r1 * (c1 + c2) * (k1 + 1))),
      add(mul(d, poly(0, 0, c1 * c2 * r1 * (k1 + 1))), mul(n, poly(0, c1 * (k1 + 1), c1 * c2 * r1))),
      add(mul(d, poly(-k1 - 1, -r1 * (c1 + c2) * (k1 + 1))), mul(n, poly(-1, -r1 * (c1 + c2)))),
    )),
  );
  if (hasRf)
    sources.push(
      johnson("rf", f, resp(
        mul(n, poly(-1, -c1 * r1 - c2 * r1 - c2 * r2, -c1 * c2 * r1 * r2)),
        mul(n, poly(0, c1, c1 * c2 * r2)),
        mul(n, poly(0, -c2 * r2)),
      )),
    );
  if (rg !== null)
    sources.push(
      johnson("rg", rg, resp(
        mul(n, poly(-k1, -k1 * (c1 * r1 + c2 * r1 + c2 * r2), -c1 * c2 * k1 * r1 * r2)),
        mul(n, poly(0, c1 * k1, c1 * c2 * k1 * r2)),
        mul(n, poly(0, -c2 * k1 * r2)),
      )),
    );
  sources.push(
    src("en", "en", resp(
      mul(n, poly(k1 + 1, (k1 + 1) * (c1 * r1 + c2 * r1 + c2 * r2), c1 * c2 * r1 * r2 * (k1 + 1))),
      mul(n, poly(0, -c1 * (k1 + 1), -c1 * c2 * r2 * (k1 + 1))),
      mul(n, poly(0, c2 * r2 * (k1 + 1))),
    )),
  );
  sources.push(
    src("in+", "in+", resp(
      mul(n, poly(-r2 * (k1 + 1), -r1 * r2 * (c1 + c2) * (k1 + 1))),
      add(mul(d, poly(0, 0, c1 * c2 * r1 * r2 * (k1 + 1))), mul(n, poly(0, c1 * r2 * (k1 + 1), c1 * c2 * r1 * r2))),
      add(mul(d, poly(-r2 * (k1 + 1), -r1 * r2 * (c1 + c2) * (k1 + 1))), mul(n, poly(-r2, -r1 * r2 * (c1 + c2)))),
    )),
  );
  if (hasRf)
    sources.push(
      src("in-", "in-", resp(
        mul(n, poly(f, f * (c1 * r1 + c2 * r1 + c2 * r2), c1 * c2 * f * r1 * r2)),
        mul(n, poly(0, -c1 * f, -c1 * c2 * f * r2)),
        mul(n, poly(0, c2 * f * r2)),
      )),
    );
  sources.push(
    src("vref", "vref", resp(
      mul(n, poly(1, c1 * r1 - c2 * k1 * r2 + c2 * r1, -c1 * c2 * k1 * r1 * r2)),
      add(mul(d, poly(0, 0, -c1 * c2 * r1 * (k1 + 1))), mul(n, poly(0, -c1, -c1 * c2 * (-k1 * r2 + r1)))),
      add(mul(d, poly(k1 + 1, r1 * (c1 + c2) * (k1 + 1))), mul(n, poly(1, c1 * r1 - c2 * k1 * r2 + c2 * r1))),
    )),
  );
  return { kind: "sallenKeyHighpass", den, vin, sources };
}

/**
 * Multiple-feedback high-pass: c1 Vin→A, r1 A→vref, c2 A→out, c3 A→(−), r2 (−)→out ("r2: out → (−)"),
 * (+) at vref. Ideal: H = −s²·c1c3r1r2/(1 + s·r1·(c1 + c2 + c3) + s²·c2c3r1r2), i.e. −(c1/c2)·s²/(s² +
 * s·(c1 + c2 + c3)/(r2c2c3) + 1/(r1r2c2c3)). The input admittance numerator is of degree 4 with a
 * single-pole op-amp (the kernel's limit).
 */
function mfbHighpass({ c1, c2, c3, r1, r2 }: MfbHighpassParams, { n, d }: OpenLoop): StageModel {
  const den = add(mul(d, poly(1, c1 * r1 + c2 * r1 + c3 * r1 + c3 * r2, c3 * r1 * r2 * (c1 + c2))), mul(n, poly(1, r1 * (c1 + c2 + c3), c2 * c3 * r1 * r2)));
  const vin = resp(
    mul(n, poly(0, 0, -c1 * c3 * r1 * r2)),
    add(mul(d, poly(0, c1, c1 * (c2 * r1 + c3 * r1 + c3 * r2), c1 * c2 * c3 * r1 * r2)), mul(n, poly(0, c1, c1 * r1 * (c2 + c3), c1 * c2 * c3 * r1 * r2))),
    ZERO,
  );
  const sources: InternalSource[] = [];
  sources.push(
    johnson("r1", r1, resp(
      mul(n, poly(0, c3 * r2)),
      add(mul(d, poly(0, c1, c1 * c3 * r2)), mul(n, poly(0, c1))),
      ZERO,
    )),
  );
  sources.push(
    johnson("r2", r2, resp(
      mul(n, poly(-1, -r1 * (c1 + c2 + c3))),
      add(mul(d, poly(0, 0, -c1 * c3 * r1)), mul(n, poly(0, 0, c1 * c2 * r1))),
      ZERO,
    )),
  );
  sources.push(
    src("en", "en", resp(
      mul(n, poly(1, c1 * r1 + c2 * r1 + c3 * r1 + c3 * r2, c3 * r1 * r2 * (c1 + c2))),
      mul(n, poly(0, 0, -c1 * r1 * (c2 + c3), -c1 * c2 * c3 * r1 * r2)),
      ZERO,
    )),
  );
  sources.push(
    src("in-", "in-", resp(
      mul(n, poly(r2, r1 * r2 * (c1 + c2 + c3))),
      add(mul(d, poly(0, 0, c1 * c3 * r1 * r2)), mul(n, poly(0, 0, -c1 * c2 * r1 * r2))),
      ZERO,
    )),
  );
  sources.push(
    src("vref", "vref", resp(
      mul(n, poly(1, r1 * (c1 + c2 + c3), c3 * r1 * r2 * (c1 + c2))),
      add(mul(d, poly(0, -c1, -c1 * c3 * r2)), mul(n, poly(0, -c1, -c1 * r1 * (c2 + c3), -c1 * c2 * c3 * r1 * r2))),
      add(mul(d, poly(1, c1 * r1 + c2 * r1 + c3 * r1 + c3 * r2, c3 * r1 * r2 * (c1 + c2))), mul(n, poly(1, r1 * (c1 + c2 + c3), c2 * c3 * r1 * r2))),
    )),
  );
  return { kind: "mfbHighpass", den, vin, sources };
}
// --- end filters ------------------------------------------------------------------------------------------

// ---------------------------------------------------------------------------------------------------------
// Front-end stages for sensor sources (issue 14). Each holds the part of the source it is wired to:
// a current-input stage the sensor's shunt admittance, a differential stage the legs of the pair.

/** What a stage takes over from the source that feeds it. */
export interface StageInput {
  /** resistance of each leg of a differential pair (half the pair's differential resistance), Ω */
  leg: number;
  /** the Norton shunt of a current or charge source */
  shunt: { r: number; c: number } | null;
  /** the source gives a charge (the stage sees the current s·q) */
  charge: boolean;
}

export const NO_INPUT: StageInput = { leg: 0, shunt: null, charge: false };

/**
 * Transimpedance and charge amplifiers: the sensor current i into (−) with the sensor's shunt
 * Ys = (1 + s·rsh·cs)/rsh to ground (cs = sensor capacitance + cin), rf ∥ cf from out to (−), (+) at vref.
 * With ys = 1 + s·rsh·cs, yf = 1 + s·rf·cf and Σ = rf·ys + rsh·yf (Ys + Yf over the common factor rf·rsh):
 * den = d·Σ + n·rsh·yf; Vo/i = −n·rf·rsh/den (→ −rf/(1 + s·rf·cf) ideal); a charge input multiplies by s
 * (→ −s·rf/(1 + s·rf·cf), a passband of −1/cf above 1/(2π·rf·cf)). en and vref: n·Σ (the noise gain
 * 1 + Zf/Zs); in− drawn from (−): n·rf·rsh; rf's Johnson voltage (out → (−)): −n·rsh. The source is
 * wired to this stage only, so the current it draws is not needed (iin = 0).
 */
function currentInput(kind: OpAmpKind, rf: number, cf: number, cin: number, input: StageInput, { n, d }: OpenLoop): StageModel {
  if (!input.shunt) throw new Error(`${kind} needs a photodiode or piezo source`);
  const rsh = input.shunt.r;
  const cs = input.shunt.c + cin;
  const ys = poly(1, rsh * cs);
  const yf = poly(1, rf * cf);
  const sig = add(scale(ys, rf), scale(yf, rsh));
  const den = add(mul(d, sig), mul(n, yf, poly(rsh)));
  const sig0 = scale(n, -rf * rsh);
  const vin = resp(input.charge ? mul(S, sig0) : sig0, ZERO, ZERO);
  const enR = resp(mul(n, sig), ZERO, ZERO);
  return {
    kind,
    den,
    vin,
    sources: [
      johnson("rf", rf, resp(scale(n, -rsh), ZERO, ZERO)),
      src("en", "en", enR),
      src("in-", "in-", resp(scale(n, rf * rsh), ZERO, ZERO)),
      src("vref", "vref", { ...enR, p: den }),
    ],
  };
}

/**
 * Difference amplifier on a differential pair E± = vcm ± Vd/2 with legs of `leg` ohms: E− → leg → r1 → (−),
 * r2 out → (−); E+ → leg → r3 → (+), r4 (+) → vref. The legs add to r1 and r3 exactly (the op-amp's (+)
 * draws no current), so with a = r1 + leg, c = r3 + leg, k = r4/(c + r4):
 * den = d·(a + r2) + n·a; Vo/Vd = n·((a + r2)·k + r2)/2 / den (→ r2/r1 for r4/r3 = r2/r1, no legs);
 * vcm: n·((a + r2)·k − r2) (zero only for a matched ratio: the resistor-mismatch common-mode gain);
 * vref: n·(a + r2)·(1 − k). Johnson voltages: r1 and leg− −n·r2, r2 (out → (−)) −n·a, r3 and leg+
 * n·(a + r2)·k, r4 (vref → (+)) n·(a + r2)·(1 − k). (+) pin: k/2 of Vd, k of vcm, 1 − k of vref.
 */
function differenceAmp({ r1, r2, r3, r4 }: DifferenceAmpParams, input: StageInput, { n, d }: OpenLoop): StageModel {
  const a = r1 + input.leg;
  const c = r3 + input.leg;
  const k = r4 / (c + r4);
  const den = add(scale(d, a + r2), scale(n, a));
  const plusSide = resp(scale(n, (a + r2) * k), ZERO, scale(den, k));
  const refSide = resp(scale(n, (a + r2) * (1 - k)), ZERO, scale(den, 1 - k));
  const minusSide = resp(scale(n, -r2), ZERO, ZERO);
  const sources: InternalSource[] = [johnson("r1", r1, minusSide), johnson("r2", r2, resp(scale(n, -a), ZERO, ZERO)), johnson("r3", r3, plusSide), johnson("r4", r4, refSide)];
  if (input.leg > 0) sources.push(johnson("leg-", input.leg, minusSide), johnson("leg+", input.leg, plusSide));
  sources.push(
    src("en", "en", resp(scale(n, a + r2), ZERO, ZERO)),
    src("in-", "in-", resp(scale(n, a * r2), ZERO, ZERO)),
    src("in+", "in+", resp(scale(n, -(a + r2) * c * k), ZERO, scale(den, -c * k))),
    src("vcm", "vcm", resp(scale(n, (a + r2) * k - r2), ZERO, scale(den, k))),
    src("cm-error", "cm-error", resp(scale(n, a), ZERO, ZERO)),
    src("vref", "vref", refSide),
  );
  return { kind: "differenceAmp", den, vin: resp(scale(n, ((a + r2) * k + r2) / 2), ZERO, scale(den, k / 2)), sources };
}

/**
 * Three-op-amp instrumentation amplifier, one part for all three: A1 and A2 buffer P and N (the pair's
 * legs behind them) with rf from each output to its (−) and rg between the two (−) nodes; A3 is a unity
 * difference stage of four rd (o1 → rd → (+) → rd → vref, o2 → rd → (−) → rd → out). Splitting the input
 * stage into its difference and sum, with K = rg + 2·rf, D1 = d·K + n·rg and D2 = 2d + n:
 * o1 − o2 = n·(K·(P1 − N1) − rf·rg·(Ja − Jb))/D1 and Vo = n·(o1 − o2 + vref + rd·(Jp − Jm) + 2·en3)/D2, where
 * J are the currents injected at the (−) nodes a, b of A1, A2 and at A3's pins. So den = D1·D2 and
 * Vo/Vd = n²·K/den (→ 1 + 2rf/rg ideal); the sum o1 + o2 does not reach the output (matched resistors),
 * so vcm has no transfer and the part's CMRR enters as the ± cm-error. The (+) pin reported is A1's,
 * P = vcm + Vd/2 − leg·i1.
 */
function inAmp({ rg, rf, rd }: InAmpParams, input: StageInput, { n, d }: OpenLoop): StageModel {
  const K = rg + 2 * rf;
  const d1 = add(scale(d, K), scale(n, rg));
  const d2 = add(scale(d, 2), n);
  const den = mul(d1, d2);
  const nn = mul(n, n);
  const nd1 = mul(n, d1);
  const diff = (x: number) => resp(scale(nn, x), ZERO, ZERO);
  const second = (x: number) => resp(scale(nd1, x), ZERO, ZERO);
  const leg = input.leg;
  const sources: InternalSource[] = [
    johnson("rf1", rf, diff(-rg)), // o1 → a
    johnson("rf2", rf, diff(rg)), // o2 → b
    johnson("rg", rg, diff(2 * rf)), // a → b
    johnson("rd1", rd, second(1)), // o1 → A3 (+)
    johnson("rd2", rd, second(1)), // vref → A3 (+)
    johnson("rd3", rd, second(-1)), // o2 → A3 (−)
    johnson("rd4", rd, second(-1)), // out → A3 (−)
  ];
  if (leg > 0) sources.push(johnson("leg+", leg, { ...diff(K), p: den }), johnson("leg-", leg, diff(-K)));
  sources.push(
    src("en1", "en", diff(K)),
    src("en2", "en", diff(-K)),
    src("en3", "en", second(2)),
    src("in+1", "in+", { ...diff(-leg * K), p: scale(den, -leg) }),
    src("in+2", "in+", diff(leg * K)),
    src("in-1", "in-", diff(rf * rg)),
    src("in-2", "in-", diff(-rf * rg)),
    src("in+3", "in+", second(-rd)),
    src("in-3", "in-", second(rd)),
    src("vcm", "vcm", resp(ZERO, ZERO, den)),
    src("cm-error", "cm-error", second(1)),
    src("vref", "vref", second(1)),
  );
  return { kind: "inAmp", den, vin: resp(scale(nn, K), ZERO, scale(den, 0.5)), sources };
}

/**
 * Builds the closed-form model of an op-amp stage for the given open-loop gain. `input` is what the
 * stage takes over from a sensor source wired straight to it (the legs of a pair, a Norton shunt).
 */
export function stageModel(node: OpAmpNode, ol: OpenLoop, input: StageInput = NO_INPUT): StageModel {
  switch (node.kind) {
    case "transimpedance":
      return currentInput("transimpedance", node.params.rf, node.params.cf, node.params.cin, input, ol);
    case "chargeAmp":
      return currentInput("chargeAmp", node.params.rf, node.params.cf, node.params.cin, input, ol);
    case "differenceAmp":
      return differenceAmp(node.params, input, ol);
    case "inAmp":
      return inAmp(node.params, input, ol);
    case "inverting":
      return inverting(node.params, ol);
    case "noninverting":
      return noninverting(node.params, ol);
    case "lossyIntegrator":
      return lossyIntegrator(node.params, ol);
    case "integrator":
      return integrator(node.params, ol);
    case "sallenKeyLowpass":
      // unity gain (no rf): the hand-derived form, unchanged for documents written before rf/rg existed
      return node.params.rf == null ? sallenKey(node.params, ol) : sallenKeyGain(node.params, ol);
    case "mfbLowpass":
      return mfb(node.params, ol);
    case "sallenKeyHighpass":
      return sallenKeyHighpass(node.params, ol);
    case "mfbHighpass":
      return mfbHighpass(node.params, ol);
  }
}
