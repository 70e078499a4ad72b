/**
 * Autosave of the draft: a short while after the last edit the draft is saved with the version it was
 * based on. A stale save (409) puts the editor in the conflict state and nothing more is saved until the
 * user chooses to reload or keep a copy; nothing is ever overwritten silently. Other failures are shown
 * and retried, with a growing pause, while the draft keeps changing locally.
 */
import type { DraftDoc } from "./draft";
import type { EditorStore } from "./editor-store";

export interface SaveResult {
  version: number;
}

export type SaveFn = (input: { id: string; baseVersion: number; document: DraftDoc }) => Promise<SaveResult>;

export interface SaveFailureLike {
  status?: number;
  message: string;
  body?: { currentVersion?: number };
}

export interface AutosaveOptions {
  delayMs?: number;
  /** first retry pause after a failure that may pass (network, 5xx) */
  retryMs?: number;
}

export interface Autosave {
  /** save now if there is anything to save (Ctrl S); resolves when that save ends */
  flush(): Promise<void>;
  stop(): void;
}

export function startAutosave(store: EditorStore, save: SaveFn, opts: AutosaveOptions = {}): Autosave {
  const delay = opts.delayMs ?? 1200;
  const firstRetry = opts.retryMs ?? 4000;
  let timer: ReturnType<typeof setTimeout> | null = null;
  let inFlight: Promise<void> | null = null;
  let retry = firstRetry;
  let stopped = false;

  const pending = () => {
    const s = store.getState();
    return !s.readOnly && !!s.chainId && s.doc !== s.savedDoc && (s.save === "unsaved" || s.save === "error");
  };

  const schedule = (ms: number) => {
    if (stopped) return;
    if (timer) clearTimeout(timer);
    timer = setTimeout(() => {
      timer = null;
      void run();
    }, ms);
  };

  const run = async (): Promise<void> => {
    if (inFlight) {
      await inFlight;
      if (pending()) return run();
      return;
    }
    if (!pending()) return;
    const s = store.getState();
    const sent = s.doc;
    s.actions.markSaving();
    inFlight = (async () => {
      try {
        const out = await save({ id: s.chainId!, baseVersion: s.version, document: sent });
        retry = firstRetry;
        store.getState().actions.markSaved(out.version, sent);
      } catch (e) {
        const err = e as SaveFailureLike;
        if (err.status === 409) {
          store.getState().actions.markConflict({ serverVersion: err.body?.currentVersion ?? null });
        } else {
          store.getState().actions.markSaveError(err.message || "the save failed");
          // A refusal of the request itself (400, 401, 403, 404) will not pass by waiting.
          if (!err.status || err.status >= 500) {
            schedule(retry);
            retry = Math.min(retry * 2, 60_000);
          }
        }
      } finally {
        inFlight = null;
      }
    })();
    await inFlight;
    if (pending() && store.getState().save === "unsaved") schedule(delay);
  };

  const unsubscribe = store.subscribe((s, prev) => {
    if (s.doc !== prev.doc && s.save === "unsaved") schedule(delay);
  });

  return {
    async flush() {
      if (timer) clearTimeout(timer);
      timer = null;
      await run();
    },
    stop() {
      stopped = true;
      unsubscribe();
      if (timer) clearTimeout(timer);
    },
  };
}
