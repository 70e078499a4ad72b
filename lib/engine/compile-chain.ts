/**
 * The fast evaluation path: a chain compiled once into typed arrays and real polynomial coefficients,
 * then evaluated at any number of frequencies with scalar doubles (no object per point).
 *
 * Network model (chain-format.md, "How the engine must treat the network"):
 * - Every op-amp output is an ideal voltage source. It, or the source EMF, drives a *net*: the passive
 *   sections below it (the source resistance, rcLowpass, rcHighpass) and, at every point of the net, the
 *   loads hung on it: op-amp stage inputs (their exact input admittance, finite gain included), ADC input
 *   resistances and further sections. A point feeding several nodes is loaded by all of them in parallel.
 * - A passive section is an L two-port: series admittance G, then shunt admittance Y to AC ground
 *   (rcLowpass: G = 1/r, Y = s·c; rcHighpass: G = s·c, Y = 1/r; source: G = 1/resistance, Y = 0). Its
 *   ABCD matrix scaled by G is [[G + Y, 1], [G·Y, G]], so terminated by a load YL it passes
 *   T = G/(G + Y + YL) forward and presents Yin = G·(Y + YL)/(G + Y + YL) to its driver (the scaling keeps
 *   s·c = 0 at DC finite). Two equal RC sections in a row come out as 1/(1 + 3sRC + (sRC)²).
 * - Op-amp stages are the closed-form rationals of stage-models.ts.
 *
 * Noise and DC use per-source transfer functions to a target point. A current injected in a net changes
 * its voltages through the net's transfer impedances Z; the net being passive and reciprocal with one-port
 * loads, Z(target, q) = Z(q, target), so one unit injection at the net's exit point gives the transfer
 * from every injection point at once.
 *
 * Units: ω in rad/s inside, Hz only at the API edge (sweep takes Hz); gains are linear ratios.
 */
import type { Chain, ChainNode, NodeKind, OpAmpNode } from "../chain/types";
import { TWO_PI } from "./constants";
import { openLoop, type OpenLoop } from "./open-loop";
import { limitAtZero, PolyPool, withPolyPool } from "./poly";
import { sourceSignal } from "./sensors";
import { NO_INPUT, stageModel, type InternalSourceType, type StageInput, type StageModel } from "./stage-models";
import { buildTopology, isOpAmpKind, type Topology } from "./topology";

const ROLE_SOURCE_SECTION = 1; // source with resistance > 0: an L-section from the EMF
const ROLE_SOURCE_DRIVER = 2; // source with zero resistance: its output is the EMF itself
const ROLE_OPAMP = 3;
const ROLE_RC_LP = 4;
const ROLE_RC_HP = 5;
const ROLE_ADC = 6;
/** coefficients per polynomial in the vectorised kernel (degree ≤ 4: the MFB high-pass input admittance) */
const KC = 5;
const ROLE_NORTON = 7; // photodiode or piezo into a voltage stage: i (or s·q) into Ys ∥ the loads

/** What a transfer source is, for noise densities and DC roles. */
export type TransferSourceType = "emf" | "passive-r" | InternalSourceType | "drift";

export interface TransferSource {
  /** `${nodeId}:${element}` */
  key: string;
  node: number;
  nodeId: string;
  element: string;
  type: TransferSourceType;
  /** ohms, for resistor noise */
  resistance?: number;
}

export interface CompiledPath {
  /** node ids from the source to the leaf */
  nodes: string[];
  indices: number[];
  /** index of the last node (its response is the path's response) */
  end: number;
}

/** Output of a sweep: per node, complex values over the frequency list (re/im in separate arrays). */
export interface SweepResult {
  freqs: Float64Array;
  /** voltage at the node's output over the source EMF (ADC: at its input pin) */
  cumRe: Float64Array[];
  cumIm: Float64Array[];
  /** the node's own transfer, as loaded in place (op-amp: Vo/Vin; section: Vout/Vin; ADC: 1) */
  indRe: Float64Array[];
  indIm: Float64Array[];
  /** input admittance of each node, drawn from the point that feeds it (S; source: unused) */
  yRe: Float64Array[];
  yIm: Float64Array[];
  /** 1 where some value was not finite (evaluation at or numerically on a pole) */
  pole: Uint8Array;
  /** ω = 2π·f, rad/s (scratch kept for reuse) */
  omega: Float64Array;
}

export interface SweepOptions {
  /**
   * false: an op-amp stage's input admittance (`yRe`/`yIm`) is worked out only where the sweep needs it,
   * as a load on a passive section; elsewhere those entries keep what they held. Every response is the
   * same (the tolerance spread, which reads no admittance). Default true.
   */
  admittances?: boolean;
}

export interface RetuneOptions {
  /**
   * Build the stage models into the buffers of the previous reusing retune (`PolyPool`, poly.ts) instead of
   * new ones: the same numbers without the allocations, for a run of many builds of one chain (the
   * tolerance spread). `models` and `openLoops` from an earlier retune are then overwritten: read them
   * from the compiled chain after each retune, never keep them.
   */
  reuse?: boolean;
}

