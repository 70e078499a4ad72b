/**
 * Firmware scaling: the constants a converter's code needs to become volts at the source again, and
 * the measurand's own unit when the source declares a sensitivity. Pure: no I/O.
 *
 * Conventions (stated in the JSON and the header so firmware and this page agree):
 * - The converter is taken as ideal with its codes centred on vinLow + code·LSB, LSB = (vinHigh − vinLow)/2^bits
 *   (the engine's LSB), so a voltage v reads code = round((v − vinLow)/LSB), held to 0 … 2^bits − 1.
 *   Converting a code back gives the centre of its step: within half an LSB of the voltage that made it.
 * - A DC-coupled path (a finite, non-zero DC gain from the source EMF to the converter) is scaled with
 *   that DC gain: volts at the source = sourceVoltsPerCode·code + sourceOffsetVolts.
 * - An AC-coupled path (a series capacitor blocks the source's DC) has no DC relation to the source; it
 *   is scaled with the signed gain at the middle of the source band, and the "source volts" it gives are
 *   the signal's swing about the converter's resting level, not the source's DC.
 * - A current source (photodiode) or a charge source (piezo in charge mode) is scaled the same way in its
 *   own quantity: the "source volts" fields then hold amperes or coulombs, and `sourceUnit` says which
 *   (the field names stay for documents made before sensor sources). The C header names its constants
 *   by the quantity (SOURCE_VOLTS / SOURCE_AMPS / SOURCE_COULOMBS) so firmware cannot mistake them.
 * - The measurand = source volts / sensitivity. A sensor whose output is not zero at zero measurand has
 *   that offset subtracted by the firmware (the chain format carries no such figure).
 * - Group delay −dφ/dω of the path at the scaling frequency (a low frequency, a thousandth of the source
 *   band's top, for a DC-coupled path): how long a slow change takes to reach the converter.
 */
import { isSourceKind } from "@/lib/chain/types";
import { OUTPUT_UNIT, sourceSignal } from "@/lib/engine/sensors";
import type { AnalysisResult, Chain, ChainNode } from "../chain/types";
import { compileChain, type CompiledChain } from "../engine";
import { nominalOf } from "./bring-up";
import { isFeed } from "./order";

export const SCALING_FORMAT = "chainwright.scaling/1" as const;

export interface FirmwareScaling {
  format: typeof SCALING_FORMAT;
  chain: string;
  adcId: string;
  path: string[];
  adc: { bits: number; vinLow: number; vinHigh: number; lsb: number; codeMin: number; codeMax: number };
  coupling: "dc" | "ac";
  /** Hz; 0 for a DC-coupled path */
  scalingFrequency: number;
  /** the unit of the source's output quantity: V (voltage and bridge sources), A (photodiode), C (charge) */
  sourceUnit: "V" | "A" | "C";
  /** V at the converter per sourceUnit at the source, signed */
  gain: number;
  /** phase of the path at scalingFrequency, degrees (0 or ±180 at DC) */
  gainPhaseDeg: number;
  /** converter input voltage with the source EMF at 0 V (nominal), V */
  zeroInputVolts: number;
  /** the code of that voltage (may lie outside 0 … codeMax, which means zero input is out of range) */
  zeroInputCode: number;
  /** sourceUnit per code (volts for a voltage source, amperes or coulombs otherwise) */
  sourceVoltsPerCode: number;
  /** in sourceUnit */
  sourceOffsetVolts: number;
  measurand: null | { unit: string; sensitivity: number; unitsPerCode: number; unitOffset: number };
  /** s */
  groupDelay: number;
  groupDelayFrequency: number;
  convention: string;
}

export type ScalingResult = { ok: true; scaling: FirmwareScaling } | { ok: false; adcId: string; reason: string };

const CONVENTION =
  "code = round((v - vinLow)/lsb) held to codeMin..codeMax; v = vinLow + code*lsb; " +
  "source value (in sourceUnit: V, A or C) = sourceVoltsPerCode*code + sourceOffsetVolts; measurand = source value / sensitivity";

/** Ratio of a complex number to another as its phase, radians (no wrapping problems for small steps). */
function phaseStep(aRe: number, aIm: number, bRe: number, bIm: number): number {
  // arg(b / a) = atan2(Im(b·conj a), Re(b·conj a))
  return Math.atan2(bIm * aRe - bRe * aIm, bRe * aRe + bIm * aIm);
}

function at(cc: CompiledChain, i: number, freqs: number[]): { re: number; im: number }[] {
  const sw = cc.sweep(Float64Array.from(freqs));
  return freqs.map((_, k) => ({ re: sw.cumRe[i][k], im: sw.cumIm[i][k] }));
}

