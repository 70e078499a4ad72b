/**
 * The checks that belong to the sensor front-end stages (issue 14), run by analyzeChain for each of them:
 * - transimpedance and charge amplifiers: loop stability by the noise-gain construction (phase margin,
 *   closed-loop peaking, a suggested feedback capacitor), the TIA's signal corner against the band, the
 *   charge amplifier's low-frequency corner 1/(2π·rf·cf) against the band;
 * - instrumentation amplifier: common-mode range at both inputs and at the internal nodes of the
 *   three-op-amp form (A1 and A2 outputs against the usable swing, A3's (+) against the input range);
 * - difference amplifier: CMRR from the resistor values and its worst case over the resistor tolerance.
 * The internal-node figures use the ideal gains and leave the op-amps' offsets out (they are micro- to
 * millivolts against volts of headroom).
 */
import type { Chain, Interval, OpAmpNode, Part } from "../chain/types";
import { TWO_PI } from "./constants";
import type { OperatingPoint } from "./dc";
import { si } from "./format";
import { chainSource, differenceAmpCmSpread, differenceAmpGains, differenceAmpTolerances, sourceSignal, tiaStability } from "./sensors";

export interface FrontEndContext {
  op: OperatingPoint;
  /** band maxima of |H| from the source to each node */
  band: readonly { gain: number | null }[];
  amp: number;
  usable: { low: number; high: number };
  allowed: { low: number; high: number };
  W: (code: string, message: string) => void;
}

export interface FrontEndFigures {
  figures: Record<string, unknown>;
  clip: boolean;
}

/** Phase margin below which the TIA warning fires: 45°, a common design target (rule of thumb). */
export const TIA_MIN_PHASE_MARGIN = 45;

const nameOf = (n: OpAmpNode) => (n.label ? `${n.id} ("${n.label}")` : n.id);

function partOf(chain: Chain, node: OpAmpNode): Part | undefined {
  return node.part ? chain.parts[node.part] : undefined;
}

export function frontEndChecks(chain: Chain, node: OpAmpNode, i: number, ctx: FrontEndContext): FrontEndFigures | null {
  switch (node.kind) {
    case "transimpedance":
    case "chargeAmp":
      return currentStage(chain, node, ctx);
    case "inAmp":
      return inAmpRange(chain, node, i, ctx);
    case "differenceAmp":
      return diffAmpCmrr(chain, node);
    default:
      return null;
  }
}

function currentStage(chain: Chain, node: Extract<OpAmpNode, { kind: "transimpedance" | "chargeAmp" }>, ctx: FrontEndContext): FrontEndFigures {
  const sig = sourceSignal(chainSource(chain));
  const sh = sig.shunt!;
  const { rf, cf, cin } = node.params;
  const name = nameOf(node);
  const stab = tiaStability(rf, cf, sh.r, sh.c + cin, partOf(chain, node));
  const figures: Record<string, unknown> = { stability: stab };
  if (stab.phaseMarginDeg !== null && stab.phaseMarginDeg < TIA_MIN_PHASE_MARGIN) {
    const fix =
      stab.suggestedCf !== null && stab.suggestedCf > cf
        ? ` A feedback capacitor of about ${si(stab.suggestedCf, "F")} (√(Cin/(2π·rf·GBW)), a common design rule) gives about 45° or more.`
        : "";
    ctx.W(
      "tia-stability",
      `${name}: phase margin ${stab.phaseMarginDeg.toFixed(1)}° where the noise gain 1/β meets the open-loop gain (${si(stab.crossover!, "Hz")}), with ${si(stab.cin, "F")} at the summing node and cf = ${si(cf, "F")}; the closed loop peaks ${stab.peakingDb!.toFixed(1)} dB. Under ${TIA_MIN_PHASE_MARGIN}° (a common target) it rings or oscillates.${fix}`,
    );
  }
  const corner = cf > 0 ? 1 / (TWO_PI * rf * cf) : null;
  if (node.kind === "transimpedance") {
    figures.signalCorner = corner;
    if (corner !== null && corner < sig.fHigh)
      ctx.W(
        "tia-bandwidth",
        `${name}: rf ∥ cf rolls the signal off from ${si(corner, "Hz")}, inside the source band (up to ${si(sig.fHigh, "Hz")}).`,
      );
  } else {
    figures.lowCorner = corner;
    if (corner !== null && corner > sig.fLow)
      ctx.W(
        "charge-corner",
        `${name}: its low-frequency corner 1/(2π·rf·cf) is ${si(corner, "Hz")}, above the source band's low edge ${si(sig.fLow, "Hz")}; the signal below the corner is lost. A larger rf or cf lowers it.`,
      );
  }
  return { figures, clip: false };
}

