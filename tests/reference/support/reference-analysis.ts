/**
 * Reference figures computed with the independent nodal solver (nodal.ts): DC
 * intervals, band maxima (AC peak, slew), noise integrals. Each function restates
 * the chain-format.md definition it implements.
 */
import { cx, type Cx } from "./cx";
import type { Chain, Interval } from "@/lib/chain/types";
import { adjoint, buildNet, forward, GND, jw, K_BOLTZMANN, SOURCE_KINDS, weight, type Injection, type Net } from "./nodal";
import { integrateLogVec } from "./simpson";

const ZERO = cx(0, 0);

function mag(z: Cx): number {
  return z.abs();
}

/** The source node of a chain: a plain `source` or one of the four sensor kinds. */
export function sourceOf(chain: Chain) {
  const s = chain.nodes.find((n) => SOURCE_KINDS.has(n.kind));
  if (!s) throw new Error("chain has no source");
  return s;
}

/** Elementary charge, C, exact since the 2019 SI (SI Brochure 9th ed.). */
export const Q_ELECTRON = 1.602176634e-19;

/**
 * What the source puts out, in its own unit (V, V of difference, A, C), read from the
 * tables of lib/chain/README.md ("Sensor sources"): the nominal DC, its ± spread, the peak
 * amplitude, the band, and the PSD of the noise that sits on the emf itself (the source's
 * resistance, legs, shunt or leakage are resistors of the net and make their own noise).
 */
export interface SourceSignal {
  id: string;
  dc: number;
  spread: number;
  amplitude: number;
  fLow: number;
  fHigh: number;
  emfPsd: number;
}
export function signalOf(chain: Chain): SourceSignal {
  const s = sourceOf(chain);
  switch (s.kind) {
    case "source": {
      const p = s.params;
      return { id: s.id, dc: p.dc, spread: p.dcSpread, amplitude: p.amplitude, fLow: p.fLow, fHigh: p.fHigh, emfPsd: p.noiseDensity ** 2 };
    }
    case "bridge": {
      // Vd over excitation·fullScale·[loadLow, loadHigh]: DC the mid-point, amplitude half the span, ± excitation·offset
      const p = s.params;
      const fs = p.excitation * p.fullScale;
      return { id: s.id, dc: (fs * (p.loadLow + p.loadHigh)) / 2, spread: p.excitation * p.offset, amplitude: (fs * (p.loadHigh - p.loadLow)) / 2, fLow: p.fLow, fHigh: p.fHigh, emfPsd: p.noiseDensity ** 2 };
    }
    case "thermocouple": {
      // Vd = seebeck·(t − tCold) over [tLow, tHigh], ± seebeck·coldJunctionError; no fLow: the band starts at DC
      const p = s.params;
      return { id: s.id, dc: p.seebeck * ((p.tLow + p.tHigh) / 2 - p.tCold), spread: p.seebeck * p.coldJunctionError, amplitude: (p.seebeck * Math.abs(p.tHigh - p.tLow)) / 2, fLow: 0, fHigh: p.fHigh, emfPsd: 0 };
    }
    case "photodiode": {
      // DC dc + darkCurrent; shot noise 2q·I (Schottky's formula) and the extra noiseDensity, as currents
      const p = s.params;
      const i = p.dc + p.darkCurrent;
      return { id: s.id, dc: i, spread: p.dcSpread, amplitude: p.amplitude, fLow: p.fLow, fHigh: p.fHigh, emfPsd: 2 * Q_ELECTRON * Math.abs(i) + p.noiseDensity ** 2 };
    }
    case "piezo": {
      const p = s.params;
      return { id: s.id, dc: 0, spread: 0, amplitude: p.amplitude, fLow: p.fLow, fHigh: p.fHigh, emfPsd: 0 };
    }
    default:
      throw new Error(`${s.kind} is not a source kind`);
  }
}

