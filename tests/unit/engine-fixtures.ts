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

/**
 * A random valid chain that starts at a sensor source (seeded): a bridge or thermocouple into a difference
 * or instrumentation amplifier, or a photodiode or piezo element into a transimpedance or charge amplifier
 * or (Norton form) straight into voltage stages (leakage kept to 1 GΩ: beyond it, transfers that are exactly
 * zero at DC come out of both solvers as rounding of GΩ-sized transfer impedances); then a random tree of the ordinary kinds as randomChain
 * grows it. Values log-uniform over wide ranges, a random open-loop form per op-amp stage.
 */
export function randomSensorChain(seed: string, size = 5): Chain {
  const rng = seedrandom(seed);
  const logU = (lo: number, hi: number) => lo * (hi / lo) ** rng();
  const pick = <T,>(xs: readonly T[]): T => xs[Math.floor(rng() * xs.length)];
  const R = () => logU(100, 1e6);
  const C = () => logU(1e-12, 1e-7);
  const partKeys = [null, ...Object.keys(testParts)];
  const op = () => ({ part: pick(partKeys), rails: rails() });
  const front = pick(["bridge", "thermocouple", "photodiode", "piezo", "photodiode-v", "piezo-v"] as const);
  const nodes: ChainNode[] = [];
  const edges: { from: string; to: string }[] = [];
  const safety = "low-voltage" as const;
  let head = "src";
  if (front === "bridge" || front === "thermocouple") {
    nodes.push(
      front === "bridge"
        ? { id: "src", kind: "bridge", params: { excitation: 5, fullScale: 0.002, loadLow: 0, loadHigh: 1, offset: 4e-4, resistance: rng() < 0.2 ? 1 : logU(100, 5e3), vcm: null, fLow: 0, fHigh: 100, noiseDensity: 0, safety } }
        : { id: "src", kind: "thermocouple", params: { seebeck: 4e-5, tLow: 0, tHigh: 400, tCold: 25, coldJunctionError: 0.5, leadResistance: rng() < 0.3 ? 0 : logU(1, 200), vcm: 1, fHigh: 10, safety } },
    );
    const stage: ChainNode =
      rng() < 0.5
        ? { id: "fe", kind: "differenceAmp", params: { r1: R(), r2: R(), r3: R(), r4: R(), vref: 0 }, ...op() }
        : { id: "fe", kind: "inAmp", params: { rg: R(), rf: R(), rd: R(), vref: 0, cmrrDb: rng() < 0.5 ? null : 90 }, ...op() };
    nodes.push(stage);
    edges.push({ from: "src", to: "fe" });
    head = "fe";
  } else {
    const charge = front.startsWith("piezo");
    nodes.push(
      charge
        ? { id: "src", kind: "piezo", params: { amplitude: 1e-10, fLow: 1, fHigh: 1e3, capacitance: C(), leakage: logU(1e6, 1e9), safety } }
        : { id: "src", kind: "photodiode", params: { dc: 1e-6, dcSpread: 0, amplitude: 1e-6, fLow: 0, fHigh: 1e3, capacitance: C(), shuntResistance: logU(1e6, 1e10), darkCurrent: 1e-9, noiseDensity: 0, safety } },
    );
    if (!front.endsWith("-v")) {
      const kind = rng() < 0.5 ? "transimpedance" : "chargeAmp";
      nodes.push({ id: "fe", kind, params: { rf: R(), cf: rng() < 0.2 && kind === "transimpedance" ? 0 : C(), vref: 0, cin: rng() < 0.5 ? 0 : C() }, ...op() } as ChainNode);
      edges.push({ from: "src", to: "fe" });
      head = "fe";
    }
  }
  const tail = randomChain(`${seed}-tail`, size);
  // graft the tail's tree (without its own source) below `head`
  const tailSource = tail.nodes[0].id;
  for (const n of tail.nodes.slice(1)) nodes.push({ ...n, id: `t${n.id}` } as ChainNode);
  for (const e of tail.edges) edges.push({ from: e.from === tailSource ? head : `t${e.from}`, to: `t${e.to}` });
  return chainOf(nodes, edges, testParts);
}
