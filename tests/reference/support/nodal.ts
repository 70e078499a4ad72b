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
export type Element = Resistor | Capacitor | VSource | OpAmp;

export interface Net {
  chain: Chain;
  elements: Element[];
  /** net node names in unknown order (ground excluded) */
  nodes: string[];
  index: Map<string, number>;
  /** number of unknowns */
  size: number;
  /** row/column of each voltage source and op-amp, keyed by the element object */
  extra: Map<Element, number>;
  /** chain node id → net node holding its output (an ADC maps to its input pin) */
  outputOf: Map<string, string>;
  /** op-amp stage id → its op-amp element */
  opamps: Map<string, OpAmp>;
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
]);

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
    if (inId !== undefined && dcUnbounded.has(inId)) dcUnbounded.add(id);
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
    else {
      addNode(el.p);
      addNode(el.n);
      addNode(el.out);
    }
  }
  const extra = new Map<Element, number>();
  let k = names.length;
  for (const el of elements) if (el.kind === "V" || el.kind === "opamp") extra.set(el, k++);
  return { chain, elements, nodes: names, index, size: k, extra, outputOf, opamps, dcUnbounded, dcMode };
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
