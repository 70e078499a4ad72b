/**
 * The straightforward path: at each frequency, nodal analysis of the network with complex.js numbers.
 *
 * Written independently of the fast path: no closed-form stage formulas and no two-port algebra. Each
 * chain node contributes its elements (resistors, capacitors, an op-amp) exactly as drawn in
 * chain-format.md's table; every segment of the network driven by one ideal voltage source (the source
 * EMF or an op-amp output) is solved as one admittance system Y·V = J by Gaussian elimination with partial
 * pivoting. The op-amp output row is replaced by its constraint Vo = A(s)·(V+ + en − V−), or V+ + en = V−
 * for an ideal op-amp. The op-amp outputs found in one segment drive the segments below it.
 *
 * It serves the agreement tests (fast path against this one, 1e-9) and the benchmark; per point it
 * allocates complex.js objects, so it is far slower than compile-chain.ts.
 * Units: s = j·2π·f in rad/s; SI values.
 */
import Complex from "complex.js";
import type { Chain, ChainNode, Part } from "../chain/types";
import { isSourceKind } from "../chain/types";
import { sourceSignal } from "./sensors";
import { buildTopology, isOpAmpKind } from "./topology";

const GROUND = "0";
const EMF = "emf";

type Element =
  | { t: "R"; a: string; b: string; r: number; key?: string }
  | { t: "C"; a: string; b: string; c: number }
  | { t: "OA"; p: string; m: string; o: string; part: Part | undefined; stage: string }
  // the sensor current into `node` (a photodiode's i, a piezo's s·q), per unit of the source's output
  | { t: "I"; node: string; charge: boolean };

/** Something that excites the network, named like the fast path's transfer sources. */
export type Excitation =
  | { t: "emf" }
  | { t: "series"; key: string } // the Johnson voltage of a resistor, in series with it
  | { t: "pin"; node: string } // a current drawn from `node` by an op-amp pin
  | { t: "en"; stage: string } // a voltage in series with a stage's (+) input
  | { t: "known"; node: string } // a reference node (vref, vbias) at 1 V
  | { t: "cm" }; // the common-mode voltage of a differential pair at 1 V on both legs

interface Segment {
  root: string;
  elements: Element[];
}

interface RefNetwork {
  segments: Segment[];
  prepared: PreparedSegment[];
  /** segment index by the name of its root */
  byRoot: Map<string, number>;
  /** for each segment, the roots of the segments it drives */
  childRoots: string[][];
  /** known node values at DC (vref, vbias); all are 0 for AC */
  dcKnown: Map<string, number>;
  /** the point where each node's output (ADC: its input pin) is read, and each stage's (+) pin */
  outPoint: Map<string, string>;
  plusPoint: Map<string, string>;
  inPoint: Map<string, string>;
  sourceId: string;
  sourceIsEmf: boolean;
  /** the legs of a differential source (E+ = vcm + Vd/2, E− = vcm − Vd/2), or null */
  pair: { pos: string; neg: string } | null;
  /** excitations of the sensor stages' own elements, by transfer-source key */
  special: Map<string, Excitation>;
}