export interface CompiledChain {
  /** the chain whose values are loaded (the last `retune`, else the compiled one) */
  readonly chain: Chain;
  /**
   * Reloads component values and parts from a chain with the same nodes, kinds and edges (a Monte Carlo
   * draw, a value edited in the workspace) without rebuilding the structure. Throws if the structure
   * differs (then compile again).
   */
  retune(chain: Chain, opts?: RetuneOptions): void;
  readonly topology: Topology;
  readonly nodeIds: string[];
  readonly kinds: NodeKind[];
  readonly paths: CompiledPath[];
  /** every source of a transfer function (signal, noise, offsets, references) */
  readonly sources: TransferSource[];
  /** closed-form stage models by node index (op-amp stages only) */
  readonly models: (StageModel | null)[];
  readonly openLoops: (OpenLoop | null)[];
  /** complex response of every node at each frequency (Hz), cumulative and individual */
  sweep(freqsHz: Float64Array, out?: SweepResult, opts?: SweepOptions): SweepResult;
  /**
   * Evaluates every transfer at one frequency (Hz; 0 gives the DC limit). Call before `transfersTo`.
   * At DC an integrator's output is left out (it has no DC operating point); the `drift` sources say where
   * it would reach.
   */
  setFrequency(fHz: number): void;
  /**
   * Transfer from every source (index as in `sources`) to a node's output point (ADC: its input pin), or
   * with `plus`, to the (+) pin of that op-amp stage. Values at the last `setFrequency`.
   */
  transfersTo(node: number, plus: boolean, outRe: Float64Array, outIm: Float64Array): void;
  /** the node's own transfer and input admittance at the last `setFrequency` */
  stageAt(node: number): { hRe: number; hIm: number; yRe: number; yIm: number };
}

class FastChain implements CompiledChain {
  readonly topology: Topology;
  readonly nodeIds: string[];
  readonly kinds: NodeKind[];
  readonly paths: CompiledPath[];
  readonly sources: TransferSource[] = [];
  readonly models: (StageModel | null)[];
  readonly openLoops: (OpenLoop | null)[];
  private current: Chain;
  /** buffers of the stage models for `retune(…, { reuse: true })` */
  private readonly pool = new PolyPool();

  // structure (fixed by the graph and the node kinds)
  private readonly n: number; // node count; point n is the EMF
  private readonly role: Int8Array;
  private readonly parent: Int32Array;
  private readonly inPoint: Int32Array; // input point of each node (source: the EMF point n)
  private readonly isDriver: Uint8Array; // per point
  private readonly driverOf: Int32Array; // per point: the driving point of its net
  private readonly netPoints: number[][]; // per driver point: the section points of its net
  private readonly kids: Int32Array[]; // per point (n = EMF): nodes fed from it
  private readonly srcBase: Int32Array; // first transfer-source index of each node
  private readonly integrators: number[];
  private readonly driftBase: number;
  private readonly opIdx: Int32Array;
  /** per node: 1 when it hangs on a passive section's point (its admittance is that section's load) */
  private readonly loadsSection: Uint8Array;

  // values (reloaded by retune)
  private readonly valA: Float64Array; // r (passive), resistance (source), 1/Rin (adc)
  private readonly valB: Float64Array; // c (passive)
  /** per op-amp stage q: den, vo, iin of its closed form, KC coefficients each (degree ≤ 4), 3·KC per stage */
  private readonly coef: Float64Array;
  private readonly limH: Float64Array;
  private readonly limY: Float64Array;

  // single-frequency state
  private readonly Hr: Float64Array;
  private readonly Hi: Float64Array;
  private readonly Yr: Float64Array;
  private readonly Yi: Float64Array;
  private readonly Pr: Float64Array; // V+/Vin of op-amp stages
  private readonly Pi: Float64Array;
  private readonly Gr: Float64Array;
  private readonly Gi: Float64Array;
  private readonly Sr: Float64Array;
  private readonly Si: Float64Array;
  private readonly YLr: Float64Array;
  private readonly YLi: Float64Array;
  private readonly Ur: Float64Array; // admittance seen looking back up from a section point
  private readonly Ui: Float64Array;
  private readonly RRr: Float64Array; // reverse ratio V(input)/V(output) of a section
  private readonly RRi: Float64Array;
  private readonly Zr: Float64Array;
  private readonly Zi: Float64Array;
  /** per op-amp node: [vo re, vo im, iin re, iin im, p re, p im] per internal source */
  private readonly srcVals: (Float64Array | null)[];
  /**
   * per op-amp node, for the single-frequency state: den, then V+/Vin and each source's vo, iin, p as
   * flat coefficients with [start, end) offsets, and the value of each at s → 0
   */
  private readonly stagePolys: ({ den: Float64Array; coef: Float64Array; off: Int32Array; lim: Float64Array } | null)[];
  private readonly one: { W: Float64Array; Hr: Float64Array[]; Hi: Float64Array[]; Yr: Float64Array[]; Yi: Float64Array[] };
  private readonly levelOf: Int32Array; // per driver point, during transfersTo
  /** per level of transfersTo: driver, exit point and the W, Gx, Gd transfers */
  private readonly lv: {
    drivers: Int32Array;
    exits: Int32Array;
    Wr: Float64Array;
    Wi: Float64Array;
    Gxr: Float64Array;
    Gxi: Float64Array;
    Gdr: Float64Array;
    Gdi: Float64Array;
  };
  private readonly stack: Int32Array;
  /** 1 for a piezo source (a charge: the current is s·q) */
  private readonly isCharge: Uint8Array;

