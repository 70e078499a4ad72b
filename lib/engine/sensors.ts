/**
 * Sensor sources (issue 14): every source kind reduced to the one signal description the analysis uses,
 * plus the closed-form sensor figures the checks and tests need. Pure; SI units (°C only for the
 * thermocouple's temperatures, as its params give them).
 *
 * How each source feeds the network (chain-format.md, "Sensor sources"):
 * - `source`: a voltage EMF behind its series resistance (unchanged).
 * - bridge, thermocouple: a differential pair E± = vcm ± Vd/2, each leg behind half the source's
 *   differential resistance. The signal the chain carries up to the next stage is Vd; the one stage it
 *   feeds (a difference or instrumentation amplifier) holds the legs in its own closed form.
 * - photodiode, piezo: a current i (or a charge q, i = s·q) in parallel with the shunt admittance
 *   Ys = 1/R + s·C. Into a transimpedance or charge amplifier the stage holds Ys in its closed form; into
 *   any other stage the source is a Norton section whose point voltage is i/(Ys + Yload).
 */
import type { AnySourceNode, Chain, ChainNode, Safety } from "../chain/types";
import { DIFFERENTIAL_SOURCE_KINDS, CURRENT_SOURCE_KINDS, isSourceKind } from "../chain/types";
import { TWO_PI } from "./constants";
import { bandGrid, bandMax } from "./grids";

/** What a source's output is: the unit of dc, amplitude and of the emf transfer's denominator. */
export type SourceOutput = "voltage" | "differential" | "current" | "charge";

/** What each source kind puts out (as `sourceSignal` describes it), known from the kind alone. */
export function sourceOutputOf(kind: AnySourceNode["kind"]): SourceOutput {
  return kind === "photodiode" ? "current" : kind === "piezo" ? "charge" : kind === "bridge" ? "differential" : "voltage";
}

/**
 * What a stage's gain is per: a transimpedance or charge amplifier takes the sensor's current or charge
 * itself, so its gain is in V/A or V/C; every other stage is fed a voltage (V/V).
 */
export function stageGainPerUnit(stageKind: string, sourceKind: AnySourceNode["kind"] | undefined): "V" | "A" | "C" {
  return sourceKind && (stageKind === "transimpedance" || stageKind === "chargeAmp") ? transferPerUnit(sourceOutputOf(sourceKind)) : "V";
}

/** What a chain's transfer from its source is per (V, A or C), from the source's kind; V with no source. */
export function chainSourceUnit(nodes: readonly { kind: string }[]): "V" | "A" | "C" {
  const src = nodes.find((n) => isSourceKind(n.kind));
  return src ? transferPerUnit(sourceOutputOf(src.kind as AnySourceNode["kind"])) : "V";
}

/** Each node's gain unit (stageGainPerUnit with the chain's own source), by node id. */
export function stageGainUnits(nodes: readonly { id: string; kind: string }[]): Map<string, "V" | "A" | "C"> {
  const src = nodes.find((n) => isSourceKind(n.kind))?.kind as AnySourceNode["kind"] | undefined;
  return new Map(nodes.map((n) => [n.id, stageGainPerUnit(n.kind, src)]));
}

/**
 * The unit a chain's transfer from its source is per: a cascade from a photodiode is in volts per ampere
 * and from a piezo in volts per coulomb, so its magnitude in dB is relative to 1 V/A or 1 V/C, not a
 * plain ratio. Voltage and differential sources give V/V.
 */
export function transferPerUnit(output: SourceOutput): "V" | "A" | "C" {
  return OUTPUT_UNIT[output];
}

/** "dB", or "dB re 1 V/A" and "dB re 1 V/C" for a transfer from a current or charge source. */
export function magnitudeDbLabel(perUnit: "V" | "A" | "C"): string {
  return perUnit === "V" ? "dB" : `dB re 1 V/${perUnit}`;
}

export interface SourceSignal {
  output: SourceOutput;
  /** nominal DC of the output quantity (V, V differential, A; 0 for a charge) */
  dc: number;
  /** ± DC spread */
  dcSpread: number;
  /** signal peak anywhere in [fLow, fHigh] */
  amplitude: number;
  fLow: number;
  fHigh: number;
  /** voltage: series resistance; differential: the pair's differential resistance (legs of half each) */
  resistance: number;
  /** current and charge: the Norton shunt (ohms, farads); null for voltage outputs */
  shunt: { r: number; c: number } | null;
  /** differential only: the pair's common-mode voltage */
  vcm: number;
  /** white noise density in the output unit per √Hz, in series (voltage) or in parallel (current) */
  noiseDensity: number;
  /** DC current whose shot noise 2·q·I the source carries (photodiode), A */
  shotCurrent: number;
  safety: Safety;
  /** output unit per unit of the measurand, when declared or derived (thermocouple: its Seebeck coefficient) */
  sensitivity: number | null;
  unit: string | null;
}

