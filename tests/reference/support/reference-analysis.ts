/**
 * Reference figures computed with the independent nodal solver (nodal.ts): DC
 * intervals, band maxima (AC peak, slew), noise integrals. Each function restates
 * the chain-format.md definition it implements.
 */
import { cx, type Cx } from "./cx";
import type { Chain, Interval } from "@/lib/chain/types";
import { adjoint, buildNet, forward, GND, jw, K_BOLTZMANN, weight, type Injection, type Net } from "./nodal";
import { integrateLogVec } from "./simpson";

const ZERO = cx(0, 0);

function mag(z: Cx): number {
  return z.abs();
}

/** The source node of a chain. */
export function sourceOf(chain: Chain) {
  const s = chain.nodes.find((n) => n.kind === "source");
  if (!s || s.kind !== "source") throw new Error("chain has no source");
  return s;
}

/**
 * DC interval at a net node (chain-format.md "DC operating point as intervals"):
 * centre from the source dc and every vref/vbias; half-width
 * |g_emf|·dcSpread + Σ |g_vos|·vos + Σ (|g_ib+| + |g_ib−|)·ib, every sign independent.
 */
export function dcIntervalAtNet(chain: Chain, netNode: string): Interval | null {
  const net = buildNet(chain, { dcMode: true });
  const y = adjoint(net, ZERO, netNode);
  if (!y) return null;
  const src = sourceOf(chain);
  let centre = 0;
  let half = 0;
  for (const el of net.elements) {
    if (el.kind === "V") {
      const w = weight(net, y, { type: "ref", source: el }).re;
      centre += w * el.dc;
      if (el.role === "emf") half += Math.abs(w) * src.params.dcSpread;
    } else if (el.kind === "opamp") {
      const vos = el.part.vos ?? 0;
      const ib = el.part.ib ?? 0;
      half += Math.abs(weight(net, y, { type: "series", opamp: el }).re) * vos;
      half += Math.abs(weight(net, y, { type: "current", a: el.p, b: GND }).re) * ib;
      half += Math.abs(weight(net, y, { type: "current", a: el.n, b: GND }).re) * ib;
    }
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
  const sp = sourceOf(chain).params;
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
  const sp = sourceOf(chain).params;
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
  const src = sourceOf(net.chain);
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
  const nd = src.params.noiseDensity;
  if (nd > 0) out.push({ owner: src.id, element: "source", inj: { type: "emf" }, psd: () => nd * nd });
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
