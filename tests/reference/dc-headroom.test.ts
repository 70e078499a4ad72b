/**
 * Item 4: DC intervals and headroom (chain-format.md "DC operating point as intervals"
 * and "Headroom"; references.md §9). Derived closed forms where they are short, and
 * the independent nodal solve at DC (superposition, each term with its own sign) for
 * larger chains. Tolerance: exact (1e-9 relative to the volt scale) for derived
 * values; the 0.5 % bar is the fallback only where noted.
 * Status rule: `tight` = under 10 % of the usable span to spare (a rule of thumb,
 * common practice, as chain-format.md says).
 */
import { describe, it } from "vitest";
import type { Chain, Part, Rails } from "@/lib/chain/types";
import {
  adc,
  integrator,
  inverting,
  makeChain,
  noninverting,
  rcHighpass,
  rcLowpass,
  lossyIntegrator,
  sallenKey,
  source,
} from "./support/chain-builders";
import { near, same } from "./support/checks";
import { acPeak, dcInterval, dcIntervalAtNet } from "./support/reference-analysis";
import { analyze, nonFinitePaths, pathTo, stageOf, warningsOf } from "./support/engine-access";

const EXACT = (v: number) => ({ abs: 1e-9 * Math.max(1, Math.abs(v)) });

function intervalIs(actual: { min: number; max: number } | null | undefined, min: number, max: number, source: string) {
  near(actual?.min, min, EXACT(min), `${source} (min)`);
  near(actual?.max, max, EXACT(max), `${source} (max)`);
}