/** Interval of x·v for v in [lo, hi] and x ≥ 0, shifted by c. */
const around = (c: number, x: number, lo: number, hi: number): Interval => ({ min: c + x * lo, max: c + x * hi });

function inAmpRange(chain: Chain, node: Extract<OpAmpNode, { kind: "inAmp" }>, i: number, ctx: FrontEndContext): FrontEndFigures {
  const sig = sourceSignal(chainSource(chain));
  const name = nameOf(node);
  const { rf, rg, vref } = node.params;
  const g1 = 1 + (2 * rf) / rg;
  const vd = ctx.op.out[0].interval;
  const ac = ctx.amp * (ctx.band[0].gain ?? 1);
  if (!vd) return { figures: {}, clip: false };
  const lo = vd.min - ac;
  const hi = vd.max + ac;
  // P = vcm + Vd/2 and N = vcm − Vd/2; o1 = vcm + G1·Vd/2, o2 = vcm − G1·Vd/2; A3 (+) = (o1 + vref)/2
  const p = around(sig.vcm, 0.5, lo, hi);
  const n = around(sig.vcm, -0.5, hi, lo);
  const o1 = around(sig.vcm, g1 / 2, lo, hi);
  const o2 = around(sig.vcm, -g1 / 2, hi, lo);
  const p3 = { min: (o1.min + vref) / 2, max: (o1.max + vref) / 2 };
  const span = (a: Interval, b: Interval): Interval => ({ min: Math.min(a.min, b.min), max: Math.max(a.max, b.max) });
  const pins = span(p, n);
  const internal = span(o1, o2);
  let clip = false;
  const check = (what: string, iv: Interval, lim: { low: number; high: number }, limWord: string) => {
    if (iv.min >= lim.low && iv.max <= lim.high) return;
    clip = true;
    ctx.W(
      "inamp-common-mode",
      `${name}: ${what} spans ${si(iv.min, "V")} to ${si(iv.max, "V")}, outside its ${limWord} ${si(lim.low, "V")} to ${si(lim.high, "V")} (common mode ${si(sig.vcm, "V")}, differential ${si(lo, "V")} to ${si(hi, "V")}, first-stage gain ${g1.toPrecision(4)}).`,
    );
  };
  check("the inputs (common mode ± half the differential)", pins, ctx.allowed, "input range");
  check("the input-stage outputs (common mode ± half the differential times the first-stage gain)", internal, ctx.usable, "usable output");
  check("the difference stage's (+) input", p3, ctx.allowed, "input range");
  void i;
  return { figures: { commonMode: { vcm: sig.vcm, pins, internal, firstStageGain: g1, cmrrDb: node.params.cmrrDb } }, clip };
}

function diffAmpCmrr(chain: Chain, node: Extract<OpAmpNode, { kind: "differenceAmp" }>): FrontEndFigures {
  const sig = sourceSignal(chainSource(chain));
  const leg = sig.resistance / 2;
  const { r1, r2, r3, r4 } = node.params;
  const { ad, acm } = differenceAmpGains(r1, r2, r3, r4, leg);
  const spread = differenceAmpCmSpread(r1, r2, r3, r4, differenceAmpTolerances(chain, node.id), leg);
  const db = (x: number) => (x > 0 && Number.isFinite(x) ? 20 * Math.log10(x) : null);
  return {
    figures: {
      cmrr: { differentialGain: ad, commonModeGain: acm, nominalDb: acm === 0 ? null : db(Math.abs(ad / acm)), worstDb: db(Math.abs(ad) / (Math.abs(acm) + spread)) },
    },
    clip: false,
  };
}
