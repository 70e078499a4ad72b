/**
 * An independent modified-nodal-analysis (MNA) solver for whole chains, used as the
 * reference the engine is compared with. Written from the topology table of
 * chain-format.md ("Stage kinds"), not from the engine.
 *
 * Unknowns: every net node voltage (ground excluded), the current of every voltage
 * source, and the output current of every op-amp. The op-amp is the controlled source
 * of chain-format.md, Vo = A(s)·(V+ + e − V−) with e a voltage in series with (+)
 * (offset or en). Its row is written as
 *
 *     (1/A(s))·Vo − V+ + V− = e,   1/A(s) = 1/aol + s/(2π·gbw)
 *
 * which is the single-pole model A(s) = aol/(1 + s·aol/(2π·gbw)) of chain-format.md;
 * a missing aol drops the 1/aol term (A = 2π·gbw/s), a missing gbw drops the s term
 * (flat aol), and an ideal op-amp has 1/A = 0 (a nullor: V+ + e = V−).
 *
 * Complex arithmetic and the LU solve are mathjs (`math.lusolve`), as references.md §16
 * suggests. Transfer functions from many sources to one output node are obtained with
 * one adjoint solve: V_out = e_outᵀ·A⁻¹·b = (A⁻ᵀ·e_out)ᵀ·b.
 */
import { lusolve, slu, sparse } from "mathjs";
import { cx, type Cx } from "./cx";
import type { Chain, ChainNode, Part } from "@/lib/chain/types";

export const GND = "0";

/** Boltzmann constant, J/K, exact since the 2019 SI (SI Brochure 9th ed.; references.md §1). */
export const K_BOLTZMANN = 1.380649e-23;

export interface Resistor {
  kind: "R";
  a: string;
  b: string;
  r: number;
  owner: string;
  element: string;
  /** false for the ADC input resistance, whose noise the format does not define */
  noisy: boolean;
}
export interface Capacitor {
  kind: "C";
  a: string;
  b: string;
  c: number;
  owner: string;
  element: string;
}
/** Voltage source from node p to ground. role emf = the source EMF; ref = a vref/vbias or a DC stand-in. */
export interface VSource {
  kind: "V";
  p: string;
  owner: string;
  role: "emf" | "ref";
  dc: number;
}
export interface OpAmp {
  kind: "opamp";
  p: string;
  n: string;
  out: string;
  owner: string;
  part: Part;
}
/**
 * Voltage-controlled voltage source V(p) = Σ gain·V(node), to ground: the bridge's and the
 * thermocouple's two output nets E± = vcm ± Vd/2, built from a Vd and a vcm source.
 */
export interface VcVs {
  kind: "E";
  p: string;
  terms: { node: string; gain: number }[];
  owner: string;
}
/**
 * Current g(s)·V(ctrl) driven into node `into` (returning through ground): the photodiode's
 * current (g = 1, one ampere per volt of its emf source) and the piezo's charge (g = s: the
 * current of a charge q is s·q). The controlling node carries the source's emf, so the emf
 * transfer is per ampere or per coulomb, the unit of the source's output.
 */
export interface VcCs {
  kind: "G";
  into: string;
  ctrl: string;
  derivative: boolean;
  owner: string;
}
export type Element = Resistor | Capacitor | VSource | OpAmp | VcVs | VcCs;

export interface Net {
  chain: Chain;
  elements: Element[];
  /** net node names in unknown order (ground excluded) */
  nodes: string[];
  index: Map<string, number>;
  /** number of unknowns (node voltages, then the currents of voltage sources, VCVSs and op-amps) */
  size: number;
  /** row/column of each voltage source and op-amp, keyed by the element object */
  extra: Map<Element, number>;
  /** chain node id → net node holding its output (an ADC maps to its input pin) */
  outputOf: Map<string, string>;
  /** op-amp stage id → its op-amp element (the in-amp: A3, the one driving its output) */
  opamps: Map<string, OpAmp>;
  /** op-amp stage id → every op-amp element it holds (three for the in-amp) */
  stageOpamps: Map<string, OpAmp[]>;
  /** chain node ids whose DC value is unbounded (an integrator or anything after it) */
  dcUnbounded: Set<string>;
  dcMode: boolean;
}