describe("DC intervals through gains, source resistance, vref, ±vos and ±ib", () => {
  it("inverting stage fed through 1 kΩ of source resistance, with vref, vos and ib", () => {
    const [dc, spread, rs, r1, r2, vref, vos, ib] = [0.5, 0.02, 1e3, 1e4, 1e5, 0.3, 2e-3, 5e-8];
    const chain = makeChain({
      nodes: [source({ dc, dcSpread: spread, resistance: rs }), inverting("u", { r1, r2, vref }, { part: "p" }), adc("adc")],
      parts: { p: { vos, ib } },
    });
    // Derived by KCL at (−): Vo = (vref ± vos)(1 + R2/(R1+Rs)) − Vin·R2/(R1+Rs) ± ib·R2; (+) sits on vref, so ib+ adds nothing.
    const g = r2 / (r1 + rs);
    const centre = -g * dc + (1 + g) * vref;
    const half = g * spread + (1 + g) * vos + ib * r2;
    const s = stageOf(analyze(chain), "u");
    intervalIs(s.dcOut, centre - half, centre + half, "derived: noise gain 1 + r2/(r1 + Rs) on vref and vos (chain-format.md), ib·R2 (references.md §9)");
    near(s.dcGain, -r2 / r1, EXACT(10), "chain-format.md: dcGain is from the stage's input terminal, source resistance excluded");
    near(pathTo(analyze(chain), "adc").adc?.pathDcGain, -g, EXACT(g), "chain-format.md: pathDcGain from the source EMF, −r2/(r1 + Rs)");
  });

  it("non-inverting G = 100 with bias current through the source resistance (references.md §9)", () => {
    const chain = makeChain({
      nodes: [source({ dc: 0.1, dcSpread: 0.005, resistance: 1e4 }), noninverting("u", { rf: 99e3, rg: 1e3 }, { part: "p" }), adc("adc")],
      parts: { p: { vos: 1e-3, ib: 1e-7 } },
    });
    // NG·(Vos ± Ib+·Rp) ± Ib−·Rf, references.md §9, plus NG·(dc ± dcSpread)
    const half = 100 * 0.005 + 100 * 1e-3 + 100 * 1e-7 * 1e4 + 1e-7 * 99e3;
    intervalIs(stageOf(analyze(chain), "u").dcOut, 10 - half, 10 + half, "references.md §9: NG(Vos ± Ib+·Rp) ± Ib−·Rf");
  });

  it("references.md §9 worked cases: 109.9 mV and 19 mV worst case", () => {
    const ni = makeChain({ nodes: [source(), noninverting("u", { rf: 99e3, rg: 1e3 }, { part: "p" }), adc("adc")], parts: { p: { vos: 1e-3, ib: 1e-7 } } });
    intervalIs(stageOf(analyze(ni), "u").dcOut, -0.1099, 0.1099, "references.md §9: G = 100, Vos 1 mV, Ib 100 nA → 109.9 mV worst case");
    const inv = makeChain({ nodes: [source(), inverting("u", { r1: 1e4, r2: 1e5 }, { part: "p" }), adc("adc")], parts: { p: { vos: 1e-3, ib: 8e-8 } } });
    intervalIs(stageOf(analyze(inv), "u").dcOut, -0.019, 0.019, "references.md §9: uncompensated 11 mV + 8 mV = 19 mV");
    const li = makeChain({ nodes: [source(), lossyIntegrator("u", { r1: 1e4, r2: 1e5, c2: 1e-8 }, { part: "p" }), adc("adc")], parts: { p: { vos: 1e-3, ib: 8e-8 } } });
    intervalIs(stageOf(analyze(li), "u").dcOut, -0.019, 0.019, "references.md §5: (1 + R2/R1)·Vos + Ib−·R2 = 11 mV + 8 mV");
  });

  it("AC coupling with vbias: the (+) input sits at vbias ± ib·r", () => {
    const chain = makeChain({
      nodes: [source({ dc: 3, dcSpread: 1 }), rcHighpass("hp", { r: 1e5, c: 1e-6, vbias: 2.5 }), noninverting("u", { rf: 1e4, rg: 1e4, vref: 2.5 }, { part: "p" }), adc("adc")],
      parts: { p: { vos: 5e-4, ib: 1e-8 } },
    });
    // (+) = vbias ± ib·r; Vo = 2·(+) − vref ± 2·vos ± ib·rf; the source dc is blocked by C (derived)
    const half = 2 * (1e-8 * 1e5) + 2 * 5e-4 + 1e-8 * 1e4;
    intervalIs(stageOf(analyze(chain), "u").dcOut, 2.5 - half, 2.5 + half, "derived: capacitor blocks the source DC, vbias and vref set the point");
  });

  it("offsets of cascaded stages add with independent signs (nodal solve at DC)", () => {
    const chain = makeChain({
      nodes: [
        source({ dc: -0.05, dcSpread: 0.01, resistance: 300 }),
        noninverting("a", { rf: 2.2e4, rg: 2.2e3, vref: 0.1 }, { part: "p" }),
        rcLowpass("rc", { r: 4.7e3, c: 1e-7 }),
        inverting("b", { r1: 1e4, r2: 2.2e4, vref: -0.2 }, { part: "q" }),
        sallenKey("sk", { r1: 1e4, r2: 2.2e4, c1: 1e-8, c2: 4.7e-9, vref: 0.05 }, { part: "q" }),
        adc("adc", { vinLow: -5, vinHigh: 5, inputResistance: 5e4 }),
      ],
      parts: { p: { vos: 1.5e-3, ib: 2e-7, aol: 2e5 }, q: { vos: 3e-4, ib: 4e-8, aol: 5e4, gbw: 1e6 } },
    });
    const r = analyze(chain);
    for (const id of ["a", "b", "sk"]) {
      const ref = dcInterval(chain, id)!;
      intervalIs(stageOf(r, id).dcOut, ref.min, ref.max, `mathjs nodal solve at DC with every term's sign independent, stage ${id}`);
    }
    const pin = dcInterval(chain, "adc")!;
    const ap = acPeak(chain, "adc");
    const a = pathTo(r, "adc").adc!;
    near(a.rangeUse, (pin.max + ap - (pin.min - ap)) / 10, { rel: 1e-6 }, "chain-format.md: rangeUse = span of the pin's peak interval / (vinHigh − vinLow)");
  });

  it("the (+) interval of a Sallen-Key includes ib+ through r1 + r2 (nodal solve at DC)", () => {
    const chain = makeChain({
      nodes: [source({ dc: 1 }), sallenKey("sk", { r1: 1e5, r2: 1e5, c1: 2e-9, c2: 1e-9 }, { part: "p" }), adc("adc")],
      parts: { p: { ib: 1e-6 } },
    });
    // Ideal follower: Vo = V+ = 1 ± ib·(r1 + r2) ± 0 (ib− flows into the ideal output) — derived
    intervalIs(stageOf(analyze(chain), "sk").dcOut, 1 - 0.2, 1 + 0.2, "derived: ib+ through r1 + r2 = 200 kΩ gives ±0.2 V");
    intervalIs(dcIntervalAtNet(chain, "sk:p"), 0.8, 1.2, "self-check of the reference: (+) node interval");
  });
});