function buildNetwork(chain: Chain): RefNetwork {
  const topo = buildTopology(chain);
  const src = topo.nodes[0];
  if (!isSourceKind(src.kind)) throw new Error("first node must be the source");
  const sig = sourceSignal(src);
  const special = new Map<string, Excitation>();
  const firstKind = topo.children[0].length ? topo.nodes[topo.children[0][0]].kind : null;
  const norton = sig.shunt !== null && firstKind !== "transimpedance" && firstKind !== "chargeAmp";
  const rs = src.kind === "source" ? sig.resistance : 0;
  const outPoint = new Map<string, string>();
  const plusPoint = new Map<string, string>();
  const inPoint = new Map<string, string>();
  const dcKnown = new Map<string, number>();
  // which segment root drives each point
  const rootOf = new Map<string, string>();
  const segments: Segment[] = [{ root: EMF, elements: [] }];
  const byRoot = new Map<string, number>([[EMF, 0]]);
  const sourceIsEmf = !(rs > 0) && !norton;
  const srcPoint = sourceIsEmf ? EMF : src.id;
  outPoint.set(src.id, srcPoint);
  rootOf.set(srcPoint, EMF);
  if (rs > 0) segments[0].elements.push({ t: "R", a: EMF, b: src.id, r: rs, key: `${src.id}:resistance` });
  if (norton) {
    // the sensor current into its own shunt, loaded by what it feeds
    const sh = sig.shunt!;
    segments[0].elements.push(
      { t: "I", node: src.id, charge: sig.output === "charge" },
      { t: "R", a: src.id, b: GROUND, r: sh.r },
      { t: "C", a: src.id, b: GROUND, c: sh.c },
    );
  }
  const pair = sig.output === "differential" ? { pos: `${src.id}.pos`, neg: `${src.id}.neg` } : null;
  if (pair) {
    dcKnown.set(pair.pos, sig.vcm + sig.dc / 2);
    dcKnown.set(pair.neg, sig.vcm - sig.dc / 2);
  }
  const leg = pair ? sig.resistance / 2 : 0;

  const partOf = (node: ChainNode): Part | undefined => {
    const key = "part" in node ? node.part : null;
    return key ? chain.parts[key] : undefined;
  };

  for (let i = 1; i < topo.nodes.length; i++) {
    const node = topo.nodes[i];
    const vin = outPoint.get(topo.nodes[topo.parent[i]].id)!;
    inPoint.set(node.id, vin);
    const seg = segments[byRoot.get(rootOf.get(vin)!)!];
    const id = node.id;
    const el = seg.elements;
    const R = (a: string, b: string, r: number, name: string) => el.push({ t: "R", a, b, r, key: `${id}:${name}` });
    const C = (a: string, b: string, c: number) => el.push({ t: "C", a, b, c });
    const vref = `${id}.vref`;
    const a = `${id}.a`;
    const m = `${id}.m`;
    const p = `${id}.p`;
    // a Sallen-Key section's gain network: rf output→(−), rg vref→(−); without rf, (−) is the output
    const gainNet = (g: { rf?: number | null; rg?: number | null }) => {
      if (g.rf == null) return id;
      R(id, m, g.rf, "rf");
      if (g.rg != null) R(vref, m, g.rg, "rg");
      return m;
    };
    /** the pair's legs into this stage: E± behind half the differential resistance each */
    const legs = (sid: string) => {
      if (!pair) throw new Error(`${sid} needs a differential source`);
      if (!(leg > 0)) return { P: pair.pos, N: pair.neg };
      const P = `${sid}.P`;
      const N = `${sid}.N`;
      R(pair.pos, P, leg, "leg+");
      R(pair.neg, N, leg, "leg-");
      return { P, N };
    };
    if (isOpAmpKind(node.kind)) {
      outPoint.set(id, id);
      rootOf.set(id, id);
      byRoot.set(id, segments.length);
      segments.push({ root: id, elements: [] });
    }
    switch (node.kind) {
      case "inverting":
      case "lossyIntegrator":
      case "integrator": {
        // r1 into (−); feedback r2 and/or c2 from the output to (−); (+) at vref
        R(vin, m, node.params.r1, "r1");
        if ("r2" in node.params) R(id, m, node.params.r2, "r2");
        if ("c2" in node.params) C(id, m, node.params.c2);
        el.push({ t: "OA", p: vref, m, o: id, part: partOf(node), stage: id });
        dcKnown.set(vref, node.params.vref);
        plusPoint.set(id, vref);
        break;
      }
      case "noninverting": {
        const { rf, rg } = node.params;
        // rf null: (−) wired straight to the output
        const minus = rf === null ? id : m;
        if (rf !== null) R(id, m, rf, "rf");
        if (rg !== null) R(vref, minus, rg, "rg");
        el.push({ t: "OA", p: vin, m: minus, o: id, part: partOf(node), stage: id });
        dcKnown.set(vref, node.params.vref);
        plusPoint.set(id, vin);
        break;
      }
      case "sallenKeyLowpass":
        R(vin, a, node.params.r1, "r1");
        R(a, p, node.params.r2, "r2");
        C(a, id, node.params.c1);
        C(p, vref, node.params.c2);
        el.push({ t: "OA", p, m: gainNet(node.params), o: id, part: partOf(node), stage: id });
        dcKnown.set(vref, node.params.vref);
        plusPoint.set(id, p);
        break;
      // filters: Sallen-Key high-pass and MFB high-pass
      case "sallenKeyHighpass":
        C(vin, a, node.params.c1);
        C(a, p, node.params.c2);
        R(a, id, node.params.r1, "r1");
        R(p, vref, node.params.r2, "r2");
        el.push({ t: "OA", p, m: gainNet(node.params), o: id, part: partOf(node), stage: id });
        dcKnown.set(vref, node.params.vref);
        plusPoint.set(id, p);
        break;
      case "mfbHighpass":
        C(vin, a, node.params.c1);
        R(a, vref, node.params.r1, "r1");
        C(a, id, node.params.c2);
        C(a, m, node.params.c3);
        R(id, m, node.params.r2, "r2");
        el.push({ t: "OA", p: vref, m, o: id, part: partOf(node), stage: id });
        dcKnown.set(vref, node.params.vref);
        plusPoint.set(id, vref);
        break;
      case "mfbLowpass":
        R(vin, a, node.params.r1, "r1");
        C(a, GROUND, node.params.c1);
        R(id, a, node.params.r2, "r2");
        R(a, m, node.params.r3, "r3");
        C(m, id, node.params.c2);
        el.push({ t: "OA", p: vref, m, o: id, part: partOf(node), stage: id });
        dcKnown.set(vref, node.params.vref);
        plusPoint.set(id, vref);
        break;
      case "rcLowpass":
        R(vin, id, node.params.r, "r");
        C(id, GROUND, node.params.c);
        outPoint.set(id, id);
        rootOf.set(id, rootOf.get(vin)!);
        break;
      case "rcHighpass": {
        const vb = `${id}.vbias`;
        C(vin, id, node.params.c);
        R(vb, id, node.params.r, "r");
        dcKnown.set(vb, node.params.vbias);
        outPoint.set(id, id);
        rootOf.set(id, rootOf.get(vin)!);
        break;
      }
      case "adc":
        if (node.params.inputResistance !== null) R(vin, GROUND, node.params.inputResistance, "rin");
        outPoint.set(id, vin);
        break;
      case "transimpedance":
      case "chargeAmp": {
        // the sensor current into (−) with the sensor's shunt; rf ∥ cf feedback; (+) at vref
        const sh = sig.shunt!;
        el.push({ t: "I", node: m, charge: sig.output === "charge" });
        el.push({ t: "R", a: m, b: GROUND, r: sh.r });
        C(m, GROUND, sh.c);
        if (node.params.cin > 0) C(m, GROUND, node.params.cin);
        R(id, m, node.params.rf, "rf");
        if (node.params.cf > 0) C(id, m, node.params.cf);
        el.push({ t: "OA", p: vref, m, o: id, part: partOf(node), stage: id });
        dcKnown.set(vref, node.params.vref);
        plusPoint.set(id, vref);
        break;
      }
      case "differenceAmp": {
        const { P, N } = legs(id);
        R(N, m, node.params.r1, "r1");
        R(id, m, node.params.r2, "r2");
        R(P, p, node.params.r3, "r3");
        R(vref, p, node.params.r4, "r4");
        el.push({ t: "OA", p, m, o: id, part: partOf(node), stage: id });
        dcKnown.set(vref, node.params.vref);
        plusPoint.set(id, p);
        special.set(`${id}:in+`, { t: "pin", node: p });
        special.set(`${id}:vcm`, { t: "cm" });
        break;
      }
      case "inAmp": {
        const { P, N } = legs(id);
        const { rf, rg, rd } = node.params;
        const o1 = `${id}.o1`;
        const o2 = `${id}.o2`;
        const b = `${id}.b`;
        const p3 = `${id}.p3`;
        const m3 = `${id}.m3`;
        el.push({ t: "OA", p: P, m: a, o: o1, part: partOf(node), stage: `${id}#1` });
        el.push({ t: "OA", p: N, m: b, o: o2, part: partOf(node), stage: `${id}#2` });
        R(o1, a, rf, "rf1");
        R(o2, b, rf, "rf2");
        R(a, b, rg, "rg");
        R(o1, p3, rd, "rd1");
        R(vref, p3, rd, "rd2");
        R(o2, m3, rd, "rd3");
        R(id, m3, rd, "rd4");
        el.push({ t: "OA", p: p3, m: m3, o: id, part: partOf(node), stage: `${id}#3` });
        dcKnown.set(vref, node.params.vref);
        plusPoint.set(id, P);
        const ex: [string, Excitation][] = [
          ["en1", { t: "en", stage: `${id}#1` }],
          ["en2", { t: "en", stage: `${id}#2` }],
          ["en3", { t: "en", stage: `${id}#3` }],
          ["in+1", { t: "pin", node: P }],
          ["in+2", { t: "pin", node: N }],
          ["in-1", { t: "pin", node: a }],
          ["in-2", { t: "pin", node: b }],
          ["in+3", { t: "pin", node: p3 }],
          ["in-3", { t: "pin", node: m3 }],
          ["vcm", { t: "cm" }],
        ];
        for (const [k, v] of ex) special.set(`${id}:${k}`, v);
        break;
      }
      case "source":
      case "bridge":
      case "photodiode":
      case "piezo":
      case "thermocouple":
        throw new Error("a chain has one source");
    }
  }
  // internal op-amp outputs of a stage (an in-amp's o1, o2) drive nothing beyond their own stage
  const childRoots = segments.map((s) =>
    s.elements.filter((e) => e.t === "OA" && byRoot.has(e.o)).map((e) => (e as { o: string }).o),
  );
  const prepared = segments.map((s) => prepareSegment(s, dcKnown));
  return { segments, prepared, byRoot, childRoots, dcKnown, outPoint, plusPoint, inPoint, sourceId: src.id, sourceIsEmf, pair, special };
}

