/**
 * Seeded random chains for the reference tests (seedrandom; our own generator, not the
 * engine's): every stage kind, fan-outs, source resistance, ADC input resistance, and
 * op-amp parts of every model (ideal; aol and gbw; gbw only; aol only); and chains from each
 * sensor source through its front-end stage (randomSensorChain).
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
  bridge,
  thermocouple,
  photodiode,
  piezo,
  transimpedance,
  chargeAmp,
  differenceAmp,
  inAmp,
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

function randomStage(rng: Rng, id: string, allowIntegrator: boolean): ChainNode {
  const o = opAmpOpts(rng, id);
  const vref = vrefOf(rng);
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
  if (allowIntegrator) kinds.push("integrator");
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

function opAmpOpts(rng: Rng, id: string) {
  return { part: rng() < 0.75 ? `p${id}` : null, rails: { low: -logU(rng, 2, 15), high: logU(rng, 2, 15) } };
}
const vrefOf = (rng: Rng) => (rng() < 0.3 ? (rng() - 0.5) * 2 : 0);

/** The sensor sources of lib/chain/README.md, in the order randomSensorChain cycles through them. */
export const SENSOR_KINDS = ["bridge", "thermocouple", "photodiode", "piezo"] as const;
export type SensorKind = (typeof SENSOR_KINDS)[number];

function sensorSource(rng: Rng, kind: SensorKind): ChainNode {
  switch (kind) {
    case "bridge": {
      const loadLow = rng() * 1.5 - 1;
      return bridge({
        excitation: logU(rng, 1, 10),
        fullScale: logU(rng, 5e-4, 3e-3),
        loadLow,
        loadHigh: loadLow + rng() * (1 - loadLow),
        offset: rng() < 0.5 ? 0 : rng() * 5e-4,
        resistance: logU(rng, 100, 5e3),
        vcm: rng() < 0.5 ? null : rng() * 5,
        fLow: rng() < 0.5 ? 0 : logU(rng, 0.1, 10),
        fHigh: logU(rng, 10, 5e3),
        noiseDensity: rng() < 0.5 ? 0 : logU(rng, 1e-9, 1e-7),
      });
    }
    case "thermocouple": {
      const tLow = rng() * 300 - 100;
      return thermocouple({
        seebeck: logU(rng, 1e-5, 6e-5),
        tLow,
        tHigh: tLow + logU(rng, 10, 1000),
        tCold: rng() * 40,
        coldJunctionError: rng() < 0.3 ? 0 : rng() * 2,
        leadResistance: rng() < 0.3 ? 0 : logU(rng, 1, 200),
        vcm: rng() < 0.4 ? 0 : rng() * 2.5,
        fHigh: logU(rng, 1, 100),
      });
    }
    case "photodiode":
      return photodiode({
        dc: rng() < 0.3 ? 0 : logU(rng, 1e-9, 1e-5),
        dcSpread: rng() < 0.5 ? 0 : logU(rng, 1e-10, 1e-6),
        amplitude: logU(rng, 1e-9, 1e-5),
        fLow: rng() < 0.2 ? 0 : logU(rng, 1, 50),
        fHigh: logU(rng, 500, 2e4),
        capacitance: logU(rng, 1e-12, 1e-9),
        shuntResistance: logU(rng, 1e7, 1e10),
        darkCurrent: rng() < 0.5 ? 0 : logU(rng, 1e-12, 1e-8),
        noiseDensity: rng() < 0.5 ? 0 : logU(rng, 1e-15, 1e-12),
      });
    case "piezo":
      return piezo({
        amplitude: logU(rng, 1e-12, 1e-9),
        fLow: logU(rng, 1, 50),
        fHigh: logU(rng, 500, 2e4),
        capacitance: logU(rng, 1e-10, 1e-8),
        leakage: logU(rng, 1e8, 1e11),
      });
  }
}

/**
 * The front-end stage a sensor feeds directly (lib/chain/README.md pairing rules): a pair into a
 * difference amplifier (matched or not) or an in-amp; a current or charge into a TIA or charge
 * amplifier. null: a photodiode or piezo used as a Norton section by ordinary voltage stages.
 */
