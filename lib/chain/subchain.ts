/**
 * Which part of a draft can be analysed exactly while the user is still sketching.
 *
 * A node is kept when it is complete, its input comes from a kept node, and the voltage it sees does not
 * depend on anything left out. The last point is about loading: a passive section (rcLowpass,
 * rcHighpass) and a source with resistance are loaded by everything they feed, so if one of the nodes
 * they feed is not complete (its input impedance unknown), they and all that follows them are left out
 * too, and that can climb back up a ladder of passive sections. An op-amp output is an ideal voltage
 * source (chain-format.md, "Loading is exact"), so a path may stop at an op-amp stage whose successors
 * are unfinished: what it shows up to there is exact.
 */
import { isSourceKind, type ChainIssue, type DraftChain, type DraftChainNode } from "./types";
import { reachableFrom } from "./graph";

export interface SubchainPlan {
  /** ids of the nodes to analyse (empty when nothing can be analysed) */
  keep: Set<string>;
  issues: ChainIssue[];
}

const q = (s: string) => JSON.stringify(s);

function loadSensitive(node: DraftChainNode): boolean {
  if (node.kind === "rcLowpass" || node.kind === "rcHighpass") return true;
  if (node.kind === "source") return typeof node.params.resistance === "number" && node.params.resistance > 0;
  // a photodiode or piezo element is a Norton source: its point is loaded by what it feeds
  if (node.kind === "photodiode" || node.kind === "piezo") return true;
  return false;
}

/**
 * @param problemOf the first reason a node is not complete, in words, or null when it is complete
 */
export function planSubchain(draft: DraftChain, problemOf: (node: DraftChainNode) => string | null): SubchainPlan {
  const issues: ChainIssue[] = [];
  const nodes = draft.nodes;
  const index = new Map(nodes.map((n, i) => [n.id, i]));
  const byId = new Map(nodes.map((n) => [n.id, n]));
  const children = new Map<string, string[]>();
  for (const e of draft.edges) {
    const list = children.get(e.from);
    if (list) list.push(e.to);
    else children.set(e.from, [e.to]);
  }
  const none = (message: string, path = "nodes"): SubchainPlan => ({ keep: new Set(), issues: [...issues, { path, message }] });

  const sources = nodes.filter((n) => isSourceKind(n.kind));
  if (sources.length === 0) return none("has no source yet; the analysis starts at the source");
  const source = sources[0];
  if (sources.length > 1) {
    issues.push({
      path: "nodes",
      message: `has ${sources.length} sources; a chain has one, so only what follows ${q(source.id)} is analysed`,
    });
  }
  const sourceProblem = problemOf(source);
  if (sourceProblem) return none(`the source ${q(source.id)} is not complete yet: ${sourceProblem}`, `nodes[${index.get(source.id)}]`);

  // Complete nodes whose every predecessor up to the source is complete.
  const keep = new Set<string>([source.id]);
  const why = new Map<string, string>();
  const stack = [source.id];
  while (stack.length) {
    const id = stack.pop()!;
    for (const c of children.get(id) ?? []) {
      const problem = problemOf(byId.get(c)!);
      if (problem) {
        why.set(c, `${q(c)} is not complete yet: ${problem}`);
        markBelow(c, `follows ${q(c)}, which is not complete yet`);
      } else {
        keep.add(c);
        stack.push(c);
      }
    }
  }

  function markBelow(id: string, reason: string) {
    for (const d of reachableFrom(id, children)) {
      if (d !== id && !why.has(d)) why.set(d, `${q(d)} ${reason}`);
    }
  }

  // Loading: drop load-sensitive nodes that feed something left out, until nothing changes.
  for (let changed = true; changed; ) {
    changed = false;
    for (const id of [...keep]) {
      const node = byId.get(id)!;
      if (!keep.has(id) || !loadSensitive(node)) continue;
      const missing = (children.get(id) ?? []).find((c) => !keep.has(c));
      if (missing === undefined) continue;
      for (const d of reachableFrom(id, children)) {
        if (!keep.delete(d)) continue;
        why.set(
          d,
          d === id
            ? `${q(id)} feeds ${q(missing)}, which is left out, so the load on ${q(id)} is not known yet`
            : `${q(d)} follows ${q(id)}, whose load is not known yet`,
        );
      }
      changed = true;
    }
  }
  if (!keep.has(source.id)) {
    return none(
      `the source ${q(source.id)} has resistance and feeds a stage that is not complete, so no voltage in the chain is known yet`,
    );
  }

  nodes.forEach((n, i) => {
    if (keep.has(n.id)) return;
    const reason = why.get(n.id) ?? `${q(n.id)} is not connected to the source ${q(source.id)}`;
    issues.push({ path: `nodes[${i}]`, message: `${reason}; it is not analysed` });
  });
  return { keep, issues };
}