/**
 * The ± common-mode error of a difference or instrumentation amplifier (lib/engine/README.md,
 * sensor section): the difference amplifier's |vcm| times the first-order worst-case spread of
 * its common-mode gain over the resistor tolerance, the in-amp's |vcm|·G/CMRR when cmrrDb is
 * given, both as the ideal stage would show them at its output. Acm with legs L is the closed
 * form of lib/chain/README.md, ((a + r2)·k − r2)/a = k + r2·(k − 1)/a, a = r1 + L,
 * k = r4/(r3 + L + r4); its log-sensitivities, derived by hand:
 *   ∂Acm/∂ln r1 = −r1·r2·(k − 1)/a²,  ∂Acm/∂ln r2 = r2·(k − 1)/a,
 *   ∂Acm/∂ln r3 = −(1 + r2/a)·r3·r4/D²,  ∂Acm/∂ln r4 = (1 + r2/a)·(r3 + L)·r4/D², D = r3 + L + r4.
 * Matched (L = 0, r4/r3 = r2/r1 = G) each is ±G/(1 + G), the sum 4t·G/(1 + G) of the README.
 * `noiseGain` is the ideal gain from a voltage in series with the output op-amp's (+) to the
 * output (1 + r2/a; the in-amp's unity difference stage: 2), so err/noiseGain in that place is
 * the error at the ideal output, and a finite loop gain shrinks it as it shrinks the nominal
 * common-mode gain (the engine does so; its README says only "referred to the stage output").
 * Each resistor's tolerance is its `tolerances.overrides` entry, else `tolerances.resistor`
 * (lib/chain/README.md: a part without an entry takes `resistor`).
 */
export function cmError(chain: Chain, stageId: string): { err: number; noiseGain: number } {
  const node = chain.nodes.find((n) => n.id === stageId)!;
  const src = sourceOf(chain);
  let vcm = 0;
  let legR = 0;
  if (src.kind === "bridge") {
    vcm = src.params.vcm ?? src.params.excitation / 2;
    legR = src.params.resistance / 2;
  } else if (src.kind === "thermocouple") {
    vcm = src.params.vcm;
    legR = src.params.leadResistance;
  }
  if (node.kind === "inAmp") {
    const p = node.params;
    return { err: p.cmrrDb === null ? 0 : (Math.abs(vcm) * (1 + (2 * p.rf) / p.rg)) / Math.pow(10, p.cmrrDb / 20), noiseGain: 2 };
  }
  if (node.kind !== "differenceAmp") return { err: 0, noiseGain: 1 };
  const { r1, r2, r3, r4 } = node.params;
  const a = r1 + legR;
  const D = r3 + legR + r4;
  const k = r4 / D;
  const sens = [-(r1 * r2 * (k - 1)) / (a * a), (r2 * (k - 1)) / a, (-(1 + r2 / a) * r3 * r4) / (D * D), ((1 + r2 / a) * (r3 + legR) * r4) / (D * D)];
  const t = ["r1", "r2", "r3", "r4"].map((key) => chain.tolerances.overrides?.[`${stageId}.${key}`] ?? chain.tolerances.resistor);
  return { err: Math.abs(vcm) * sens.reduce((acc, x, i) => acc + Math.abs(x) * t[i], 0), noiseGain: 1 + r2 / a };
}

/**
 * DC interval at a net node (chain-format.md "DC operating point as intervals"):
 * centre from the source dc and every vref/vbias (and a differential source's vcm);
 * half-width |g_emf|·spread + Σ |g_vos|·vos + Σ (|g_ib+| + |g_ib−|)·ib over every op-amp
 * (the in-amp's three included), every sign independent, plus each difference or in-amp
 * stage's common-mode error, entered as err/noiseGain in series with its output op-amp's (+)
 * (cmError).
 */
