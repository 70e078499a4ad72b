/**
 * A readable comparison of two chain documents (any level: drafts too): which stages were added,
 * removed or changed, and for each changed value its old and new text in engineering notation;
 * connections, op-amp models, analysis settings and tolerances likewise. Positions on the canvas are
 * not values: a stage that only moved is listed under `moved`, never as a change.
 */
import { formatAnalysisSetting, formatParam, formatPartFigure, formatValue } from "./values";

export interface ValueChange {
  /** the field as a path inside its stage, part or setting group: `r2`, `rails.low`, `part`, `fMax` */
  field: string;
  old: string;
  new: string;
}

export type ChangeKind = "added" | "removed" | "changed";

export interface StageChange {
  id: string;
  kind: string;
  label: string | null;
  change: ChangeKind;
  /** for "changed": every value that differs; for added/removed: every value the stage holds */
  values: ValueChange[];
}

export interface PartChange {
  key: string;
  label: string | null;
  change: ChangeKind;
  values: ValueChange[];
}

export interface ChainDiff {
  name: ValueChange | null;
  notesChanged: boolean;
  stages: StageChange[];
  edges: { added: Array<{ from: string; to: string }>; removed: Array<{ from: string; to: string }> };
  parts: PartChange[];
  settings: ValueChange[];
  /** stages present in both whose only difference is their place on the canvas */
  moved: string[];
}

type Rec = Record<string, unknown>;

function isRec(v: unknown): v is Rec {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

function rec(v: unknown): Rec {
  return isRec(v) ? v : {};
}

function same(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== "object" || typeof b !== "object" || a === null || b === null) return false;
  return JSON.stringify(a) === JSON.stringify(b);
}

function nodesById(doc: Rec): Map<string, Rec> {
  const out = new Map<string, Rec>();
  if (!Array.isArray(doc.nodes)) return out;
  for (const n of doc.nodes) if (isRec(n) && typeof n.id === "string") out.set(n.id, n);
  return out;
}

function textOf(v: unknown): string | null {
  return typeof v === "string" && v !== "" ? v : null;
}

/** Every value a stage holds, as field → text (params, then label, part and rails). */
function stageValues(node: Rec): Map<string, string> {
  const kind = String(node.kind ?? "");
  const out = new Map<string, string>();
  for (const [k, v] of Object.entries(rec(node.params))) out.set(k, formatParam(kind, k, v));
  if (node.label !== undefined) out.set("label", formatValue(node.label, null));
  if (node.part !== undefined) out.set("part", formatValue(node.part, null));
  const rails = node.rails;
  if (isRec(rails)) {
    out.set("rails.low", formatValue(rails.low, "volt"));
    out.set("rails.high", formatValue(rails.high, "volt"));
  }
  return out;
}

function compareMaps(a: Map<string, string>, b: Map<string, string>): ValueChange[] {
  const out: ValueChange[] = [];
  for (const key of new Set([...a.keys(), ...b.keys()])) {
    const o = a.get(key) ?? "—";
    const n = b.get(key) ?? "—";
    if (o !== n) out.push({ field: key, old: o, new: n });
  }
  return out;
}

function stageDiff(before: Map<string, Rec>, after: Map<string, Rec>): { stages: StageChange[]; moved: string[] } {
  const stages: StageChange[] = [];
  const moved: string[] = [];
  for (const [id, old] of before) {
    const now = after.get(id);
    if (!now) {
      const values = [...stageValues(old)].map(([field, v]) => ({ field, old: v, new: "—" }));
      stages.push({ id, kind: String(old.kind ?? ""), label: textOf(old.label), change: "removed", values });
      continue;
    }
    // A change of kind keeps the id but is a different stage: every value is compared as text.
    const values = compareMaps(stageValues(old), stageValues(now));
    if (old.kind !== now.kind) values.unshift({ field: "kind", old: String(old.kind), new: String(now.kind) });
    if (values.length) stages.push({ id, kind: String(now.kind ?? ""), label: textOf(now.label), change: "changed", values });
    else if (!same(old.position, now.position)) moved.push(id);
  }
  for (const [id, now] of after) {
    if (before.has(id)) continue;
    const values = [...stageValues(now)].map(([field, v]) => ({ field, old: "—", new: v }));
    stages.push({ id, kind: String(now.kind ?? ""), label: textOf(now.label), change: "added", values });
  }
  return { stages, moved };
}

function edgeKeys(doc: Rec): Map<string, { from: string; to: string }> {
  const out = new Map<string, { from: string; to: string }>();
  if (!Array.isArray(doc.edges)) return out;
  for (const e of doc.edges) {
    if (isRec(e) && typeof e.from === "string" && typeof e.to === "string") out.set(`${e.from}\u0000${e.to}`, { from: e.from, to: e.to });
  }
  return out;
}

function partValues(part: Rec): Map<string, string> {
  const out = new Map<string, string>();
  for (const [k, v] of Object.entries(part)) out.set(k, k === "label" ? formatValue(v, null) : formatPartFigure(k, v));
  return out;
}

function partDiff(a: Rec, b: Rec): PartChange[] {
  const out: PartChange[] = [];
  for (const key of new Set([...Object.keys(a), ...Object.keys(b)])) {
    const old = a[key];
    const now = b[key];
    const label = textOf(rec(now ?? old).label);
    if (old === undefined) out.push({ key, label, change: "added", values: compareMaps(new Map(), partValues(rec(now))) });
    else if (now === undefined) out.push({ key, label, change: "removed", values: compareMaps(partValues(rec(old)), new Map()) });
    else {
      const values = compareMaps(partValues(rec(old)), partValues(rec(now)));
      if (values.length) out.push({ key, label, change: "changed", values });
    }
  }
  return out;
}