const OPAMP_KINDS = new Set([
  "inverting",
  "noninverting",
  "lossyIntegrator",
  "integrator",
  "sallenKeyLowpass",
  "mfbLowpass",
  "sallenKeyHighpass",
  "mfbHighpass",
  // sensor front ends (lib/chain/README.md, "Sensor sources and front-end stages")
  "transimpedance",
  "chargeAmp",
  "differenceAmp",
  "inAmp",
]);

/** Sections with a series capacitor at their input: their DC output does not depend on the input's. */
const DC_BLOCKING = new Set(["rcHighpass", "sallenKeyHighpass", "mfbHighpass"]);

/** The source kinds: the plain EMF and the four sensors of lib/chain/README.md. */
export const SOURCE_KINDS = new Set(["source", "bridge", "photodiode", "piezo", "thermocouple"]);

export function isOpAmpKind(kind: string): boolean {
  return OPAMP_KINDS.has(kind);
}

function predecessorMap(chain: Chain): Map<string, string> {
  const pred = new Map<string, string>();
  for (const e of chain.edges) pred.set(e.to, e.from);
  return pred;
}

/** Chain nodes in an order where every node comes after its predecessor. */
export function topoOrder(chain: Chain): ChainNode[] {
  const pred = predecessorMap(chain);
  const byId = new Map(chain.nodes.map((n) => [n.id, n] as const));
  const done = new Set<string>();
  const out: ChainNode[] = [];
  const visit = (id: string) => {
    if (done.has(id)) return;
    const p = pred.get(id);
    if (p) visit(p);
    done.add(id);
    out.push(byId.get(id)!);
  };
  for (const n of chain.nodes) visit(n.id);
  return out;
}

