/**
 * Item 3: loading (chain-format.md "Loading is exact"). Closed forms where a short one
 * exists, and otherwise the independent mathjs solve of the WHOLE chain (all stages
 * and their loads in one admittance matrix). Every path response is compared at 40
 * log-spaced frequencies across fMin..fMax, first at the issue's bar (0.01 dB, 0.05°),
 * then at 1e-9 relative (1e-7 dB, 1e-6°), since chain-format.md says loading is exact.
 */
import { describe, it } from "vitest";
import type { Chain } from "@/lib/chain/types";
import {
  adc,
  inverting,
  makeChain,
  mfb,
  noninverting,
  rcHighpass,
  rcLowpass,
  sallenKey,
  lossyIntegrator,
  source,
  links,
} from "./support/chain-builders";
import { cx, type Cx } from "./support/cx";
import { rcHighpassH, rcLadder2H, sAt } from "./support/closed-forms";
import { dB, near, nearPhase, phaseDeg } from "./support/checks";
import { buildNet, transfer } from "./support/nodal";
import { analyze, pathTo } from "./support/engine-access";

const BARS = {
  issue: { db: 0.01, deg: 0.05, name: "the issue's bar (0.01 dB, 0.05°)" },
  exact: { db: 1e-7, deg: 1e-6, name: "1e-9 relative (exact loading, chain-format.md)" },
};
type Bar = (typeof BARS)[keyof typeof BARS];

function gridOf(chain: Chain, n = 40): number[] {
  const { fMin, fMax } = chain.analysis;
  return Array.from({ length: n }, (_, i) => fMin * Math.pow(fMax / fMin, i / (n - 1)));
}

/** Engine response of every listed path end against the whole-chain nodal solve. */
function wholeChain(chain: Chain, ends: string[], bar: Bar, label: string) {
  const freqs = gridOf(chain);
  const result = analyze(chain, freqs);
  const net = buildNet(chain);
  for (const end of ends) {
    const r = pathTo(result, end).response;
    freqs.forEach((f, i) => {
      const h = transfer(net, f, net.outputOf.get(end)!)!;
      const src = `whole-chain mathjs nodal solve, ${label}, path to ${end}, ${f.toPrecision(4)} Hz, ${bar.name}`;
      near(r.magDb[i], dB(h), { abs: bar.db }, src);
      nearPhase(r.phaseDeg[i], phaseDeg(h), bar.deg, src);
    });
  }
}

/** Engine response against a closed form at the same 40 frequencies. */
function closedForm(chain: Chain, end: string, h: (f: number) => Cx, bar: Bar, label: string) {
  const freqs = gridOf(chain);
  const r = pathTo(analyze(chain, freqs), end).response;
  freqs.forEach((f, i) => {
    near(r.magDb[i], dB(h(f)), { abs: bar.db }, `${label} at ${f.toPrecision(4)} Hz, ${bar.name}`);
    nearPhase(r.phaseDeg[i], phaseDeg(h(f)), bar.deg, `${label} at ${f.toPrecision(4)} Hz, ${bar.name}`);
  });
}

const ONE = cx(1);
const R = 1e4;
const C = 1e-8;

const ladder = makeChain({ nodes: [source(), rcLowpass("a", { r: R, c: C }), rcLowpass("b", { r: R, c: C }), adc("adc")] });
/** RC section loaded by an inverting stage's r1 to the virtual earth: −(r2/r1)/(1 + R/r1 + sRC). */
const rcIntoInverting = makeChain({
  nodes: [source(), rcLowpass("rc", { r: R, c: C }), inverting("inv", { r1: 4.7e3, r2: 4.7e4 }), adc("adc")],
});
/** Source resistance into an inverting stage: −r2/(r1 + Rs). */
const rsIntoInverting = makeChain({ nodes: [source({ resistance: 1e3 }), inverting("inv", { r1: 1e4, r2: 1e5 }), adc("adc")] });
/** RC section loaded by the ADC input resistance: 1/(1 + R/Rin + sRC). */
const rcIntoAdc = makeChain({ nodes: [source(), rcLowpass("rc", { r: R, c: C }), adc("adc", { inputResistance: 2.2e4 })] });
/** High-pass into a non-inverting stage: no load, sRC/(1 + sRC)·(1 + rf/rg). */
const hpIntoNoninv = makeChain({ nodes: [source(), rcHighpass("hp", { r: 1e5, c: 1e-6 }), noninverting("g", { rf: 9e3, rg: 1e3 }), adc("adc")] });

const closed: [string, Chain, (f: number) => Cx][] = [
  ["two equal RC sections: 1/(1 + 3sRC + (sRC)²), chain-format.md", ladder, (f) => rcLadder2H(R, C, f)],
  [
    "RC loaded by the inverting stage's r1: −(r2/r1)/(1 + R/r1 + sRC), derived by nodal analysis",
    rcIntoInverting,
    (f) => cx(-10).div(ONE.add(cx(R / 4.7e3)).add(sAt(f).mul(R * C))),
  ],
  ["source resistance into an inverting stage: −r2/(r1 + Rs), chain-format.md 'DC operating point'", rsIntoInverting, () => cx(-1e5 / 1.1e4)],
  ["RC loaded by the ADC input resistance: 1/(1 + R/Rin + sRC), derived", rcIntoAdc, (f) => ONE.div(ONE.add(cx(R / 2.2e4)).add(sAt(f).mul(R * C)))],
  ["AC coupling into a non-inverting input (no load): 10·sRC/(1 + sRC), references.md §2/§3", hpIntoNoninv, (f) => rcHighpassH(1e5, 1e-6, f).mul(10)],
];