/** The unit word of a source's output quantity, for messages. */
export const OUTPUT_UNIT: Readonly<Record<SourceOutput, "V" | "A" | "C">> = { voltage: "V", differential: "V", current: "A", charge: "C" };

export function isDifferentialSource(kind: unknown): boolean {
  return (DIFFERENTIAL_SOURCE_KINDS as readonly unknown[]).includes(kind);
}
export function isCurrentSource(kind: unknown): boolean {
  return (CURRENT_SOURCE_KINDS as readonly unknown[]).includes(kind);
}

/** The chain's source node (the engine works on complete chains: exactly one). */
export function chainSource(chain: Chain): AnySourceNode {
  const s = chain.nodes.find((n) => isSourceKind(n.kind));
  if (!s) throw new Error("chain has no source node");
  return s as AnySourceNode;
}

/** The signal description of any source kind. */
export function sourceSignal(node: ChainNode): SourceSignal {
  const base = { shunt: null, vcm: 0, shotCurrent: 0, noiseDensity: 0 };
  switch (node.kind) {
    case "source": {
      const p = node.params;
      return {
        ...base,
        output: "voltage",
        dc: p.dc,
        dcSpread: p.dcSpread,
        amplitude: p.amplitude,
        fLow: p.fLow,
        fHigh: p.fHigh,
        resistance: p.resistance,
        noiseDensity: p.noiseDensity,
        safety: p.safety,
        sensitivity: p.sensitivity ?? null,
        unit: p.unit || null,
      };
    }
    case "bridge": {
      const p = node.params;
      const span = bridgeFullScaleVolts(p.excitation, p.fullScale);
      return {
        ...base,
        output: "differential",
        dc: (span * (p.loadLow + p.loadHigh)) / 2,
        dcSpread: p.excitation * p.offset,
        amplitude: (span * (p.loadHigh - p.loadLow)) / 2,
        fLow: p.fLow,
        fHigh: p.fHigh,
        resistance: p.resistance,
        vcm: p.vcm ?? p.excitation / 2,
        noiseDensity: p.noiseDensity,
        safety: p.safety,
        sensitivity: p.sensitivity ?? null,
        unit: p.unit || null,
      };
    }
    case "thermocouple": {
      const p = node.params;
      const mid = (p.tLow + p.tHigh) / 2;
      return {
        ...base,
        output: "differential",
        dc: p.seebeck * (mid - p.tCold),
        dcSpread: p.seebeck * p.coldJunctionError,
        amplitude: (p.seebeck * (p.tHigh - p.tLow)) / 2,
        fLow: 0,
        fHigh: p.fHigh,
        resistance: 2 * p.leadResistance,
        vcm: p.vcm,
        safety: p.safety,
        sensitivity: p.sensitivity ?? p.seebeck,
        unit: p.unit || "°C",
      };
    }
    case "photodiode": {
      const p = node.params;
      return {
        ...base,
        output: "current",
        dc: p.dc + p.darkCurrent,
        dcSpread: p.dcSpread,
        amplitude: p.amplitude,
        fLow: p.fLow,
        fHigh: p.fHigh,
        resistance: 0,
        shunt: { r: p.shuntResistance, c: p.capacitance },
        noiseDensity: p.noiseDensity,
        shotCurrent: p.dc + p.darkCurrent,
        safety: p.safety,
        sensitivity: p.sensitivity ?? null,
        unit: p.unit || null,
      };
    }
    case "piezo": {
      const p = node.params;
      return {
        ...base,
        output: "charge",
        dc: 0,
        dcSpread: 0,
        amplitude: p.amplitude,
        fLow: p.fLow,
        fHigh: p.fHigh,
        resistance: 0,
        shunt: { r: p.leakage, c: p.capacitance },
        safety: p.safety,
        sensitivity: p.sensitivity ?? null,
        unit: p.unit || null,
      };
    }
    default:
      throw new Error(`${node.kind} is not a source kind`);
  }
}

// ---------------------------------------------------------------------------------------------------------
// Closed-form sensor figures

