/**
 * The canvas's node and edge types. A flow node's `type` is the chain node's kind (a typed union, one
 * member per kind) and its `data` holds only the node's own parameters; analysis results are read from
 * the editor store by id, so a new analysis never rebuilds the node list.
 */
import type { Edge as FlowEdge, Node } from "@xyflow/react";
import type { NodeKind, Rails } from "@/lib/chain/types";
import type { DraftNode, ParamValue } from "@/lib/store/draft";

export type StageData = {
  params: Record<string, ParamValue | undefined>;
  label?: string;
  part?: string | null;
  rails?: Rails;
};

export type StageFlowNode = { [K in NodeKind]: Node<StageData, K> }[NodeKind];
export type ChainFlowEdge = FlowEdge;

const cache = new WeakMap<DraftNode, StageFlowNode>();

/** The flow node for a draft node; the same object while the draft node is unchanged (keeps memo hits). */
export function toFlowNode(n: DraftNode): StageFlowNode {
  let f = cache.get(n);
  if (!f) {
    f = {
      id: n.id,
      type: n.kind,
      position: n.position ?? { x: 0, y: 0 },
      data: { params: n.params, label: n.label, part: n.part, rails: n.rails },
    } as StageFlowNode;
    cache.set(n, f);
  }
  return f;
}

/** Data type of a drag from the shelf onto the canvas. */
export const SHELF_DRAG_TYPE = "application/x-chainwright-kind";
