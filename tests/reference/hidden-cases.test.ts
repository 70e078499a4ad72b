/**
 * Cases built to find what a stage-by-stage implementation can miss: DC paths that
 * the capacitors cut, bias currents through resistors that only a full nodal view
 * sees, noise of resistors on a sibling branch of a fan-out, loaded dividers at DC,
 * a path that does not end at an ADC, and frequencies given out of order.
 * Every expectation is a closed form derived beside it, or the whole-chain nodal
 * reference (support/nodal.ts).
 */
import { describe, it, vi } from "vitest";
import type { Chain } from "@/lib/chain/types";
import {
  adc,
  inverting,
  lossyIntegrator,
  makeChain,
  mfb,
  noninverting,
  rcHighpass,
  rcLowpass,
  sallenKey,
  source,
  links,
} from "./support/chain-builders";
import { near, nearPhase, same, dB, phaseDeg } from "./support/checks";
import { acPeak, dcInterval, noiseRms, slewNeeded as slewNeededRef } from "./support/reference-analysis";
import { responseAt } from "./support/nodal";
import { rcLowpassH } from "./support/closed-forms";
import { analyze, nonFinitePaths, pathTo, stageOf } from "./support/engine-access";

// Heavy reference integrals and spawned processes: room for a loaded two-core machine.
vi.setConfig({ testTimeout: 180_000, hookTimeout: 180_000 });

const EXACT = (v: number) => ({ abs: 1e-9 * Math.max(1, Math.abs(v)) });

function dcIs(chain: Chain, id: string, min: number, max: number, source: string) {
  const s = stageOf(analyze(chain), id);
  near(s.dcOut?.min, min, EXACT(min), `${source} (min)`);
  near(s.dcOut?.max, max, EXACT(max), `${source} (max)`);
}

describe("DC operating points the capacitors shape", () => {
  it("Sallen-Key vref has no DC effect: c2 is open at DC, so V+ = Vin", () => {
    const c = makeChain({ nodes: [source({ dc: 1 }), sallenKey("sk", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8, vref: 2.5 }), adc("adc")] });
    dcIs(c, "sk", 1, 1, "derived: unity-gain Sallen-Key at DC passes Vin; vref only sets the AC return of c2 (chain-format.md topology)");
  });
  it("MFB with vref, vos and ib: Vo = (1 + r2/r1)(vref ± vos) − (r2/r1)Vin ± ib·(r2 + r3(1 + r2/r1))", () => {
    const [r1, r2, r3, vref, vin, vos, ib] = [1e4, 2.2e4, 4.7e4, 0.5, 0.2, 1e-3, 1e-7];
    const c = makeChain({
      nodes: [source({ dc: vin }), mfb("m", { r1, r2, r3, c1: 1e-8, c2: 1e-9, vref }, { part: "p" }), adc("adc")],
      parts: { p: { vos, ib } },
    });
    const g = r2 / r1;
    // Derived by KCL with both capacitors open: V(−) = vref + vos, V_A = V(−) + ib·r3 (ib− drawn through r3)
    const centre = (1 + g) * vref - g * vin;
    const half = (1 + g) * vos + ib * (r2 + r3 * (1 + g));
    dcIs(c, "m", centre - half, centre + half, "derived: MFB DC with ib− through r3 (chain-format.md topology, references.md §9 method)");
  });
  it("lossy integrator with vref: (1 + r2/r1)·vref − (r2/r1)·Vin", () => {
    const c = makeChain({ nodes: [source({ dc: 0.3 }), lossyIntegrator("li", { r1: 1e4, r2: 4.7e4, c2: 1e-8, vref: 1.2 }), adc("adc")] });
    const v = (1 + 4.7) * 1.2 - 4.7 * 0.3;
    dcIs(c, "li", v, v, "derived: inverting DC with the (+) input on vref (references.md §3, §5)");
  });
  it("follower with rf and no rg: ib− through rf appears at the output (chain-format.md: rf still joins out to (−))", () => {
    const c = makeChain({ nodes: [source({ dc: 0.5 }), noninverting("f", { rf: 1e5, rg: null }, { part: "p" }), adc("adc")], parts: { p: { ib: 2e-8 } } });
    dcIs(c, "f", 0.5 - 2e-3, 0.5 + 2e-3, "derived: Vo = Vin ± ib·rf = 0.5 V ± 2 mV");
  });
  it("AC coupling into an ADC input resistance: the pin sits at vbias·Rin/(r + Rin)", () => {
    const c = makeChain({ nodes: [source({ dc: 3 }), rcHighpass("hp", { r: 1e5, c: 1e-6, vbias: 2 }), adc("adc", { inputResistance: 1e5, vinLow: 0, vinHigh: 4 })] });
    const r = analyze(c);
    near(pathTo(r, "adc").adc?.pathDcGain ?? null, 0, { abs: 1e-12 }, "derived: the capacitor blocks the source, pathDcGain 0");
    const pin = dcInterval(c, "adc")!;
    near(pin.max, 1, { abs: 1e-12 }, "self-check of the reference: divider 2 V·1/2");
    // the ADC's range use then reflects a 1 V pin: span of the pin's interval is 2·acPeak only
    near(pathTo(r, "adc").adc?.rangeUse, (2 * acPeak(c, "adc")) / 4, { rel: 1e-6 }, "chain-format.md rangeUse with the loaded pin (nodal reference)");
  });
  it("an RC section into an ADC input resistance divides the DC: pathDcGain = Rin/(r + Rs + Rin)", () => {
    const c = makeChain({ nodes: [source({ dc: 1, resistance: 1e3 }), rcLowpass("rc", { r: 9e3, c: 1e-8 }), adc("adc", { inputResistance: 3e4 })] });
    near(pathTo(analyze(c), "adc").adc?.pathDcGain, 0.75, { rel: 1e-12 }, "derived: 30 k/(1 k + 9 k + 30 k) = 0.75");
  });
  it("dcGain of a stage after an RC section is from its own input terminal: −r2/r1, not −r2/(r1 + r)", () => {
    const c = makeChain({ nodes: [source({ dc: 0.1 }), rcLowpass("rc", { r: 1e4, c: 1e-8 }), inverting("g", { r1: 1e4, r2: 1e5 }), adc("adc")] });
    const r = analyze(c);
    near(stageOf(r, "g").dcGain, -10, EXACT(10), "chain-format.md: dcGain from the voltage at the stage's input terminal");
    near(pathTo(r, "adc").adc?.pathDcGain, -5, EXACT(5), "derived: the RC's r adds to r1 at DC, −100 k/20 k");
    dcIs(c, "g", -0.5, -0.5, "derived: 0.1 V × −5");
  });
});