/** Full-scale differential output of a bridge: excitation × rated output (V/V). */
export function bridgeFullScaleVolts(excitation: number, fullScale: number): number {
  return excitation * fullScale;
}

/**
 * Output of a Wheatstone bridge of four equal arms R with `active` arms changed by ±ΔR (alternating signs,
 * as strain gauges are placed), exactly: quarter (1 arm) Vex·x/(4 + 2x), half (2 arms) Vex·x/2,
 * full (4 arms) Vex·x, with x = ΔR/R. Derived from the two voltage dividers of the bridge; the small-x
 * forms Vex·x/4, Vex·x/2, Vex·x are the usual textbook figures (e.g. Pallás-Areny & Webster, Sensors and
 * Signal Conditioning, ch. 3, from memory).
 */
export function bridgeOutput(excitation: number, x: number, active: 1 | 2 | 4): number {
  if (active === 1) return excitation * (x / (4 + 2 * x));
  if (active === 2) return (excitation * x) / 2;
  return excitation * x;
}

// ---------------------------------------------------------------------------------------------------------
// Transimpedance stability (noise-gain construction)

export interface TiaStability {
  /** total capacitance at the summing node (sensor + op-amp input), F */
  cin: number;
  /** frequency where |A| meets the noise gain 1/β, Hz (null for an ideal op-amp) */
  crossover: number | null;
  /** phase margin at that crossing, degrees */
  phaseMarginDeg: number | null;
  /** peak of |1/(1 + 1/(Aβ))| over frequency, dB above its low-frequency value */
  peakingDb: number | null;
  /** feedback capacitance for about 45° or better: √(Cin/(2π·Rf·GBW)) */
  suggestedCf: number | null;
}

/**
 * Loop of a transimpedance stage with the single-pole op-amp A(s) = aol/(1 + s·aol/ωt): feedback factor
 * β(s) = Zs/(Zs + Zf), Zs = Rsh ∥ 1/(s·Cin), Zf = Rf ∥ 1/(s·Cf); the loop gain is A·β and the noise gain
 * 1/β. Phase margin = 180° + ∠(A·β) at |A·β| = 1, found by bisection in log f (|A·β| falls through 1 once for
 * these networks). Peaking: the largest |1/(1 + 1/(A·β))| (dense log grid refined by golden-section
 * search, as the band peaks), against its value at 1 mHz (the DC value).
 * The suggested Cf is the common design rule Cf = √(Cin/(2π·Rf·GBW)) (it puts the noise-gain zero at the
 * geometric mean of 1/(2π·Rf·Cin) and GBW, giving roughly 45° or more; a rule of thumb).
 */
export function tiaStability(
  rf: number,
  cf: number,
  rsh: number,
  cin: number,
  part: { gbw?: number; aol?: number } | undefined,
): TiaStability {
  const gbw = part?.gbw;
  const suggestedCf = gbw ? Math.sqrt(cin / (TWO_PI * rf * gbw)) : null;
  if (!gbw) return { cin, crossover: null, phaseMarginDeg: null, peakingDb: null, suggestedCf };
  const aol = part?.aol;
  const loop = (f: number): [number, number] => {
    const w = TWO_PI * f;
    // A = 1/(1/aol + s/ωt)
    const ir = aol ? 1 / aol : 0;
    const ii = w / (TWO_PI * gbw);
    const am = ir * ir + ii * ii;
    const ar = ir / am;
    const ai = -ii / am;
    // β = Yf/(Ys + Yf) with Y = G + sC
    const yfr = 1 / rf;
    const yfi = w * cf;
    const ysr = 1 / rsh + yfr;
    const ysi = w * cin + yfi;
    const dm = ysr * ysr + ysi * ysi;
    const br = (yfr * ysr + yfi * ysi) / dm;
    const bi = (yfi * ysr - yfr * ysi) / dm;
    return [ar * br - ai * bi, ar * bi + ai * br];
  };
  const mag = (f: number) => Math.hypot(...loop(f));
  let lo = 1e-3;
  let hi = gbw * 10;
  if (mag(lo) < 1 || mag(hi) > 1) return { cin, crossover: null, phaseMarginDeg: null, peakingDb: null, suggestedCf };
  for (let k = 0; k < 200; k++) {
    const mid = Math.sqrt(lo * hi);
    if (mag(mid) > 1) lo = mid;
    else hi = mid;
    if (hi / lo < 1 + 1e-12) break;
  }
  const fc = Math.sqrt(lo * hi);
  const [lr, li] = loop(fc);
  const phase = (Math.atan2(li, lr) * 180) / Math.PI;
  const pm = 180 + phase;
  // closed-loop shape 1/(1 + 1/(Aβ)), relative to low frequency
  const shape = (f: number) => {
    const [r, i] = loop(f);
    const m = r * r + i * i;
    const invR = r / m;
    const invI = -i / m;
    return 1 / Math.hypot(1 + invR, invI);
  };
  const ref = shape(1e-3);
  // the dense band grid refined around its best sample, as every other peak: a fixed 0.01-decade grid
  // missed a sharp peak (0.05 dB at Q ≈ 80, more as Q grows; found by tests/reference/hidden-sensor-cases)
  const grid = bandGrid(1e-3, gbw * 10);
  const peak = Math.max(ref, bandMax(grid, Array.from(grid, shape), shape).value);
  return { cin, crossover: fc, phaseMarginDeg: pm > 180 ? pm - 360 : pm, peakingDb: 20 * Math.log10(peak / ref), suggestedCf };
}