function settingsDiff(a: Rec, b: Rec): ValueChange[] {
  const out: ValueChange[] = [];
  const analysisA = rec(a.analysis);
  const analysisB = rec(b.analysis);
  for (const k of new Set([...Object.keys(analysisA), ...Object.keys(analysisB)])) {
    if (!same(analysisA[k], analysisB[k])) {
      out.push({ field: `analysis.${k}`, old: formatAnalysisSetting(k, analysisA[k]), new: formatAnalysisSetting(k, analysisB[k]) });
    }
  }
  const tolA = rec(a.tolerances);
  const tolB = rec(b.tolerances);
  for (const k of new Set([...Object.keys(tolA), ...Object.keys(tolB)])) {
    if (!same(tolA[k], tolB[k])) out.push({ field: `tolerances.${k}`, old: formatValue(tolA[k], "percent"), new: formatValue(tolB[k], "percent") });
  }
  return out;
}

/** Compare two chain documents (old first). Anything that is not a document compares as an empty one. */
export function diffChains(before: unknown, after: unknown): ChainDiff {
  const a = rec(before);
  const b = rec(after);
  const { stages, moved } = stageDiff(nodesById(a), nodesById(b));
  const ea = edgeKeys(a);
  const eb = edgeKeys(b);
  return {
    name: a.name !== b.name ? { field: "name", old: formatValue(a.name, null), new: formatValue(b.name, null) } : null,
    notesChanged: (a.notes ?? "") !== (b.notes ?? ""),
    stages,
    edges: {
      added: [...eb].filter(([k]) => !ea.has(k)).map(([, e]) => e),
      removed: [...ea].filter(([k]) => !eb.has(k)).map(([, e]) => e),
    },
    parts: partDiff(rec(a.parts), rec(b.parts)),
    settings: settingsDiff(a, b),
    moved,
  };
}

/** True when the two documents differ in anything a reader would call a change (moves excluded). */
export function hasChanges(diff: ChainDiff): boolean {
  return (
    diff.name !== null ||
    diff.notesChanged ||
    diff.stages.length > 0 ||
    diff.edges.added.length > 0 ||
    diff.edges.removed.length > 0 ||
    diff.parts.length > 0 ||
    diff.settings.length > 0
  );
}

const SUMMARY_MAX = 240;

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? "" : "s"}`;
}

function stageName(s: { id: string; label: string | null }): string {
  return s.label ? `${s.label} (${s.id})` : s.id;
}

/**
 * A one-line account of a diff for the revision list: the values themselves when there are few
 * ("u1: r2 100 kΩ → 47.0 kΩ"), counts when there are many. At most 240 characters.
 */
export function summarizeDiff(diff: ChainDiff): string {
  const parts: string[] = [];
  const changed = diff.stages.filter((s) => s.change === "changed");
  const added = diff.stages.filter((s) => s.change === "added");
  const removed = diff.stages.filter((s) => s.change === "removed");
  const valueCount = changed.reduce((n, s) => n + s.values.length, 0);
  if (diff.name) parts.push(`renamed to “${diff.name.new}”`);
  if (added.length) parts.push(`added ${added.length > 2 ? plural(added.length, "stage") : added.map(stageName).join(", ")}`);
  if (removed.length) parts.push(`removed ${removed.length > 2 ? plural(removed.length, "stage") : removed.map(stageName).join(", ")}`);
  if (valueCount > 0 && valueCount <= 2) {
    for (const s of changed) for (const v of s.values) parts.push(`${stageName(s)}: ${v.field} ${v.old} → ${v.new}`);
  } else if (valueCount > 2) {
    parts.push(`changed ${plural(valueCount, "value")} in ${changed.length > 3 ? plural(changed.length, "stage") : changed.map(stageName).join(", ")}`);
  }
  const edgeCount = diff.edges.added.length + diff.edges.removed.length;
  if (edgeCount) {
    const bits = [];
    if (diff.edges.added.length) bits.push(`${diff.edges.added.length} connected`);
    if (diff.edges.removed.length) bits.push(`${diff.edges.removed.length} disconnected`);
    parts.push(`connections: ${bits.join(", ")}`);
  }
  if (diff.parts.length) parts.push(`op-amp models: ${diff.parts.map((p) => `${p.label ?? p.key} ${p.change}`).join(", ")}`);
  if (diff.settings.length) parts.push(diff.settings.length <= 2 ? diff.settings.map((v) => `${v.field} ${v.old} → ${v.new}`).join(", ") : `${plural(diff.settings.length, "setting")} changed`);
  if (diff.notesChanged) parts.push("notes edited");
  if (!parts.length) return diff.moved.length ? `Moved ${plural(diff.moved.length, "stage")}` : "no change";
  const text = parts.join("; ");
  // Sentences that start with one of our words get a capital; ids and field names keep their case.
  const sentence = /^(renamed|added|removed|changed|connections|op-amp|notes)/.test(text) ? text.charAt(0).toUpperCase() + text.slice(1) : text;
  return sentence.length > SUMMARY_MAX ? `${sentence.slice(0, SUMMARY_MAX - 1)}…` : sentence;
}
