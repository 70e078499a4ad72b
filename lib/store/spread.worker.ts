/// <reference lib="webworker" />
/**
 * The tolerance spread off the main thread: one run at a time, sliced by driveSpread so a cancel (or a
 * new start, which cancels the old run) is seen within a slice, with progress and partial results.
 */
import { driveSpread } from "./spread-runner";
import type { SpreadMessage, SpreadRequest } from "./spread-protocol";

const scope = self as unknown as DedicatedWorkerGlobalScope;
let current = 0;
const cancelled = new Set<number>();

/** A macrotask: lets the worker take the next message (a cancel) before going on. */
const channel = new MessageChannel();
const waiting: (() => void)[] = [];
channel.port1.onmessage = () => waiting.shift()?.();
const pause = () =>
  new Promise<void>((resolve) => {
    waiting.push(resolve);
    channel.port2.postMessage(0);
  });

const send = (m: SpreadMessage) => scope.postMessage(m);

scope.onmessage = (e: MessageEvent<SpreadRequest>) => {
  const req = e.data;
  if (req.type === "cancel") {
    cancelled.add(req.id);
    return;
  }
  if (current) cancelled.add(current);
  const id = req.id;
  current = id;
  void driveSpread(req.chain, req.opts, {
    cancelled: () => cancelled.has(id),
    pause,
    progress: (done, total, result) => send({ type: "progress", id, done, total, ...(result ? { result } : {}) }),
  })
    .then((out) => {
      cancelled.delete(id);
      if (current === id) current = 0;
      send(out.finished ? { type: "done", id, result: out.result, ms: out.ms } : { type: "cancelled", id, done: out.done, total: out.total });
    })
    .catch((err: unknown) => {
      cancelled.delete(id);
      if (current === id) current = 0;
      send({ type: "error", id, message: err instanceof Error ? err.message : String(err) });
    });
};
