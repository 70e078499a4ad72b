/**
 * Keeps the store's live analysis in step with the draft. Every edit that can change a figure asks the
 * quick tier for the new draft (one request in flight, and only the latest waiting, so the plot never
 * falls behind by more than one analysis); a pause in editing asks the full tier. Moving cards around
 * changes nothing the engine sees and asks for nothing.
 *
 * Performance marks `cw:edit:N`, `cw:live:N` (N the driver's revision) let the browser benchmark time an
 * edit through to the plot and the rail spans.
 */
import type { DraftDoc } from "./draft";
import type { EditorStore } from "./editor-store";
import { assembleLive, fullTier, quickTier, type FullTier, type QuickTier } from "./live-analysis";
import type { AnalysisRequest, AnalysisResponse } from "./analysis-protocol";

export interface TierRunner {
  run(req: AnalysisRequest): Promise<AnalysisResponse>;
  /**
   * The answer at once, computed in this thread, when this runner would compute it here anyway; undefined
   * when it would not (a worker). The driver then publishes the figures inside the edit that asked for
   * them, and the page renders the edit and its figures in one pass.
   */
  runNow?(req: AnalysisRequest): AnalysisResponse | undefined;
  dispose(): void;
}

function compute(req: AnalysisRequest): AnalysisResponse {
  return req.tier === "quick" ? { tier: "quick", seq: req.seq, quick: quickTier(req.doc) } : { tier: "full", seq: req.seq, full: fullTier(req.doc) };
}

/**
 * Runs requests in this thread: at once through `runNow`, or right after the code that asked (a
 * microtask) through `run`; either way the edit and its figures reach the screen in the same frame. Used
 * while the quick tier takes less than a frame (adaptiveRunner), in tests, and in browsers without
 * module workers.
 */
export function inlineRunner(): TierRunner {
  return {
    run: (req) => new Promise((resolve) => queueMicrotask(() => resolve(compute(req)))),
    runNow: compute,
    dispose() {},
  };
}

/**
 * The quick tier where it is fastest overall: in this thread while it stays within `budgetMs` (one frame at
 * 60 Hz by default: no worker round trip, which costs about 10 ms in headless Chromium here, and a keystroke
 * is held up by less than a frame), in the worker once a chain makes it slower than that. The choice follows
 * the median of the last three measured runs, so a growing chain moves to the worker and a shrinking one
 * comes back, while one slow run (a garbage collection in the middle of it) does not send the next edit on a
 * round trip.
 */
export function adaptiveRunner(inline: TierRunner, worker: TierRunner, budgetMs = 16): TierRunner & { where(): "inline" | "worker" } {
  const recent: number[] = [];
  let where: "inline" | "worker" = "inline";
  const choose = () => {
    const sorted = [...recent].sort((a, b) => a - b);
    where = !sorted.length || sorted[(sorted.length - 1) >> 1] <= budgetMs ? "inline" : "worker";
    return where;
  };
  const record = (res: AnalysisResponse) => {
    if (res.tier !== "quick") return;
    recent.push(res.quick.ms);
    if (recent.length > 3) recent.shift();
  };
  return {
    where: () => where,
    run: async (req) => {
      const res = await (choose() === "inline" ? inline : worker).run(req);
      record(res);
      return res;
    },
    runNow: (req) => {
      if (choose() !== "inline" || !inline.runNow) return undefined;
      const res = inline.runNow(req);
      if (res) record(res);
      return res;
    },
    dispose() {
      inline.dispose();
      worker.dispose();
    },
  };
}

/** Runs requests in a web worker; answers are matched to requests by sequence number. */
export function workerRunner(worker: Worker): TierRunner {
  const waiting = new Map<number, (r: AnalysisResponse) => void>();
  worker.onmessage = (e: MessageEvent<AnalysisResponse>) => {
    const done = waiting.get(e.data.seq);
    waiting.delete(e.data.seq);
    done?.(e.data);
  };
  worker.onerror = (e) => {
    // Answer every open request with the failure so the workspace shows it instead of waiting forever.
    for (const [seq, done] of waiting) {
      const error = `the analysis worker failed (${e.message || "unknown error"})`;
      done({ tier: "quick", seq, quick: { chain: null, issues: [], result: null, curves: null, ms: 0, error } });
    }
    waiting.clear();
  };
  return {
    run: (req) =>
      new Promise((resolve) => {
        waiting.set(req.seq, resolve);
        worker.postMessage(req);
      }),
    dispose: () => worker.terminate(),
  };
}

/** Does anything the analysis reads differ? (Positions do not count.) */
export function sameAnalysisInput(a: DraftDoc, b: DraftDoc): boolean {
  if (a === b) return true;
  if (a.analysis !== b.analysis || a.parts !== b.parts || a.edges !== b.edges || a.tolerances !== b.tolerances || a.name !== b.name) return false;
  if (a.nodes.length !== b.nodes.length) return false;
  for (let i = 0; i < a.nodes.length; i++) {
    const x = a.nodes[i];
    const y = b.nodes[i];
    if (x === y) continue;
    if (x.id !== y.id || x.kind !== y.kind || x.params !== y.params || x.part !== y.part || x.rails !== y.rails || x.label !== y.label) return false;
  }
  return true;
}

export interface AnalysisDriver {
  stop(): void;
}

function mark(name: string, detail?: unknown) {
  try {
    performance.mark(name, detail === undefined ? undefined : { detail });
  } catch {
    /* marks are a measuring aid only */
  }
}