  constructor(chain: Chain) {
    const topo = buildTopology(chain);
    this.current = chain;
    this.topology = topo;
    const n = topo.nodes.length;
    this.n = n;
    this.nodeIds = topo.nodes.map((x) => x.id);
    this.kinds = topo.nodes.map((x) => x.kind);
    this.paths = topo.paths.map((idx) => ({
      nodes: idx.map((i) => topo.nodes[i].id),
      indices: idx,
      end: idx[idx.length - 1],
    }));
    this.role = new Int8Array(n);
    this.parent = Int32Array.from(topo.parent);
    this.inPoint = new Int32Array(n);
    this.isDriver = new Uint8Array(n + 1);
    this.driverOf = new Int32Array(n + 1).fill(-1);
    this.srcBase = new Int32Array(n);
    this.models = new Array(n).fill(null);
    this.openLoops = new Array(n).fill(null);
    this.srcVals = new Array(n).fill(null);
    this.stagePolys = new Array(n).fill(null);
    this.integrators = [];
    this.valA = new Float64Array(n);
    this.valB = new Float64Array(n);
    this.limH = new Float64Array(n);
    this.limY = new Float64Array(n);

    this.isCharge = new Uint8Array(n);
    topo.nodes.forEach((node: ChainNode, i) => {
      this.inPoint[i] = i === 0 ? n : topo.parent[i];
      switch (node.kind) {
        case "source":
          this.role[i] = node.params.resistance > 0 ? ROLE_SOURCE_SECTION : ROLE_SOURCE_DRIVER;
          break;
        case "bridge":
        case "thermocouple":
          // the pair's legs belong to the one differential stage it feeds
          this.role[i] = ROLE_SOURCE_DRIVER;
          break;
        case "photodiode":
        case "piezo": {
          const child = topo.children[i][0];
          const k = child === undefined ? null : topo.nodes[child].kind;
          this.role[i] = k === "transimpedance" || k === "chargeAmp" ? ROLE_SOURCE_DRIVER : ROLE_NORTON;
          this.isCharge[i] = node.kind === "piezo" ? 1 : 0;
          break;
        }
        case "rcLowpass":
          this.role[i] = ROLE_RC_LP;
          break;
        case "rcHighpass":
          this.role[i] = ROLE_RC_HP;
          break;
        case "adc":
          this.role[i] = ROLE_ADC;
          break;
        default:
          if (!isOpAmpKind(node.kind)) throw new Error(`unknown node kind ${node.kind}`);
          this.role[i] = ROLE_OPAMP;
          if (node.kind === "integrator") this.integrators.push(i);
      }
    });
    const ops = this.role.reduce<number[]>((acc, r, i) => (r === ROLE_OPAMP ? [...acc, i] : acc), []);
    this.opIdx = Int32Array.from(ops);
    this.loadsSection = Uint8Array.from(topo.nodes, (_, i) => {
      const r = i === 0 ? -1 : this.role[topo.parent[i]];
      return r === ROLE_SOURCE_SECTION || r === ROLE_RC_LP || r === ROLE_RC_HP || r === ROLE_NORTON ? 1 : 0;
    });
    this.coef = new Float64Array(3 * KC * ops.length);
    this.loadValues(chain, true);
    this.driftBase = this.sources.length;
    for (const i of this.integrators) {
      const id = topo.nodes[i].id;
      this.sources.push({ key: `${id}:drift`, node: i, nodeId: id, element: "drift", type: "drift" });
    }

    // nets: drivers are the EMF, op-amp outputs and a zero-resistance source
    this.isDriver[n] = 1;
    this.driverOf[n] = n;
    for (let i = 0; i < n; i++) {
      const r = this.role[i];
      if (r === ROLE_OPAMP || r === ROLE_SOURCE_DRIVER) this.isDriver[i] = 1;
    }
    this.netPoints = Array.from({ length: n + 1 }, () => [] as number[]);
    for (let i = 0; i < n; i++) {
      // parents precede children, so the input point's driver is already known
      if (this.role[i] === ROLE_ADC) continue;
      if (this.isDriver[i]) this.driverOf[i] = i;
      else {
        const d = this.driverOf[this.inPoint[i]];
        this.driverOf[i] = d;
        this.netPoints[d].push(i);
      }
    }
    this.kids = [...topo.children, [0]].map((k) => Int32Array.from(k)); // the EMF point feeds the source

    const zeros = () => new Float64Array(n + 1);
    this.Hr = zeros();
    this.Hi = zeros();
    this.Yr = zeros();
    this.Yi = zeros();
    this.Pr = zeros();
    this.Pi = zeros();
    this.Gr = zeros();
    this.Gi = zeros();
    this.Sr = zeros();
    this.Si = zeros();
    this.YLr = zeros();
    this.YLi = zeros();
    this.Ur = zeros();
    this.Ui = zeros();
    this.RRr = zeros();
    this.RRi = zeros();
    this.Zr = zeros();
    this.Zi = zeros();
    this.levelOf = new Int32Array(n + 1).fill(-1);
    this.stack = new Int32Array(n + 1);
    this.lv = {
      drivers: new Int32Array(n + 1),
      exits: new Int32Array(n + 1),
      Wr: zeros(),
      Wi: zeros(),
      Gxr: zeros(),
      Gxi: zeros(),
      Gdr: zeros(),
      Gdi: zeros(),
    };
    const ones = () => Array.from({ length: n }, () => new Float64Array(1));
    this.one = { W: new Float64Array(1), Hr: ones(), Hi: ones(), Yr: ones(), Yi: ones() };
  }

  get chain(): Chain {
    return this.current;
  }

