/**
 * Benchmark chains: a 10-stage chain of mixed kinds with finite-GBW parts, and Monte-Carlo-style
 * perturbations of its component values (seeded, uniform within the chain's tolerances).
 */
import seedrandom from "seedrandom";
import type { Chain, ChainNode, Part } from "@/lib/chain/types";

const part: Part = { label: "generic 10 MHz", gbw: 1e7, aol: 2e5, slewRate: 5e6, vos: 5e-4, ib: 2e-12, en: 8e-9, in: 1e-15 };
const slow: Part = { label: "generic 1 MHz", gbw: 1e6, aol: 1e5, slewRate: 5e5, vos: 1e-4, ib: 1e-11, en: 1.5e-8, in: 1e-15 };
const rails = { low: -12, high: 12 };

/** Two loaded RC sections, three gain stages, two Sallen-Key, two MFB and a lossy integrator. */
export function benchChain(): Chain {
  const nodes: ChainNode[] = [
    { id: "src", kind: "source", params: { dc: 0.05, dcSpread: 0.01, amplitude: 0.1, fLow: 1, fHigh: 2000, resistance: 50, noiseDensity: 1e-8, safety: "low-voltage" } },
    { id: "rc1", kind: "rcLowpass", params: { r: 1000, c: 10e-9 } },
    { id: "rc2", kind: "rcLowpass", params: { r: 1000, c: 10e-9 } },
    { id: "g1", kind: "noninverting", params: { rf: 9000, rg: 1000, vref: 0 }, part: "fast", rails },
    { id: "sk1", kind: "sallenKeyLowpass", params: { r1: 10e3, r2: 10e3, c1: 20e-9, c2: 10e-9, vref: 0 }, part: "fast", rails },
    { id: "mfb1", kind: "mfbLowpass", params: { r1: 10e3, r2: 10e3, r3: 10e3, c1: 45e-9, c2: 10e-9, vref: 0 }, part: "slow", rails },
    { id: "g2", kind: "inverting", params: { r1: 10e3, r2: 22e3, vref: 0 }, part: "slow", rails },
    { id: "li1", kind: "lossyIntegrator", params: { r1: 10e3, r2: 47e3, c2: 1e-9, vref: 0 }, part: "fast", rails },
    { id: "sk2", kind: "sallenKeyLowpass", params: { r1: 4.7e3, r2: 4.7e3, c1: 22e-9, c2: 10e-9, vref: 0 }, part: "fast", rails },
    { id: "mfb2", kind: "mfbLowpass", params: { r1: 4.7e3, r2: 4.7e3, r3: 10e3, c1: 47e-9, c2: 4.7e-9, vref: 0 }, part: "slow", rails },
    { id: "g3", kind: "noninverting", params: { rf: 1000, rg: 1000, vref: 0 }, part: "fast", rails },
    { id: "adc", kind: "adc", params: { bits: 16, sampleRate: 50e3, vinLow: -5, vinHigh: 5, inputResistance: 1e6 } },
  ];
  return {
    format: "chainwright.chain/1",
    name: "benchmark chain",
    notes: "",
    analysis: { fMin: 0.1, fMax: 1e6, points: 2000, temperatureK: 298.15, noiseLow: 0.1, noiseHigh: null, aliasTargetDb: null },
    tolerances: { resistor: 0.01, capacitor: 0.05 },
    parts: { fast: part, slow },
    nodes,
    edges: nodes.slice(1).map((n, i) => ({ from: nodes[i].id, to: n.id })),
  };
}

/** Number of stages between the source and the ADC (what "stage-points" counts). */
export const stageCount = (c: Chain) => c.nodes.filter((n) => n.kind !== "source" && n.kind !== "adc").length;

/**
 * `count` copies of the chain with every resistor and capacitor drawn uniformly within ±tolerance of its
 * nominal value (resistance of the source and vref/vbias untouched). Deterministic for a given seed.
 */
export function perturbed(base: Chain, count: number, seed = "chainwright-bench"): Chain[] {
  const rng = seedrandom(seed);
  const { resistor, capacitor } = base.tolerances;
  const out: Chain[] = [];
  for (let k = 0; k < count; k++) {
    const nodes = base.nodes.map((n) => {
      if (n.kind === "source" || n.kind === "adc") return n;
      const params: Record<string, unknown> = { ...n.params };
      for (const [key, v] of Object.entries(params)) {
        if (typeof v !== "number" || key === "vref" || key === "vbias") continue;
        const tol = key.startsWith("c") ? capacitor : resistor;
        params[key] = v * (1 + tol * (2 * rng() - 1));
      }
      return { ...n, params } as unknown as ChainNode;
    });
    out.push({ ...base, nodes });
  }
  return out;
}