/** 1/A(s) of the single-pole model, or null for an infinite gain; A itself for the zero-gain case. */
function openLoopAt(part: Part | undefined, s: Complex): { inv: Complex | null; a: Complex } {
  const aol = part?.aol;
  const gbw = part?.gbw;
  if (aol === 0 || gbw === 0) return { inv: null, a: new Complex(0, 0) };
  if (aol === undefined && gbw === undefined) return { inv: new Complex(0, 0), a: new Complex(Infinity, 0) };
  // 1/A = 1/aol + s/ωt (each term present only when its figure is given)
  let inv = new Complex(0, 0);
  if (aol !== undefined) inv = inv.add(1 / aol);
  if (gbw !== undefined) inv = inv.add(s.div(2 * Math.PI * gbw));
  return { inv, a: new Complex(1, 0).div(inv) };
}

/** Solves A·x = b in place (Gaussian elimination, partial pivoting). Returns null if singular. */
function solveLinear(A: Complex[][], b: Complex[]): Complex[] | null {
  const k = b.length;
  let scaleMax = 0;
  for (const row of A) for (const v of row) scaleMax = Math.max(scaleMax, v.abs());
  for (let col = 0; col < k; col++) {
    let piv = col;
    let best = A[col][col].abs();
    for (let r = col + 1; r < k; r++) {
      const v = A[r][col].abs();
      if (v > best) {
        best = v;
        piv = r;
      }
    }
    if (!(best > scaleMax * 1e-15)) return null;
    if (piv !== col) {
      [A[piv], A[col]] = [A[col], A[piv]];
      [b[piv], b[col]] = [b[col], b[piv]];
    }
    for (let r = col + 1; r < k; r++) {
      if (A[r][col].isZero()) continue;
      const f = A[r][col].div(A[col][col]);
      for (let c = col; c < k; c++) A[r][c] = A[r][c].sub(f.mul(A[col][c]));
      b[r] = b[r].sub(f.mul(b[col]));
    }
  }
  const x: Complex[] = new Array(k);
  for (let r = k - 1; r >= 0; r--) {
    let acc = b[r];
    for (let c = r + 1; c < k; c++) acc = acc.sub(A[r][c].mul(x[c]));
    x[r] = acc.div(A[r][r]);
  }
  return x;
}

