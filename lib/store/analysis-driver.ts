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
  dispose(): void;
}

/** Runs requests in this thread, after a macrotask (tests, or a browser without module workers). */
export function inlineRunner(): TierRunner {
  return {
    run: (req) =>
      new Promise((resolve) =>
        setTimeout(() => resolve(req.tier === "quick" ? { tier: "quick", seq: req.seq, quick: quickTier(req.doc) } : { tier: "full", seq: req.seq, full: fullTier(req.doc) }), 0),
      ),
    dispose() {},
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

function mark(name: string) {
  try {
    performance.mark(name);
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

  const sendQuick = (doc: DraftDoc, r: number) => {
    quickBusy = true;
    void runners.quick.run({ tier: "quick", seq: ++seq, doc }).then((res) => {
      quickBusy = false;
      if (stopped || res.tier !== "quick") return;
      lastQuick = { doc, rev: r, tier: res.quick };
      publish();
      mark(`cw:live:${r}`);
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

/** The driver as the workspace runs it: two module workers where the browser has them, else inline. */
export function startBrowserAnalysis(store: EditorStore): AnalysisDriver {
  let quick: TierRunner;
  let full: TierRunner;
  try {
    quick = workerRunner(new Worker(new URL("./analysis.worker.ts", import.meta.url), { type: "module", name: "cw-quick" }));
    full = workerRunner(new Worker(new URL("./analysis.worker.ts", import.meta.url), { type: "module", name: "cw-full" }));
  } catch {
    quick = inlineRunner();
    full = inlineRunner();
  }
  return startAnalysis(store, { quick, full });
}
