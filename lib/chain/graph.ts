/**
 * The graph rules of chain-format.md ("Graph") and the part references, checked on whatever the field
 * parser produced: every read here is defensive, so the rules are reported together with field errors
 * instead of hiding behind them.
 */
import {
  CURRENT_INPUT_KINDS,
  CURRENT_SOURCE_KINDS,
  DIFFERENTIAL_INPUT_KINDS,
  DIFFERENTIAL_SOURCE_KINDS,
  OPAMP_KINDS,
  isSourceKind,
  type NodeKind,
} from "./types";

export type Level = "complete" | "draft";

export interface RawIssue {
  path: (string | number)[];
  message: string;
}

interface NodeRef {
  index: number;
  id: string;
  kind: unknown;
}

export const isPlainObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === "object" && v !== null && !Array.isArray(v);

const q = (s: string) => JSON.stringify(s);

function listWords(items: string[]): string {
  return items.length <= 1 ? items.join("") : `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}`;
}

/**
 * Graph and reference issues of a chain-shaped value. At both levels: unique ids, edges naming existing
 * nodes, no edge into a source or out of an ADC, at most one input per node, no loops, `part` naming a
 * key of `parts`. At the complete level also: exactly one source and every node reachable from it.
 */
export function graphIssues(doc: unknown, level: Level): RawIssue[] {
  if (!isPlainObject(doc)) return [];
  const out: RawIssue[] = [];
  const nodes = Array.isArray(doc.nodes) ? doc.nodes : [];
  const edges = Array.isArray(doc.edges) ? doc.edges : [];

  const byId = new Map<string, NodeRef>();
  const refs: NodeRef[] = [];
  nodes.forEach((n, index) => {
    if (!isPlainObject(n) || typeof n.id !== "string") return;
    const ref: NodeRef = { index, id: n.id, kind: n.kind };
    const first = byId.get(n.id);
    if (first) {
      out.push({
        path: ["nodes", index, "id"],
        message: `repeats the id ${q(n.id)} of nodes[${first.index}]; ids must be unique`,
      });
      return;
    }
    byId.set(n.id, ref);
    refs.push(ref);
  });

  checkPartRefs(doc.parts, nodes, out);

  const parent = new Map<string, { from: string; edge: number }>();
  const children = new Map<string, string[]>();
  edges.forEach((e, k) => {
    if (!isPlainObject(e) || typeof e.from !== "string" || typeof e.to !== "string") return;
    const from = byId.get(e.from);
    const to = byId.get(e.to);
    if (!from) out.push({ path: ["edges", k, "from"], message: `names no node of this chain (${q(e.from)})` });
    if (!to) out.push({ path: ["edges", k, "to"], message: `names no node of this chain (${q(e.to)})` });
    if (!from || !to) return;
    if (from.id === to.id) {
      out.push({ path: ["edges", k], message: `joins ${q(from.id)} to itself; a chain has no loops` });
      return;
    }
    let ok = true;
    if (isSourceKind(to.kind)) {
      out.push({ path: ["edges", k, "to"], message: `leads into the source ${q(to.id)}; a source takes no input` });
      ok = false;
    }
    if (from.kind === "adc") {
      out.push({ path: ["edges", k, "from"], message: `leaves the ADC ${q(from.id)}; an ADC feeds nothing` });
      ok = false;
    }
    const earlier = parent.get(to.id);
    if (earlier) {
      out.push({
        path: ["edges", k, "to"],
        message: `gives ${q(to.id)} a second input (edges[${earlier.edge}] already feeds it); a node takes one input`,
      });
      ok = false;
    }
    const pairing = pairingProblem(from, to);
    if (pairing) {
      out.push({ path: ["edges", k, "to"], message: pairing });
      ok = false;
    }
    if (!ok) return;
    if (singleFeed(from.kind, to.kind) || singleFeed(from.kind, kindOfFirstChild(children.get(from.id), byId))) {
      const first = children.get(from.id);
      if (first && first.length) {
        out.push({
          path: ["edges", k, "from"],
          message: `gives ${q(from.id)} a second output; a ${String(from.kind)} source that feeds ${KIND_NOUN[String(to.kind)] ?? "a differential or current-input stage"} is wired to that one stage only`,
        });
        return;
      }
    }
    parent.set(to.id, { from: from.id, edge: k });
    const list = children.get(from.id);
    if (list) list.push(to.id);
    else children.set(from.id, [to.id]);
  });

  const inLoop = findLoops(refs, parent, out);

  if (level === "complete") {
    const sources = refs.filter((r) => isSourceKind(r.kind));
    if (sources.length === 0 && refs.length > 0) {
      out.push({ path: ["nodes"], message: "has no source; a chain starts at exactly one source" });
    } else if (sources.length > 1) {
      out.push({
        path: ["nodes"],
        message: `has ${sources.length} sources (${listWords(sources.map((s) => q(s.id)))}); a chain has exactly one`,
      });
    } else if (sources.length === 1) {
      const reached = reachableFrom(sources[0].id, children);
      for (const r of refs) {
        if (!reached.has(r.id) && !inLoop.has(r.id)) {
          out.push({
            path: ["nodes", r.index],
            message: `${q(r.id)} is not connected to the source ${q(sources[0].id)}; every node must be reachable from it`,
          });
        }
      }
    }
    if (nodes.length === 0) out.push({ path: ["nodes"], message: "is empty; a chain starts at exactly one source" });
  }
  return out;
}