/** A segment's unknowns, indexed once per chain (the per-frequency work is stamping and solving). */
interface PreparedSegment {
  seg: Segment;
  unknowns: string[];
  idx: Map<string, number>;
  /** rows of op-amp outputs: their KCL is replaced by the op-amp constraint */
  opRows: Set<number>;
}

function prepareSegment(seg: Segment, dcKnown: Map<string, number>): PreparedSegment {
  const unknowns: string[] = [];
  const idx = new Map<string, number>();
  const note = (x: string) => {
    if (x === GROUND || x === seg.root || dcKnown.has(x) || idx.has(x)) return;
    idx.set(x, unknowns.length);
    unknowns.push(x);
  };
  for (const e of seg.elements) {
    if (e.t === "OA") [e.p, e.m, e.o].forEach(note);
    else if (e.t === "I") note(e.node);
    else [e.a, e.b].forEach(note);
  }
  const opRows = new Set<number>();
  for (const e of seg.elements) if (e.t === "OA" && idx.has(e.o)) opRows.add(idx.get(e.o)!);
  return { seg, unknowns, idx, opRows };
}

/**
 * Solves one segment at s with its root at `rootV`, the reference nodes at `known`, and the excitation.
 * Returns the voltages of its unknown nodes (in `unknowns` order), or null if the system is singular.
 */