function frontEnd(rng: Rng, kind: SensorKind, id: string): ChainNode | null {
  const o = opAmpOpts(rng, id);
  const vref = vrefOf(rng);
  if (kind === "bridge" || kind === "thermocouple") {
    if (rng() < 0.5) return inAmp(id, { rg: logU(rng, 50, 1e5), rf: rng() < 0.5 ? 25e3 : logU(rng, 1e4, 5e4), rd: logU(rng, 1e3, 1e5), vref, cmrrDb: rng() < 0.5 ? null : 70 + rng() * 50 }, o);
    const r1 = logU(rng, 1e3, 1e5);
    const r2 = r1 * logU(rng, 1, 200);
    const matched = rng() < 0.5;
    const r3 = matched ? r1 : r1 * (0.8 + 0.4 * rng());
    const r4 = matched ? r2 : r2 * (0.8 + 0.4 * rng());
    return differenceAmp(id, { r1, r2, r3, r4, vref }, o);
  }
  if (rng() < 0.3) return null;
  const cin = rng() < 0.5 ? 0 : logU(rng, 1e-12, 2e-11);
  if (kind === "piezo" && rng() < 0.7) return chargeAmp(id, { cf: logU(rng, 1e-11, 1e-9), rf: logU(rng, 1e7, 1e10), cin, vref }, o);
  if (kind === "photodiode" && rng() < 0.2) return chargeAmp(id, { cf: logU(rng, 1e-11, 1e-9), rf: logU(rng, 1e5, 1e8), cin, vref }, o);
  return transimpedance(id, { rf: logU(rng, 1e3, 1e7), cf: rng() < 0.3 ? 0 : logU(rng, 1e-12, 1e-9), cin, vref }, o);
}

function bandLow(src: ChainNode): number {
  return "fLow" in src.params ? (src.params as { fLow: number }).fLow : 0;
}

/** Every leaf gets an ADC: ±10 V, random sample rate, half with an input resistance. */
function closeWithAdcs(rng: Rng, nodes: ChainNode[], edges: Edge[]) {
  const parents = new Set(edges.map((e) => e.from));
  for (const n of [...nodes]) {
    if (parents.has(n.id)) continue;
    const id = `adc_${n.id}`;
    nodes.push(adc(id, { vinLow: -10, vinHigh: 10, sampleRate: logU(rng, 3e4, 3e5), inputResistance: rng() < 0.5 ? null : logU(rng, 1e4, 1e6) }));
    edges.push({ from: n.id, to: id });
  }
}

/**
 * A random complete chain from a sensor source (the kind given, else cycled by the caller):
 * its front-end stage, or for a photodiode or piezo possibly ordinary voltage stages loading it
 * as a Norton section (fan-out allowed there), then 1–5 further stages of the older kinds.
 * Every leaf ends in an ADC. Analysis band 1 Hz – 100 kHz, noise from 1 Hz.
 */
export function randomSensorChain(seed: string, kind: SensorKind): Chain {
  const rng = seedrandom(seed);
  const src = sensorSource(rng, kind);
  const nodes: ChainNode[] = [src];
  const edges: Edge[] = [];
  const parts: Record<string, Part> = {};
  const add = (parent: ChainNode, stage: ChainNode) => {
    if ("part" in stage && stage.part) parts[stage.part] = randomPart(rng);
    nodes.push(stage);
    edges.push({ from: parent.id, to: stage.id });
  };
  const fe = frontEnd(rng, kind, "fe");
  // a pair or a current-input stage holds the source alone; a Norton source may feed several stages
  const canFeed = (n: ChainNode) => n !== src || fe === null;
  if (fe) add(src, fe);
  const count = 1 + Math.floor(rng() * 5);
  for (let i = 0; i < count; i++) {
    const candidates = nodes.filter(canFeed);
    const parent = pick(rng, candidates);
    // No integrator when the source band reaches DC (a bridge from fLow 0, a thermocouple, a
    // photodiode from 0): every peak through it is then unbounded (null), and at f = 0 the whole
    // AC network is singular; hidden-cases.test.ts covers that case by hand.
    add(parent, randomStage(rng, `n${i}`, isOpAmpKind(parent.kind) && bandLow(src) > 0));
  }
  closeWithAdcs(rng, nodes, edges);
  return makeChain({ nodes, edges, parts, analysis: { fMin: 1, fMax: 1e5, noiseLow: 1 } });
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
  closeWithAdcs(rng, nodes, edges);
  return makeChain({ nodes, edges, parts, analysis: { fMin: 1, fMax: 1e5, noiseLow: 1 } });
}