/** Build the element list of a whole chain. dcMode replaces each integrator's output by a 0 V stand-in. */
export function buildNet(chain: Chain, opts: { dcMode?: boolean } = {}): Net {
  const dcMode = opts.dcMode ?? false;
  const pred = predecessorMap(chain);
  const elements: Element[] = [];
  const outputOf = new Map<string, string>();
  const opamps = new Map<string, OpAmp>();
  const stageOpamps = new Map<string, OpAmp[]>();
  // a differential source's two output nets, after its legs: E+ at `p`, E− at `m`
  const diffOf = new Map<string, { p: string; m: string }>();
  const dcUnbounded = new Set<string>();
  const R = (a: string, b: string, r: number, owner: string, element: string, noisy = true) =>
    elements.push({ kind: "R", a, b, r, owner, element, noisy });
  const C = (a: string, b: string, c: number, owner: string, element: string) =>
    elements.push({ kind: "C", a, b, c, owner, element });
  const refs = new Set<string>();
  // one source per reference node, however many elements return to it
  const ref = (node: string, v: number, owner: string) => {
    if (!refs.has(node)) elements.push({ kind: "V", p: node, owner, role: "ref", dc: v });
    refs.add(node);
    return node;
  };
  const amp = (owner: string, p: string, n: string, out: string, partKey: string | null | undefined) => {
    const part = partKey ? chain.parts[partKey] ?? {} : {};
    const op: OpAmp = { kind: "opamp", p, n, out, owner, part };
    elements.push(op);
    opamps.set(owner, op);
    stageOpamps.set(owner, [...(stageOpamps.get(owner) ?? []), op]);
  };
  // a leg resistance from a to a new node b, or the same node when the leg is 0 Ω
  const leg = (a: string, b: string, r: number, owner: string, element: string) => {
    if (!(r > 0)) return a;
    R(a, b, r, owner, element);
    return b;
  };
  /**
   * A differential sensor: Vd (the emf, per volt of difference) and vcm (a DC level, an AC
   * ground) make E± = vcm ± Vd/2 (lib/chain/README.md, bridge and thermocouple rows), each
   * behind its leg resistance.
   */
  const differential = (id: string, vd: number, vcm: number, legR: number) => {
    elements.push({ kind: "V", p: `${id}:vd`, owner: id, role: "emf", dc: vd });
    ref(`${id}:cm`, vcm, id);
    elements.push({ kind: "E", p: `${id}:E+`, terms: [{ node: `${id}:cm`, gain: 1 }, { node: `${id}:vd`, gain: 0.5 }], owner: id });
    elements.push({ kind: "E", p: `${id}:E-`, terms: [{ node: `${id}:cm`, gain: 1 }, { node: `${id}:vd`, gain: -0.5 }], owner: id });
    diffOf.set(id, { p: leg(`${id}:E+`, `${id}:p`, legR, id, "leg+"), m: leg(`${id}:E-`, `${id}:m`, legR, id, "leg-") });
  };
  /** A Norton sensor: its output current (or charge) into node `id`, with its shunt to ground. */
  const norton = (id: string, dc: number, derivative: boolean, rsh: number, csh: number, rName: string) => {
    elements.push({ kind: "V", p: `${id}:emf`, owner: id, role: "emf", dc });
    elements.push({ kind: "G", into: id, ctrl: `${id}:emf`, derivative, owner: id });
    R(id, GND, rsh, id, rName);
    C(id, GND, csh, id, "capacitance");
  };

  // a Sallen-Key section's (−) pin: the output itself, or the tap of rf (out→(−)) and rg ((−)→vref)
  const skMinus = (id: string, out: string, p: { rf?: number | null; rg?: number | null; vref: number }) => {
    if (p.rf === null || p.rf === undefined) return out;
    const n = `${id}:n`;
    R(out, n, p.rf, id, "rf");
    if (p.rg !== null && p.rg !== undefined) R(n, ref(`${id}:ref`, p.vref, id), p.rg, id, "rg");
    return n;
  };

  for (const node of topoOrder(chain)) {
    const id = node.id;
    const inId = pred.get(id);
    const input = inId !== undefined ? outputOf.get(inId)! : GND;
    // unbounded DC carries on through DC-coupled stages; a section whose input capacitor blocks DC
    // (the RC and the two high-pass filters) is bounded again (chain-format.md: "everything DC-coupled")
    if (inId !== undefined && dcUnbounded.has(inId) && !DC_BLOCKING.has(node.kind)) dcUnbounded.add(id);
    const out = id;
    switch (node.kind) {
      case "source": {
        const p = node.params;
        if (p.resistance > 0) {
          elements.push({ kind: "V", p: `${id}:emf`, owner: id, role: "emf", dc: p.dc });
          R(`${id}:emf`, out, p.resistance, id, "resistance");
        } else {
          elements.push({ kind: "V", p: out, owner: id, role: "emf", dc: p.dc });
        }
        outputOf.set(id, out);
        break;
      }
      // sensor sources (lib/chain/README.md, "Sensor sources and front-end stages")
      case "bridge": {
        const p = node.params;
        // Vd over excitation·fullScale·[loadLow, loadHigh]: its DC is the mid-point
        const vd = (p.excitation * p.fullScale * (p.loadLow + p.loadHigh)) / 2;
        differential(id, vd, p.vcm ?? p.excitation / 2, p.resistance / 2);
        break;
      }
      case "thermocouple": {
        const p = node.params;
        // Vd = seebeck·(t − tCold) over [tLow, tHigh]: its DC is the mid-point
        differential(id, p.seebeck * ((p.tLow + p.tHigh) / 2 - p.tCold), p.vcm, p.leadResistance);
        break;
      }
      case "photodiode": {
        const p = node.params;
        norton(id, p.dc + p.darkCurrent, false, p.shuntResistance, p.capacitance, "shuntResistance");
        outputOf.set(id, out);
        break;
      }
      case "piezo": {
        const p = node.params;
        norton(id, 0, true, p.leakage, p.capacitance, "leakage");
        outputOf.set(id, out);
        break;
      }
      // front-end stages: the sensor current into (−), rf ∥ cf out→(−), cin (−)→ground, (+) at vref
      case "transimpedance":
      case "chargeAmp": {
        const p = node.params;
        R(input, out, p.rf, id, "rf");
        if (p.cf > 0) C(input, out, p.cf, id, "cf");
        if (p.cin > 0) C(input, GND, p.cin, id, "cin");
        amp(id, ref(`${id}:ref`, p.vref, id), input, out, node.part);
        outputOf.set(id, out);
        break;
      }
      case "differenceAmp": {
        // E− → leg → r1 → (−), r2 out→(−); E+ → leg → r3 → (+), r4 (+)→vref
        const p = node.params;
        const d = diffOf.get(inId!)!;
        const n = `${id}:n`;
        const pl = `${id}:p`;
        R(d.m, n, p.r1, id, "r1");
        R(n, out, p.r2, id, "r2");
        R(d.p, pl, p.r3, id, "r3");
        R(pl, ref(`${id}:ref`, p.vref, id), p.r4, id, "r4");
        amp(id, pl, n, out, node.part);
        outputOf.set(id, out);
        break;
      }
      case "inAmp": {
        // A1, A2 buffer E+, E−; rf from each output to its (−); rg between the (−) nodes;
        // A3: o2 → rd → (−), rd out→(−); o1 → rd → (+), rd (+)→vref. All three of the one part.
        const p = node.params;
        const d = diffOf.get(inId!)!;
        const [o1, o2, n1, n2, n3, p3] = ["o1", "o2", "n1", "n2", "n3", "p3"].map((x) => `${id}:${x}`);
        R(o1, n1, p.rf, id, "rf1");
        R(o2, n2, p.rf, id, "rf2");
        R(n1, n2, p.rg, id, "rg");
        amp(id, d.p, n1, o1, node.part);
        amp(id, d.m, n2, o2, node.part);
        R(o2, n3, p.rd, id, "rd1");
        R(n3, out, p.rd, id, "rd2");
        R(o1, p3, p.rd, id, "rd3");
        R(p3, ref(`${id}:ref`, p.vref, id), p.rd, id, "rd4");
        amp(id, p3, n3, out, node.part);
        outputOf.set(id, out);
        break;
      }
      case "inverting": {
        const p = node.params;
        const n = `${id}:n`;
        R(input, n, p.r1, id, "r1");
        R(n, out, p.r2, id, "r2");
        amp(id, ref(`${id}:ref`, p.vref, id), n, out, node.part);
        outputOf.set(id, out);
        break;
      }
      case "noninverting": {
        const p = node.params;
        let n = out;
        if (p.rf !== null) {
          n = `${id}:n`;
          R(out, n, p.rf, id, "rf");
          if (p.rg !== null) R(n, ref(`${id}:ref`, p.vref, id), p.rg, id, "rg");
        }
        amp(id, input, n, out, node.part);
        outputOf.set(id, out);
        break;
      }
      case "lossyIntegrator": {
        const p = node.params;
        const n = `${id}:n`;
        R(input, n, p.r1, id, "r1");
        R(n, out, p.r2, id, "r2");
        C(n, out, p.c2, id, "c2");
        amp(id, ref(`${id}:ref`, p.vref, id), n, out, node.part);
        outputOf.set(id, out);
        break;
      }
      case "integrator": {
        const p = node.params;
        const n = `${id}:n`;
        R(input, n, p.r1, id, "r1");
        C(n, out, p.c2, id, "c2");
        if (dcMode) {
          // No DC feedback path: the output is unbounded. A 0 V stand-in in place of the
          // op-amp keeps the matrix regular; everything from here on is reported unbounded.
          ref(out, 0, id);
        } else {
          amp(id, ref(`${id}:ref`, p.vref, id), n, out, node.part);
        }
        dcUnbounded.add(id);
        outputOf.set(id, out);
        break;
      }
      case "rcLowpass": {
        R(input, out, node.params.r, id, "r");
        C(out, GND, node.params.c, id, "c");
        outputOf.set(id, out);
        break;
      }
      case "rcHighpass": {
        const p = node.params;
        C(input, out, p.c, id, "c");
        R(out, ref(`${id}:bias`, p.vbias, id), p.r, id, "r");
        outputOf.set(id, out);
        break;
      }
      case "sallenKeyLowpass": {
        const p = node.params;
        const a = `${id}:a`;
        const pl = `${id}:p`;
        R(input, a, p.r1, id, "r1");
        R(a, pl, p.r2, id, "r2");
        C(a, out, p.c1, id, "c1");
        C(pl, ref(`${id}:ref`, p.vref, id), p.c2, id, "c2");
        amp(id, pl, skMinus(id, out, p), out, node.part);
        outputOf.set(id, out);
        break;
      }
      // filters: Sallen-Key high-pass and MFB high-pass, from the topology of lib/chain/README.md
      case "sallenKeyHighpass": {
        const p = node.params;
        const a = `${id}:a`;
        const pl = `${id}:p`;
        C(input, a, p.c1, id, "c1");
        C(a, pl, p.c2, id, "c2");
        R(a, out, p.r1, id, "r1");
        R(pl, ref(`${id}:ref`, p.vref, id), p.r2, id, "r2");
        amp(id, pl, skMinus(id, out, p), out, node.part);
        outputOf.set(id, out);
        break;
      }
      case "mfbHighpass": {
        const p = node.params;
        const a = `${id}:a`;
        const n = `${id}:n`;
        const vr = ref(`${id}:ref`, p.vref, id);
        C(input, a, p.c1, id, "c1");
        R(a, vr, p.r1, id, "r1");
        C(a, out, p.c2, id, "c2");
        C(a, n, p.c3, id, "c3");
        R(n, out, p.r2, id, "r2");
        amp(id, vr, n, out, node.part);
        outputOf.set(id, out);
        break;
      }
      case "mfbLowpass": {
        const p = node.params;
        const a = `${id}:a`;
        const n = `${id}:n`;
        R(input, a, p.r1, id, "r1");
        C(a, GND, p.c1, id, "c1");
        R(a, out, p.r2, id, "r2");
        R(a, n, p.r3, id, "r3");
        C(n, out, p.c2, id, "c2");
        amp(id, ref(`${id}:ref`, p.vref, id), n, out, node.part);
        outputOf.set(id, out);
        break;
      }
      case "adc": {
        if (node.params.inputResistance !== null) R(input, GND, node.params.inputResistance, id, "inputResistance", false);
        outputOf.set(id, input);
        break;
      }
    }
  }
  const names: string[] = [];
  const index = new Map<string, number>();
  const addNode = (n: string) => {
    if (n === GND || index.has(n)) return;
    index.set(n, names.length);
    names.push(n);
  };
  for (const el of elements) {
    if (el.kind === "R" || el.kind === "C") {
      addNode(el.a);
      addNode(el.b);
    } else if (el.kind === "V") addNode(el.p);
    else if (el.kind === "E") {
      addNode(el.p);
      el.terms.forEach((t) => addNode(t.node));
    } else if (el.kind === "G") {
      addNode(el.into);
      addNode(el.ctrl);
    } else {
      addNode(el.p);
      addNode(el.n);
      addNode(el.out);
    }
  }
  const extra = new Map<Element, number>();
  let k = names.length;
  for (const el of elements) if (el.kind === "V" || el.kind === "opamp" || el.kind === "E") extra.set(el, k++);
  return { chain, elements, nodes: names, index, size: k, extra, outputOf, opamps, stageOpamps, dcUnbounded, dcMode };
}

