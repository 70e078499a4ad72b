"use client";
/**
 * The canvas: the draft's nodes as cards, connections checked against the format's graph rules as they
 * are drawn, cards dropped from the shelf. The draft in the store is the only truth; React Flow's node
 * list is derived from it (plus the measured card sizes React Flow reports), and every change the canvas
 * makes goes back through store actions, so undo, autosave and analysis see it.
 */
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import {
  Background,
  BackgroundVariant,
  Controls,
  ReactFlow,
  useReactFlow,
  type Connection,
  type EdgeChange,
  type IsValidConnection,
  type NodeChange,
} from "@xyflow/react";
import "@xyflow/react/dist/style.css";
import type { NodeKind, Position as XY } from "@/lib/chain/types";
import { NODE_KINDS } from "@/lib/chain/types";
import { useEditor, useEditorActions, useEditorStoreApi } from "@/lib/store/editor-context";
import { edgeKey } from "@/lib/store/editor-store";
import { checkConnection } from "@/lib/store/graph";
import type { DraftDoc, DraftNode } from "@/lib/store/draft";
import { nodeTypes } from "./stage-card";
import { SHELF_DRAG_TYPE, toFlowNode, type ChainFlowEdge, type StageFlowNode } from "./flow-types";



type Measured = { width: number; height: number };

const uiCache = new WeakMap<StageFlowNode, { sel: boolean; m: Measured | undefined; out: StageFlowNode }>();

/** The flow node with selection and measured size; the same object while none of the three changes. */
function withUi(src: StageFlowNode, sel: boolean, m: Measured | undefined): StageFlowNode {
  const hit = uiCache.get(src);
  if (hit && hit.sel === sel && hit.m === m) return hit.out;
  const out = { ...src, selected: sel, ...(m ? { measured: m } : {}), deletable: false } as StageFlowNode;
  uiCache.set(src, { sel, m, out });
  return out;
}

function flowEdges(docEdges: DraftDoc["edges"], selectedEdges: string[]): ChainFlowEdge[] {
  const sel = new Set(selectedEdges);
  return docEdges.map((e) => {
    const id = edgeKey(e.from, e.to);
    return { id, source: e.from, target: e.to, selected: sel.has(id), deletable: false };
  });
}

/**
 * The flow as the canvas first shows it, for `ReactFlowProvider`: with the nodes in React Flow's store
 * from the start, the cards are in the server's HTML and in the hydrating render, so they are measured
 * and fitted in the first frame after hydration instead of after the effects that hand the node list over.
 */
export function initialFlow(doc: DraftDoc, selected: string[] = []): { nodes: StageFlowNode[]; edges: ChainFlowEdge[] } {
  const sel = new Set(selected);
  return { nodes: doc.nodes.map((d) => withUi(toFlowNode(d), sel.has(d.id), undefined)), edges: flowEdges(doc.edges, []) };
}

/** How the canvas fits the chain into view when it opens (and on Fit). */
export const FIT_OPTIONS = { maxZoom: 1, padding: 0.12 } as const;
export const MIN_ZOOM = 0.2;
export const MAX_ZOOM = 2;

