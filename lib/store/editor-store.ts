/**
 * The workspace's editor state (zustand). One store per open chain, created by the workspace and handed
 * down through context, so two chains in one session never share undo history or selection.
 *
 * Every change to the document goes through `commit`, which keeps the undo history (typing into one field
 * folds into one step), marks the draft unsaved and leaves the analysis to the live-analysis driver that
 * subscribes to `doc`. In a read-only workspace every mutating action is a no-op.
 */
import { createStore, type StoreApi } from "zustand/vanilla";
import type { NodeKind, Part, Position, Rails, Safety } from "@/lib/chain/types";
import { isSourceKind } from "@/lib/chain/types";
import { checkConnection, LAYOUT, tidyLayout, type ConnectionCheck } from "./graph";
import { CLIP_STORAGE_KEY, makeClip, parseClip, pasteClip, type Clip } from "./clipboard";
import { isOpAmpKind, lastUsedRails, nextNodeId, nextPartKey, type DraftDoc, type DraftNode, type ParamValue } from "./draft";
import { STAGE_CATALOG } from "./stage-catalog";
import type { LiveAnalysis } from "./live-analysis";

export type SaveState = "saved" | "unsaved" | "saving" | "conflict" | "error";
export type PlotMode = "cumulative" | "individual";

export interface ConflictInfo {
  /** the version now on the server */
  serverVersion: number | null;
}

export interface EditorInit {
  doc: DraftDoc;
  chainId?: string | null;
  version?: number;
  readOnly?: boolean;
}

export interface EditorState {
  doc: DraftDoc;
  /** selected node ids */
  selected: string[];
  /** selected edges as "from->to" */
  selectedEdges: string[];
  readOnly: boolean;
  past: DraftDoc[];
  future: DraftDoc[];
  /** key and time of the last commit, so consecutive keystrokes in one field make one undo step */
  coalesce: { key: string; at: number } | null;
  lastRails: Rails | undefined;

  chainId: string | null;
  /** the server version the current draft is based on */
  version: number;
  /** the document as last saved (by reference) */
  savedDoc: DraftDoc;
  save: SaveState;
  saveError: string | null;
  conflict: ConflictInfo | null;

  plotMode: PlotMode;
  /** the node whose path the plot follows when nothing is selected (a sink id) */
  plotPathEnd: string | null;
  notice: string | null;
  live: LiveAnalysis | null;

  actions: EditorActions;
}

export interface EditorActions {
  commit(next: DraftDoc, opts?: { coalesceKey?: string; select?: string[] }): void;
  /**
   * Place a node. With `after`, it goes right of that node and is connected from it when the graph
   * rules allow (the keyboard way of building a chain: select, add, add, add).
   */
  addNode(kind: NodeKind, position?: Position, opts?: { after?: string }): string | null;
  connect(from: string, to: string): ConnectionCheck;
  /** connect the two selected nodes, the left one feeding the right one */
  connectSelected(): ConnectionCheck;
  selectAll(): void;
  removeEdge(from: string, to: string): void;
  deleteSelection(): void;
  duplicateSelection(): void;
  copySelection(): Clip | null;
  cutSelection(): void;
  paste(clip?: Clip | null): void;
  undo(): void;
  redo(): void;
  setParam(id: string, key: string, value: ParamValue | undefined): void;
  setRails(id: string, rails: Rails | undefined): void;
  setPart(id: string, partKey: string | null): void;
  setLabel(id: string, label: string): void;
  setSafety(id: string, safety: Safety): void;
  upsertPart(key: string, part: Part): void;
  addPart(part?: Part): string | null;
  copyPart(key: string): string | null;
  removePart(key: string): void;
  moveNodes(positions: Record<string, Position>, final: boolean): void;
  tidy(): void;
  select(ids: string[], edges?: string[]): void;
  rename(name: string): void;
  setNotes(notes: string): void;
  setAnalysis(key: "fMin" | "fMax" | "points", value: number | undefined): void;
  setPlotMode(mode: PlotMode): void;
  setPlotPathEnd(id: string | null): void;
  setNotice(text: string | null): void;
  setLive(live: LiveAnalysis | null): void;
  markSaving(): void;
  markSaved(version: number, doc: DraftDoc): void;
  markConflict(info: ConflictInfo): void;
  markSaveError(message: string): void;
  /** replace the draft by the server's copy (after a conflict, "reload") */
  loadDoc(doc: DraftDoc, version: number): void;
  /** after "keep a copy": the editor now edits the copy */
  switchChain(chainId: string, version: number, doc: DraftDoc): void;
}

