import { describe, expect, it } from "vitest";
import { checkOptions, runAnalysis, type Analyzer } from "@/lib/chain/analyze-request";
import { exampleChain } from "@/lib/chain/example";
import { ANALYSIS_FORMAT, type AnalysisResult, type AnalyzeOptions, type Chain } from "@/lib/chain/types";

/** An analyzer that records what it was given, so the request handling is tested on its own. */
function recorder() {
  const calls: { chain: Chain; opts?: AnalyzeOptions }[] = [];
  const analyze: Analyzer = (chain, opts) => {
    calls.push({ chain, opts });
    return { format: ANALYSIS_FORMAT, engine: "test", paths: [], warnings: [] } satisfies AnalysisResult;
  };
  return { calls, analyze };
}

describe("runAnalysis", () => {
  it("validates the chain, fills its defaults and passes freqs and points on", () => {
    const { calls, analyze } = recorder();
    const chain: Record<string, unknown> = { ...exampleChain() };
    delete chain.analysis;
    const r = runAnalysis({ chain, freqs: [10, 100], points: 50 }, analyze);
    expect(r.ok).toBe(true);
    expect(calls).toHaveLength(1);
    expect(calls[0].opts).toEqual({ freqs: [10, 100], points: 50 });
    expect(calls[0].chain.analysis.points).toBe(600);
  });

  it("returns every problem of chain and options together, with paths inside the chain as in the CLI", () => {
    const { calls, analyze } = recorder();
    const chain = exampleChain() as unknown as { nodes: { params: Record<string, unknown> }[] };
    chain.nodes[1].params.r1 = -1;
    const r = runAnalysis({ chain, freqs: [10, "x"], points: 1, extra: 1 }, analyze);
    expect(calls).toHaveLength(0);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors.map((e) => e.path).sort()).toEqual(["extra", "freqs[1]", "nodes[1].params.r1", "points"]);
    }
  });

  it("refuses a body that is not a request", () => {
    const { analyze } = recorder();
    for (const body of [null, 5, "chain", [], {}]) {
      const r = runAnalysis(body, analyze);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.errors[0].message.length).toBeGreaterThan(0);
    }
    const missing = runAnalysis({}, analyze);
    expect(!missing.ok && missing.errors).toEqual([{ path: "chain", message: expect.stringMatching(/^is required/) }]);
  });

  // both found by tests/fuzz: an error must name a field even when the field is the whole chain or an empty key
  it("names the chain field when the chain is not a document, and an empty key as [\"\"]", () => {
    const { analyze } = recorder();
    const notDocument = runAnalysis({ chain: 0 }, analyze);
    expect(!notDocument.ok && notDocument.errors.map((e) => e.path)).toEqual(["chain"]);
    const emptyKey = runAnalysis({ chain: exampleChain(), "": false }, analyze);
    expect(!emptyKey.ok && emptyKey.errors.map((e) => e.path)).toEqual(['[""]']);
  });

  it("runs the real engine on the chain-format.md example", () => {
    const r = runAnalysis({ chain: exampleChain(), freqs: [10, 1000] });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.result.format).toBe("chainwright.analysis/1");
    expect(r.result.paths.map((p) => p.nodes)).toEqual([["src", "u1", "adc"]]);
    expect(r.result.paths[0].response.f).toEqual([10, 1000]);
  });
});

describe("checkOptions", () => {
  it("accepts absent options and valid ones", () => {
    expect(checkOptions(undefined, undefined)).toEqual({ ok: true, opts: {} });
    expect(checkOptions([1, 2.5e6], 2)).toEqual({ ok: true, opts: { freqs: [1, 2.5e6], points: 2 } });
  });

  it("refuses empty or oversized lists, non-positive or non-finite frequencies and bad points", () => {
    expect(checkOptions([], undefined).ok).toBe(false);
    expect(checkOptions(new Array(20_001).fill(1), undefined).ok).toBe(false);
    expect(checkOptions([1, 0], undefined)).toMatchObject({ ok: false, errors: [{ path: "freqs[1]" }] });
    expect(checkOptions([Number.NaN], undefined)).toMatchObject({ ok: false, errors: [{ path: "freqs[0]" }] });
    expect(checkOptions("10,100", undefined)).toMatchObject({ ok: false, errors: [{ path: "freqs" }] });
    expect(checkOptions(undefined, 20_001)).toMatchObject({ ok: false, errors: [{ path: "points", message: expect.stringMatching(/integer from 2 to 20000/) }] });
  });
});
