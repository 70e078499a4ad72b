/**
 * Output noise of a path (chain-format.md, "Noise").
 *
 * Sources and their one-sided densities:
 * - every resistor, Johnson noise 4·k·T·R V²/Hz in series with it (Johnson 1928, Nyquist 1928;
 *   k = 1.380649e-23 J/K exact) — the source resistance included, ADC input resistance excluded (it
 *   models the converter's input, whose noise is part of the converter's own figures);
 * - the source's noiseDensity², in series with its EMF;
 * - each op-amp's en²·(1 + enCorner/f) in series with (+), and in²·(1 + inCorner/f) at each input,
 *   uncorrelated (the usual 1/f-corner model, references.md §11.4).
 * Each is carried to the path's end by its own transfer function (fast path, exact loading) and the
 * powers add. Integration in u = ln f by adaptive Gauss–Kronrod with exact band limits.
 */
import type { Chain, NoiseContribution, Part } from "../chain/types";
import { BOLTZMANN, ELEMENTARY_CHARGE, NOISE_REL_TOL, TWO_PI } from "./constants";
import { sourceSignal } from "./sensors";
import { isSourceKind } from "../chain/types";
import type { CompiledChain } from "./compile-chain";
import { integrateLog } from "./grids";

/**
 * The noise sources of a chain: which transfer source carries each, and its one-sided density
 * white·(1 + corner/f) in V²/Hz (A²/Hz for pin currents). Flat arrays so the integrand allocates nothing.
 */
interface NoiseSources {
  nodeId: string[];
  element: string[];
  transfer: Int32Array;
  white: Float64Array;
  corner: Float64Array;
  /** 1 where the density is a current but the transfer is per unit of charge (piezo): divided by ω² */
  perCharge: Uint8Array;
}

function noiseSources(chain: Chain, cc: CompiledChain): NoiseSources {
  const kT4 = 4 * BOLTZMANN * chain.analysis.temperatureK;
  const list: { nodeId: string; element: string; transfer: number; white: number; corner: number; perCharge?: boolean }[] = [];
  const partFor = (id: string): Part | undefined => {
    const node = chain.nodes.find((n) => n.id === id);
    const key = node && "part" in node ? node.part : null;
    return key ? chain.parts[key] : undefined;
  };
  cc.sources.forEach((s, k) => {
    const add = (element: string, white: number, corner = 0) => {
      if (white > 0) list.push({ nodeId: s.nodeId, element, transfer: k, white, corner });
    };
    switch (s.type) {
      case "emf": {
        const src = chain.nodes.find((n) => n.id === s.nodeId);
        if (!src || !isSourceKind(src.kind)) return;
        const sig = sourceSignal(src);
        add("source", sig.noiseDensity ** 2);
        // a differential pair's resistance is in its legs, which the stage it feeds carries
        if (sig.output === "voltage") add("resistance", kT4 * sig.resistance);
        if (sig.output === "current") {
          // shot noise 2·q·I of the DC current (Schottky 1918) and the shunt's Johnson current 4kT/R
          add("shot", 2 * ELEMENTARY_CHARGE * sig.shotCurrent);
          add("shunt", kT4 / sig.shunt!.r);
        }
        if (sig.output === "charge" && kT4 / sig.shunt!.r > 0)
          list.push({ nodeId: s.nodeId, element: "leakage", transfer: k, white: kT4 / sig.shunt!.r, corner: 0, perCharge: true });
        return;
      }
      case "passive-r":
      case "johnson":
        add(s.element, kT4 * s.resistance!);
        return;
      case "en": {
        const p = partFor(s.nodeId);
        add(s.element, (p?.en ?? 0) ** 2, p?.enCorner ?? 0);
        return;
      }
      case "in+":
      case "in-": {
        const p = partFor(s.nodeId);
        add(s.element, (p?.in ?? 0) ** 2, p?.inCorner ?? 0);
        return;
      }
      default:
        return;
    }
  });
  return {
    nodeId: list.map((x) => x.nodeId),
    element: list.map((x) => x.element),
    transfer: Int32Array.from(list, (x) => x.transfer),
    white: Float64Array.from(list, (x) => x.white),
    corner: Float64Array.from(list, (x) => x.corner),
    perCharge: Uint8Array.from(list, (x) => (x.perCharge ? 1 : 0)),
  };
}

/** Output density of each noise source at f (V²/Hz at the path end) into out[j][i]. */
function densitiesAt(cc: CompiledChain, ns: NoiseSources, end: number, f: number, re: Float64Array, im: Float64Array, out: Float64Array[], i: number): void {
  cc.setFrequency(f);
  cc.transfersTo(end, false, re, im);
  for (let j = 0; j < ns.transfer.length; j++) {
    const t = ns.transfer[j];
    const w2 = ns.perCharge[j] ? (TWO_PI * f) ** 2 : 1;
    out[j][i] = (ns.white[j] * (1 + ns.corner[j] / f) * (re[t] * re[t] + im[t] * im[t])) / w2;
  }
}