describe("a passive section's DC is set by what loads it", () => {
  it("AC coupling with vbias into an inverting stage: Vo = vref − r2·(vbias − vref)/(r + r1)", () => {
    const [r, r1, r2, vbias, vref] = [4.7e4, 1e4, 3.3e4, 1.5, 0.5];
    const c = makeChain({ nodes: [source({ dc: 2 }), rcHighpass("hp", { r, c: 1e-6, vbias }), inverting("g", { r1, r2, vref }), adc("adc")] });
    const v = vref - (r2 * (vbias - vref)) / (r + r1);
    dcIs(c, "g", v, v, "derived: DC current from vbias through r and r1 into the virtual earth at vref (capacitor open)");
  });
});

describe("figures come from their own grids, not the plotted one (chain-format.md 'Grids')", () => {
  const chain = (points: number) =>
    makeChain({
      nodes: [
        source({ amplitude: 0.7, fLow: 13, fHigh: 347, resistance: 330 }),
        rcHighpass("hp", { r: 1e4, c: 1 / (2 * Math.PI * 1e4 * 1e3) }),
        sallenKey("sk", { r1: 1e4, r2: 1e4, c1: 1e-7, c2: 2.5e-9 }, { part: "p" }),
        adc("adc", { sampleRate: 1500 }),
      ],
      parts: { p: { en: 1e-8, gbw: 1e6 } },
      analysis: { points, noiseLow: 2, noiseHigh: 400 },
    });
  it("acPeak, slewNeeded, alias and noise are the same with 2 plotted points, 2000 points, or one --freq", () => {
    const runs = [analyze(chain(2)), analyze(chain(2000)), analyze(chain(600), [123.4])];
    const ref = chain(600);
    const peak = acPeak(ref, "sk");
    const slew = slewNeededRef(ref, "sk");
    const noise = noiseRms(ref, "adc", 2, 400, 1e-8).rms;
    for (const r of runs) {
      const s = stageOf(r, "sk");
      near(s.acPeak, peak, { rel: 1e-6 }, "chain-format.md: peaks on their own dense grid with the exact band limits (nodal reference)");
      near(s.slewNeeded, slew, { rel: 1e-6 }, "chain-format.md: slew on its own grid (nodal reference)");
      near(pathTo(r, "adc").noise.outputRms, noise, { rel: 1e-4 }, "chain-format.md: noise on its own grid (adaptive Simpson reference)");
    }
    near(runs[0].paths[0].adc?.aliasAttenuationDb, runs[1].paths[0].adc?.aliasAttenuationDb ?? NaN, { abs: 1e-9 }, "chain-format.md: alias on its own grid, independent of points");
  });
});

