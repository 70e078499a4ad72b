import { describe, expect, it, vi } from "vitest";
import { adaptiveRunner, inlineRunner, lazyRunner, sameAnalysisInput, startAnalysis, type TierRunner } from "@/lib/store/analysis-driver";
import { createEditorStore } from "@/lib/store/editor-store";
import { findTemplate } from "@/lib/templates";
import type { AnalysisRequest } from "@/lib/store/analysis-protocol";

const settle = () => new Promise((r) => setTimeout(r, 0));

function counting(): TierRunner & { calls: AnalysisRequest[] } {
  const inner = inlineRunner();
  const calls: AnalysisRequest[] = [];
  return { calls, run: (req) => (calls.push(req), inner.run(req)), dispose() {} };
}

describe("startAnalysis", () => {
  it("analyses the opening draft and every edit, then fills in the full analysis after a pause", async () => {
    const store = createEditorStore({ doc: findTemplate("ballast-bridge")!.make(), chainId: "c" });
    const quick = counting();
    const full = counting();
    // the first analysis published, caught as it lands (polling could miss it once the full one is in)
    const published: (number | null)[] = [];
    store.subscribe((s, prev) => {
      if (s.live && s.live !== prev.live) published.push(s.live.adcById.adc1?.snrDb ?? null);
    });
    const driver = startAnalysis(store, { quick, full }, { fullDelayMs: 20 });
    await vi.waitFor(() => expect(store.getState().live?.stageById.u1).toBeDefined());
    expect(published[0]).toBeNull();
    await vi.waitFor(() => expect(store.getState().live!.adcById.adc1.snrDb).not.toBeNull());
    store.getState().actions.setParam("u1", "rg", 1e3);
    await vi.waitFor(() => expect(store.getState().live!.doc).toBe(store.getState().doc));
    expect(store.getState().live!.stageById.u1.dcGain).toBeCloseTo(51, 0); // the in-amp's 1 + 2·rf/rg, finite aol shaves a little
    driver.stop();
  });

  it("keeps one quick request in flight and only the latest edit waiting", async () => {
    const store = createEditorStore({ doc: findTemplate("ballast-bridge")!.make(), chainId: "c" });
    const quick = counting();
    const driver = startAnalysis(store, { quick, full: counting() }, { fullDelayMs: 10_000 });
    const a = store.getState().actions;
    for (const rf of [20e3, 30e3, 40e3, 50e3]) a.setParam("u1", "rf", rf);
    await vi.waitFor(() => expect(store.getState().live?.doc).toBe(store.getState().doc));
    // the opening draft, then only the last of the four edits
    expect(quick.calls).toHaveLength(2);
    expect(quick.calls[1].doc.nodes[1].params.rf).toBe(50e3);
    driver.stop();
  });

  it("publishes the figures inside the edit itself when the quick tier runs in this thread", () => {
    const store = createEditorStore({ doc: findTemplate("ballast-bridge")!.make(), chainId: "c" });
    const driver = startAnalysis(store, { quick: inlineRunner(), full: counting() }, { fullDelayMs: 10_000 });
    expect(store.getState().live?.doc).toBe(store.getState().doc); // the opening draft, analysed at once
    store.getState().actions.setParam("u1", "rg", 1e3);
    // no await in between: the edit and its analysis land together
    expect(store.getState().live!.doc).toBe(store.getState().doc);
    expect(store.getState().live!.stageById.u1.dcGain).toBeCloseTo(51, 0);
    driver.stop();
  });

  it("asks nothing when only positions change", async () => {
    const store = createEditorStore({ doc: findTemplate("ballast-bridge")!.make(), chainId: "c" });
    const quick = counting();
    const driver = startAnalysis(store, { quick, full: counting() }, { fullDelayMs: 10_000 });
    await settle();
    store.getState().actions.moveNodes({ u1: { x: 500, y: 500 } }, true);
    await settle();
    expect(quick.calls).toHaveLength(1);
    driver.stop();
  });
});