function solveSegment(
  ps: PreparedSegment,
  s: Complex,
  rootV: Complex,
  known: (node: string) => Complex,
  ex: Excitation | null,
): Complex[] | null {
  const { seg, idx, opRows } = ps;
  const k = ps.unknowns.length;
  const value = (x: string) => (x === seg.root ? rootV : x === GROUND ? new Complex(0, 0) : known(x));
  const A: Complex[][] = Array.from({ length: k }, () => Array.from({ length: k }, () => new Complex(0, 0)));
  const J: Complex[] = Array.from({ length: k }, () => new Complex(0, 0));

  // admittance y between a and b
  const stamp = (a: string, b: string, y: Complex) => {
    const ia = idx.get(a);
    const ib = idx.get(b);
    if (ia !== undefined && !opRows.has(ia)) {
      A[ia][ia] = A[ia][ia].add(y);
      if (ib !== undefined) A[ia][ib] = A[ia][ib].sub(y);
      else J[ia] = J[ia].add(y.mul(value(b)));
    }
    if (ib !== undefined && !opRows.has(ib)) {
      A[ib][ib] = A[ib][ib].add(y);
      if (ia !== undefined) A[ib][ia] = A[ib][ia].sub(y);
      else J[ib] = J[ib].add(y.mul(value(a)));
    }
  };
  const inject = (x: string, amount: Complex) => {
    const i = idx.get(x);
    if (i !== undefined && !opRows.has(i)) J[i] = J[i].add(amount);
  };
  for (const e of seg.elements) {
    if (e.t === "R") {
      const g = new Complex(1 / e.r, 0);
      stamp(e.a, e.b, g);
      if (ex?.t === "series" && ex.key === e.key) {
        // a unit voltage in series, a→b: a current g from a to b
        inject(e.a, g.neg());
        inject(e.b, g);
      }
    } else if (e.t === "C") {
      stamp(e.a, e.b, s.mul(e.c));
    }
  }
  if (ex?.t === "pin") inject(ex.node, new Complex(-1, 0));
  if (ex?.t === "emf") {
    for (const e of seg.elements) if (e.t === "I") inject(e.node, e.charge ? s : new Complex(1, 0));
  }
  for (const e of seg.elements) {
    if (e.t !== "OA") continue;
    const row = idx.get(e.o);
    if (row === undefined) continue;
    const en = ex?.t === "en" && ex.stage === e.stage ? 1 : 0;
    const { inv, a } = openLoopAt(e.part, s);
    // row: Vo·(1/A) − V+ + V− = en   (ideal: 1/A = 0);  zero gain: Vo = 0
    const put = (x: string, coef: Complex) => {
      const i = idx.get(x);
      if (i !== undefined) A[row][i] = A[row][i].add(coef);
      else J[row] = J[row].sub(coef.mul(value(x)));
    };
    if (inv === null) {
      put(e.o, new Complex(1, 0));
      continue;
    }
    if (a.isFinite()) put(e.o, inv);
    put(e.p, new Complex(-1, 0));
    put(e.m, new Complex(1, 0));
    J[row] = J[row].add(en);
  }
  return solveLinear(A, J);
}

export interface ReferenceSolution {
  /** voltage at every named point (per unit of the excitation); missing where the network is singular */
  voltages: Map<string, Complex>;
  singular: boolean;
}

