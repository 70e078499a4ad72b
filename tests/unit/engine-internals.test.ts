/** The engine's internal modules that analyzeChain builds on, each against a closed form. */
import { describe, expect, it } from "vitest";
import type { ChainNode } from "@/lib/chain/types";
import { compileChain, BOLTZMANN } from "@/lib/engine";
import { operatingPoint } from "@/lib/engine/dc";
import { pathNoise, pathNoiseDensity } from "@/lib/engine/noise";
import { add, mul, poly, scale } from "@/lib/engine/poly";
import { buildTopology } from "@/lib/engine/topology";
import { adc, chainOf, line, rails, source } from "./engine-fixtures";

const op = (id: string, kind: string, params: Record<string, number | null>, part: string | null = null): ChainNode =>
  ({ id, kind, params: { vref: 0, ...params }, rails: rails(), part }) as ChainNode;

describe("buildTopology", () => {
  it("orders parents before children, follows the edge order and lists one path per leaf", () => {
    const ch = chainOf(
      [source("s"), adc("b"), op("u", "inverting", { r1: 1, r2: 1 }), adc("a")],
      [
        { from: "s", to: "u" },
        { from: "u", to: "a" },
        { from: "s", to: "b" },
      ],
    );
    const t = buildTopology(ch);
    expect(t.nodes.map((n) => n.id)).toEqual(["s", "u", "a", "b"]);
    expect(t.parent).toEqual([-1, 0, 1, 0]);
    expect(t.paths).toEqual([
      [0, 1, 2],
      [0, 3],
    ]);
  });
});

describe("poly arithmetic", () => {
  it("adds, scales and multiplies ascending coefficients", () => {
    // (1 + 2s)(3 − s) = 3 + 5s − 2s²
    expect(Array.from(mul(poly(1, 2), poly(3, -1)))).toEqual([3, 5, -2]);
    expect(Array.from(add(poly(1, 2), poly(0, -2, 4)))).toEqual([1, 0, 4]);
    expect(Array.from(scale(poly(1, 2), 0))).toEqual([0]);
  });
});

describe("operatingPoint", () => {
  it("gives every node's interval, the (+) pins and the stages' own DC gains", () => {
    // source 1 V ± 0.1 V through Rs = 1 kΩ into a follower drawing ib = 1 µA: V+ = 1 − 1 mV ± (0.1 + 1 mV)
    const ch = line([source("s", { dc: 1, dcSpread: 0.1, resistance: 1e3 }), op("u", "noninverting", { rf: null, rg: null }, "p")], { p: { ib: 1e-6 } });
    const cc = compileChain(ch);
    const dc = operatingPoint(ch, cc);
    expect(dc.plus[1]!.interval!.min).toBeCloseTo(1 - 0.1 - 1e-3, 14);
    expect(dc.plus[1]!.interval!.max).toBeCloseTo(1 + 0.1 + 1e-3, 14);
    expect(dc.out[1].interval).toEqual(dc.plus[1]!.interval);
    expect(dc.stageGain).toEqual([null, 1]);
    expect(dc.out[1].terms.map((t) => t.what)).toEqual(["source DC", "source DC spread", "bias current at (+)"]);
  });
});

describe("pathNoise", () => {
  it("integrates the density that pathNoiseDensity reports (flat 4kTR through a follower)", () => {
    const ch = line([source("s", { resistance: 2e3 }), op("u", "noninverting", { rf: null, rg: null })], {}, { noiseLow: 10, noiseHigh: 1010, fMax: 1e4 });
    const cc = compileChain(ch);
    const d = pathNoiseDensity(ch, cc, 1, [1, 100, 1e4]);
    const e = Math.sqrt(4 * BOLTZMANN * 298.15 * 2e3);
    for (const v of d) expect(v).toBeCloseTo(e, 20);
    const nz = pathNoise(ch, cc, 1);
    expect(nz.outputRms).toBeCloseTo(e * Math.sqrt(1000), 18);
    expect(nz.totalRms).toBeCloseTo(e * Math.sqrt(1e4 - 10), 18);
  });
});