describe("adaptiveRunner", () => {
  it("runs the quick tier in this thread while it is within budget and in the worker once it is not", async () => {
    const doc = findTemplate("ballast-bridge")!.make();
    const slow = (ms: number): TierRunner => ({
      run: async (req) => ({ tier: "quick", seq: req.seq, quick: { chain: null, issues: [], result: null, curves: null, ms, error: null } }),
      dispose() {},
    });
    const worker = counting();
    const runner = adaptiveRunner(slow(20), worker, 8);
    await runner.run({ tier: "quick", seq: 1, doc });
    expect(runner.where()).toBe("inline");
    await runner.run({ tier: "quick", seq: 2, doc }); // the first took 20 ms: over budget
    expect(runner.where()).toBe("worker");
    expect(worker.calls).toHaveLength(1);
  });

  it("answers at once only while it would run in this thread", async () => {
    const doc = findTemplate("ballast-bridge")!.make();
    const worker = counting();
    const runner = adaptiveRunner(inlineRunner(), worker, 1e9);
    const now = runner.runNow!({ tier: "quick", seq: 1, doc });
    expect(now?.tier).toBe("quick");
    const strict = adaptiveRunner(inlineRunner(), worker, -1); // every run is over this budget
    expect(strict.runNow!({ tier: "quick", seq: 2, doc })).toBeDefined(); // nothing measured yet: here
    expect(strict.runNow!({ tier: "quick", seq: 3, doc })).toBeUndefined(); // then the worker's
    await strict.run({ tier: "quick", seq: 4, doc });
    expect(worker.calls.map((c) => c.seq)).toEqual([4]);
  });
});

describe("lazyRunner", () => {
  /** A stand-in worker that answers every request with the inline computation, and counts what it got. */
  function fakeWorker(log: string[]) {
    const inner = inlineRunner();
    const w = {
      onmessage: null as ((e: MessageEvent) => void) | null,
      onerror: null as unknown,
      postMessage(req: AnalysisRequest) {
        log.push(`post ${req.seq}`);
        void inner.run(req).then((data) => w.onmessage?.({ data } as MessageEvent));
      },
      terminate: () => log.push("terminate"),
    };
    return w as unknown as Worker;
  }

  it("starts its worker with the first request, not before, and only once", async () => {
    const doc = findTemplate("ballast-bridge")!.make();
    const log: string[] = [];
    const runner = lazyRunner(() => (log.push("start"), fakeWorker(log)));
    await settle();
    expect(log).toEqual([]);
    const a = await runner.run({ tier: "quick", seq: 1, doc });
    const b = await runner.run({ tier: "quick", seq: 2, doc });
    expect([a.seq, b.seq]).toEqual([1, 2]);
    expect(log).toEqual(["start", "post 1", "post 2"]);
    runner.dispose();
    expect(log.at(-1)).toBe("terminate");
  });

  it("holds the first request back until the browser is idle, when asked to", async () => {
    const doc = findTemplate("ballast-bridge")!.make();
    const log: string[] = [];
    const idle: (() => void)[] = [];
    vi.stubGlobal("requestIdleCallback", (fn: () => void) => (idle.push(fn), 1));
    try {
      const runner = lazyRunner(() => (log.push("start"), fakeWorker(log)), { firstWhenIdle: true });
      const answer = runner.run({ tier: "full", seq: 7, doc });
      await settle();
      expect(log).toEqual([]); // still waiting for idle time
      idle.forEach((fn) => fn());
      expect((await answer).seq).toBe(7);
      expect(log).toEqual(["start", "post 7"]);
    } finally {
      vi.unstubAllGlobals();
    }
  });

  it("computes in this thread when no worker can be made, and starts none once disposed", async () => {
    const doc = findTemplate("ballast-bridge")!.make();
    const failing = lazyRunner(() => {
      throw new Error("no module workers here");
    });
    const res = await failing.run({ tier: "quick", seq: 3, doc });
    expect(res.tier === "quick" && res.quick.result).toBeTruthy();
    const log: string[] = [];
    const gone = lazyRunner(() => (log.push("start"), fakeWorker(log)));
    gone.dispose();
    void gone.run({ tier: "quick", seq: 4, doc });
    await settle();
    expect(log).toEqual([]);
  });
});

describe("sameAnalysisInput", () => {
  it("ignores positions and notices params", () => {
    const d = findTemplate("ballast-bridge")!.make();
    const moved = { ...d, nodes: d.nodes.map((n, i) => (i === 1 ? { ...n, position: { x: 1, y: 2 } } : n)) };
    expect(sameAnalysisInput(d, moved)).toBe(true);
    const edited = { ...d, nodes: d.nodes.map((n, i) => (i === 1 ? { ...n, params: { ...n.params, rf: 1 } } : n)) };
    expect(sameAnalysisInput(d, edited)).toBe(false);
  });
});