export function dcIntervalAtNet(chain: Chain, netNode: string): Interval | null {
  const net = buildNet(chain, { dcMode: true });
  const y = adjoint(net, ZERO, netNode);
  if (!y) return null;
  const sig = signalOf(chain);
  let centre = 0;
  let half = 0;
  for (const el of net.elements) {
    if (el.kind === "V") {
      const w = weight(net, y, { type: "ref", source: el }).re;
      centre += w * el.dc;
      if (el.role === "emf") half += Math.abs(w) * sig.spread;
    } else if (el.kind === "opamp") {
      const vos = el.part.vos ?? 0;
      const ib = el.part.ib ?? 0;
      half += Math.abs(weight(net, y, { type: "series", opamp: el }).re) * vos;
      half += Math.abs(weight(net, y, { type: "current", a: el.p, b: GND }).re) * ib;
      half += Math.abs(weight(net, y, { type: "current", a: el.n, b: GND }).re) * ib;
    }
  }
  for (const n of chain.nodes) {
    const { err, noiseGain } = cmError(chain, n.id);
    if (err > 0) half += (Math.abs(weight(net, y, { type: "series", opamp: net.opamps.get(n.id)! }).re) * err) / noiseGain;
  }
  return { min: centre - half, max: centre + half };
}

/** DC interval of a chain node's output (an ADC: its pin); null when unbounded (integrator upstream). */
export function dcInterval(chain: Chain, nodeId: string): Interval | null {
  const net = buildNet(chain, { dcMode: true });
  if (net.dcUnbounded.has(nodeId)) return null;
  return dcIntervalAtNet(chain, net.outputOf.get(nodeId)!);
}

/** Response magnitude |V(netNode)/EMF| at f, with a prebuilt net (forward solve, memoised). */
export function magAt(net: Net, netNode: string, f: number): number {
  if (netNode === GND) return 0;
  const x = forward(net, f);
  if (!x) return Infinity;
  return mag(x[net.index.get(netNode)!]);
}

/** The AC net of a chain, built once per chain object (the reference tests never mutate a chain's nodes). */
const nets = new WeakMap<Chain, Net>();
export function netOf(chain: Chain): Net {
  let n = nets.get(chain);
  if (!n) nets.set(chain, (n = buildNet(chain)));
  return n;
}

/**
 * max of g(f) over [lo, hi]: a 160-point log grid with both ends exact, then a
 * golden-section refinement around the best grid point (the maxima here are smooth).
 */
export function maxOverBand(g: (f: number) => number, lo: number, hi: number): { f: number; value: number } {
  const start = lo > 0 ? lo : hi * 1e-9;
  const n = 160;
  const grid = Array.from({ length: n + 1 }, (_, i) => start * Math.pow(hi / start, i / n));
  grid[0] = start;
  grid[n] = hi;
  let best = 0;
  let bestV = -Infinity;
  const vals = grid.map((f) => g(f));
  vals.forEach((v, i) => {
    if (v > bestV) {
      bestV = v;
      best = i;
    }
  });
  let result = { f: grid[best], value: bestV };
  if (best > 0 && best < n) {
    let a = Math.log(grid[best - 1]);
    let b = Math.log(grid[best + 1]);
    const phi = (Math.sqrt(5) - 1) / 2;
    let c = b - phi * (b - a);
    let d = a + phi * (b - a);
    let gc = g(Math.exp(c));
    let gd = g(Math.exp(d));
    for (let i = 0; i < 80; i++) {
      if (gc > gd) {
        b = d;
        d = c;
        gd = gc;
        c = b - phi * (b - a);
        gc = g(Math.exp(c));
      } else {
        a = c;
        c = d;
        gc = gd;
        d = a + phi * (b - a);
        gd = g(Math.exp(d));
      }
    }
    const fm = Math.exp((a + b) / 2);
    const vm = g(fm);
    if (vm > result.value) result = { f: fm, value: vm };
  }
  if (lo === 0) {
    const v0 = g(0);
    if (v0 > result.value) result = { f: 0, value: v0 };
  }
  return result;
}

/** acPeak = amplitude · max |H_src→node| over [fLow, fHigh] (chain-format.md "Headroom"). */
export function acPeakAtNet(chain: Chain, netNode: string): number {
  const net = netOf(chain);
  const sp = signalOf(chain);
  return sp.amplitude * maxOverBand((f) => magAt(net, netNode, f), sp.fLow, sp.fHigh).value;
}

export function acPeak(chain: Chain, nodeId: string): number {
  const net = netOf(chain);
  return acPeakAtNet(chain, net.outputOf.get(nodeId)!);
}