/** 1/A(s) of the single-pole op-amp model (chain-format.md), s = j·ω; 0 for an ideal op-amp. */
export function inverseGain(part: Part, s: Cx): Cx {
  let inv = cx(0, 0);
  if (part.aol !== undefined && part.aol > 0) inv = inv.add(cx(1 / part.aol, 0));
  if (part.gbw !== undefined && part.gbw > 0) inv = inv.add(s.div(2 * Math.PI * part.gbw));
  return inv;
}

/** The MNA matrix at complex frequency s (rad/s). */
export function assemble(net: Net, s: Cx): Cx[][] {
  const n = net.size;
  const A: Cx[][] = Array.from({ length: n }, () => Array.from({ length: n }, () => cx(0, 0)));
  const at = (node: string) => (node === GND ? -1 : net.index.get(node)!);
  const add = (i: number, j: number, v: Cx) => {
    if (i >= 0 && j >= 0) A[i][j] = A[i][j].add(v);
  };
  const stampY = (a: string, b: string, y: Cx) => {
    const i = at(a);
    const j = at(b);
    add(i, i, y);
    add(j, j, y);
    add(i, j, y.neg());
    add(j, i, y.neg());
  };
  for (const el of net.elements) {
    if (el.kind === "R") stampY(el.a, el.b, cx(1 / el.r, 0));
    else if (el.kind === "C") stampY(el.a, el.b, s.mul(el.c));
    else if (el.kind === "V") {
      const k = net.extra.get(el)!;
      const p = at(el.p);
      add(p, k, cx(1, 0));
      add(k, p, cx(1, 0));
    } else if (el.kind === "E") {
      // row: V(p) − Σ gain·V(node) = 0; its current leaves p's KCL like a source's
      const k = net.extra.get(el)!;
      const p = at(el.p);
      add(p, k, cx(1, 0));
      add(k, p, cx(1, 0));
      for (const t of el.terms) add(k, at(t.node), cx(-t.gain, 0));
    } else if (el.kind === "G") {
      // g·V(ctrl) flows into `into`: on the left of its KCL (currents leaving) as −g·V(ctrl)
      add(at(el.into), at(el.ctrl), el.derivative ? s.neg() : cx(-1, 0));
    } else {
      const k = net.extra.get(el)!;
      add(at(el.out), k, cx(1, 0));
      add(k, at(el.out), inverseGain(el.part, s));
      add(k, at(el.p), cx(-1, 0));
      add(k, at(el.n), cx(1, 0));
    }
  }
  return A;
}