  /**
   * Component values, parts and the closed-form models. With `first`, also lists the transfer sources;
   * otherwise (retune) the new chain must give every stage the same list.
   */
  private loadValues(chain: Chain, first: boolean): void {
    const nodes = this.topology.index;
    let q = 0;
    let k = 1;
    if (first) this.sources.push({ key: `${this.nodeIds[0]}:emf`, node: 0, nodeId: this.nodeIds[0], element: "emf", type: "emf" });
    if (chain.nodes.length !== this.n || chain.edges.length !== this.n - 1)
      throw new Error("retune: the chain has other nodes or edges than the compiled one");
    const ordered = new Array<ChainNode>(this.n);
    for (const node of chain.nodes) {
      const i = nodes.get(node.id);
      if (i === undefined || this.kinds[i] !== node.kind || ordered[i]) throw new Error(`retune: node ${node.id} differs from the compiled chain`);
      ordered[i] = node;
    }
    for (const e of chain.edges) {
      if (this.parent[nodes.get(e.to) ?? -1] !== nodes.get(e.from))
        throw new Error(`retune: edge ${e.from} → ${e.to} is not in the compiled chain`);
    }
    ordered.forEach((node, i) => {
      if (first) this.srcBase[i] = this.sources.length;
      const addSource = (s: Omit<TransferSource, "key" | "node" | "nodeId">) => {
        if (first) this.sources.push({ key: `${node.id}:${s.element}`, node: i, nodeId: node.id, ...s });
        else if (this.sources[k]?.element !== s.element || this.sources[k].node !== i)
          throw new Error(`retune: the sources of ${node.id} differ from the compiled chain`);
        else this.sources[k].resistance = s.resistance;
        k++;
      };
      switch (node.kind) {
        case "source":
          if ((node.params.resistance > 0) !== (this.role[i] === ROLE_SOURCE_SECTION))
            throw new Error("retune: the source resistance changed between zero and non-zero");
          this.valA[i] = node.params.resistance;
          break;
        case "bridge":
        case "thermocouple":
          break;
        case "photodiode":
        case "piezo": {
          const sh = sourceSignal(node).shunt!;
          this.valA[i] = sh.r;
          this.valB[i] = sh.c;
          break;
        }
        case "rcLowpass":
        case "rcHighpass":
          this.valA[i] = node.params.r;
          this.valB[i] = node.params.c;
          addSource({ element: "r", type: "passive-r", resistance: node.params.r });
          break;
        case "adc":
          this.valA[i] = node.params.inputResistance === null ? 0 : 1 / node.params.inputResistance;
          break;
        default: {
          const partKey = "part" in node ? node.part : null;
          const ol = openLoop(partKey ? chain.parts[partKey] : undefined);
          const model = stageModel(node as OpAmpNode, ol, this.stageInput(ordered, i));
          this.models[i] = model;
          this.openLoops[i] = ol;
          if (first) this.srcVals[i] = new Float64Array(6 * model.sources.length);
          for (const s of model.sources) addSource({ element: s.element, type: s.type, resistance: s.resistance });
          // the kernel evaluates quartics; a kind with a higher degree needs the kernel extended
          const o = 3 * KC * q;
          this.kernelPoly(node.kind, o, model.den);
          this.kernelPoly(node.kind, o + KC, model.vin.vo);
          this.kernelPoly(node.kind, o + 2 * KC, model.vin.iin);
          this.limH[i] = limitAtZero(model.vin.vo, model.den);
          this.limY[i] = limitAtZero(model.vin.iin, model.den);
          // V+/Vin, then vo, iin, p of each source, flat; a retune refills the arrays when the sizes allow
          const count = 1 + 3 * model.sources.length;
          let size = model.vin.p.length;
          for (const x of model.sources) size += x.vo.length + x.iin.length + x.p.length;
          const old = this.stagePolys[i];
          const fits = old !== null && old.coef.length === size && old.lim.length === count;
          const coef = fits ? old.coef : new Float64Array(size);
          const off = fits ? old.off : new Int32Array(2 * count);
          const lim = fits ? old.lim : new Float64Array(count);
          let at = 0;
          let j = 0;
          const put = (x: Float64Array) => {
            for (let c = 0; c < x.length; c++) coef[at + c] = x[c];
            off[2 * j] = at;
            at += x.length;
            off[2 * j + 1] = at;
            lim[j++] = limitAtZero(x, model.den);
          };
          put(model.vin.p);
          for (const x of model.sources) {
            put(x.vo);
            put(x.iin);
            put(x.p);
          }
          this.stagePolys[i] = { den: model.den, coef, off, lim };
          q++;
        }
      }
    });
    this.current = chain;
  }

  retune(chain: Chain, opts?: RetuneOptions): void {
    if (opts?.reuse) withPolyPool(this.pool, () => this.loadValues(chain, false));
    else this.loadValues(chain, false);
  }

  /** A closed-form polynomial into the kernel's coefficients at `o` (KC of them, zero-padded). */
  private kernelPoly(kind: string, o: number, p: Float64Array): void {
    if (p.length > KC) throw new Error(`${kind}: closed form of degree ${p.length - 1} > ${KC - 1}`);
    for (let c = 0; c < KC; c++) this.coef[o + c] = c < p.length ? p[c] : 0;
  }