const HISTORY_LIMIT = 200;
const COALESCE_MS = 1200;

export type EditorStore = StoreApi<EditorState>;

export const edgeKey = (from: string, to: string) => `${from}->${to}`;

export function createEditorStore(init: EditorInit): EditorStore {
  return createStore<EditorState>()((set, get) => {
    const writable = () => !get().readOnly;

    const commit: EditorActions["commit"] = (next, opts = {}) => {
      if (!writable()) return;
      const s = get();
      if (next === s.doc) return;
      const now = Date.now();
      const fold = !!opts.coalesceKey && s.coalesce?.key === opts.coalesceKey && now - s.coalesce.at < COALESCE_MS;
      const past = fold ? s.past : [...s.past, s.doc].slice(-HISTORY_LIMIT);
      set({
        doc: next,
        past,
        future: [],
        coalesce: opts.coalesceKey ? { key: opts.coalesceKey, at: now } : null,
        save: s.save === "saved" || s.save === "error" ? "unsaved" : s.save,
        ...(opts.select ? { selected: opts.select, selectedEdges: [] } : {}),
      });
    };

    const updateNode = (id: string, fn: (n: DraftNode) => DraftNode, coalesceKey?: string) => {
      const { doc } = get();
      const i = doc.nodes.findIndex((n) => n.id === id);
      if (i < 0) return;
      const nodes = doc.nodes.slice();
      nodes[i] = fn(nodes[i]);
      commit({ ...doc, nodes }, { coalesceKey });
    };

    const restore = (doc: DraftDoc) => {
      const ids = new Set(doc.nodes.map((n) => n.id));
      set((s) => ({
        doc,
        coalesce: null,
        selected: s.selected.filter((id) => ids.has(id)),
        selectedEdges: [],
        save: s.save === "saved" || s.save === "error" ? "unsaved" : s.save,
      }));
    };

    const removeIds = (doc: DraftDoc, nodeIds: Set<string>, edgeKeys: Set<string>): DraftDoc => ({
      ...doc,
      nodes: doc.nodes.filter((n) => !nodeIds.has(n.id)),
      edges: doc.edges.filter((e) => !nodeIds.has(e.from) && !nodeIds.has(e.to) && !edgeKeys.has(edgeKey(e.from, e.to))),
    });

    const actions: EditorActions = {
      commit,
      addNode(kind, position, opts = {}) {
        if (!writable()) return null;
        const { doc, lastRails } = get();
        const after = opts.after ? doc.nodes.find((n) => n.id === opts.after) : undefined;
        if (isSourceKind(kind) && doc.nodes.some((n) => isSourceKind(n.kind))) {
          set({ notice: "This chain already has its source; a chain has exactly one." });
          return null;
        }
        const id = nextNodeId(kind, doc.nodes.map((n) => n.id));
        const spec = STAGE_CATALOG[kind];
        const node: DraftNode = {
          id,
          kind,
          params: { ...spec.starter },
          position: position ?? (after ? spotAfter(doc, after) : freeSpot(doc)),
        };
        if (isOpAmpKind(kind)) {
          node.part = null;
          const rails = lastRails ?? lastUsedRails(doc);
          if (rails) node.rails = { ...rails };
        }
        let next: DraftDoc = { ...doc, nodes: [...doc.nodes, node] };
        if (after && checkConnection(next, after.id, id).ok) next = { ...next, edges: [...next.edges, { from: after.id, to: id }] };
        commit(next, { select: [id] });
        return id;
      },
      connect(from, to) {
        if (!writable()) return { ok: false, reason: "This chain is read-only for you." };
        const { doc } = get();
        const check = checkConnection(doc, from, to);
        if (!check.ok) {
          set({ notice: check.reason });
          return check;
        }
        commit({ ...doc, edges: [...doc.edges, { from, to }] });
        return check;
      },
      connectSelected() {
        const { doc, selected } = get();
        if (selected.length !== 2) {
          const reason = "Select exactly two nodes to connect them.";
          set({ notice: reason });
          return { ok: false, reason };
        }
        const [a, b] = selected.map((id) => doc.nodes.find((n) => n.id === id)!);
        const ax = a.position?.x ?? 0;
        const bx = b.position?.x ?? 0;
        const [from, to] = ax <= bx ? [a, b] : [b, a];
        return actions.connect(from.id, to.id);
      },
      selectAll() {
        const { doc } = get();
        set({ selected: doc.nodes.map((n) => n.id), selectedEdges: [] });
      },
      removeEdge(from, to) {
        const { doc } = get();
        commit({ ...doc, edges: doc.edges.filter((e) => !(e.from === from && e.to === to)) });
      },
      deleteSelection() {
        const { doc, selected, selectedEdges } = get();
        if (selected.length === 0 && selectedEdges.length === 0) return;
        const next = removeIds(doc, new Set(selected), new Set(selectedEdges));
        commit(next, { select: [] });
      },
      duplicateSelection() {
        const { doc, selected } = get();
        const clip = makeClip(doc, selected);
        if (!clip) return;
        const out = pasteClip(doc, clip);
        commit(out.doc, { select: out.newIds });
        if (out.skipped.length) set({ notice: `Not duplicated: ${out.skipped.join(", ")}.` });
      },
      copySelection() {
        const { doc, selected } = get();
        const clip = makeClip(doc, selected);
        if (clip) writeClip(clip);
        if (clip) set({ notice: `Copied ${clip.nodes.length} node${clip.nodes.length === 1 ? "" : "s"}.` });
        return clip;
      },
      cutSelection() {
        if (!writable()) return;
        actions.copySelection();
        actions.deleteSelection();
      },
      paste(given) {
        if (!writable()) return;
        const clip = given ?? readClip();
        if (!clip) {
          set({ notice: "Nothing to paste: copy some nodes first." });
          return;
        }
        const out = pasteClip(get().doc, clip);
        if (out.newIds.length) commit(out.doc, { select: out.newIds });
        set({ notice: out.skipped.length ? `Pasted; left out ${out.skipped.join(", ")}.` : null });
      },
      undo() {
        const s = get();
        if (!writable() || s.past.length === 0) return;
        const prev = s.past[s.past.length - 1];
        set({ past: s.past.slice(0, -1), future: [s.doc, ...s.future].slice(0, HISTORY_LIMIT) });
        restore(prev);
      },
      redo() {
        const s = get();
        if (!writable() || s.future.length === 0) return;
        const next = s.future[0];
        set({ future: s.future.slice(1), past: [...s.past, s.doc].slice(-HISTORY_LIMIT) });
        restore(next);
      },
      setParam(id, key, value) {
        updateNode(
          id,
          (n) => {
            const params = { ...n.params };
            if (value === undefined) delete params[key];
            else params[key] = value;
            return { ...n, params };
          },
          `${id}.params.${key}`,
        );
      },
      setRails(id, rails) {
        updateNode(
          id,
          (n) => {
            const next = { ...n };
            if (rails) next.rails = { ...rails };
            else delete next.rails;
            return next;
          },
          `${id}.rails`,
        );
        if (rails && writable()) set({ lastRails: { ...rails } });
      },
      setPart(id, partKey) {
        updateNode(id, (n) => ({ ...n, part: partKey }));
      },
      setLabel(id, label) {
        updateNode(
          id,
          (n) => {
            const next = { ...n };
            if (label.trim()) next.label = label;
            else delete next.label;
            return next;
          },
          `${id}.label`,
        );
      },
      setSafety(id, safety) {
        updateNode(id, (n) => ({ ...n, params: { ...n.params, safety } }));
      },
      upsertPart(key, part) {
        const { doc } = get();
        commit({ ...doc, parts: { ...doc.parts, [key]: part } }, { coalesceKey: `parts.${key}` });
      },
      addPart(part) {
        if (!writable()) return null;
        const { doc } = get();
        const key = nextPartKey(Object.keys(doc.parts));
        commit({ ...doc, parts: { ...doc.parts, [key]: part ?? { label: "New op-amp model" } } });
        return key;
      },
      copyPart(key) {
        if (!writable()) return null;
        const { doc } = get();
        const src = doc.parts[key];
        if (!src) return null;
        const newKey = nextPartKey(Object.keys(doc.parts));
        const label = `${src.label ?? key} (copy)`;
        commit({ ...doc, parts: { ...doc.parts, [newKey]: { ...src, label } } });
        return newKey;
      },
      removePart(key) {
        const { doc } = get();
        if (!doc.parts[key]) return;
        const parts = { ...doc.parts };
        delete parts[key];
        // Stages that used it fall back to the ideal op-amp rather than pointing at nothing.
        const nodes = doc.nodes.map((n) => (n.part === key ? { ...n, part: null } : n));
        commit({ ...doc, parts, nodes });
      },
      moveNodes(positions, final) {
        if (!writable()) return;
        const s = get();
        const nodes = s.doc.nodes.map((n) => (positions[n.id] ? { ...n, position: positions[n.id] } : n));
        const next = { ...s.doc, nodes };
        // A drag makes one undo step: intermediate positions replace the document without history.
        if (!final) set({ doc: next, save: s.save === "saved" ? "unsaved" : s.save });
        else commit(next, { coalesceKey: `move.${Object.keys(positions).sort().join(",")}` });
      },
      tidy() {
        const { doc } = get();
        const pos = tidyLayout(doc);
        commit({ ...doc, nodes: doc.nodes.map((n) => ({ ...n, position: pos[n.id] })) });
      },
      select(ids, edges = []) {
        const s = get();
        if (sameList(s.selected, ids) && sameList(s.selectedEdges, edges)) return;
        set({ selected: ids, selectedEdges: edges });
      },
      rename(name) {
        const { doc } = get();
        if (name.trim().length === 0 || name.length > 200) return;
        commit({ ...doc, name }, { coalesceKey: "name" });
      },
      setNotes(notes) {
        const { doc } = get();
        commit({ ...doc, notes }, { coalesceKey: "notes" });
      },
      setAnalysis(key, value) {
        const { doc } = get();
        const analysis = { ...(doc.analysis ?? {}) };
        if (value === undefined) delete analysis[key];
        else analysis[key] = value;
        commit({ ...doc, analysis }, { coalesceKey: `analysis.${key}` });
      },
      setPlotMode: (plotMode) => set({ plotMode }),
      setPlotPathEnd: (plotPathEnd) => set({ plotPathEnd }),
      setNotice: (notice) => set({ notice }),
      setLive: (live) => set({ live }),
      markSaving: () => set({ save: "saving", saveError: null }),
      markSaved(version, savedDoc) {
        set((s) => ({ version, savedDoc, save: s.doc === savedDoc ? "saved" : "unsaved", saveError: null, conflict: null }));
      },
      markConflict: (conflict) => set({ save: "conflict", conflict }),
      markSaveError: (message) => set({ save: "error", saveError: message }),
      loadDoc(doc, version) {
        set({ doc, savedDoc: doc, version, save: "saved", conflict: null, saveError: null, past: [], future: [], selected: [], selectedEdges: [], coalesce: null });
      },
      switchChain(chainId, version, doc) {
        set({ chainId, version, doc, savedDoc: doc, save: "saved", conflict: null, saveError: null });
      },
    };

    return {
      doc: init.doc,
      selected: [],
      selectedEdges: [],
      readOnly: !!init.readOnly,
      past: [],
      future: [],
      coalesce: null,
      lastRails: lastUsedRails(init.doc),
      chainId: init.chainId ?? null,
      version: init.version ?? 0,
      savedDoc: init.doc,
      save: "saved",
      saveError: null,
      conflict: null,
      plotMode: "cumulative",
      plotPathEnd: null,
      notice: null,
      live: null,
      actions,
    };
  });
}