describe("integrator: no DC path (chain-format.md)", () => {
  const chain = makeChain({
    nodes: [
      source({ dc: 0.01, amplitude: 0.1, fLow: 10, fHigh: 100 }),
      integrator("int", { r1: 1e4, c2: 1e-7 }, { part: "p" }),
      inverting("after", { r1: 1e4, r2: 1e4 }),
      adc("adc"),
    ],
    parts: { p: { aol: 1e5, gbw: 1e6, vos: 1e-3 } },
  });
  it("dcGain and dcOut null, status clip, warning no-dc-path; what follows has null intervals; nothing infinite", () => {
    const r = analyze(chain);
    const s = stageOf(r, "int");
    same(s.dcGain, null, "chain-format.md: integrator dcGain null");
    same(s.dcOut, null, "chain-format.md: integrator dcOut null");
    same(s.status, "clip", "chain-format.md: integrator status clip");
    same(warningsOf(r, "no-dc-path", "int").length > 0, true, "chain-format.md: warning no-dc-path on the integrator");
    same(stageOf(r, "after").dcOut, null, "chain-format.md: unbounded DC carries on (null, not Infinity)");
    same(pathTo(r, "adc").adc?.pathDcGain ?? null, null, "chain-format.md: path DC gain through an integrator has no finite value → null");
    same(nonFinitePaths(r), [], "chain-format.md: never Infinity or NaN anywhere in the result");
  });
  it("acPeak is still the linear band peak: amplitude/(2π·fLow·R1·C2) (chain-format.md 'Linear analysis')", () => {
    const s = stageOf(analyze(chain), "int");
    // |H| = 1/(2πf·R1·C2)·A/(1+A) with finite gain; largest at fLow. Compare with the nodal solve.
    near(s.acPeak, acPeak(chain, "int"), { rel: 1e-6 }, "mathjs nodal solve, max over [fLow, fHigh]");
    near(s.acPeak, 0.1 / (2 * Math.PI * 10 * 1e4 * 1e-7), { rel: 1e-3 }, "derived: ideal integrator peak at fLow");
  });
});

/** A follower (ideal gain) with rails and swing, so the output interval is the source's. */
function follower(dc: number, amplitude: number, part: Part, rails: Rails = { low: -5, high: 5 }, dcSpread = 0): Chain {
  return makeChain({
    nodes: [source({ dc, amplitude, dcSpread }), noninverting("u", { rf: null, rg: null }, { part: "p", rails }), adc("adc", { vinLow: -20, vinHigh: 20 })],
    parts: { p: part },
  });
}

describe("headroom status at the boundaries (tight = under 10 % of the usable span to spare, common practice)", () => {
  const part = { swingLow: 0.5, swingHigh: 0.5 }; // usable [−4.5, 4.5], span 9, 10 % = 0.9 V
  const cases: [string, number, number, "ok" | "tight" | "clip"][] = [
    ["margin 1.0 V each side (11 %)", 0, 3.5, "ok"],
    ["margin 0.91 V each side (10.1 %)", 0, 3.59, "ok"],
    ["margin 0.89 V each side (9.9 %)", 0, 3.61, "tight"],
    ["margin 0.01 V", 0, 4.49, "tight"],
    ["over by 0.01 V (signal peak)", 0, 4.51, "clip"],
    ["DC alone over the usable range", 4.6, 0, "clip"],
    ["DC at −4.55 V below the low limit", -4.55, 0, "clip"],
  ];
  for (const [name, dc, amp, status] of cases) {
    it(`${name} → ${status}`, () => {
      const r = analyze(follower(dc, amp, part));
      const s = stageOf(r, "u");
      same(s.status, status, `chain-format.md 'Headroom' (rule of thumb for tight), ${name}`);
      near(s.usable?.low, -4.5, { abs: 1e-12 }, "chain-format.md: usable = rails.low + swingLow");
      near(s.usable?.high, 4.5, { abs: 1e-12 }, "chain-format.md: usable = rails.high − swingHigh");
      intervalIs(s.peakOut, dc - amp, dc + amp, "chain-format.md: peakOut = dcOut ± acPeak (follower: gain 1)");
      const code = status === "clip" ? "rail-clip" : status === "tight" ? "rail-tight" : null;
      if (code) same(warningsOf(r, code, "u").length, 1, `chain-format.md: ${code} warning for status ${status}`);
      else same(warningsOf(r, "rail-clip").length + warningsOf(r, "rail-tight").length, 0, "chain-format.md: no rail warning when ok");
    });
  }
  it("the spare is measured to the nearer limit: peak [3.8, 4.0] in [−4.5, 4.5] has 0.5 V (5.6 %) to spare → tight", () => {
    same(stageOf(analyze(follower(3.9, 0.1, part)), "u").status, "tight", "chain-format.md 'Headroom': under 10 % to spare (nearer rail); references.md §9 reports the smaller margin");
  });
  it("dcSpread widens the interval: dc 0 ± 4.0 with 0.4 V peak → clip", () => {
    same(stageOf(analyze(follower(0, 0.6, part, undefined, 4.0)), "u").status, "clip", "chain-format.md: dc ± dcSpread carried through");
  });
});

