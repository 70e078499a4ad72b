/**
 * Seeded random chains for the reference tests (seedrandom; our own generator, not the
 * engine's): every stage kind, fan-outs, source resistance, ADC input resistance, and
 * op-amp parts of every model (ideal; aol and gbw; gbw only; aol only).
 */
import seedrandom from "seedrandom";
import type { Chain, ChainNode, Edge, Part } from "@/lib/chain/types";
import {
  adc,
  integrator,
  inverting,
  lossyIntegrator,
  makeChain,
  mfb,
  noninverting,
  rcHighpass,
  rcLowpass,
  sallenKey,
  sallenKeyHighpass,
  mfbHighpass,
  source,
} from "./chain-builders";
import { isOpAmpKind } from "./nodal";

type Rng = () => number;
const logU = (rng: Rng, lo: number, hi: number) => lo * Math.pow(hi / lo, rng());
const pick = <T>(rng: Rng, xs: readonly T[]): T => xs[Math.floor(rng() * xs.length)];

function randomPart(rng: Rng): Part {
  const model = pick(rng, ["ideal", "both", "gbw", "aol"] as const);
  const p: Part = {
    vos: rng() < 0.7 ? logU(rng, 1e-5, 5e-3) : undefined,
    ib: rng() < 0.7 ? logU(rng, 1e-12, 1e-6) : undefined,
    en: rng() < 0.7 ? logU(rng, 3e-9, 5e-8) : undefined,
    in: rng() < 0.5 ? logU(rng, 1e-15, 2e-12) : undefined,
  };
  if (rng() < 0.6) {
    p.swingLow = rng() * 0.5;
    p.swingHigh = rng() * 0.5;
    p.inputLow = rng() * 1.7 - 0.2;
    p.inputHigh = rng() * 1.7 - 0.2;
  }
  if (model === "both" || model === "aol") p.aol = logU(rng, 1e3, 1e6);
  if (model === "both" || model === "gbw") p.gbw = logU(rng, 1e5, 2e7);
  return Object.fromEntries(Object.entries(p).filter(([, v]) => v !== undefined)) as Part;
}

const R = (rng: Rng) => logU(rng, 1e3, 1e5);
const C = (rng: Rng) => logU(rng, 1e-9, 1e-7);

function randomStage(rng: Rng, id: string, parentIsOpAmp: boolean): ChainNode {
  const o = { part: rng() < 0.75 ? `p${id}` : null, rails: { low: -logU(rng, 2, 15), high: logU(rng, 2, 15) } };
  const vref = rng() < 0.3 ? (rng() - 0.5) * 2 : 0;
  const kinds = [
    "inverting",
    "noninverting",
    "lossyIntegrator",
    "rcLowpass",
    "rcHighpass",
    "sallenKeyLowpass",
    "mfbLowpass",
    "follower",
    // filters: the gain network of the Sallen-Key sections, and the high-pass sections
    "sallenKeyGain",
    "sallenKeyHighpass",
    "mfbHighpass",
  ];
  // An integrator only behind an op-amp output: its DC has no value, and the upstream DC
  // loading by its input would depend on that (see the report); keep the rest well defined.
  if (parentIsOpAmp) kinds.push("integrator");
  switch (pick(rng, kinds)) {
    case "inverting":
      return inverting(id, { r1: R(rng), r2: R(rng), vref }, o);
    case "noninverting":
      return noninverting(id, { rf: R(rng), rg: R(rng), vref }, o);
    case "follower":
      return noninverting(id, { rf: rng() < 0.5 ? R(rng) : null, rg: null }, o);
    case "lossyIntegrator":
      return lossyIntegrator(id, { r1: R(rng), r2: R(rng), c2: C(rng), vref }, o);
    case "integrator":
      return integrator(id, { r1: R(rng), c2: C(rng), vref }, o);
    case "rcLowpass":
      return rcLowpass(id, { r: R(rng), c: C(rng) });
    case "rcHighpass":
      return rcHighpass(id, { r: R(rng), c: C(rng), vbias: rng() < 0.3 ? rng() * 3 : 0 });
    case "sallenKeyLowpass":
      return sallenKey(id, { r1: R(rng), r2: R(rng), c1: C(rng), c2: C(rng), vref }, o);
    case "sallenKeyGain":
      // gain up to 2: mostly below the equal-component limit of 3, so the section is usually stable
      return sallenKey(id, { r1: R(rng), r2: R(rng), c1: C(rng), c2: C(rng), rf: R(rng) / 10, rg: rng() < 0.2 ? null : R(rng), vref }, o);
    case "sallenKeyHighpass":
      return sallenKeyHighpass(id, { c1: C(rng), c2: C(rng), r1: R(rng), r2: R(rng), rf: rng() < 0.5 ? null : R(rng) / 10, rg: null, vref }, o);
    case "mfbHighpass":
      return mfbHighpass(id, { c1: C(rng), c2: C(rng), c3: C(rng), r1: R(rng), r2: R(rng), vref }, o);
    default:
      return mfb(id, { r1: R(rng), r2: R(rng), r3: R(rng), c1: C(rng), c2: C(rng), vref }, o);
  }
}

/** A random complete chain; every leaf ends in an ADC. Analysis band 1 Hz – 100 kHz. */
export function randomChain(seed: string): Chain {
  const rng = seedrandom(seed);
  const nodes: ChainNode[] = [
    source({
      dc: (rng() - 0.5) * 2,
      dcSpread: rng() * 0.05,
      amplitude: logU(rng, 1e-3, 1),
      fLow: logU(rng, 1, 50),
      fHigh: logU(rng, 500, 2e4),
      resistance: rng() < 0.3 ? 0 : logU(rng, 50, 1e4),
      noiseDensity: rng() < 0.3 ? logU(rng, 1e-9, 1e-7) : 0,
    }),
  ];
  const edges: Edge[] = [];
  const parts: Record<string, Part> = {};
  const count = 3 + Math.floor(rng() * 5);
  for (let i = 0; i < count; i++) {
    const parent = pick(rng, nodes);
    const id = `n${i}`;
    const stage = randomStage(rng, id, isOpAmpKind(parent.kind));
    if ("part" in stage && stage.part) parts[stage.part] = randomPart(rng);
    nodes.push(stage);
    edges.push({ from: parent.id, to: id });
  }
  const parents = new Set(edges.map((e) => e.from));
  for (const n of [...nodes]) {
    if (parents.has(n.id)) continue;
    const id = `adc_${n.id}`;
    nodes.push(adc(id, { vinLow: -10, vinHigh: 10, sampleRate: logU(rng, 3e4, 3e5), inputResistance: rng() < 0.5 ? null : logU(rng, 1e4, 1e6) }));
    edges.push({ from: n.id, to: id });
  }
  return makeChain({ nodes, edges, parts, analysis: { fMin: 1, fMax: 1e5, noiseLow: 1 } });
}

