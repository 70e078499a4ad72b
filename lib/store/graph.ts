/**
 * The format's graph rules as the canvas enforces them while the user connects, and the tidy left-to-right
 * layout. A draft may be unfinished, but the editor never produces a cycle, a second input, an edge into the
 * source or out of an ADC.
 */
import type { Edge, Position } from "@/lib/chain/types";
import { isSourceKind } from "@/lib/chain/types";
import type { DraftDoc } from "./draft";

export type ConnectionCheck = { ok: true } | { ok: false; reason: string };

/** Would the edge from → to keep the graph within chain-format.md's rules? */
export function checkConnection(doc: Pick<DraftDoc, "nodes" | "edges">, from: string, to: string): ConnectionCheck {
  const a = doc.nodes.find((n) => n.id === from);
  const b = doc.nodes.find((n) => n.id === to);
  if (!a || !b) return { ok: false, reason: "Both ends must be nodes of this chain." };
  if (from === to) return { ok: false, reason: "A node cannot feed itself." };
  if (a.kind === "adc") return { ok: false, reason: "An ADC is the end of a path; it feeds nothing." };
  if (isSourceKind(b.kind)) return { ok: false, reason: "The source takes no input." };
  if (doc.edges.some((e) => e.to === to)) return { ok: false, reason: `${to} already has an input; a node takes one.` };
  if (reaches(doc.edges, to, from)) return { ok: false, reason: "That would close a loop; a chain runs one way." };
  return { ok: true };
}

/** Is `target` reachable from `start` along edges? */
export function reaches(edges: Edge[], start: string, target: string): boolean {
  const out = adjacency(edges);
  const seen = new Set<string>();
  const stack = [start];
  while (stack.length) {
    const id = stack.pop()!;
    if (id === target) return true;
    if (seen.has(id)) continue;
    seen.add(id);
    for (const next of out.get(id) ?? []) stack.push(next);
  }
  return false;
}

function adjacency(edges: readonly Edge[]): Map<string, string[]> {
  const out = new Map<string, string[]>();
  for (const e of edges) {
    const list = out.get(e.from);
    if (list) list.push(e.to);
    else out.set(e.from, [e.to]);
  }
  return out;
}

/** Node ids from the source to `nodeId` along the (unique) incoming edges; [] when not connected to a source. */
export function pathTo(doc: { nodes: readonly { id: string; kind: string }[]; edges: readonly Edge[] }, nodeId: string): string[] {
  const incoming = new Map(doc.edges.map((e) => [e.to, e.from]));
  const path = [nodeId];
  const seen = new Set(path);
  let cur = nodeId;
  while (incoming.has(cur)) {
    cur = incoming.get(cur)!;
    if (seen.has(cur)) return [];
    seen.add(cur);
    path.unshift(cur);
  }
  const head = doc.nodes.find((n) => n.id === path[0]);
  return head && isSourceKind(head.kind) ? path : [];
}

/** Card pitch on the canvas (cards are 184 px wide), in flow units. */
/**
 * Layout grid. `wrapColumns`: a chain deeper than this continues on a band below, from the left again, so
 * a long chain stays readable in a fitted view (twelve columns fitted to the canvas at 1280×800 shrink the
 * cards to a third; two bands of six keep them above half size). `bandGap`: the room between bands for
 * the connection that runs back to the left.
 */
export const LAYOUT = { columnGap: 220, rowGap: 180, originX: 40, originY: 40, wrapColumns: 6, bandGap: 70 };

/**
 * Tidy layout, left to right. Each node has at most one input, so the graph is a forest: columns are the
 * depth from a root, leaves take consecutive rows and a parent sits at the mean row of its children, so
 * fan-out reads as a fork. Trees are stacked top to bottom: the source's tree first, loose nodes after.
 * Deeper than `LAYOUT.wrapColumns`, the columns continue on bands below (column 7 is the first of the
 * second band), each band as tall as all the rows.
 */
export function tidyLayout(doc: { nodes: readonly { id: string; kind: string }[]; edges: readonly Edge[] }): Record<string, Position> {
  const children = adjacency(doc.edges);
  const hasInput = new Set(doc.edges.map((e) => e.to));
  const order = new Map(doc.nodes.map((n, i) => [n.id, i]));
  const byFirstPosition = (a: string, b: string) => (order.get(a) ?? 0) - (order.get(b) ?? 0);
  const roots = doc.nodes
    .filter((n) => !hasInput.has(n.id))
    .sort((a, b) => rootRank(a) - rootRank(b) || byFirstPosition(a.id, b.id))
    .map((n) => n.id);
  const rows = new Map<string, number>();
  const depth = new Map<string, number>();
  let nextRow = 0;
  const place = (id: string, d: number, guard: Set<string>): number => {
    if (guard.has(id)) return rows.get(id) ?? nextRow;
    guard.add(id);
    depth.set(id, d);
    const kids = [...(children.get(id) ?? [])].sort(byFirstPosition);
    let row: number;
    if (kids.length === 0) row = nextRow++;
    else {
      const r = kids.map((k) => place(k, d + 1, guard));
      row = (Math.min(...r) + Math.max(...r)) / 2;
    }
    rows.set(id, row);
    return row;
  };
  const guard = new Set<string>();
  for (const r of roots) place(r, 0, guard);
  // Anything left (only possible in a malformed draft with a cycle) goes on its own rows.
  for (const n of doc.nodes) if (!rows.has(n.id)) place(n.id, 0, guard);
  const deepest = Math.max(0, ...depth.values());
  const wrap = deepest + 1 > LAYOUT.wrapColumns ? LAYOUT.wrapColumns : deepest + 1;
  const bandHeight = Math.max(1, nextRow) * LAYOUT.rowGap + LAYOUT.bandGap;
  const result: Record<string, Position> = {};
  for (const n of doc.nodes) {
    const d = depth.get(n.id) ?? 0;
    const band = Math.floor(d / wrap);
    result[n.id] = {
      x: LAYOUT.originX + (d - band * wrap) * LAYOUT.columnGap,
      y: LAYOUT.originY + band * bandHeight + (rows.get(n.id) ?? 0) * LAYOUT.rowGap,
    };
  }
  return result;
}

function rootRank(n: { kind: string }): number {
  return isSourceKind(n.kind) ? 0 : 1;
}