export function jw(f: number): Cx {
  return cx(0, 2 * Math.PI * f);
}

type MathMatrix = import("mathjs").MathArray;

/**
 * Solve A·x = b with mathjs: the matrix goes in as a mathjs SparseMatrix, is factored by
 * `math.slu` (column ordering 3, threshold 1 = partial pivoting) and solved by
 * `math.lusolve`. The dense `math.lusolve(A, b)` gives the same numbers (checked in the
 * self-test) but is several times slower on the 30–40 unknowns of a long chain.
 * Returns null for a singular or non-finite system.
 */
export function solve(A: Cx[][], b: Cx[], dense = false): Cx[] | null {
  try {
    const rhs = b.map((v) => [v]) as unknown as MathMatrix;
    const x = dense
      ? lusolve(A as unknown as MathMatrix, rhs)
      : lusolve(slu(sparse(A as unknown as MathMatrix), 3, 1), rhs);
    const rows = (Array.isArray(x) ? x : (x as unknown as { toArray(): unknown[] }).toArray()) as (Cx | number)[][];
    const flat = rows.map(([v]) => (typeof v === "number" ? cx(v) : v));
    if (flat.some((v) => !Number.isFinite(v.re) || !Number.isFinite(v.im))) return null;
    return flat;
  } catch {
    return null;
  }
}