  /** What a stage wired straight to a sensor source takes over from it (sensors.ts). */
  private stageInput(ordered: ChainNode[], i: number): StageInput {
    const p = this.topology.parent[i];
    if (p !== 0 || this.role[0] !== ROLE_SOURCE_DRIVER) return NO_INPUT;
    const src = ordered[0];
    if (src.kind === "source") return NO_INPUT;
    const sig = sourceSignal(src);
    return { leg: sig.output === "differential" ? sig.resistance / 2 : 0, shunt: sig.shunt, charge: sig.output === "charge" };
  }

  /**
   * The vectorised kernel: each node's own transfer H and input admittance Y at every ω (rad/s) of `W`,
   * node by node with the frequencies innermost (flat coefficients, Horner inlined, no allocation).
   * Op-amp stages: H = vo/den, Y = iin/den of their closed forms; at ω = 0 the exact limits (with
   * `operatingPoint`, an integrator's H is left at 0: its DC output is undetermined). Sections, bottom-up
   * since they depend on their loads: YL = Σ Y of the nodes they feed, T = G/(G + Ysh + YL),
   * Yin = T·(Ysh + YL).
   */
  private kernel(
    W: Float64Array,
    nf: number,
    Hr: Float64Array[],
    Hi: Float64Array[],
    Yr: Float64Array[],
    Yi: Float64Array[],
    operatingPoint: boolean,
    allLoads = true,
  ): void {
    const { opIdx, role, valA, valB, kids } = this;
    for (let q = 0; q < opIdx.length; q++) {
      const i = opIdx[q];
      const hLim = operatingPoint && this.kinds[i] === "integrator" ? 0 : this.limH[i];
      this.stageKernel(q, W, nf, hLim, Hr[i], Hi[i], allLoads || this.loadsSection[i] === 1 ? Yr[i] : null, Yi[i]);
    }
    for (let i = this.n - 1; i >= 0; i--) {
      const r = role[i];
      const hr = Hr[i];
      const hi = Hi[i];
      const yr = Yr[i];
      const yi = Yi[i];
      if (r === ROLE_ADC || r === ROLE_SOURCE_DRIVER) {
        const g = r === ROLE_ADC ? valA[i] : 0;
        for (let k = 0; k < nf; k++) {
          hr[k] = 1;
          hi[k] = 0;
          yr[k] = g;
          yi[k] = 0;
        }
        continue;
      }
      if (r === ROLE_NORTON) {
        const kk = kids[i];
        const g = 1 / valA[i];
        const c = valB[i];
        const q = this.isCharge[i] === 1;
        for (let k = 0; k < nf; k++) {
          let br = g;
          let bi = W[k] * c;
          for (let j = 0; j < kk.length; j++) {
            br += Yr[kk[j]][k];
            bi += Yi[kk[j]][k];
          }
          const inv = 1 / (br * br + bi * bi);
          // 1/(Ys + YL), times jω for a charge
          const tr = br * inv;
          const ti = -bi * inv;
          hr[k] = q ? -W[k] * ti : tr;
          hi[k] = q ? W[k] * tr : ti;
          yr[k] = 0;
          yi[k] = 0;
        }
        continue;
      }
      if (r !== ROLE_RC_LP && r !== ROLE_RC_HP && r !== ROLE_SOURCE_SECTION) continue;
      const kk = kids[i];
      const nk = kk.length;
      const a = valA[i];
      const c = valB[i];
      // 1/r once per section, not per point (the same quotient)
      const ga = 1 / a;
      for (let k = 0; k < nf; k++) {
        let lr = 0;
        let li = 0;
        for (let j = 0; j < nk; j++) {
          lr += Yr[kk[j]][k];
          li += Yi[kk[j]][k];
        }
        // series G and shunt Y of the L-section
        let gr: number;
        let gi: number;
        let ar: number;
        let ai: number;
        if (r === ROLE_RC_LP) {
          gr = ga;
          gi = 0;
          ar = lr;
          ai = li + W[k] * c;
        } else if (r === ROLE_RC_HP) {
          gr = 0;
          gi = W[k] * c;
          ar = lr + ga;
          ai = li;
        } else {
          gr = ga;
          gi = 0;
          ar = lr;
          ai = li;
        }
        const br = gr + ar;
        const bi = gi + ai;
        const inv = 1 / (br * br + bi * bi);
        const tr = (gr * br + gi * bi) * inv;
        const ti = (gi * br - gr * bi) * inv;
        hr[k] = tr;
        hi[k] = ti;
        yr[k] = tr * ar - ti * ai;
        yi[k] = tr * ai + ti * ar;
      }
    }
  }