/** slewNeeded = max over [fLow, fHigh] of 2π·f·amplitude·|H_src→node(f)| (chain-format.md "Slew rate"). */
export function slewNeeded(chain: Chain, nodeId: string): number {
  const net = netOf(chain);
  const node = net.outputOf.get(nodeId)!;
  const sp = signalOf(chain);
  return maxOverBand((f) => 2 * Math.PI * f * sp.amplitude * magAt(net, node, f), sp.fLow, sp.fHigh).value;
}

export interface NoiseSource {
  owner: string;
  element: string;
  inj: Injection;
  /** one-sided PSD of the source at f: V²/Hz for voltages, A²/Hz for currents */
  psd: (f: number) => number;
}

/**
 * Every noise source of chain-format.md "Noise": 4kTR of each resistor (as a parallel
 * current 4kT/R), the source noiseDensity (in series with the EMF), each op-amp's en in
 * series with (+) and in at each input, both with the 1/f corner en²·(1 + fc/f).
 * The ADC input resistance is left out (the format does not say it is noisy).
 */
export function noiseSources(net: Net): NoiseSource[] {
  const T = net.chain.analysis.temperatureK;
  const out: NoiseSource[] = [];
  const sig = signalOf(net.chain);
  for (const el of net.elements) {
    if (el.kind === "R" && el.noisy) {
      const p = (4 * K_BOLTZMANN * T) / el.r;
      out.push({ owner: el.owner, element: el.element, inj: { type: "current", a: el.a, b: el.b }, psd: () => p });
    } else if (el.kind === "opamp") {
      const { en = 0, in: inoise = 0, enCorner = 0, inCorner = 0 } = el.part;
      if (en > 0) out.push({ owner: el.owner, element: "en", inj: { type: "series", opamp: el }, psd: (f) => en * en * (1 + enCorner / f) });
      if (inoise > 0) {
        const psd = (f: number) => inoise * inoise * (1 + inCorner / f);
        out.push({ owner: el.owner, element: "in+", inj: { type: "current", a: el.p, b: GND }, psd });
        out.push({ owner: el.owner, element: "in-", inj: { type: "current", a: el.n, b: GND }, psd });
      }
    }
  }
  // noise on the emf itself: the source's noiseDensity (V or A per √Hz), a photodiode's shot noise
  if (sig.emfPsd > 0) out.push({ owner: sig.id, element: "source", inj: { type: "emf" }, psd: () => sig.emfPsd });
  return out;
}

export interface NoiseResult {
  rms: number;
  parts: { owner: string; element: string; rms: number }[];
}

/** Output noise rms at a chain node over [lo, hi]: √(Σ ∫ PSD_i·|T_i|² df), each source through its own T. */
export function noiseRms(chain: Chain, nodeId: string, lo: number, hi: number, rel = 1e-9): NoiseResult {
  const net = buildNet(chain);
  const node = net.outputOf.get(nodeId)!;
  const sources = noiseSources(net);
  const integrand = (f: number) => {
    const y = adjoint(net, jw(f), node);
    if (!y) throw new Error(`singular at ${f} Hz`);
    return sources.map((s) => {
      const m = mag(weight(net, y, s.inj));
      return s.psd(f) * m * m;
    });
  };
  const powers = integrateLogVec(integrand, lo, hi, rel);
  const total = powers.reduce((a, b) => a + b, 0);
  return {
    rms: Math.sqrt(total),
    parts: sources.map((s, i) => ({ owner: s.owner, element: s.element, rms: Math.sqrt(powers[i]) })),
  };
}

/** Output noise density (V/√Hz) at a chain node and frequency f: √(Σ PSD_i·|T_i|²). */
export function noiseDensityAt(chain: Chain, nodeId: string, f: number): number {
  const net = buildNet(chain);
  const y = adjoint(net, jw(f), net.outputOf.get(nodeId)!);
  if (!y) throw new Error(`singular at ${f} Hz`);
  let p = 0;
  for (const s of noiseSources(net)) {
    const m = mag(weight(net, y, s.inj));
    p += s.psd(f) * m * m;
  }
  return Math.sqrt(p);
}