export interface PathNoiseFigures {
  outputRms: number;
  totalRms: number;
  low: number;
  high: number;
  contributions: NoiseContribution[];
}

/**
 * Noise at the end of a path (node index `end`): rms over [noiseLow, noiseHigh] (noiseHigh null = fMax)
 * and over [noiseLow, fMax]; contributions with their rms over the first band, their share of its power
 * and their rms over the second (`totalRms`).
 */
export function pathNoise(chain: Chain, cc: CompiledChain, end: number): PathNoiseFigures {
  const { noiseLow, fMax } = chain.analysis;
  const high = chain.analysis.noiseHigh ?? fMax;
  const ns = noiseSources(chain, cc);
  const count = ns.transfer.length;
  const re = new Float64Array(cc.sources.length);
  const im = new Float64Array(cc.sources.length);
  const evaluate = (freqs: Float64Array, vals: Float64Array[]) => {
    for (let i = 0; i < freqs.length; i++) densitiesAt(cc, ns, end, freqs[i], re, im, vals, i);
  };
  // integrate [noiseLow, min(high, fMax)] once, then the part of the longer band beyond it
  const mid = Math.max(noiseLow, Math.min(high, fMax));
  const first = integrateLog(noiseLow, mid, count, evaluate, NOISE_REL_TOL);
  const second = integrateLog(mid, Math.max(high, fMax), count, evaluate, NOISE_REL_TOL);
  const inBand = (j: number) => first[j] + (high > fMax ? second[j] : 0);
  const inTotal = (j: number) => first[j] + (fMax > high ? second[j] : 0);
  let pBand = 0;
  let pTotal = 0;
  for (let j = 0; j < count; j++) {
    pBand += inBand(j);
    pTotal += inTotal(j);
  }
  const contributions: NoiseContribution[] = [];
  for (let j = 0; j < count; j++) {
    const p = inBand(j);
    const pt = inTotal(j);
    if (!(p > 0) && !(pt > 0)) continue;
    contributions.push({
      nodeId: ns.nodeId[j],
      element: ns.element[j],
      rms: Math.sqrt(p),
      share: pBand > 0 ? p / pBand : 0,
      totalRms: Math.sqrt(pt),
      // share of the power the converter samples ([noiseLow, fMax])
      totalShare: pTotal > 0 ? pt / pTotal : 0,
    });
  }
  contributions.sort((a, b) => b.rms - a.rms || (b.totalRms as number) - (a.totalRms as number));
  return {
    outputRms: Math.sqrt(pBand),
    totalRms: noiseLow < fMax ? Math.sqrt(pTotal) : 0,
    low: noiseLow,
    high,
    contributions,
  };
}

/**
 * Noise density at the path end, V/√Hz, at each frequency (for the density plot), total of all sources.
 */
export function pathNoiseDensity(chain: Chain, cc: CompiledChain, end: number, freqs: ArrayLike<number>): number[] {
  const ns = noiseSources(chain, cc);
  const re = new Float64Array(cc.sources.length);
  const im = new Float64Array(cc.sources.length);
  const vals = Array.from({ length: ns.transfer.length }, () => new Float64Array(1));
  const out: number[] = [];
  for (let i = 0; i < freqs.length; i++) {
    const f = freqs[i];
    if (!(f > 0)) {
      out.push(NaN);
      continue;
    }
    densitiesAt(cc, ns, end, f, re, im, vals, 0);
    let p = 0;
    for (const v of vals) p += v[0];
    out.push(Math.sqrt(p));
  }
  return out;
}

/**
 * Density at the path end, V/√Hz, of each named source (nodeId + element as in the contributions) at
 * each frequency, for the budget's density plot of the largest contributors. NaN at f ≤ 0.
 */
export function pathNoiseDensityBy(
  chain: Chain,
  cc: CompiledChain,
  end: number,
  freqs: ArrayLike<number>,
  which: { nodeId: string; element: string }[],
): number[][] {
  const ns = noiseSources(chain, cc);
  const idx = which.map((w) => ns.nodeId.findIndex((id, j) => id === w.nodeId && ns.element[j] === w.element));
  const re = new Float64Array(cc.sources.length);
  const im = new Float64Array(cc.sources.length);
  const vals = Array.from({ length: ns.transfer.length }, () => new Float64Array(1));
  const out = which.map(() => [] as number[]);
  for (let i = 0; i < freqs.length; i++) {
    const f = freqs[i];
    if (!(f > 0)) {
      out.forEach((o) => o.push(NaN));
      continue;
    }
    densitiesAt(cc, ns, end, f, re, im, vals, 0);
    idx.forEach((j, w) => out[w].push(j >= 0 ? Math.sqrt(vals[j][0]) : NaN));
  }
  return out;
}