  /**
   * Op-amp stage q (node opIdx[q]) in the kernel: H = vo/den into hr/hi, and Y = iin/den into yr/yi unless
   * yr is null (nothing reads it); at ω = 0 the limits (H: `hLim`).
   * p(jω) = (c0 − c2·ω² + c4·ω⁴) + j·ω·(c1 − c3·ω²)
   */
  private stageKernel(q: number, W: Float64Array, nf: number, hLim: number, hr: Float64Array, hi: Float64Array, yr: Float64Array | null, yi: Float64Array): void {
    const coef = this.coef;
    const o = 3 * KC * q;
    const d0 = coef[o], d1 = coef[o + 1], d2 = coef[o + 2], d3 = coef[o + 3], d4 = coef[o + 4];
    const v0 = coef[o + 5], v1 = coef[o + 6], v2 = coef[o + 7], v3 = coef[o + 8], v4 = coef[o + 9];
    const y0 = coef[o + 10], y1 = coef[o + 11], y2 = coef[o + 12], y3 = coef[o + 13], y4 = coef[o + 14];
    const yLim = this.limY[this.opIdx[q]];
    for (let k = 0; k < nf; k++) {
      const w = W[k];
      if (w === 0) {
        hr[k] = hLim;
        hi[k] = 0;
        if (yr !== null) {
          yr[k] = yLim;
          yi[k] = 0;
        }
        continue;
      }
      const w2 = w * w;
      const ar = d0 - w2 * (d2 - d4 * w2);
      const ai = w * (d1 - d3 * w2);
      const inv = 1 / (ar * ar + ai * ai);
      const br = v0 - w2 * (v2 - v4 * w2);
      const bi = w * (v1 - v3 * w2);
      hr[k] = (br * ar + bi * ai) * inv;
      hi[k] = (bi * ar - br * ai) * inv;
      if (yr !== null) {
        const cr = y0 - w2 * (y2 - y4 * w2);
        const ci = w * (y1 - y3 * w2);
        yr[k] = (cr * ar + ci * ai) * inv;
        yi[k] = (ci * ar - cr * ai) * inv;
      }
    }
  }

  /**
   * Single-frequency state for noise and DC: the kernel at one ω, the loads of every point, the internal
   * sources of the op-amp stages and the upward admittances.
   */
  private evaluate(w: number, operatingPoint: boolean): void {
    const n = this.n;
    const one = this.one;
    one.W[0] = w;
    this.kernel(one.W, 1, one.Hr, one.Hi, one.Yr, one.Yi, operatingPoint);
    const { role, Hr, Hi, Yr, Yi, Gr, Gi, Sr, Si, YLr, YLi, valA, valB } = this;
    for (let i = 0; i < n; i++) {
      Hr[i] = one.Hr[i][0];
      Hi[i] = one.Hi[i][0];
      Yr[i] = one.Yr[i][0];
      Yi[i] = one.Yi[i][0];
      const r = role[i];
      Gr[i] = Gi[i] = Sr[i] = Si[i] = 0;
      if (r === ROLE_RC_LP) {
        Gr[i] = 1 / valA[i];
        Si[i] = w * valB[i];
      } else if (r === ROLE_RC_HP) {
        Gi[i] = w * valB[i];
        Sr[i] = 1 / valA[i];
      } else if (r === ROLE_SOURCE_SECTION) Gr[i] = 1 / valA[i];
      else if (r === ROLE_NORTON) {
        // looking back up from a Norton source's point: its shunt admittance
        Gr[i] = 1 / valA[i];
        Gi[i] = w * valB[i];
      }
    }
    for (let i = 0; i <= n; i++) {
      const k = this.kids[i];
      let lr = 0;
      let li = 0;
      for (let j = 0; j < k.length; j++) {
        lr += Yr[k[j]];
        li += Yi[k[j]];
      }
      YLr[i] = lr;
      YLi[i] = li;
    }
    for (const i of this.opIdx) this.evaluateSources(i, w, operatingPoint && this.kinds[i] === "integrator");
  }

  /**
   * V+/Vin and the internal sources of op-amp stage i at ω into Pr/Pi and srcVals (no allocation).
   * `dropVo` leaves the sources' direct output terms at 0 (an integrator at the DC operating point).
   */
  private evaluateSources(i: number, w: number, dropVo: boolean): void {
    const sp = this.stagePolys[i]!;
    const v = this.srcVals[i]!;
    const cnt = sp.lim.length;
    if (w === 0) {
      this.Pr[i] = sp.lim[0];
      this.Pi[i] = 0;
      for (let j = 1; j < cnt; j++) {
        v[2 * (j - 1)] = dropVo && (j - 1) % 3 === 0 ? 0 : sp.lim[j];
        v[2 * (j - 1) + 1] = 0;
      }
      return;
    }
    const den = sp.den;
    let dr = den[den.length - 1];
    let di = 0;
    for (let k = den.length - 2; k >= 0; k--) {
      const t = den[k] - di * w;
      di = dr * w;
      dr = t;
    }
    const inv = 1 / (dr * dr + di * di);
    const { coef, off } = sp;
    for (let j = 0; j < cnt; j++) {
      const a = off[2 * j];
      const b = off[2 * j + 1];
      let re = coef[b - 1];
      let im = 0;
      for (let k = b - 2; k >= a; k--) {
        const t = coef[k] - im * w;
        im = re * w;
        re = t;
      }
      const xr = (re * dr + im * di) * inv;
      const xi = (im * dr - re * di) * inv;
      if (j === 0) {
        this.Pr[i] = xr;
        this.Pi[i] = xi;
      } else if (dropVo && (j - 1) % 3 === 0) {
        v[2 * (j - 1)] = v[2 * (j - 1) + 1] = 0;
      } else {
        v[2 * (j - 1)] = xr;
        v[2 * (j - 1) + 1] = xi;
      }
    }
  }

