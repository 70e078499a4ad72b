/**
 * Graph bookkeeping shared by both evaluation paths: a deterministic order of the nodes (source first,
 * depth-first following the edge list), parent and children, and the paths (source → each node with no
 * outgoing edge). The chain is assumed valid and complete (one source, a tree, no cycles).
 */
import type { Chain, ChainNode, NodeKind, OpAmpKind, PassiveKind } from "../chain/types";
import { OPAMP_KINDS, isSourceKind } from "../chain/types";

export interface Topology {
  /** nodes in depth-first order from the source; every parent precedes its children */
  nodes: ChainNode[];
  index: Map<string, number>;
  /** parent index, −1 for the source */
  parent: number[];
  children: number[][];
  /** node indices from the source to each leaf */
  paths: number[][];
}

const OPAMP_SET = new Set<NodeKind>(OPAMP_KINDS);

export const isOpAmpKind = (k: NodeKind): k is OpAmpKind => OPAMP_SET.has(k);
export const isPassiveKind = (k: NodeKind): k is PassiveKind => k === "rcLowpass" || k === "rcHighpass";

export function buildTopology(chain: Chain): Topology {
  const byId = new Map(chain.nodes.map((n) => [n.id, n]));
  const kids = new Map<string, string[]>();
  for (const e of chain.edges) {
    const list = kids.get(e.from);
    if (list) list.push(e.to);
    else kids.set(e.from, [e.to]);
  }
  const source = chain.nodes.find((n) => isSourceKind(n.kind));
  if (!source) throw new Error("chain has no source node");

  const nodes: ChainNode[] = [];
  const index = new Map<string, number>();
  const parent: number[] = [];
  const children: number[][] = [];
  // iterative depth-first walk; children visited in edge order
  const stack: { id: string; parent: number }[] = [{ id: source.id, parent: -1 }];
  while (stack.length) {
    const { id, parent: p } = stack.pop()!;
    if (index.has(id)) continue;
    const node = byId.get(id);
    if (!node) continue;
    const i = nodes.length;
    nodes.push(node);
    index.set(id, i);
    parent.push(p);
    children.push([]);
    if (p >= 0) children[p].push(i);
    const next = kids.get(id) ?? [];
    for (let k = next.length - 1; k >= 0; k--) stack.push({ id: next[k], parent: i });
  }
  // children were pushed in visiting order, which follows the edge order; keep it stable
  const paths: number[][] = [];
  const walk = (i: number, trail: number[]) => {
    const t = [...trail, i];
    if (children[i].length === 0) paths.push(t);
    else for (const c of children[i]) walk(c, t);
  };
  walk(0, []);
  return { nodes, index, parent, children, paths };
}
