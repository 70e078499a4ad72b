/**
 * Runs a tolerance spread in slices: a few evaluations at a time (at most `sliceMs` of work), then a
 * pause (`pause()`, a macrotask in the worker) so a cancel message can arrive between slices; progress
 * after every slice and a partial result every `partialEveryMs`. The numbers do not depend on how the
 * work is sliced (lib/engine/spread.ts), so this gives exactly what `runSpread` and the command line give.
 * Pure apart from the clock and the callbacks; the worker and the tests both use it.
 */
import type { Chain } from "@/lib/chain/types";
import { startSpread, type SpreadOptions, type SpreadResult } from "@/lib/engine/spread";

export interface DriveOptions {
  /** longest slice of work between pauses, ms (default 20: a cancel is seen within about that) */
  sliceMs?: number;
  /** how often a partial result is sent at the most, ms (default 400; each costs a sort of every build's figures) */
  partialEveryMs?: number;
  cancelled(): boolean;
  pause(): Promise<void>;
  progress(done: number, total: number, partial?: SpreadResult): void;
  now?: () => number;
}

export type DriveOutcome = { finished: true; result: SpreadResult; ms: number } | { finished: false; done: number; total: number };

export async function driveSpread(chain: Chain, opts: SpreadOptions, d: DriveOptions): Promise<DriveOutcome> {
  const now = d.now ?? (() => performance.now());
  const sliceMs = d.sliceMs ?? 20;
  const partialEvery = d.partialEveryMs ?? 400;
  const t0 = now();
  const run = startSpread(chain, opts);
  let lastPartial = t0;
  // a partial result sorts every build's figures, so it costs more as builds accumulate (about 30 ms at
  // 10,000 builds): it is spaced to at least 4× its own cost, so it never takes over a fifth of the time
  let partialCost = 0;
  const stopped = (): DriveOutcome => ({ finished: false, done: run.done, total: run.total });
  for (;;) {
    if (d.cancelled()) return stopped();
    const start = now();
    let finished = false;
    // one evaluation at a time until the slice is used up
    while (!(finished = run.step(1)) && now() - start < sliceMs);
    if (finished) return { finished: true, result: run.result(), ms: now() - t0 };
    let partial: SpreadResult | undefined;
    if (now() - lastPartial >= Math.max(partialEvery, 4 * partialCost)) {
      // a cancel sent during the slice is taken before the partial's work, not after it
      await d.pause();
      if (d.cancelled()) return stopped();
      const t = now();
      partial = run.result();
      partialCost = now() - t;
      lastPartial = now();
    }
    d.progress(run.done, run.total, partial);
    await d.pause();
  }
}
