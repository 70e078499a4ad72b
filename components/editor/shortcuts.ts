/**
 * The workspace's keyboard commands. Every canvas action has a key; the table is shown to the user in the
 * "Keys" list, and `commandFor` is the one place that reads key events, so the two never disagree.
 * Keys are ignored while typing in a field (the field's own editing keys win).
 */
import type { NodeKind } from "@/lib/chain/types";
import { SHELF_ORDER } from "@/lib/store/stage-catalog";

export type Command =
  | { type: "delete" | "undo" | "redo" | "duplicate" | "copy" | "cut" | "paste" | "selectAll" | "tidy" | "fit" | "deselect" | "connect" | "save" }
  | { type: "add"; kind: NodeKind };

export interface KeyLike {
  key: string;
  ctrlKey: boolean;
  metaKey: boolean;
  shiftKey: boolean;
  altKey: boolean;
}

/**
 * The digit that adds each shelf kind: 1…9 for the first nine, 0 for the last (the ADC). The shelf holds more
 * than ten kinds, so the ones between have no digit (undefined here); they are added from the shelf.
 */
const LAST_KIND = SHELF_ORDER[SHELF_ORDER.length - 1];
export const SHELF_KEYS: Partial<Record<NodeKind, string>> = Object.fromEntries([
  ...SHELF_ORDER.slice(0, 9).map((k, i) => [k, String(i + 1)]),
  [LAST_KIND, "0"],
]);

export const KEY_TABLE: { keys: string; what: string }[] = [
  { keys: "1 … 9, 0", what: "add the shelf's first nine stages, or (0) the ADC (after the selected node, connected)" },
  { keys: "K", what: "connect the two selected nodes, left to right" },
  { keys: "Delete", what: "delete the selected nodes or connections" },
  { keys: "Ctrl D", what: "duplicate" },
  { keys: "Ctrl C / X / V", what: "copy, cut, paste (also into another chain)" },
  { keys: "Ctrl Z", what: "undo" },
  { keys: "Ctrl Shift Z, Ctrl Y", what: "redo" },
  { keys: "Ctrl A", what: "select everything" },
  { keys: "T", what: "tidy the layout, left to right" },
  { keys: "F", what: "fit the chain in view" },
  { keys: "Esc", what: "clear the selection" },
  { keys: "Ctrl S", what: "save now" },
  { keys: "Tab, arrows", what: "move between cards; arrows move the selected card" },
];

export function commandFor(e: KeyLike): Command | null {
  const mod = e.ctrlKey || e.metaKey;
  const k = e.key.length === 1 ? e.key.toLowerCase() : e.key;
  if (mod && !e.altKey) {
    if (k === "z") return { type: e.shiftKey ? "redo" : "undo" };
    if (k === "y") return { type: "redo" };
    if (k === "d") return { type: "duplicate" };
    if (k === "c") return { type: "copy" };
    if (k === "x") return { type: "cut" };
    if (k === "v") return { type: "paste" };
    if (k === "a") return { type: "selectAll" };
    if (k === "s") return { type: "save" };
    return null;
  }
  if (e.altKey || mod) return null;
  if (k === "Delete" || k === "Backspace") return { type: "delete" };
  if (k === "Escape") return { type: "deselect" };
  if (e.shiftKey) return null;
  if (k === "t") return { type: "tidy" };
  if (k === "f") return { type: "fit" };
  if (k === "k") return { type: "connect" };
  if (/^[0-9]$/.test(k)) {
    const kind = k === "0" ? LAST_KIND : SHELF_ORDER[Number(k) - 1];
    return kind ? { type: "add", kind } : null;
  }
  return null;
}

/** Is the event aimed at something the user types into? Then the workspace leaves it alone. */
export function isTypingTarget(t: EventTarget | null): boolean {
  if (!t || typeof (t as HTMLElement).tagName !== "string") return false;
  const el = t as HTMLElement;
  const tag = el.tagName;
  return tag === "INPUT" || tag === "TEXTAREA" || tag === "SELECT" || el.isContentEditable;
}