describe("fan-out: each branch loads the other, at DC, in the band and in noise", () => {
  const fan = makeChain({
    nodes: [
      source({ dc: 0.4, dcSpread: 0.05, amplitude: 0.3, fLow: 5, fHigh: 5000, resistance: 2e3 }),
      rcLowpass("rc", { r: 4.7e3, c: 2.2e-8 }),
      inverting("inv", { r1: 1e4, r2: 2.2e4, vref: 0.2 }, { part: "p" }),
      adc("adcA"),
      noninverting("ni", { rf: 1e4, rg: 1e4 }, { part: "p" }),
      rcHighpass("hp", { r: 2.2e4, c: 1e-7 }),
      adc("adcB"),
      adc("adcC", { inputResistance: 5e4 }),
    ],
    edges: links("src>rc", "rc>inv", "inv>adcA", "rc>ni", "ni>adcB", "src>hp", "hp>adcC"),
    parts: { p: { vos: 2e-3, ib: 5e-8, en: 8e-9, in: 1e-12, aol: 1e5, gbw: 2e6 } },
  });
  it("DC intervals of both op-amp branches (nodal solve at DC over the whole chain)", () => {
    const r = analyze(fan);
    for (const id of ["inv", "ni"]) {
      const ref = dcInterval(fan, id)!;
      const s = stageOf(r, id);
      near(s.dcOut?.min, ref.min, EXACT(ref.min), `mathjs nodal DC solve of the whole fan-out, ${id} (min)`);
      near(s.dcOut?.max, ref.max, EXACT(ref.max), `mathjs nodal DC solve of the whole fan-out, ${id} (max)`);
      near(s.acPeak, acPeak(fan, id), { rel: 1e-6 }, `mathjs nodal band maximum, ${id}`);
    }
  });
  it("path responses to all three ADCs (nodal solve)", () => {
    const freqs = [0.5, 20, 700, 5000, 9e4];
    const r = analyze(fan, freqs);
    for (const end of ["adcA", "adcB", "adcC"]) {
      const resp = pathTo(r, end).response;
      freqs.forEach((f, i) => {
        const h = responseAt(fan, end, f);
        near(resp.magDb[i], dB(h), { abs: 1e-7 }, `whole-chain nodal solve, ${end}, ${f} Hz`);
        nearPhase(resp.phaseDeg[i], phaseDeg(h), 1e-6, `whole-chain nodal solve, ${end}, ${f} Hz`);
      });
    }
  });
  it("one path per sink, its nodes from the source, its op-amp stages in path order (chain-format.md 'Analysis result')", () => {
    const r = analyze(fan);
    same(r.paths.length, 3, "chain-format.md: a path runs from the source to each node with no outgoing edge");
    const want: Record<string, string[]> = { adcA: ["src", "rc", "inv", "adcA"], adcB: ["src", "rc", "ni", "adcB"], adcC: ["src", "hp", "adcC"] };
    for (const [end, nodes] of Object.entries(want)) {
      const p = pathTo(r, end);
      same(p.nodes, nodes, `chain-format.md: path nodes from the source to ${end}`);
      same(p.stages.filter((s) => s.status !== undefined).map((s) => s.id), nodes.filter((id) => id === "inv" || id === "ni"), `chain-format.md: the path's op-amp stages in order, ${end}`);
    }
  });
  it("noise at each ADC includes the resistors of sibling branches that load the shared nodes", () => {
    const r = analyze(fan);
    for (const end of ["adcA", "adcB", "adcC"]) {
      const ref = noiseRms(fan, end, fan.analysis.noiseLow, fan.analysis.fMax, 1e-8);
      near(pathTo(r, end).noise.totalRms, ref.rms, { rel: 1e-4 }, `adaptive Simpson of the nodal |T|² of every resistor and op-amp source, ${end}`);
    }
    // e.g. the high-pass branch's r reaches adcA through the source resistance and the RC:
    const ref = noiseRms(fan, "adcA", fan.analysis.noiseLow, fan.analysis.fMax, 1e-8);
    const hpR = ref.parts.find((p) => p.owner === "hp" && p.element === "r")!.rms;
    const got = pathTo(r, "adcA").noise.contributions.find((c) => c.nodeId === "hp" && c.element === "r")?.rms;
    near(got, hpR, { rel: 1e-3 }, "chain-format.md: every resistor's 4kTR to the path's end through its own transfer (sibling branch)");
  });
});