  /** Admittances looking back up from each section point (for the noise and DC transfer impedances). */
  private evaluateUpward(): void {
    const n = this.n;
    const { role, Gr, Gi, Sr, Si, Yr, Yi, Ur, Ui, RRr, RRi, isDriver, inPoint } = this;
    for (let i = 0; i < n; i++) {
      const r = role[i];
      if (r !== ROLE_RC_LP && r !== ROLE_RC_HP && r !== ROLE_SOURCE_SECTION && r !== ROLE_NORTON) continue;
      const u = inPoint[i];
      if (isDriver[u]) {
        Ur[i] = Sr[i] + Gr[i];
        Ui[i] = Si[i] + Gi[i];
        RRr[i] = RRi[i] = 0;
        continue;
      }
      // the rest of the network at the input point u: what u sees upward plus its other loads
      let xr = Ur[u];
      let xi = Ui[u];
      const k = this.kids[u];
      for (let j = 0; j < k.length; j++) {
        if (k[j] === i) continue;
        xr += Yr[k[j]];
        xi += Yi[k[j]];
      }
      // RR = G/(G + X); U = Y + G·X/(G + X) = Y + RR·X
      const br = Gr[i] + xr;
      const bi = Gi[i] + xi;
      const inv = 1 / (br * br + bi * bi);
      const rr = (Gr[i] * br + Gi[i] * bi) * inv;
      const ri = (Gi[i] * br - Gr[i] * bi) * inv;
      RRr[i] = rr;
      RRi[i] = ri;
      Ur[i] = Sr[i] + rr * xr - ri * xi;
      Ui[i] = Si[i] + rr * xi + ri * xr;
    }
  }

  setFrequency(fHz: number): void {
    this.evaluate(TWO_PI * fHz, fHz === 0);
    this.evaluateUpward();
  }

  stageAt(node: number) {
    return { hRe: this.Hr[node], hIm: this.Hi[node], yRe: this.Yr[node], yIm: this.Yi[node] };
  }

  /** Voltages in the net of point x for a unit current injected at x (transfer impedances Z(·, x)). */
  private spread(x: number): void {
    const { Zr, Zi, isDriver, driverOf, inPoint, RRr, RRi } = this;
    const members = this.netPoints[driverOf[x]];
    for (const p of members) Zr[p] = Zi[p] = 0;
    if (isDriver[x]) return;
    {
      const ar = this.Ur[x] + this.YLr[x];
      const ai = this.Ui[x] + this.YLi[x];
      const inv = 1 / (ar * ar + ai * ai);
      Zr[x] = ar * inv;
      Zi[x] = -ai * inv;
    }
    this.down(x, -1);
    let cur = x;
    while (!isDriver[cur]) {
      const u = inPoint[cur];
      if (isDriver[u]) break;
      Zr[u] = Zr[cur] * RRr[cur] - Zi[cur] * RRi[cur];
      Zi[u] = Zr[cur] * RRi[cur] + Zi[cur] * RRr[cur];
      this.down(u, cur);
      cur = u;
    }
  }

  /** Carries the spread voltage of point `from` down into its sections, skipping the branch `skip`. */
  private down(from: number, skip: number): void {
    const { Zr, Zi, Hr, Hi, role, stack } = this;
    let top = 0;
    stack[top++] = from;
    while (top > 0) {
      const p = stack[--top];
      const k = this.kids[p];
      for (let j = 0; j < k.length; j++) {
        const c = k[j];
        if (c === skip) continue;
        const rc = role[c];
        if (rc !== ROLE_RC_LP && rc !== ROLE_RC_HP) continue;
        Zr[c] = Zr[p] * Hr[c] - Zi[p] * Hi[c];
        Zi[c] = Zr[p] * Hi[c] + Zi[p] * Hr[c];
        stack[top++] = c;
      }
    }
  }