export function startAnalysis(store: EditorStore, runners: { quick: TierRunner; full: TierRunner }, opts: { fullDelayMs?: number } = {}): AnalysisDriver {
  const fullDelay = opts.fullDelayMs ?? 400;
  let seq = 0;
  let rev = 0;
  let stopped = false;
  let analysed: DraftDoc | null = null;
  let lastQuick: { doc: DraftDoc; rev: number; tier: QuickTier } | null = null;
  let lastFull: { doc: DraftDoc; tier: FullTier } | null = null;
  let quickBusy = false;
  let quickNext: { doc: DraftDoc; rev: number } | null = null;
  let fullBusy = false;
  let fullNext: DraftDoc | null = null;
  let fullTimer: ReturnType<typeof setTimeout> | null = null;

  const publish = () => {
    if (!lastQuick || stopped) return;
    const s = store.getState();
    s.actions.setLive(assembleLive(lastQuick.doc, lastQuick.rev, lastQuick.tier, lastFull, s.live));
  };

  const landQuick = (res: AnalysisResponse, doc: DraftDoc, r: number) => {
    if (stopped || res.tier !== "quick") return;
    lastQuick = { doc, rev: r, tier: res.quick };
    publish();
    const where = "where" in runners.quick ? (runners.quick as { where(): string }).where() : "worker";
    mark(`cw:live:${r}`, { quickMs: res.quick.ms, steps: res.quick.steps, where });
  };

  const sendQuick = (doc: DraftDoc, r: number) => {
    const req: AnalysisRequest = { tier: "quick", seq: ++seq, doc };
    // nothing is in flight here, so an answer computed at once cannot be overtaken by an older one
    const now = runners.quick.runNow?.(req);
    if (now) {
      landQuick(now, doc, r);
      return;
    }
    quickBusy = true;
    void runners.quick.run(req).then((res) => {
      quickBusy = false;
      landQuick(res, doc, r);
      if (quickNext) {
        const n = quickNext;
        quickNext = null;
        sendQuick(n.doc, n.rev);
      }
    });
  };

  const sendFull = (doc: DraftDoc) => {
    fullBusy = true;
    void runners.full.run({ tier: "full", seq: ++seq, doc }).then((res) => {
      fullBusy = false;
      if (stopped || res.tier !== "full") return;
      lastFull = { doc, tier: res.full };
      if (lastQuick?.doc === doc) publish();
      if (fullNext) {
        const n = fullNext;
        fullNext = null;
        sendFull(n);
      }
    });
  };

  const request = (doc: DraftDoc) => {
    analysed = doc;
    const r = ++rev;
    mark(`cw:edit:${r}`);
    if (quickBusy) quickNext = { doc, rev: r };
    else sendQuick(doc, r);
    if (fullTimer) clearTimeout(fullTimer);
    fullTimer = setTimeout(() => {
      fullTimer = null;
      if (fullBusy) fullNext = doc;
      else sendFull(doc);
    }, fullDelay);
  };

  const unsubscribe = store.subscribe((s) => {
    if (analysed && sameAnalysisInput(analysed, s.doc)) return;
    request(s.doc);
  });
  request(store.getState().doc);

  return {
    stop() {
      stopped = true;
      unsubscribe();
      if (fullTimer) clearTimeout(fullTimer);
      runners.quick.dispose();
      runners.full.dispose();
    },
  };
}

/**
 * The driver as the workspace runs it: the full tier in a module worker, the quick tier in this thread
 * while it is quick enough and in a second worker when it is not (see adaptiveRunner). Without module
 * workers everything runs in this thread.
 */
export function startBrowserAnalysis(store: EditorStore): AnalysisDriver {
  const quick = adaptiveRunner(inlineRunner(), lazyRunner(() => new Worker(new URL("./analysis.worker.ts", import.meta.url), { type: "module", name: "cw-quick" })));
  const full = lazyRunner(() => new Worker(new URL("./analysis.worker.ts", import.meta.url), { type: "module", name: "cw-full" }), { firstWhenIdle: true });
  return startAnalysis(store, { quick, full });
}

/**
 * A worker runner whose worker starts with its first request, not before: a worker loads and compiles the
 * engine, work that competes with the page's own while a chain opens (the quick tier's worker is not
 * started at all while the quick tier stays in this thread). `firstWhenIdle`: the first request also
 * waits for the browser's idle time, so the full tier's first run does not fall into the page's first
 * rendering. Without module workers the requests run in this thread.
 */
export function lazyRunner(make: () => Worker, opts: { firstWhenIdle?: boolean } = {}): TierRunner {
  let runner: TierRunner | null = null;
  let first: Promise<void> | null = null;
  let disposed = false;
  const idle = () =>
    new Promise<void>((resolve) => {
      if (typeof requestIdleCallback === "function") requestIdleCallback(() => resolve(), { timeout: 1500 });
      else setTimeout(resolve, 0);
    });
  const start = (): TierRunner => {
    if (runner) return runner;
    try {
      runner = workerRunner(make());
    } catch {
      runner = inlineRunner();
    }
    return runner;
  };
  return {
    run: async (req) => {
      if (opts.firstWhenIdle && !runner) await (first ??= idle());
      if (disposed) return new Promise(() => {}); // stopped while waiting: no answer is wanted
      return start().run(req);
    },
    dispose: () => {
      disposed = true;
      runner?.dispose();
    },
  };
}
