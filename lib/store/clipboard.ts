/**
 * Copy and paste of nodes between chains. The clipboard holds our own small JSON document (not a chain:
 * a fragment with the nodes, the edges among them and the parts they use), so a fragment copied from one
 * chain pastes into another with its op-amp models, and the chain stays self-contained.
 */
import type { Edge, Part } from "@/lib/chain/types";
import { isSourceKind } from "@/lib/chain/types";
import { nextNodeId, nextPartKey, type DraftDoc, type DraftNode } from "./draft";

export const CLIP_FORMAT = "chainwright.fragment/1" as const;
export const CLIP_STORAGE_KEY = "chainwright.clipboard";

export interface Clip {
  format: typeof CLIP_FORMAT;
  nodes: DraftNode[];
  edges: Edge[];
  parts: Record<string, Part>;
}

export function makeClip(doc: DraftDoc, ids: string[]): Clip | null {
  const set = new Set(ids);
  const nodes = doc.nodes.filter((n) => set.has(n.id));
  if (nodes.length === 0) return null;
  const edges = doc.edges.filter((e) => set.has(e.from) && set.has(e.to));
  const parts: Record<string, Part> = {};
  for (const n of nodes) if (n.part && doc.parts[n.part]) parts[n.part] = doc.parts[n.part];
  return structuredClone({ format: CLIP_FORMAT, nodes, edges, parts });
}

/** Read a clipboard text; anything that is not our fragment gives null (pasting foreign text does nothing). */
export function parseClip(text: string | null | undefined): Clip | null {
  if (!text) return null;
  try {
    const v = JSON.parse(text) as Partial<Clip>;
    if (v?.format !== CLIP_FORMAT || !Array.isArray(v.nodes) || !Array.isArray(v.edges)) return null;
    const nodes = v.nodes.filter(
      (n): n is DraftNode => !!n && typeof n.id === "string" && typeof n.kind === "string" && typeof n.params === "object",
    );
    return { format: CLIP_FORMAT, nodes, edges: v.edges, parts: v.parts && typeof v.parts === "object" ? v.parts : {} };
  } catch {
    return null;
  }
}

export interface PasteOutcome {
  doc: DraftDoc;
  newIds: string[];
  /** things the paste left out, in words for a notice */
  skipped: string[];
}

/**
 * Insert a fragment: new ids for every node, positions shifted by `offset`, parts merged (a part whose key
 * is taken by a different model gets a new key). A second source is left out: a chain has exactly one.
 */
export function pasteClip(doc: DraftDoc, clip: Clip, offset = { x: 40, y: 40 }): PasteOutcome {
  const taken = new Set(doc.nodes.map((n) => n.id));
  const parts = { ...doc.parts };
  const partMap = new Map<string, string>();
  for (const [key, part] of Object.entries(clip.parts)) {
    if (parts[key] && JSON.stringify(parts[key]) === JSON.stringify(part)) {
      partMap.set(key, key);
      continue;
    }
    const newKey = parts[key] ? nextPartKey(Object.keys(parts)) : key;
    parts[newKey] = structuredClone(part);
    partMap.set(key, newKey);
  }
  const hasSource = doc.nodes.some((n) => isSourceKind(n.kind));
  const idMap = new Map<string, string>();
  const skipped: string[] = [];
  const added: DraftNode[] = [];
  for (const n of clip.nodes) {
    if (isSourceKind(n.kind) && (hasSource || added.some((a) => isSourceKind(a.kind)))) {
      skipped.push("the source (a chain has only one)");
      continue;
    }
    const id = nextNodeId(n.kind, taken);
    taken.add(id);
    idMap.set(n.id, id);
    const copy: DraftNode = structuredClone(n);
    copy.id = id;
    if (copy.part) copy.part = partMap.get(copy.part) ?? null;
    copy.position = { x: (n.position?.x ?? 0) + offset.x, y: (n.position?.y ?? 0) + offset.y };
    added.push(copy);
  }
  const edges = clip.edges
    .filter((e) => idMap.has(e.from) && idMap.has(e.to))
    .map((e) => ({ from: idMap.get(e.from)!, to: idMap.get(e.to)! }));
  return {
    doc: { ...doc, parts, nodes: [...doc.nodes, ...added], edges: [...doc.edges, ...edges] },
    newIds: added.map((n) => n.id),
    skipped,
  };
}