  transfersTo(node: number, plus: boolean, outRe: Float64Array, outIm: Float64Array): void {
    const n = this.n;
    const { role, isDriver, driverOf, inPoint, Hr, Hi, Zr, Zi, levelOf, srcBase } = this;
    const target = role[node] === ROLE_ADC || plus ? inPoint[node] : node;
    // nets from the EMF down to the target: drivers and exit points
    const { drivers, exits, Wr, Wi, Gxr, Gxi, Gdr, Gdi } = this.lv;
    // nets from the target up to the EMF, then reversed: level 0 is the EMF's net
    let m = -1;
    for (let p = target; ; ) {
      const d = driverOf[p];
      m++;
      drivers[m] = d;
      exits[m] = p;
      if (d === n || role[d] === ROLE_SOURCE_DRIVER) break;
      p = inPoint[d];
    }
    drivers.subarray(0, m + 1).reverse();
    exits.subarray(0, m + 1).reverse();
    levelOf.fill(-1);
    // W: driver → exit within the net; Gx: exit → target; Gd: driver → target
    for (let l = 0; l <= m; l++) {
      levelOf[drivers[l]] = l;
      this.spread(exits[l]);
      let wr = 1;
      let wi = 0;
      for (let p = exits[l]; !isDriver[p]; p = inPoint[p]) {
        const t = wr * Hr[p] - wi * Hi[p];
        wi = wr * Hi[p] + wi * Hr[p];
        wr = t;
      }
      Wr[l] = wr;
      Wi[l] = wi;
    }
    Gxr[m] = 1;
    Gxi[m] = 0;
    for (let l = m; l >= 0; l--) {
      if (l < m) {
        const s = drivers[l + 1];
        // Gx[l] = H(s)·Gd[l+1]
        Gxr[l] = Hr[s] * Gdr[l + 1] - Hi[s] * Gdi[l + 1];
        Gxi[l] = Hr[s] * Gdi[l + 1] + Hi[s] * Gdr[l + 1];
      }
      Gdr[l] = Wr[l] * Gxr[l] - Wi[l] * Gxi[l];
      Gdi[l] = Wr[l] * Gxi[l] + Wi[l] * Gxr[l];
    }

    outRe.fill(0);
    outIm.fill(0);
    outRe[0] = Gdr[0];
    outIm[0] = Gdi[0];
    for (let i = 0; i < n; i++) {
      const r = role[i];
      if (r === ROLE_RC_LP || r === ROLE_RC_HP) {
        const l = levelOf[driverOf[i]];
        if (l < 0) continue;
        // current e/r injected at the section output (and, for the series r, drawn from its input)
        let zr = Zr[i];
        let zi = Zi[i];
        if (r === ROLE_RC_LP && !isDriver[inPoint[i]]) {
          zr -= Zr[inPoint[i]];
          zi -= Zi[inPoint[i]];
        }
        const g = 1 / this.valA[i];
        outRe[srcBase[i]] = g * (zr * Gxr[l] - zi * Gxi[l]);
        outIm[srcBase[i]] = g * (zr * Gxi[l] + zi * Gxr[l]);
      } else if (r === ROLE_OPAMP) {
        const q = inPoint[i];
        const l = levelOf[driverOf[q]];
        if (l < 0) continue;
        const v = this.srcVals[i]!;
        const cnt = v.length / 6;
        // −Z(q)·Gx: the effect of a current drawn from the input point
        const kr = -(Zr[q] * Gxr[l] - Zi[q] * Gxi[l]);
        const ki = -(Zr[q] * Gxi[l] + Zi[q] * Gxr[l]);
        const onPath = l < m && drivers[l + 1] === i;
        for (let j = 0; j < cnt; j++) {
          const yr = v[6 * j + 2];
          const yi = v[6 * j + 3];
          let tr = yr * kr - yi * ki;
          let ti = yr * ki + yi * kr;
          if (onPath) {
            const hr = v[6 * j];
            const hi = v[6 * j + 1];
            tr += hr * Gdr[l + 1] - hi * Gdi[l + 1];
            ti += hr * Gdi[l + 1] + hi * Gdr[l + 1];
          }
          outRe[srcBase[i] + j] = tr;
          outIm[srcBase[i] + j] = ti;
        }
      }
    }
    for (let k = 0; k < this.integrators.length; k++) {
      const l = levelOf[this.integrators[k]];
      if (l >= 0) {
        outRe[this.driftBase + k] = Gdr[l];
        outIm[this.driftBase + k] = Gdi[l];
      }
    }
    if (plus) {
      // V+ = (V+/Vin)·Vin + the stage's own direct terms
      const pr = this.Pr[node];
      const pi = this.Pi[node];
      for (let k = 0; k < outRe.length; k++) {
        const a = outRe[k];
        const b = outIm[k];
        outRe[k] = a * pr - b * pi;
        outIm[k] = a * pi + b * pr;
      }
      const v = this.srcVals[node]!;
      for (let j = 0; j < v.length / 6; j++) {
        outRe[srcBase[node] + j] += v[6 * j + 4];
        outIm[srcBase[node] + j] += v[6 * j + 5];
      }
    }
  }

  sweep(freqsHz: Float64Array, out?: SweepResult, opts?: SweepOptions): SweepResult {
    const n = this.n;
    const nf = freqsHz.length;
    const res = out && out.freqs.length === nf && out.cumRe.length === n ? out : allocSweep(n, nf);
    res.freqs.set(freqsHz);
    const W = res.omega;
    for (let k = 0; k < nf; k++) W[k] = TWO_PI * freqsHz[k];
    this.kernel(W, nf, res.indRe, res.indIm, res.yRe, res.yIm, false, opts?.admittances !== false);
    const pole = res.pole;
    pole.fill(0);
    const { parent, role } = this;
    for (let i = 0; i < n; i++) {
      const hr = res.indRe[i];
      const hi = res.indIm[i];
      const cr = res.cumRe[i];
      const ci = res.cumIm[i];
      // Infinity·0 and NaN·0 are NaN: flags values that are not finite (in the same pass as the product)
      if (i === 0) {
        cr.set(hr);
        ci.set(hi);
        for (let k = 0; k < nf; k++) if (cr[k] * 0 + ci[k] * 0 !== 0) pole[k] = 1;
      } else if (role[i] === ROLE_ADC) {
        // the converter's input pin is its parent's output: already flagged
        cr.set(res.cumRe[parent[i]]);
        ci.set(res.cumIm[parent[i]]);
      } else {
        const pr = res.cumRe[parent[i]];
        const pi = res.cumIm[parent[i]];
        for (let k = 0; k < nf; k++) {
          const a = pr[k];
          const b = pi[k];
          const x = a * hr[k] - b * hi[k];
          const y = a * hi[k] + b * hr[k];
          cr[k] = x;
          ci[k] = y;
          if (x * 0 + y * 0 !== 0) pole[k] = 1;
        }
      }
    }
    return res;
  }
}

function allocSweep(n: number, nf: number): SweepResult {
  const arr = () => Array.from({ length: n }, () => new Float64Array(nf));
  return {
    freqs: new Float64Array(nf),
    omega: new Float64Array(nf),
    cumRe: arr(),
    cumIm: arr(),
    indRe: arr(),
    indIm: arr(),
    yRe: arr(),
    yIm: arr(),
    pole: new Uint8Array(nf),
  };
}

/**
 * Compiles a complete chain (defaults filled in) for repeated evaluation. Cheap enough to call per
 * Monte Carlo draw: it builds a few small polynomials per stage and allocates the per-frequency state.
 */
export function compileChain(chain: Chain): CompiledChain {
  return new FastChain(chain);
}
