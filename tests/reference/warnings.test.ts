/**
 * Item 8: every warning code of chain-format.md appears for a chain built to trigger
 * it, on the right node, and its message names the stage (id or label) and the cause
 * ("which stage, and whether the source's DC, a reference, an offset or the signal peak
 * drives it, by how much"). A clean chain gives none, so the checks can fail.
 */
import { describe, it } from "vitest";
import type { AnalysisResult, Chain, ChainNode } from "@/lib/chain/types";
import { adc, integrator, inverting, makeChain, noninverting, rcLowpass, source } from "./support/chain-builders";
import { holds, same, near } from "./support/checks";
import { analyze, nonFinitePaths, numbersIn, pathTo, stageOf, warningsOf } from "./support/engine-access";

const RAILS = { low: -15, high: 15 };

function only(r: AnalysisResult, code: string, nodeId: string) {
  const w = warningsOf(r, code, nodeId);
  same(w.length, 1, `chain-format.md: one ${code} warning on ${nodeId}`);
  return w[0]?.message ?? "";
}

function namesStage(message: string, id: string, label: string | undefined, code: string) {
  holds(message.includes(id) || (label !== undefined && message.includes(label)), `chain-format.md: the ${code} message names the stage (${id} / ${label}): "${message}"`);
}

/** "by how much": some number in the message is within 5 % of the expected excess (V). */
function saysHowMuch(message: string, excess: number, code: string) {
  holds(numbersIn(message).some((v) => Math.abs(Math.abs(v) - excess) <= 0.05 * excess), `chain-format.md: the ${code} message says by how much (≈ ${excess.toFixed(3)} V): "${message}"`);
}

function chainOf(stage: ChainNode, src: Parameters<typeof source>[0], parts = {}, adcId = "conv1", adcParams = {}): Chain {
  return makeChain({
    nodes: [{ ...source(src), label: "Line sensor" }, stage, adc(adcId, { vinLow: -20, vinHigh: 20, sampleRate: 1e6, ...adcParams })],
    parts,
    analysis: { aliasTargetDb: 0 },
  });
}

describe("a clean chain has no warnings (negative control)", () => {
  it("no warnings at all", () => {
    const c = makeChain({
      nodes: [source({ dc: 0.1, amplitude: 0.5, fLow: 1, fHigh: 1000 }), inverting("g", { r1: 1e4, r2: 2e4 }, { rails: RAILS }), rcLowpass("rc", { r: 1e4, c: 1e-8 }), adc("conv1", { vinLow: -5, vinHigh: 5, bits: 8 })],
    });
    // |gain| 2 → ±1 V plus 0.2 V DC inside ±15 V and ±5 V; 8 bits need 49.9 dB, the RC gives ≈ 56 dB at 999 kHz (derived)
    same(analyze(c).warnings, [], "chain-format.md: nothing to report on a chain inside every limit");
  });
});

describe("rail-clip names the cause (chain-format.md 'warnings')", () => {
  it("driven by the source's DC", () => {
    // G = 11, 2 V DC, 10 mV peak: out 22 V ± 0.11 V against 15 V → over by ≈ 7.11 V (derived)
    const r = analyze(chainOf(noninverting("g", { rf: 1e5, rg: 1e4 }, { rails: RAILS, label: "Bridge gain" }), { dc: 2, amplitude: 0.01 }));
    const m = only(r, "rail-clip", "g");
    namesStage(m, "g", "Bridge gain", "rail-clip");
    holds(/\bdc\b|source/i.test(m), `chain-format.md: cause is the source's DC: "${m}"`);
    saysHowMuch(m, 7.11, "rail-clip");
  });
  it("driven by a reference", () => {
    // inverting G = −10 with vref 2 V: out = 11·2 V = 22 V, 10 mV peak → 0.1 V; over by ≈ 7.1 V (derived)
    const r = analyze(chainOf(inverting("g", { r1: 1e3, r2: 1e4, vref: 2 }, { rails: RAILS, label: "Level shift" }), { dc: 0, amplitude: 0.01 }));
    const m = only(r, "rail-clip", "g");
    namesStage(m, "g", "Level shift", "rail-clip");
    holds(/ref/i.test(m), `chain-format.md: cause is the reference: "${m}"`);
    saysHowMuch(m, 7.1, "rail-clip");
  });
  it("driven by an offset", () => {
    // G = 1001, vos 20 mV → ±20.02 V; 1 mV peak → 1.001 V; over by ≈ 6.02 V (derived)
    const r = analyze(chainOf(noninverting("g", { rf: 1e6, rg: 1e3 }, { part: "p", rails: RAILS, label: "High gain" }), { dc: 0, amplitude: 0.001 }, { p: { vos: 0.02 } }));
    const m = only(r, "rail-clip", "g");
    namesStage(m, "g", "High gain", "rail-clip");
    holds(/offset|vos/i.test(m), `chain-format.md: cause is the offset: "${m}"`);
    saysHowMuch(m, 6.02, "rail-clip");
  });
  it("driven by the signal peak", () => {
    // inverting G = −10, 2 V peak, no DC: ±20 V against ±15 V → over by 5 V (derived)
    const r = analyze(chainOf(inverting("g", { r1: 1e3, r2: 1e4 }, { rails: RAILS, label: "Post gain" }), { dc: 0, amplitude: 2 }));
    const m = only(r, "rail-clip", "g");
    namesStage(m, "g", "Post gain", "rail-clip");
    holds(/peak|signal|\bac\b|amplitude/i.test(m), `chain-format.md: cause is the signal peak: "${m}"`);
    saysHowMuch(m, 5, "rail-clip");
  });
});

