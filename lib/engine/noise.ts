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
import { BOLTZMANN, NOISE_REL_TOL } from "./constants";
import type { CompiledChain } from "./compile-chain";
import { integrateLog } from "./grids";

/** A noise contribution: which transfer source carries it and its density in V²/Hz or A²/Hz. */
interface NoiseSource {
  transfer: number;
  nodeId: string;
  element: string;
  psd: (f: number) => number;
}

function noiseSources(chain: Chain, cc: CompiledChain): NoiseSource[] {
  const kT4 = 4 * BOLTZMANN * chain.analysis.temperatureK;
  const out: NoiseSource[] = [];
  const partFor = (id: string): Part | undefined => {
    const node = chain.nodes.find((n) => n.id === id);
    const key = node && "part" in node ? node.part : null;
    return key ? chain.parts[key] : undefined;
  };
  cc.sources.forEach((s, k) => {
    switch (s.type) {
      case "emf": {
        const src = chain.nodes.find((n) => n.id === s.nodeId);
        if (src?.kind !== "source") return;
        const nd = src.params.noiseDensity;
        const rs = src.params.resistance;
        if (nd > 0) out.push({ transfer: k, nodeId: s.nodeId, element: "source", psd: () => nd * nd });
        if (rs > 0) out.push({ transfer: k, nodeId: s.nodeId, element: "resistance", psd: () => kT4 * rs });
        return;
      }
      case "passive-r":
      case "johnson": {
        const r = s.resistance!;
        out.push({ transfer: k, nodeId: s.nodeId, element: s.element, psd: () => kT4 * r });
        return;
      }
      case "en": {
        const p = partFor(s.nodeId);
        const en = p?.en ?? 0;
        const fc = p?.enCorner ?? 0;
        if (en > 0) out.push({ transfer: k, nodeId: s.nodeId, element: "en", psd: (f) => en * en * (1 + fc / f) });
        return;
      }
      case "in+":
      case "in-": {
        const p = partFor(s.nodeId);
        const cur = p?.in ?? 0;
        const fc = p?.inCorner ?? 0;
        if (cur > 0) out.push({ transfer: k, nodeId: s.nodeId, element: s.type, psd: (f) => cur * cur * (1 + fc / f) });
        return;
      }
      default:
        return;
    }
  });
  return out;
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
  const sources = noiseSources(chain, cc);
  const re = new Float64Array(cc.sources.length);
  const im = new Float64Array(cc.sources.length);
  const evaluate = (freqs: Float64Array, vals: Float64Array[]) => {
    for (let i = 0; i < freqs.length; i++) {
      const f = freqs[i];
      cc.setFrequency(f);
      cc.transfersTo(end, false, re, im);
      sources.forEach((s, j) => {
        const t = s.transfer;
        vals[j][i] = s.psd(f) * (re[t] * re[t] + im[t] * im[t]);
      });
    }
  };
  // integrate [noiseLow, min(high, fMax)] once, then the part of the longer band beyond it
  const mid = Math.max(noiseLow, Math.min(high, fMax));
  const first = integrateLog(noiseLow, mid, sources.length, evaluate, NOISE_REL_TOL);
  const second = integrateLog(mid, Math.max(high, fMax), sources.length, evaluate, NOISE_REL_TOL);
  const inBand = (j: number) => first[j] + (high > fMax ? second[j] : 0);
  const inTotal = (j: number) => first[j] + (fMax > high ? second[j] : 0);
  let pBand = 0;
  let pTotal = 0;
  sources.forEach((_, j) => {
    pBand += inBand(j);
    pTotal += inTotal(j);
  });
  const contributions: NoiseContribution[] = [];
  sources.forEach((s, j) => {
    const p = inBand(j);
    const pt = inTotal(j);
    if (!(p > 0) && !(pt > 0)) return;
    contributions.push({
      nodeId: s.nodeId,
      element: s.element,
      rms: Math.sqrt(p),
      share: pBand > 0 ? p / pBand : 0,
      totalRms: Math.sqrt(pt),
    });
  });
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
  const sources = noiseSources(chain, cc);
  const re = new Float64Array(cc.sources.length);
  const im = new Float64Array(cc.sources.length);
  const out: number[] = [];
  for (let i = 0; i < freqs.length; i++) {
    const f = freqs[i];
    if (!(f > 0)) {
      out.push(NaN);
      continue;
    }
    cc.setFrequency(f);
    cc.transfersTo(end, false, re, im);
    let p = 0;
    for (const s of sources) p += s.psd(f) * (re[s.transfer] ** 2 + im[s.transfer] ** 2);
    out.push(Math.sqrt(p));
  }
  return out;
}