/** −dφ/dω at f by a central difference of ±0.1 % in frequency (error of order 1e-6 relative). */
export function groupDelayAt(cc: CompiledChain, nodeIndex: number, f: number): number {
  const h = 1e-3;
  const [a, b] = at(cc, nodeIndex, [f * (1 - h), f * (1 + h)]);
  return -phaseStep(a.re, a.im, b.re, b.im) / (2 * Math.PI * (2 * h * f));
}

/** Scaling for every converter that ends an analysed path, in path order. */
export function buildFirmwareScaling(chain: Chain, result: AnalysisResult): ScalingResult[] {
  const cc = compileChain(chain);
  const index = new Map(cc.nodeIds.map((id, i) => [id, i]));
  const out: ScalingResult[] = [];
  const source = chain.nodes.find((n) => isFeed(chain, n));
  // any source kind through the engine's one signal description (a bridge's DC is its mid-range
  // differential volts, a thermocouple's sensitivity defaults to its Seebeck coefficient)
  const sig = source && isSourceKind(source.kind) ? sourceSignal(source) : null;
  const srcDc = sig ? sig.dc : 0;
  const fLow = sig ? sig.fLow : 0;
  const fHigh = sig ? sig.fHigh : 1;
  const sensitivity = sig && typeof sig.sensitivity === "number" && sig.sensitivity !== 0 ? sig.sensitivity : null;
  const unit = sig?.unit ?? "";
  const sourceUnit: FirmwareScaling["sourceUnit"] = sig ? OUTPUT_UNIT[sig.output] : "V";

  for (const path of result.paths) {
    const adcRes = path.adc;
    if (!adcRes) continue;
    const adcNode = chain.nodes.find((n) => n.id === adcRes.id) as Extract<ChainNode, { kind: "adc" }> | undefined;
    if (!adcNode) continue;
    const { bits, vinLow, vinHigh } = adcNode.params;
    const lsb = adcRes.lsb;
    const codeMax = 2 ** bits - 1;
    const i = index.get(adcNode.id)!;
    const dcIn = nominalOf((adcRes.dcIn as { min: number; max: number } | null | undefined) ?? null);
    if (dcIn === null) {
      out.push({ ok: false, adcId: adcNode.id, reason: "the converter's input has no bounded DC level (an integrator upstream), so codes cannot be scaled" });
      continue;
    }
    const mid = fLow > 0 ? Math.sqrt(fLow * fHigh) : fHigh / 10;
    const [band] = at(cc, i, [mid]);
    const bandGain = Math.hypot(band.re, band.im);
    const dcGain = adcRes.pathDcGain;
    const dcCoupled = dcGain !== null && Number.isFinite(dcGain) && Math.abs(dcGain) > 1e-6 * (Number.isFinite(bandGain) ? bandGain : 0);
    let gain: number;
    let phaseDeg: number;
    let scalingFrequency: number;
    let zeroInputVolts: number;
    if (dcCoupled) {
      gain = dcGain!;
      phaseDeg = gain < 0 ? 180 : 0;
      scalingFrequency = 0;
      zeroInputVolts = dcIn - gain * srcDc;
    } else {
      if (!(Number.isFinite(bandGain) && bandGain > 0)) {
        out.push({ ok: false, adcId: adcNode.id, reason: `the path passes no signal at ${mid} Hz, the middle of the source band` });
        continue;
      }
      gain = band.re < 0 ? -bandGain : bandGain;
      phaseDeg = (Math.atan2(band.im, band.re) * 180) / Math.PI;
      scalingFrequency = mid;
      zeroInputVolts = dcIn; // the source's DC does not reach the converter
    }
    const gdF = dcCoupled ? fHigh * 1e-3 : mid;
    const sourceVoltsPerCode = lsb / gain;
    const sourceOffsetVolts = (vinLow - zeroInputVolts) / gain;
    out.push({
      ok: true,
      scaling: {
        format: SCALING_FORMAT,
        chain: chain.name,
        adcId: adcNode.id,
        path: path.nodes,
        adc: { bits, vinLow, vinHigh, lsb, codeMin: 0, codeMax },
        coupling: dcCoupled ? "dc" : "ac",
        scalingFrequency,
        sourceUnit,
        gain,
        gainPhaseDeg: phaseDeg,
        zeroInputVolts,
        zeroInputCode: Math.round((zeroInputVolts - vinLow) / lsb),
        sourceVoltsPerCode,
        sourceOffsetVolts,
        measurand:
          sensitivity === null
            ? null
            : { unit, sensitivity, unitsPerCode: sourceVoltsPerCode / sensitivity, unitOffset: sourceOffsetVolts / sensitivity },
        groupDelay: groupDelayAt(cc, i, gdF),
        groupDelayFrequency: gdF,
        convention: CONVENTION,
      },
    });
  }
  return out;
}