/**
 * Adjoint vector y with y·b = voltage of `node` for any right-hand side b.
 * Returns null when the network is singular at s.
 */
export function adjoint(net: Net, s: Cx, node: string): Cx[] | null {
  const A = assemble(net, s);
  const e = Array.from({ length: net.size }, () => cx(0, 0));
  if (node === GND) return e;
  e[net.index.get(node)!] = cx(1, 0);
  return solve(A.map((_, i) => A.map((row) => row[i])), e);
}

/** A noise or offset source as an MNA right-hand side: one unit of it. */
export type Injection =
  | { type: "emf" }
  | { type: "series"; opamp: OpAmp } // voltage in series with (+)
  | { type: "current"; a: string; b: string } // unit current from b into a through the source
  | { type: "ref"; source: VSource };

export function weight(net: Net, y: Cx[], inj: Injection): Cx {
  const idx = (node: string) => (node === GND ? -1 : net.index.get(node)!);
  switch (inj.type) {
    case "emf": {
      const v = net.elements.find((el): el is VSource => el.kind === "V" && el.role === "emf")!;
      return y[net.extra.get(v)!];
    }
    case "series":
      return y[net.extra.get(inj.opamp)!];
    case "ref":
      return y[net.extra.get(inj.source)!];
    case "current": {
      let w = cx(0, 0);
      const i = idx(inj.a);
      const j = idx(inj.b);
      if (i >= 0) w = w.add(y[i]);
      if (j >= 0) w = w.sub(y[j]);
      return w;
    }
  }
}

/**
 * Every unknown for a unit source EMF at frequency f (one forward solve), memoised per
 * net and frequency: band searches ask for many nodes at the same grid frequencies.
 */
const forwardCache = new WeakMap<Net, Map<number, Cx[] | null>>();
export function forward(net: Net, f: number): Cx[] | null {
  let m = forwardCache.get(net);
  if (!m) forwardCache.set(net, (m = new Map()));
  if (m.has(f)) return m.get(f)!;
  const emf = net.elements.find((el): el is VSource => el.kind === "V" && el.role === "emf")!;
  const b = Array.from({ length: net.size }, () => cx(0, 0));
  b[net.extra.get(emf)!] = cx(1, 0);
  const x = solve(assemble(net, jw(f)), b);
  m.set(f, x);
  return x;
}

/** Voltage at a net node over the source EMF at frequency f (Hz): the reference H. */
export function transfer(net: Net, f: number, node: string): Cx | null {
  const y = adjoint(net, jw(f), node);
  return y ? weight(net, y, { type: "emf" }) : null;
}

/** The reference response from the source EMF to a chain node's output (ADC: its pin). */
export function responseAt(chain: Chain, nodeId: string, f: number): Cx {
  const net = buildNet(chain);
  const h = transfer(net, f, net.outputOf.get(nodeId)!);
  if (!h) throw new Error(`reference network singular at ${f} Hz`);
  return h;
}