describe("extremes", () => {
  it("Sallen-Key peaks up to Q = 5000: acPeak = Q/√(1 − 1/(4Q²)) and slewNeeded = 2π·f0·Q (amplitude 1)", () => {
    for (const ratio of [1e2, 1e4, 1e6, 1e8]) {
      const c1 = 1e-8 * Math.sqrt(ratio);
      const c2 = c1 / ratio;
      const q = 0.5 * Math.sqrt(ratio);
      const f0 = 1 / (2 * Math.PI * 1e4 * Math.sqrt(c1 * c2));
      const c = makeChain({ nodes: [source({ amplitude: 1, fLow: f0 / 30, fHigh: f0 * 30 }), sallenKey("sk", { r1: 1e4, r2: 1e4, c1, c2 }), adc("adc")] });
      const s = stageOf(analyze(c), "sk");
      near(s.acPeak, q / Math.sqrt(1 - 1 / (4 * q * q)), { rel: 1e-9 }, `derived: peak of the second-order low-pass (references.md §6 H), Q = ${q}`);
      // ω·|H| = 1/√((1/x − x)² + 1/Q²) with x = f/f0 is largest at x = 1, where it is ω0·Q (derived)
      near(s.slewNeeded, 2 * Math.PI * f0 * q, { rel: 1e-9 }, `derived: max of 2πf·|H| at f0 equals 2π·f0·Q, Q = ${q}`);
    }
  });
  it("an eight-section passive ladder with time constants from 10 ns to 10 ms, 1 mHz to 10 MHz (nodal solve)", () => {
    const rs = [100, 1e6, 1e3, 3e5, 1e4, 220, 4.7e4, 1e5];
    const cs = [1e-5, 1e-10, 4.7e-7, 1e-9, 2.2e-8, 1e-6, 1e-9, 3.3e-10];
    const sections = rs.map((r, i) => (i % 3 === 2 ? rcHighpass(`s${i}`, { r, c: cs[i] }) : rcLowpass(`s${i}`, { r, c: cs[i] })));
    const c = makeChain({ nodes: [source({ resistance: 50 }), ...sections, adc("adc", { inputResistance: 1e6 })], analysis: { fMin: 1e-3, fMax: 1e7 } });
    const freqs = Array.from({ length: 41 }, (_, i) => 1e-3 * Math.pow(1e10, i / 40));
    const r = pathTo(analyze(c, freqs), "adc").response;
    freqs.forEach((f, i) => {
      const h = responseAt(c, "adc", f);
      if (dB(h) < -160) return; // beyond what the double-precision reference resolves
      near(r.magDb[i], dB(h), { abs: 1e-7 }, `whole-chain nodal solve (ABCD cascade must equal it), ${f.toExponential(2)} Hz`);
      nearPhase(r.phaseDeg[i], phaseDeg(h), 1e-6, `whole-chain nodal solve, ${f.toExponential(2)} Hz`);
    });
  });
});

describe("paths and frequency lists", () => {
  it("a path may end at a stage: response is that stage's output, adc null", () => {
    const c = makeChain({
      nodes: [source(), rcLowpass("rc", { r: 1e4, c: 1e-8 }), noninverting("buf", { rf: null, rg: null }), adc("adc"), inverting("mon", { r1: 1e4, r2: 1e4 })],
      edges: links("src>rc", "rc>buf", "buf>adc", "buf>mon"),
    });
    const p = pathTo(analyze(c, [100, 1591.55]), "mon");
    same(p.adc, null, "chain-format.md: a path to a node with no outgoing edge that is not an ADC has no ADC figures");
    near(p.response.magDb[1], dB(rcLowpassH(1e4, 1e-8, 1591.55)), { abs: 1e-7 }, "chain-format.md: response at the last stage's output (references.md §2 × −1)");
    nearPhase(p.response.phaseDeg[1], phaseDeg(rcLowpassH(1e4, 1e-8, 1591.55)) + 180, 1e-6, "derived: low-pass phase + 180° of the inverter");
  });
  it("freqs out of order and repeated come back exactly as given", () => {
    const c = makeChain({ nodes: [source(), rcLowpass("rc", { r: 1e4, c: 1e-8 }), adc("adc")] });
    const freqs = [5000, 10, 1591.55, 10, 2e5];
    const r = pathTo(analyze(c, freqs), "adc").response;
    same(r.f, freqs, "chain-format.md: the response at exactly the freqs frequencies");
    freqs.forEach((f, i) => near(r.magDb[i], dB(rcLowpassH(1e4, 1e-8, f)), { abs: 1e-7 }, `references.md §2 low-pass at ${f} Hz, in the given order`));
  });
  it("an ADC whose fold-over start (sampleRate − fHigh) lies above fMax still yields finite or null figures", () => {
    const c = makeChain({ nodes: [source({ fHigh: 1000 }), rcLowpass("rc", { r: 1e4, c: 1e-8 }), adc("adc", { sampleRate: 1e7 })], analysis: { fMax: 1e5 } });
    same(nonFinitePaths(analyze(c)), [], "chain-format.md: never Infinity or NaN (case left to the engine to define)");
  });
});
