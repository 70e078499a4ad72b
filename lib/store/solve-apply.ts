/**
 * Pure document edits for the solver's "apply" buttons: new values on one stage, the advisor's edits on
 * several, and a filter's sections inserted after a node. Each returns a new draft (the caller commits it
 * as one undo step) or the same draft when nothing changes.
 */
import type { DraftDoc, DraftNode } from "./draft";
import { nextNodeId } from "./draft";
import { LAYOUT } from "./graph";

type Values = Record<string, number | null>;

/** Set params on the node `id`; null clears a nullable param (a follower's rf/rg). */
export function applyParams(doc: DraftDoc, id: string, params: Values): DraftDoc {
  const i = doc.nodes.findIndex((n) => n.id === id);
  if (i < 0) return doc;
  const nodes = doc.nodes.slice();
  nodes[i] = { ...nodes[i], params: { ...nodes[i].params, ...params } };
  return { ...doc, nodes };
}

/** Several nodes' params at once (the gain-staging advice). */
export function applyEdits(doc: DraftDoc, edits: readonly { id: string; params: Values }[]): DraftDoc {
  return edits.reduce((d, e) => applyParams(d, e.id, e.params), doc);
}

export interface NewStage {
  kind: DraftNode["kind"];
  label: string;
  params: Values;
}

/**
 * Insert `stages` in a row after node `afterId`: the edges that left `afterId` now leave the last new stage,
 * and the nodes right of it move over to make room. Op-amp stages take the rails of `afterId` (or of the
 * nearest node that has rails). Returns the new draft and the ids made.
 */
export function insertAfter(doc: DraftDoc, afterId: string, stages: readonly NewStage[]): { doc: DraftDoc; ids: string[] } {
  const after = doc.nodes.find((n) => n.id === afterId);
  if (!after || stages.length === 0) return { doc, ids: [] };
  const rails = after.rails ?? doc.nodes.find((n) => n.rails)?.rails;
  const taken = doc.nodes.map((n) => n.id);
  const step = LAYOUT.columnGap;
  const base = after.position ?? { x: 0, y: 0 };
  const shift = step * stages.length;
  const made: DraftNode[] = stages.map((s, i) => {
    const id = nextNodeId(s.kind, taken);
    taken.push(id);
    const node: DraftNode = { id, kind: s.kind, label: s.label, params: { ...s.params }, position: { x: base.x + step * (i + 1), y: base.y } };
    if (s.kind !== "rcLowpass" && s.kind !== "rcHighpass") {
      node.part = after.part ?? null;
      if (rails) node.rails = { ...rails };
    }
    return node;
  });
  const ids = made.map((n) => n.id);
  const moved = doc.nodes.map((n) =>
    n.position && n.id !== afterId && n.position.x > base.x + 1e-9 && Math.abs(n.position.y - base.y) < step ? { ...n, position: { ...n.position, x: n.position.x + shift } } : n,
  );
  const last = ids[ids.length - 1];
  const edges = [
    ...doc.edges.map((e) => (e.from === afterId ? { ...e, from: last } : e)),
    { from: afterId, to: ids[0] },
    ...ids.slice(1).map((id, i) => ({ from: ids[i], to: id })),
  ];
  return { doc: { ...doc, nodes: [...moved, ...made], edges }, ids };
}
