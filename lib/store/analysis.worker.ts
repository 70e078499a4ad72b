/// <reference lib="webworker" />
/**
 * Runs one tier of the live analysis off the main thread, so typing never waits for the engine.
 * The workspace starts two of these: one for the quick tier (every edit) and one for the full tier.
 */
import { fullTier, quickTier } from "./live-analysis";
import type { AnalysisRequest, AnalysisResponse } from "./analysis-protocol";

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (e: MessageEvent<AnalysisRequest>) => {
  const { tier, seq, doc } = e.data;
  if (tier === "quick") {
    const out = quickTier(doc);
    const c = out.curves;
    // Hand the curve arrays over instead of copying them (each sweep array owns its buffer or shares one).
    // Not the grid: the next run reuses it (live-analysis keeps it while the settings stay), so it is copied.
    const transfer = c ? [...c.cumRe, ...c.cumIm, ...c.indRe, ...c.indIm].map((a) => a.buffer as ArrayBuffer) : [];
    const msg: AnalysisResponse = { tier, seq, quick: out };
    scope.postMessage(msg, [...new Set(transfer)]);
  } else {
    const msg: AnalysisResponse = { tier, seq, full: fullTier(doc) };
    scope.postMessage(msg);
  }
};
