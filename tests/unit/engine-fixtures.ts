/**
 * Chain builders for the engine's unit tests and benchmark: complete chains with every default filled
 * in, as lib/chain/types.ts describes (the schema is not needed to build them).
 */
import seedrandom from "seedrandom";
import type { Chain, ChainNode, Part } from "@/lib/chain/types";

export const defaultAnalysis = () => ({
  fMin: 0.1,
  fMax: 1e6,
  points: 600,
  temperatureK: 298.15,
  noiseLow: 0.1,
  noiseHigh: null as number | null,
  aliasTargetDb: null as number | null,
});

type SourceOpts = Partial<Extract<ChainNode, { kind: "source" }>["params"]>;

export function source(id = "src", p: SourceOpts = {}): ChainNode {
  return {
    id,
    kind: "source",
    params: {
      dc: 0,
      dcSpread: 0,
      amplitude: 0.1,
      fLow: 1,
      fHigh: 100,
      resistance: 0,
      noiseDensity: 0,
      safety: "low-voltage",
      ...p,
    },
  };
}

/** A straight chain: nodes in order, each feeding the next. */
export function line(nodes: ChainNode[], parts: Record<string, Part> = {}, analysis = {}): Chain {
  const edges = nodes.slice(1).map((n, i) => ({ from: nodes[i].id, to: n.id }));
  return chainOf(nodes, edges, parts, analysis);
}

export function chainOf(
  nodes: ChainNode[],
  edges: { from: string; to: string }[],
  parts: Record<string, Part> = {},
  analysis = {},
): Chain {
  return {
    format: "chainwright.chain/1",
    name: "test chain",
    notes: "",
    analysis: { ...defaultAnalysis(), ...analysis },
    tolerances: { resistor: 0.01, capacitor: 0.05 },
    parts,
    nodes,
    edges,
  };
}

export const rails = (low = -15, high = 15) => ({ low, high });

export function adc(id = "adc", p: Partial<Extract<ChainNode, { kind: "adc" }>["params"]> = {}): ChainNode {
  return {
    id,
    kind: "adc",
    params: { bits: 16, sampleRate: 1e5, vinLow: -5, vinHigh: 5, inputResistance: null, ...p },
  };
}

/** Parts covering the four open-loop forms of chain-format.md (ideal is "no part"). */
export const testParts: Record<string, Part> = {
  both: { gbw: 1e6, aol: 1e5 },
  gbwOnly: { gbw: 3e6 },
  aolOnly: { aol: 2e4 },
  fast: { gbw: 5e7, aol: 1e6 },
};

/**
 * A random valid chain (seeded): a tree grown from the source, every kind, fan-out allowed, ADCs only as
 * leaves, values log-uniform over wide ranges and a random open-loop form per op-amp stage.
 */
export function randomChain(seed: string, size = 7, opts: { integrators?: boolean } = {}): Chain {
  const rng = seedrandom(seed);
  const logU = (lo: number, hi: number) => lo * (hi / lo) ** rng();
  const pick = <T,>(xs: readonly T[]): T => xs[Math.floor(rng() * xs.length)];
  const R = () => logU(100, 1e6);
  const C = () => logU(1e-11, 1e-6);
  const kinds = [
    "inverting",
    "noninverting",
    "lossyIntegrator",
    "rcLowpass",
    "rcHighpass",
    "sallenKeyLowpass",
    "mfbLowpass",
    "sallenKeyLowpassGain",
    "sallenKeyHighpass",
    "mfbHighpass",
    ...(opts.integrators ? ["integrator"] : []),
  ] as const;
  const partKeys = [null, ...Object.keys(testParts)];
  const nodes: ChainNode[] = [source("src", { resistance: rng() < 0.3 ? 0 : logU(10, 1e4) })];
  const edges: { from: string; to: string }[] = [];
  const feeders = ["src"];
  for (let k = 0; k < size; k++) {
    const id = `n${k}`;
    const kind = pick(kinds);
    const from = rng() < 0.7 ? feeders[feeders.length - 1] : pick(feeders);
    const part = pick(partKeys);
    const op = { part, rails: rails() };
    let node!: ChainNode;
    switch (kind) {
      case "inverting":
        node = { id, kind, params: { r1: R(), r2: R(), vref: 0 }, ...op };
        break;
      case "noninverting": {
        const r = rng();
        node = { id, kind, params: { rf: r < 0.15 ? null : R(), rg: r > 0.85 ? null : R(), vref: 0 }, ...op };
        break;
      }
      case "lossyIntegrator":
        node = { id, kind, params: { r1: R(), r2: R(), c2: C(), vref: 0 }, ...op };
        break;
      case "integrator":
        node = { id, kind, params: { r1: R(), c2: C(), vref: 0 }, ...op };
        break;
      case "rcLowpass":
        node = { id, kind, params: { r: R(), c: C() } };
        break;
      case "rcHighpass":
        node = { id, kind, params: { r: R(), c: C(), vbias: 0 } };
        break;
      case "sallenKeyLowpass":
        node = { id, kind, params: { r1: R(), r2: R(), c1: C(), c2: C(), vref: 0 }, ...op };
        break;
      case "mfbLowpass":
        node = { id, kind, params: { r1: R(), r2: R(), r3: R(), c1: C(), c2: C(), vref: 0 }, ...op };
        break;
      // filters: the Sallen-Key gain network (rf alone, or rf and rg) and the high-pass sections
      case "sallenKeyLowpassGain": {
        const rg = rng() < 0.2 ? null : R();
        node = { id, kind: "sallenKeyLowpass", params: { r1: R(), r2: R(), c1: C(), c2: C(), rf: R(), rg, vref: 0 }, ...op };
        break;
      }
      case "sallenKeyHighpass": {
        const g = rng();
        const rf = g < 0.3 ? null : R();
        const rg = rf === null || g > 0.85 ? null : R();
        node = { id, kind, params: { c1: C(), c2: C(), r1: R(), r2: R(), rf, rg, vref: 0 }, ...op };
        break;
      }
      case "mfbHighpass":
        node = { id, kind, params: { c1: C(), c2: C(), c3: C(), r1: R(), r2: R(), vref: 0 }, ...op };
        break;
    }
    nodes.push(node);
    edges.push({ from, to: id });
    feeders.push(id);
    if (rng() < 0.3) {
      const a = `a${k}`;
      nodes.push(adc(a, { inputResistance: rng() < 0.5 ? null : logU(1e3, 1e7) }));
      edges.push({ from: pick(feeders), to: a });
    }
  }
  return chainOf(nodes, edges, testParts);
}