export function ChainCanvas() {
  const docNodes = useEditor((s) => s.doc.nodes);
  const docEdges = useEditor((s) => s.doc.edges);
  const selected = useEditor((s) => s.selected);
  const selectedEdges = useEditor((s) => s.selectedEdges);
  const readOnly = useEditor((s) => s.readOnly);
  const store = useEditorStoreApi();
  const actions = useEditorActions();
  const rf = useReactFlow();

  /** card sizes React Flow measured, kept so the derived nodes carry them */
  const [measured, setMeasured] = useState<Record<string, Measured>>({});

  const nodes = useMemo(() => {
    const sel = new Set(selected);
    return docNodes.map((d: DraftNode) => withUi(toFlowNode(d), sel.has(d.id), measured[d.id]));
  }, [docNodes, selected, measured]);

  const edges = useMemo(() => flowEdges(docEdges, selectedEdges), [docEdges, selectedEdges]);

  // Keep a growing sketch in view: when a node is added, fit the chain once its card has been measured.
  const count = docNodes.length;
  const lastCount = useRef(count);
  useEffect(() => {
    if (count > lastCount.current) {
      const t = setTimeout(() => void rf.fitView({ duration: 150, maxZoom: 1, padding: 0.15 }), 60);
      lastCount.current = count;
      return () => clearTimeout(t);
    }
    lastCount.current = count;
  }, [count, rf]);

  const onNodesChange = useCallback(
    (changes: NodeChange<StageFlowNode>[]) => {
      let dims: Record<string, Measured> | null = null;
      const moves: Record<string, XY> = {};
      let final = false;
      let sel: Set<string> | null = null;
      for (const c of changes) {
        if (c.type === "dimensions" && c.dimensions) {
          (dims ??= {})[c.id] = { width: c.dimensions.width, height: c.dimensions.height };
        } else if (c.type === "position" && c.position) {
          moves[c.id] = { x: Math.round(c.position.x), y: Math.round(c.position.y) };
          if (!c.dragging) final = true;
        } else if (c.type === "position" && c.dragging === false) {
          final = true;
        } else if (c.type === "select") {
          sel ??= new Set(store.getState().selected);
          if (c.selected) sel.add(c.id);
          else sel.delete(c.id);
        }
      }
      if (dims) {
        const got = dims;
        setMeasured((prev) => {
          const changed = Object.entries(got).some(([id, m]) => prev[id]?.width !== m.width || prev[id]?.height !== m.height);
          return changed ? { ...prev, ...got } : prev;
        });
      }
      if (Object.keys(moves).length) actions.moveNodes(moves, final);
      else if (final) actions.moveNodes({}, true);
      if (sel) actions.select([...sel], sel.size ? [] : store.getState().selectedEdges);
    },
    [actions, store],
  );

  const onEdgesChange = useCallback(
    (changes: EdgeChange<ChainFlowEdge>[]) => {
      let sel: Set<string> | null = null;
      for (const c of changes) {
        if (c.type === "select") {
          sel ??= new Set(store.getState().selectedEdges);
          if (c.selected) sel.add(c.id);
          else sel.delete(c.id);
        }
      }
      if (sel) actions.select(sel.size ? [] : store.getState().selected, [...sel]);
    },
    [actions, store],
  );

  const onConnect = useCallback((c: Connection) => void actions.connect(c.source, c.target), [actions]);
  const isValidConnection = useCallback<IsValidConnection<ChainFlowEdge>>(
    (c) => checkConnection(store.getState().doc, c.source, c.target).ok,
    [store],
  );

  const onDrop = useCallback(
    (e: React.DragEvent) => {
      const kind = e.dataTransfer.getData(SHELF_DRAG_TYPE) as NodeKind;
      if (!NODE_KINDS.includes(kind)) return;
      e.preventDefault();
      const p = rf.screenToFlowPosition({ x: e.clientX, y: e.clientY });
      actions.addNode(kind, { x: Math.round(p.x - 92), y: Math.round(p.y - 40) });
    },
    [actions, rf],
  );

  return (
    <div className="h-full w-full" data-testid="canvas" onDragOver={(e) => { if (e.dataTransfer.types.includes(SHELF_DRAG_TYPE)) { e.preventDefault(); e.dataTransfer.dropEffect = "copy"; } }} onDrop={onDrop}>
      <ReactFlow<StageFlowNode, ChainFlowEdge>
        nodes={nodes}
        edges={edges}
        nodeTypes={nodeTypes}
        onNodesChange={onNodesChange}
        onEdgesChange={onEdgesChange}
        onConnect={onConnect}
        isValidConnection={isValidConnection}
        nodesDraggable={!readOnly}
        nodesConnectable={!readOnly}
        elementsSelectable
        deleteKeyCode={null}
        selectionKeyCode="Shift"
        multiSelectionKeyCode={["Shift", "Meta", "Control"]}
        defaultEdgeOptions={{ type: "smoothstep" }}
        fitView
        fitViewOptions={FIT_OPTIONS}
        minZoom={MIN_ZOOM}
        maxZoom={MAX_ZOOM}
        aria-label="Chain canvas"
      >
        <Background variant={BackgroundVariant.Dots} gap={20} size={1} color="#d6d2c8" />
        <Controls showInteractive={false} position="bottom-left" />
      </ReactFlow>
    </div>
  );
}
