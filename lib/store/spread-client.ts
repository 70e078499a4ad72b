/**
 * The workspace's handle on the spread worker: one run at a time, a new run or a cancel stops the old one
 * (the worker sees it between slices of about 20 ms). Without module workers the same sliced driver runs
 * in this thread, pausing on a timer so the page stays responsive.
 */
import type { Chain } from "@/lib/chain/types";
import type { SpreadOptions } from "@/lib/engine/spread";
import type { SpreadMessage, SpreadRequest } from "./spread-protocol";
import { driveSpread } from "./spread-runner";

export interface SpreadClient {
  /** starts a run and returns its id; messages for it go to the listener */
  start(chain: Chain, opts: SpreadOptions): number;
  cancel(): void;
  dispose(): void;
  /** "worker" or "inline" (no module workers) */
  readonly where: "worker" | "inline";
}

export function createSpreadClient(listener: (m: SpreadMessage) => void): SpreadClient {
  let next = 0;
  let current = 0;
  let worker: Worker | null = null;
  try {
    worker = new Worker(new URL("./spread.worker.ts", import.meta.url), { type: "module", name: "cw-spread" });
    worker.onmessage = (e: MessageEvent<SpreadMessage>) => listener(e.data);
    worker.onerror = (e) => listener({ type: "error", id: current, message: `the spread worker failed (${e.message || "unknown error"})` });
  } catch {
    worker = null;
  }
  const cancelled = new Set<number>();
  return {
    where: worker ? "worker" : "inline",
    start(chain, opts) {
      const id = ++next;
      if (current) this.cancel();
      current = id;
      if (worker) {
        worker.postMessage({ type: "start", id, chain, opts } satisfies SpreadRequest);
        return id;
      }
      void driveSpread(chain, opts, {
        cancelled: () => cancelled.has(id),
        pause: () => new Promise((r) => setTimeout(r, 0)),
        progress: (done, total, result) => listener({ type: "progress", id, done, total, ...(result ? { result } : {}) }),
      })
        .then((out) => listener(out.finished ? { type: "done", id, result: out.result, ms: out.ms } : { type: "cancelled", id, done: out.done, total: out.total }))
        .catch((err: unknown) => listener({ type: "error", id, message: err instanceof Error ? err.message : String(err) }));
      return id;
    },
    cancel() {
      if (!current) return;
      if (worker) worker.postMessage({ type: "cancel", id: current } satisfies SpreadRequest);
      else cancelled.add(current);
    },
    dispose() {
      worker?.terminate();
      worker = null;
      if (current) cancelled.add(current);
    },
  };
}