// ---------------------------------------------------------------------------------------------------------
// Common-mode figures of the differential stages

/**
 * Common-mode gain of the four-resistor difference amplifier driven by a pair through legs of `leg` Ω,
 * ideal op-amp: Acm = ((a + r2)·k − r2)/a with a = r1 + leg, c = r3 + leg, k = r4/(c + r4); the differential
 * gain is Ad = ((a + r2)·k + r2)/(2a). Zero exactly when r2/a = r4/c (derived from the two dividers).
 */
export function differenceAmpGains(r1: number, r2: number, r3: number, r4: number, leg = 0): { ad: number; acm: number } {
  const a = r1 + leg;
  const c = r3 + leg;
  const k = r4 / (c + r4);
  return { ad: ((a + r2) * k + r2) / (2 * a), acm: ((a + r2) * k - r2) / a };
}

/**
 * The most the common-mode gain can move when each of r1..r4 may sit anywhere within ±t (first-order
 * worst case: Σ|∂Acm/∂ri|·ri·t, by central differences). For a matched amplifier of gain G this is
 * 4t·G/(1 + G), i.e. a worst CMRR of (1 + G)/(4t) (derived from Acm = (r1·r4 − r2·r3)/(r1·(r3 + r4))).
 */
export function differenceAmpCmSpread(r1: number, r2: number, r3: number, r4: number, t: number | readonly number[], leg = 0): number {
  const base = [r1, r2, r3, r4];
  let sum = 0;
  for (let j = 0; j < 4; j++) {
    const h = 1e-6;
    const up = base.map((v, q) => (q === j ? v * (1 + h) : v));
    const dn = base.map((v, q) => (q === j ? v * (1 - h) : v));
    const dA = differenceAmpGains(up[0], up[1], up[2], up[3], leg).acm - differenceAmpGains(dn[0], dn[1], dn[2], dn[3], leg).acm;
    sum += Math.abs(dA / (2 * h)) * (typeof t === "number" ? t : t[j]);
  }
  return sum;
}

/**
 * The tolerances of a difference amplifier's r1..r4: each one's `tolerances.overrides` entry, else
 * `tolerances.resistor` (the same rule as the tolerance spread), so a matched network stated as such
 * gives its own common-mode error.
 */
export function differenceAmpTolerances(chain: Chain, nodeId: string): number[] {
  return ["r1", "r2", "r3", "r4"].map((k) => chain.tolerances.overrides?.[`${nodeId}.${k}`] ?? chain.tolerances.resistor);
}

/**
 * The ± common-mode error (V, referred to the stage output) of a differential stage: the difference
 * amplifier's |vcm|·(spread of Acm over the resistor tolerance), or the instrumentation amplifier's
 * |vcm|·G/CMRR when it states cmrrDb (CMRR = Ad/Acm, so the output error is G·vcm/CMRR). 0 otherwise.
 */
export function commonModeError(chain: Chain, node: ChainNode): number {
  const src = chainSource(chain);
  const sig = sourceSignal(src);
  const vcm = Math.abs(sig.vcm);
  if (node.kind === "differenceAmp") {
    const { r1, r2, r3, r4 } = node.params;
    return vcm * differenceAmpCmSpread(r1, r2, r3, r4, differenceAmpTolerances(chain, node.id), sig.resistance / 2);
  }
  if (node.kind === "inAmp" && node.params.cmrrDb !== null) {
    const g = 1 + (2 * node.params.rf) / node.params.rg;
    return (vcm * g) / 10 ** (node.params.cmrrDb / 20);
  }
  return 0;
}