const KIND_NOUN: Record<string, string> = {
  differenceAmp: "a difference amplifier",
  inAmp: "an instrumentation amplifier",
  transimpedance: "a transimpedance amplifier",
  chargeAmp: "a charge amplifier",
};
const has = (list: readonly unknown[], k: unknown) => list.includes(k);

/**
 * The sensor pairing rules (chain-format.md, "Sensor sources"): a differential pair (bridge,
 * thermocouple) feeds only a difference or instrumentation amplifier, and those take only a pair; a
 * transimpedance or charge amplifier takes its current straight from a photodiode or piezo element.
 */
function pairingProblem(from: NodeRef, to: NodeRef): string | null {
  const fromDiff = has(DIFFERENTIAL_SOURCE_KINDS, from.kind);
  if (fromDiff && !has(DIFFERENTIAL_INPUT_KINDS, to.kind)) {
    return `joins ${q(to.id)} (${String(to.kind)}) to the differential output of ${q(from.id)} (${String(from.kind)}); a bridge or thermocouple feeds only a difference amplifier (differenceAmp) or an instrumentation amplifier (inAmp)`;
  }
  if (!fromDiff && has(DIFFERENTIAL_INPUT_KINDS, to.kind)) {
    return `feeds ${KIND_NOUN[String(to.kind)]} ${q(to.id)} from ${q(from.id)} (${String(from.kind)}), which gives one voltage; it takes a differential pair, straight from a bridge or thermocouple source`;
  }
  if (has(CURRENT_INPUT_KINDS, to.kind) && !has(CURRENT_SOURCE_KINDS, from.kind)) {
    return `feeds ${KIND_NOUN[String(to.kind)]} ${q(to.id)} from ${q(from.id)} (${String(from.kind)}); it takes a current into its virtual ground, straight from a photodiode or piezo source`;
  }
  return null;
}

/** A differential source, or a current source feeding a current-input stage, feeds that one stage. */
function singleFeed(fromKind: unknown, toKind: unknown): boolean {
  if (has(DIFFERENTIAL_SOURCE_KINDS, fromKind)) return true;
  return has(CURRENT_SOURCE_KINDS, fromKind) && has(CURRENT_INPUT_KINDS, toKind);
}

function kindOfFirstChild(kids: string[] | undefined, byId: Map<string, NodeRef>): unknown {
  return kids && kids.length ? byId.get(kids[0])?.kind : undefined;
}

function checkPartRefs(parts: unknown, nodes: unknown[], out: RawIssue[]): void {
  const keys = isPlainObject(parts) ? Object.keys(parts) : null;
  if (parts !== undefined && keys === null) return; // parts itself is wrong; that is reported on its own
  nodes.forEach((n, i) => {
    if (!isPlainObject(n) || !isOpAmpKind(n.kind)) return;
    const part = n.part;
    if (typeof part !== "string") return;
    if (keys && Object.prototype.hasOwnProperty.call(parts, part)) return;
    const have = keys && keys.length ? `; parts has ${listWords(keys.slice(0, 8).map(q))}${keys.length > 8 ? " …" : ""}` : "; this chain has no parts";
    out.push({ path: ["nodes", i, "part"], message: `names no part of this chain (${q(part)})${have}` });
  });
}

/** Following each node's single input backwards finds every loop; each is reported once, on `edges`. */
function findLoops(refs: NodeRef[], parent: Map<string, { from: string }>, out: RawIssue[]): Set<string> {
  const state = new Map<string, 1 | 2>(); // 1 = on the current walk, 2 = finished
  const inLoop = new Set<string>();
  for (const start of refs) {
    const walk: string[] = [];
    let cur: string | undefined = start.id;
    while (cur !== undefined && !state.has(cur)) {
      state.set(cur, 1);
      walk.push(cur);
      cur = parent.get(cur)?.from;
    }
    if (cur !== undefined && state.get(cur) === 1) {
      // cur is on this walk: the loop is the part of the walk from cur on, in reverse (signal direction).
      const loop = walk.slice(walk.indexOf(cur)).reverse();
      for (const id of loop) inLoop.add(id);
      out.push({
        path: ["edges"],
        message: `form a loop (${[...loop, loop[0]].map(q).join(" → ")}); a chain runs one way, from the source`,
      });
    }
    for (const id of walk) state.set(id, 2);
  }
  return inLoop;
}

export function reachableFrom(start: string, children: Map<string, string[]>): Set<string> {
  const seen = new Set<string>();
  const stack = [start];
  while (stack.length) {
    const id = stack.pop()!;
    if (seen.has(id)) continue;
    seen.add(id);
    for (const c of children.get(id) ?? []) stack.push(c);
  }
  return seen;
}

export function isOpAmpKind(kind: unknown): kind is NodeKind {
  return (OPAMP_KINDS as readonly unknown[]).includes(kind);
}