describe("the other codes", () => {
  it("rail-tight", () => {
    // follower, 14.2 V peak in ±15 V: 0.8 V (2.7 %) to spare → tight (common practice, < 10 %)
    const r = analyze(chainOf(noninverting("b", { rf: null, rg: null }, { rails: RAILS, label: "Buffer" }), { dc: 0, amplitude: 14.2 }));
    namesStage(only(r, "rail-tight", "b"), "b", "Buffer", "rail-tight");
  });
  it("no-dc-path", () => {
    const r = analyze(chainOf(integrator("int", { r1: 1e4, c2: 1e-7 }, { rails: RAILS, label: "Charge integrator" }), { amplitude: 0.1, fLow: 10, fHigh: 100 }));
    namesStage(only(r, "no-dc-path", "int"), "int", "Charge integrator", "no-dc-path");
  });
  it("input-range", () => {
    const r = analyze(chainOf(noninverting("b", { rf: null, rg: null }, { part: "p", rails: { low: -5, high: 5 }, label: "Input buffer" }), { dc: 3.8, amplitude: 0 }, { p: { inputHigh: 1.5 } }));
    const m = only(r, "input-range", "b");
    namesStage(m, "b", "Input buffer", "input-range");
    holds(/\bdc\b|source/i.test(m), `chain-format.md: cause is the source's DC (3.8 V, no signal): "${m}"`);
    saysHowMuch(m, 0.3, "input-range"); // 3.8 V against 3.5 V (derived)
  });
  it("slew", () => {
    const r = analyze(chainOf(noninverting("b", { rf: null, rg: null }, { part: "p", rails: RAILS, label: "Slow buffer" }), { amplitude: 12, fLow: 10, fHigh: 1e4 }, { p: { slewRate: 0.5e6 } }));
    namesStage(only(r, "slew", "b"), "b", "Slow buffer", "slew");
  });
  it("adc-range", () => {
    // 2.5 V peak into [−2, 2] → over by 0.5 V (derived)
    const r = analyze(chainOf(noninverting("b", { rf: null, rg: null }, { rails: RAILS }), { amplitude: 2.5 }, {}, "conv1", { vinLow: -2, vinHigh: 2 }));
    const m = only(r, "adc-range", "conv1");
    namesStage(m, "conv1", undefined, "adc-range");
    holds(/peak|signal|\bac\b|amplitude/i.test(m), `chain-format.md: cause is the signal peak (no DC): "${m}"`);
    saysHowMuch(m, 0.5, "adc-range");
  });
  it("alias", () => {
    const c = chainOf(rcLowpass("rc", { r: 1e4, c: 1e-8 }), { fLow: 1, fHigh: 1000 }, {}, "conv1", { sampleRate: 1e4 });
    c.analysis.aliasTargetDb = 40;
    const r = analyze(c);
    namesStage(only(r, "alias", "conv1"), "conv1", undefined, "alias");
  });
  it("nyquist", () => {
    const r = analyze(chainOf(rcLowpass("rc", { r: 1e4, c: 1e-8 }), { fLow: 1, fHigh: 6000 }, {}, "conv1", { sampleRate: 1e4 }));
    namesStage(only(r, "nyquist", "conv1"), "conv1", undefined, "nyquist");
  });
  it("safety", () => {
    const r = analyze(chainOf(rcLowpass("rc", { r: 1e4, c: 1e-8 }), { safety: "body-connected" }));
    namesStage(only(r, "safety", "src"), "src", "Line sensor", "safety");
  });
});

describe("figures with no finite value are null with a warning (chain-format.md 'ADC', product.md)", () => {
  const ideal = (fLow: number, freqs?: number[]) =>
    analyze(
      makeChain({ nodes: [source({ amplitude: 0.1, fLow, fHigh: 100 }), integrator("int", { r1: 1e4, c2: 1e-7 }), adc("adc")] }),
      freqs,
    );
  it("a band reaching DC through an ideal integrator: acPeak null and warned", () => {
    const r = ideal(0);
    same(stageOf(r, "int").acPeak, null, "chain-format.md: a peak at DC through an integrator is null");
    holds(r.warnings.some((w) => w.nodeId === "int"), "chain-format.md: … with a warning");
    same(nonFinitePaths(r), [], "chain-format.md: never Infinity or NaN");
  });
  it("the response at 0 Hz through an ideal integrator is null, flagged, never Infinity", () => {
    const r = ideal(10, [0, 10]);
    const resp = pathTo(r, "adc").response;
    same(resp.magDb[0], null, "product.md: evaluation at a pole is flagged, never a silent Infinity");
    near(resp.magDb[1], 20 * Math.log10(1 / (2 * Math.PI * 10 * 1e4 * 1e-7)), { abs: 1e-9 }, "derived: |H| = 1/(2πf·R1·C2) at 10 Hz");
    holds(r.warnings.length > 0, "product.md: the pole is flagged by a warning");
    same(nonFinitePaths(r), [], "chain-format.md: never Infinity or NaN");
  });
  it("slew through an ideal integrator is finite even with fLow = 0: amplitude/(R1·C2)", () => {
    // 2πf·A·|H| = 2πf·A/(2πf·R1·C2) = A/(R1·C2) at every f > 0 (derived), so the band maximum exists
    near(stageOf(ideal(0), "int").slewNeeded, 0.1 / (1e4 * 1e-7), { rel: 1e-9 }, "derived from chain-format.md slew definition: A/(R1·C2) = 100 V/s");
    near(stageOf(ideal(10), "int").slewNeeded, 0.1 / (1e4 * 1e-7), { rel: 1e-9 }, "derived: the same for any band");
  });
});