describe("(+) input range (chain-format.md 'Headroom')", () => {
  const rails = { low: -5, high: 5 };
  it("a follower whose input passes rails.high − inputHigh clips on input-range, its output being fine", () => {
    const r = analyze(follower(3.6, 0, { inputHigh: 1.5 }, rails));
    same(stageOf(r, "u").status, "clip", "chain-format.md: (+) interval 3.6 V outside [−5, 3.5] → clip");
    same(warningsOf(r, "input-range", "u").length, 1, "chain-format.md: input-range warning");
    same(warningsOf(r, "rail-clip", "u").length, 0, "chain-format.md: the output (3.6 V in [−5, 5]) is not the cause");
  });
  it("the AC peak counts at the input: 3.0 V ± 0.4 V fits, ± 0.6 V does not", () => {
    same(stageOf(analyze(follower(3.0, 0.4, { inputHigh: 1.5 }, rails)), "u").status, "ok", "chain-format.md: 3.4 V ≤ 3.5 V, output 16 % to spare");
    same(stageOf(analyze(follower(3.0, 0.6, { inputHigh: 1.5 }, rails)), "u").status, "clip", "chain-format.md: 3.6 V > 3.5 V");
  });
  it("a negative inputLow extends the range beyond the rail (inverting stage with vref = −5.1 V)", () => {
    const mk = (inputLow: number) =>
      makeChain({
        nodes: [source({ dc: -10.2 }), inverting("u", { r1: 1e4, r2: 1e4, vref: -5.1 }, { part: "p", rails }), adc("adc")],
        parts: { p: { inputLow } },
      });
    // Vo = 2·vref − Vin = 0 V (derived): the output is centred, only the (+) pin at −5.1 V is in question.
    const ok = analyze(mk(-0.2));
    near(stageOf(ok, "u").dcOut?.max, 0, { abs: 1e-9 }, "derived: Vo = (1 + R2/R1)·vref − (R2/R1)·Vin = 0");
    same(stageOf(ok, "u").status, "ok", "chain-format.md: inputLow −0.2 → allowed down to −5.2 V");
    const bad = analyze(mk(0));
    same(stageOf(bad, "u").status, "clip", "chain-format.md: inputLow 0 → −5.1 V is outside");
    same(warningsOf(bad, "input-range", "u").length, 1, "chain-format.md: input-range warning");
  });
});

describe("ADC input range and rangeUse (chain-format.md 'Headroom', 'Analysis result')", () => {
  const mk = (dc: number, amp: number, spread = 0) =>
    makeChain({ nodes: [source({ dc, amplitude: amp, dcSpread: spread }), noninverting("u", { rf: null, rg: null }), adc("adc", { vinLow: -2, vinHigh: 2 })] });
  const rows: [number, number, number, "ok" | "tight" | "clip", number][] = [
    [0.5, 0.5, 0, "ok", 0.25],
    [0.5, 0.5, 0.1, "ok", 0.3],
    [0, 1.9, 0, "tight", 0.95],
    [0, 2.1, 0, "clip", 1.05],
    [-1.5, 0.6, 0, "clip", 0.3],
  ];
  for (const [dc, amp, spread, status, use] of rows) {
    it(`pin ${dc} ± ${spread} V DC, ${amp} V peak in [−2, 2] → ${status}, rangeUse ${use}`, () => {
      const r = analyze(mk(dc, amp, spread));
      const a = pathTo(r, "adc").adc!;
      same(a.status, status, "chain-format.md: ADC input held to [vinLow, vinHigh] like a stage output (tight: common practice)");
      near(a.rangeUse, use, { abs: 1e-9 }, "chain-format.md: rangeUse = peak interval span / (vinHigh − vinLow)");
      same(warningsOf(r, "adc-range", "adc").length > 0, status === "clip", "chain-format.md: adc-range warning when the pin leaves the range");
    });
  }
});