describe("loaded sections with closed forms", () => {
  for (const bar of [BARS.issue, BARS.exact]) {
    for (const [label, chain, h] of closed) {
      it(`${label} — ${bar.name}`, () => closedForm(chain, "adc", h, bar, label));
    }
  }
});

const part = { aol: 2e5, gbw: 3e6 };
/** One node feeding two paths: each path is loaded by both (chain-format.md "Loading is exact"). */
const fanOut = makeChain({
  nodes: [
    source({ resistance: 2.2e3 }),
    rcLowpass("rc", { r: 1e4, c: 4.7e-9 }),
    inverting("inv", { r1: 1.5e4, r2: 3.3e4 }, { part: "p" }),
    adc("adc1", { inputResistance: 1e5 }),
    rcLowpass("rc2", { r: 2.2e4, c: 1e-9 }),
    adc("adc2", { inputResistance: 4.7e4 }),
  ],
  edges: links("src>rc", "rc>inv", "inv>adc1", "rc>rc2", "rc2>adc2"),
  parts: { p: part },
});
/** Passive fan-out straight from a resistive source: both RC inputs load the source node. */
const passiveFanOut = makeChain({
  nodes: [
    source({ resistance: 4.7e3 }),
    rcLowpass("a", { r: 1e4, c: 1e-8 }),
    rcHighpass("b", { r: 2.2e4, c: 1e-7 }),
    adc("adcA", { inputResistance: 3.3e4 }),
    adc("adcB", { inputResistance: 6.8e4 }),
  ],
  edges: links("src>a", "src>b", "a>adcA", "b>adcB"),
});
/** RC sections feeding the frequency-dependent inputs of Sallen-Key and MFB sections, finite GBW. */
const rcIntoSections = makeChain({
  nodes: [
    source({ resistance: 600 }),
    rcHighpass("hp", { r: 4.7e4, c: 2.2e-7 }),
    rcLowpass("rc1", { r: 3.3e3, c: 2.2e-9 }),
    sallenKey("sk", { r1: 1e4, r2: 1e4, c1: 2.2e-8, c2: 1e-8 }, { part: "p" }),
    rcLowpass("rc2", { r: 1e4, c: 1e-9 }),
    mfb("mf", { r1: 1e4, r2: 2.2e4, r3: 1e4, c1: 4.7e-8, c2: 1e-9 }, { part: "p" }),
    rcLowpass("rc3", { r: 1e3, c: 1e-8 }),
    rcLowpass("rc4", { r: 1e3, c: 1e-8 }),
    adc("adc", { inputResistance: 1e4 }),
  ],
  parts: { p: part },
  // Above 100 kHz this eighth-order chain falls below −210 dB, where a double-precision
  // nodal solve no longer resolves the output (the reference returns exactly 0 at 440 kHz).
  analysis: { fMax: 1e5 },
});
/** Mixed chain, two ADCs after a fan-out at an op-amp output, one branch passive-loaded by a lossy integrator. */
const mixed = makeChain({
  nodes: [
    source({ resistance: 50 }),
    noninverting("g", { rf: 1e4, rg: 1e3 }, { part: "q" }),
    rcLowpass("r1", { r: 2.2e3, c: 1e-8 }),
    lossyIntegrator("li", { r1: 1e4, r2: 4.7e4, c2: 1e-9 }, { part: "q" }),
    adc("adcX"),
    rcHighpass("h1", { r: 1e4, c: 1e-6, vbias: 1 }),
    rcLowpass("r2", { r: 1e4, c: 1e-9 }),
    adc("adcY", { inputResistance: 2e4 }),
  ],
  edges: links("src>g", "g>r1", "r1>li", "li>adcX", "g>h1", "h1>r2", "r2>adcY"),
  parts: { q: { aol: 1e5, gbw: 1e6 } },
});

const whole: [string, Chain, string[]][] = [
  ["fan-out after an RC (inverting branch and RC branch)", fanOut, ["adc1", "adc2"]],
  ["passive fan-out from a resistive source", passiveFanOut, ["adcA", "adcB"]],
  ["RC sections into Sallen-Key and MFB inputs, finite GBW", rcIntoSections, ["adc"]],
  ["mixed chain with fan-out at an op-amp output", mixed, ["adcX", "adcY"]],
  ["RC ladder", ladder, ["adc"]],
  ["RC into inverting", rcIntoInverting, ["adc"]],
];

describe("whole chains against the whole-chain nodal solve", () => {
  for (const bar of [BARS.issue, BARS.exact]) {
    for (const [label, chain, ends] of whole) {
      it(`${label} — ${bar.name}`, () => wholeChain(chain, ends, bar, label));
    }
  }
});
