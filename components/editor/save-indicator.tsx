"use client";
/** The draft's save state, as a word and a shape (colour only reinforcing). */
import { useEditor } from "@/lib/store/editor-context";
import type { SaveState } from "@/lib/store/editor-store";

const LOOK: Record<SaveState, { shape: string; word: string; tone: string }> = {
  saved: { shape: "●", word: "Saved", tone: "text-status-ok" },
  unsaved: { shape: "○", word: "Unsaved changes", tone: "text-graphite-500" },
  saving: { shape: "◌", word: "Saving…", tone: "text-accent-700" },
  conflict: { shape: "■", word: "Conflict: not saved", tone: "text-status-clip" },
  error: { shape: "▲", word: "Not saved", tone: "text-status-tight" },
};

export function SaveIndicator() {
  const save = useEditor((s) => s.save);
  const readOnly = useEditor((s) => s.readOnly);
  const error = useEditor((s) => s.saveError);
  const version = useEditor((s) => s.version);
  if (readOnly) {
    return (
      <span className="inline-flex items-center gap-1.5 text-[12.5px] text-graphite-700" data-testid="save-state" data-state="read-only">
        <span aria-hidden>◇</span> Read only
      </span>
    );
  }
  const look = LOOK[save];
  return (
    <span
      className="inline-flex items-center gap-1.5 text-[12.5px] text-graphite-900"
      data-testid="save-state"
      data-state={save}
      title={error ?? `version ${version}`}
      role="status"
      aria-live="polite"
    >
      <span aria-hidden className={look.tone}>
        {look.shape}
      </span>
      {look.word}
      {save === "error" && error ? <span className="max-w-[16rem] truncate text-graphite-500">({error})</span> : null}
      {save === "saved" && <span className="num text-graphite-400">v{version}</span>}
    </span>
  );
}
