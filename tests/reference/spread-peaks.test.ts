/**
 * The spread's margins against analyzeChain's, on several chains. The spread evaluates each build with a
 * leaner search for the band peaks than analyzeChain (lib/engine/spread.ts, BuildFigures): the same
 * band grid, refined by Brent's method stopped at 1e-6 in ln f instead of golden section at 1e-10, with
 * magnitudes as √(re² + im²), and the DC intervals without their term lists. Here every worst margin the
 * spread reports — nominal, and the worst-case corner builds, which it evaluates in full — is held to
 * analyzeChain of the same build (the full search) within 1 nV + 1e-9 relative. Derived from the
 * definitions (same engine, same formulas); the tolerance is ours: a smooth peak found to 1e-6 in ln f
 * has its value right to about κ·1e-12 relative (κ the curvature of ln|H| in ln f), far inside it.
 */
import { describe, expect, it, vi } from "vitest";
import { analyzeChain } from "@/lib/engine";
import { bandGrid, bandMaxMany } from "@/lib/engine/grids";
import { runSpread, spreadParts, type SpreadResult } from "@/lib/engine/spread";
import type { Chain, StageResult } from "@/lib/chain/types";
import { benchChain } from "../bench/chains";
import { randomChain, randomSensorChain } from "../unit/engine-fixtures";
import { near } from "./support/checks";

vi.setConfig({ testTimeout: 180_000 });

const TOL = { abs: 1e-9, rel: 1e-9 };
const SOURCE = "analyzeChain of the same build (golden-section peaks to 1e-10)";

/** Worst margin of every stage and converter by analyzeChain, by node id (null: unbounded or no peak). */
function analyzedMargins(chain: Chain): Map<string, number | null> {
  const a = analyzeChain(chain, { noise: false });
  const out = new Map<string, number | null>();
  for (const path of a.paths) {
    for (const st of path.stages as StageResult[]) {
      if (!st.status || out.has(st.id)) continue;
      const m = st.margins as { low: number; high: number } | null | undefined;
      const ip = st.inputRange;
      out.set(st.id, m && ip?.peak ? Math.min(m.low, m.high, ip.peak.min - ip.allowed.low, ip.allowed.high - ip.peak.max) : null);
    }
    const adc = path.adc;
    if (adc && !out.has(adc.id)) {
      const node = chain.nodes.find((n) => n.id === adc.id)!;
      const p = node.params as { vinLow: number; vinHigh: number };
      const peak = adc.peakIn as { min: number; max: number } | null;
      out.set(adc.id, peak ? Math.min(peak.min - p.vinLow, p.vinHigh - peak.max) : null);
    }
  }
  return out;
}

/** The chain at a worst-case corner (−1/0/+1 per part, toward −t/nominal/+t). */
function atCorner(chain: Chain, corner: Record<string, -1 | 0 | 1>, mirror: boolean): Chain {
  const parts = spreadParts(chain);
  const nodes = chain.nodes.map((n) => {
    const mine = parts.filter((p) => p.nodeId === n.id);
    if (!mine.length) return n;
    const params = { ...n.params } as Record<string, number>;
    for (const p of mine) params[p.param] = p.nominal * (1 + (mirror ? -1 : 1) * corner[p.key] * p.tolerance);
    return { ...n, params } as unknown as typeof n;
  });
  return { ...chain, nodes };
}

function compare(res: SpreadResult, expected: Map<string, number | null>, what: string): number {
  let checked = 0;
  for (const st of res.stages) {
    if (!expected.has(st.id)) continue;
    const want = expected.get(st.id)!;
    const got = st.margin?.nominal ?? null;
    if (want === null) {
      expect(got, `${what} ${st.id}: unbounded in both`).toBeNull();
      continue;
    }
    near(got!, want, TOL, `${SOURCE}: ${what} ${st.id}`);
    checked++;
  }
  return checked;
}

const chains: [string, Chain][] = [
  ["benchmark chain", benchChain()],
  ...["a", "b", "c", "d", "e", "f"].map((s): [string, Chain] => [`random tree ${s}`, { ...randomChain(`peaks-${s}`, 7), tolerances: { resistor: 0.02, capacitor: 0.1 } }]),
  ...["a", "b", "c"].map((s): [string, Chain] => [`random sensor chain ${s}`, { ...randomSensorChain(`peaks-${s}`, 5), tolerances: { resistor: 0.02, capacitor: 0.1 } }]),
];

describe("spread margins agree with the full band-peak search", () => {
  it.each(chains)("%s: nominal and worst-case corner builds", (_name, chain) => {
    const res = runSpread(chain, { trials: 1, seed: 1, points: 50 });
    let checked = compare(res, analyzedMargins(chain), "nominal");
    for (const wc of res.worstCase.filter((w) => w.metric === "margin")) {
      for (const [end, mirror] of [["low", false], ["high", true]] as const) {
        const want = analyzedMargins(atCorner(chain, wc.lowCorner, mirror)).get(wc.nodeId) ?? null;
        const got = wc[end];
        if (want === null) expect(got, `${wc.nodeId} ${end} corner unbounded in both`).toBeNull();
        else {
          near(got!, want, TOL, `${SOURCE}: ${wc.nodeId} ${end} corner`);
          checked++;
        }
      }
    }
    expect(checked).toBeGreaterThan(0);
  });
});

describe("Brent's method against the golden-section search", () => {
  // |H| of a second-order low-pass, 1/|1 − x² + jx/Q| with x = f/f0 (the standard second-order form)
  const lowpass = (f0: number, q: number) => (f: number) => 1 / Math.hypot(1 - (f / f0) ** 2, f / f0 / q);
  const cases: [string, (f: number) => number][] = [
    ["peaking (Q = 5)", lowpass(300, 5)],
    ["sharp (Q = 50)", lowpass(1234.5, 50)],
    ["gentle (Q = 0.8)", lowpass(700, 0.8)],
    ["falling from the lower band limit", lowpass(50, 0.5)],
    ["rising to the upper band limit", (f) => f / Math.hypot(f, 5000)],
    ["peak just inside the upper band limit", lowpass(1995, 3)],
  ];
  const grid = bandGrid(1, 2000);
  const search = (fn: (f: number) => number, tol: number, method: "golden" | "brent") => {
    let evaluations = 0;
    const [peak] = bandMaxMany(
      [{ grid, values: Array.from(grid, fn) }],
      (freqs, _which, out, count) => {
        for (let c = 0; c < count; c++, evaluations++) out[c] = fn(freqs[c]);
      },
      tol,
      method,
    );
    return { ...peak, evaluations };
  };
  it.each(cases)("%s: the same peak to 1e-11 relative with fewer evaluations", (_name, fn) => {
    const full = search(fn, 1e-10, "golden");
    const brent = search(fn, 1e-6, "brent");
    near(brent.value, full.value, { rel: 1e-11 }, "golden-section search to 1e-10 (derived: same function, same bracket)");
    expect(brent.evaluations).toBeLessThan(full.evaluations / 2);
  });
});