function sameList(a: string[], b: string[]) {
  return a.length === b.length && a.every((x, i) => x === b[i]);
}

/** A spot right of the rightmost node, so a clicked-in node does not land on top of another. */
function freeSpot(doc: DraftDoc): Position {
  if (doc.nodes.length === 0) return { x: 40, y: 40 };
  let maxX = -Infinity;
  let yAtMax = 40;
  for (const n of doc.nodes) {
    const p = n.position ?? { x: 0, y: 0 };
    if (p.x > maxX) {
      maxX = p.x;
      yAtMax = p.y;
    }
  }
  return { x: maxX + LAYOUT.columnGap, y: yAtMax };
}

/** Right of `after`; further down while that spot is taken (a fork's second branch). */
function spotAfter(doc: DraftDoc, after: DraftNode): Position {
  const base = after.position ?? { x: 0, y: 0 };
  const spot = { x: base.x + LAYOUT.columnGap, y: base.y };
  const taken = (p: Position) => doc.nodes.some((n) => n.position && Math.abs(n.position.x - p.x) < LAYOUT.columnGap - 20 && Math.abs(n.position.y - p.y) < LAYOUT.rowGap - 40);
  while (taken(spot)) spot.y += LAYOUT.rowGap;
  return spot;
}

function writeClip(clip: Clip) {
  const text = JSON.stringify(clip);
  try {
    globalThis.localStorage?.setItem(CLIP_STORAGE_KEY, text);
  } catch {
    /* storage full or blocked: the system clipboard below may still work */
  }
  try {
    void globalThis.navigator?.clipboard?.writeText(text).catch(() => undefined);
  } catch {
    /* no clipboard permission; the local copy is enough within this browser */
  }
}

function readClip(): Clip | null {
  try {
    return parseClip(globalThis.localStorage?.getItem(CLIP_STORAGE_KEY));
  } catch {
    return null;
  }
}