/** The ideal converter of the convention: the code a voltage at its input reads. */
export function codeOf(s: FirmwareScaling, volts: number): number {
  const k = Math.round((volts - s.adc.vinLow) / s.adc.lsb);
  return Math.min(s.adc.codeMax, Math.max(s.adc.codeMin, k));
}

export const sourceVoltsOf = (s: FirmwareScaling, code: number): number => s.sourceVoltsPerCode * code + s.sourceOffsetVolts;

export function measurandOf(s: FirmwareScaling, code: number): number | null {
  return s.measurand ? s.measurand.unitsPerCode * code + s.measurand.unitOffset : null;
}

// ---------------------------------------------------------------------------------------------------------
// C header

/** A C identifier piece from an id: letters and digits upper-cased, anything else an underscore. */
export function macroName(id: string): string {
  const s = id.toUpperCase().replace(/[^A-Z0-9]/g, "_");
  return /^[0-9]/.test(s) ? `_${s}` : s;
}

/** A double literal that reads back to the same number (JavaScript's shortest round-trip form). */
function lit(v: number): string {
  const t = String(v);
  return /[.e]/.test(t) ? t : `${t}.0`;
}

/** The word for a source quantity in constant and function names. */
export const SOURCE_QUANTITY: Readonly<Record<FirmwareScaling["sourceUnit"], string>> = { V: "volts", A: "amps", C: "coulombs" };

/** Comment text safe inside a C block comment. */
const commentSafe = (s: string) => s.replace(/\*\//g, "* /").replace(/[\r\n]+/g, " ");

export function scalingHeader(list: FirmwareScaling[], revision?: number | null): string {
  const lines: string[] = [];
  const chain = list[0]?.chain ?? "";
  lines.push("/*");
  lines.push(` * Converter scaling for "${commentSafe(chain)}"${revision ? `, revision ${revision}` : ""}.`);
  lines.push(" * Generated by Chainwright from the analysis of the chain; regenerate it after any change.");
  lines.push(` * Convention: ${CONVENTION}.`);
  lines.push(" */");
  lines.push("#ifndef CHAINWRIGHT_SCALING_H");
  lines.push("#define CHAINWRIGHT_SCALING_H");
  lines.push("");
  lines.push("#include <stdint.h>");
  for (const s of list) {
    const p = `CW_${macroName(s.adcId)}`;
    const f = `cw_${macroName(s.adcId).toLowerCase()}`;
    const unit = s.sourceUnit ?? "V"; // documents stored before sensor sources carry no unit: volts
    const q = SOURCE_QUANTITY[unit];
    const Q = q.toUpperCase();
    lines.push("");
    lines.push(`/* ${commentSafe(s.path.join(" -> "))}: ${s.coupling === "dc" ? "DC-coupled, scaled at DC" : `AC-coupled, scaled at ${lit(s.scalingFrequency)} Hz (signal about the resting level)`} */`);
    lines.push(`#define ${p}_BITS ${s.adc.bits}`);
    lines.push(`#define ${p}_CODE_MAX ${s.adc.codeMax}L`);
    lines.push(`#define ${p}_LSB_VOLTS ${lit(s.adc.lsb)}`);
    lines.push(`#define ${p}_GAIN ${lit(s.gain)} /* V at the converter per ${unit} at the source */`);
    lines.push(`#define ${p}_ZERO_INPUT_CODE ${s.zeroInputCode}L`);
    lines.push(`#define ${p}_SOURCE_${Q}_PER_CODE ${lit(s.sourceVoltsPerCode)} /* ${unit} at the source per code */`);
    lines.push(`#define ${p}_SOURCE_OFFSET_${Q} ${lit(s.sourceOffsetVolts)} /* ${unit} */`);
    lines.push(`#define ${p}_GROUP_DELAY_SECONDS ${lit(s.groupDelay)}`);
    lines.push(`static inline double ${f}_source_${q}(int32_t code) { return ${p}_SOURCE_${Q}_PER_CODE * (double)code + ${p}_SOURCE_OFFSET_${Q}; }`);
    if (s.measurand) {
      lines.push(`/* measurand in ${commentSafe(s.measurand.unit || "its unit")}: sensitivity ${lit(s.measurand.sensitivity)} ${unit} per unit */`);
      lines.push(`#define ${p}_UNITS_PER_CODE ${lit(s.measurand.unitsPerCode)}`);
      lines.push(`#define ${p}_UNIT_OFFSET ${lit(s.measurand.unitOffset)}`);
      lines.push(`static inline double ${f}_measurand(int32_t code) { return ${p}_UNITS_PER_CODE * (double)code + ${p}_UNIT_OFFSET; }`);
    }
  }
  lines.push("");
  lines.push("#endif /* CHAINWRIGHT_SCALING_H */");
  return `${lines.join("\n")}\n`;
}