function solveAll(net: RefNetwork, fHz: number, ex: Excitation, dcValues: boolean): ReferenceSolution {
  const s = new Complex(0, 2 * Math.PI * fHz);
  const known = (x: string): Complex => {
    if (ex.t === "known" && ex.node === x) return new Complex(1, 0);
    if (net.pair && (x === net.pair.pos || x === net.pair.neg)) {
      const half = x === net.pair.pos ? 0.5 : -0.5;
      return new Complex((ex.t === "emf" ? half : 0) + (ex.t === "cm" ? 1 : 0) + (dcValues ? net.dcKnown.get(x)! : 0), 0);
    }
    return new Complex(dcValues ? (net.dcKnown.get(x) ?? 0) : 0, 0);
  };
  const voltages = new Map<string, Complex>();
  let singular = false;
  const visit = (segIdx: number, rootV: Complex) => {
    const ps = net.prepared[segIdx];
    voltages.set(ps.seg.root, rootV);
    const x = solveSegment(ps, s, rootV, known, ex);
    if (!x) {
      singular = true;
      return;
    }
    ps.unknowns.forEach((u, i) => voltages.set(u, x[i]));
    for (const r of net.childRoots[segIdx]) visit(net.byRoot.get(r)!, voltages.get(r)!);
  };
  visit(0, new Complex(ex.t === "emf" ? 1 : 0, 0));
  return { voltages, singular };
}

/** Response of every node (cumulative over the EMF, and its own transfer) at the given frequencies. */
export function referenceResponse(
  chain: Chain,
  freqsHz: number[],
): Map<string, { cum: (Complex | null)[]; ind: (Complex | null)[] }> {
  const net = buildNetwork(chain);
  const topo = buildTopology(chain);
  const out = new Map<string, { cum: (Complex | null)[]; ind: (Complex | null)[] }>();
  for (const node of topo.nodes) out.set(node.id, { cum: [], ind: [] });
  for (const f of freqsHz) {
    const { voltages } = solveAll(net, f, { t: "emf" }, false);
    for (const node of topo.nodes) {
      const r = out.get(node.id)!;
      const vo = voltages.get(net.outPoint.get(node.id)!) ?? null;
      r.cum.push(vo);
      if (isSourceKind(node.kind)) r.ind.push(vo);
      else if (node.kind === "adc") r.ind.push(new Complex(1, 0));
      else {
        const vi = voltages.get(net.inPoint.get(node.id)!) ?? null;
        r.ind.push(vo && vi ? vo.div(vi) : null);
      }
    }
  }
  return out;
}

/** Excitation for a transfer-source key of the fast path (`node:element`). */
function excitationFor(net: RefNetwork, chain: Chain, key: string): Excitation | null {
  const [id, element] = key.split(":");
  const node = chain.nodes.find((x) => x.id === id);
  if (!node) return null;
  const special = net.special.get(key);
  if (special) return special;
  if (element === "cm-error") return null; // an error referred to the output, with no element of its own
  if (element === "emf") return { t: "emf" };
  if (element === "en") return { t: "en", stage: id };
  if (element === "vref") return { t: "known", node: `${id}.vref` };
  if (element === "in+") return { t: "pin", node: net.plusPoint.get(id)! };
  if (element === "in-") {
    const rfAbsent =
      (node.kind === "noninverting" || node.kind === "sallenKeyLowpass" || node.kind === "sallenKeyHighpass") &&
      node.params.rf == null;
    const minus = rfAbsent ? id : `${id}.m`;
    return { t: "pin", node: minus };
  }
  return { t: "series", key };
}

/**
 * Transfer from one source (named as in CompiledChain.sources) to a node's output point (ADC: input pin)
 * or, with `plus`, to an op-amp stage's (+) pin, at fHz (0 = DC, capacitors open). Null if singular.
 */
export function referenceTransfer(chain: Chain, key: string, nodeId: string, plus: boolean, fHz: number): Complex | null {
  const net = buildNetwork(chain);
  const ex = excitationFor(net, chain, key);
  if (!ex) return null;
  const { voltages, singular } = solveAll(net, fHz, ex, false);
  if (singular) return null;
  const point = plus ? net.plusPoint.get(nodeId) : net.outPoint.get(nodeId);
  if (!point) return null;
  if (point.endsWith(".vref")) return new Complex(ex.t === "known" && ex.node === point ? 1 : 0, 0);
  if (net.pair && (point === net.pair.pos || point === net.pair.neg)) {
    const half = point === net.pair.pos ? 0.5 : -0.5;
    return new Complex((ex.t === "emf" ? half : 0) + (ex.t === "cm" ? 1 : 0), 0);
  }
  return voltages.get(point) ?? new Complex(0, 0);
}
