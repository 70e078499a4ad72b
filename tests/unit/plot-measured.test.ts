import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { differenceSummary, stepAbove, withMeasured, type MeasuredOverlay } from "@/components/plots/measured-figure";
import { buildFigure } from "@/components/plots/plot-data";
import { hullVibration } from "@/db/seed-data/chains";
import type { Chain } from "@/lib/chain/types";
import { analyzeChain } from "@/lib/engine/analyze";
import { compareResponses } from "@/lib/engine/measured-response";
import { readResponseCsv } from "@/lib/waveform-csv";

const f = Float64Array.from([10, 100, 1000]);
const base = () => buildFigure([{ id: "u1", name: "u1", db: Float64Array.from([0, -3, -20]), ph: Float64Array.from([0, -45, -84]), emphasis: true }], [], f, 700);
const overlay = (diffDb: number[], diffDeg: number[]): MeasuredOverlay => ({
  id: "m1",
  label: "bench.csv at u1",
  colour: "#b5562a",
  // computed −1 dB, −10° at 20 Hz and −6 dB, −60° at 200 Hz; measured off it by the given differences
  diff: compareResponses({ f: [20, 200], db: diffDb.map((d, i) => [-1, -6][i] + d), ph: diffDeg.map((d, i) => [-10, -60][i] + d) }, { f: [20, 200], db: [-1, -6], ph: [-10, -60] }),
});

describe("stepAbove", () => {
  it("rounds up to 0.5, 1, 2, 5 times a power of ten", () => {
    expect([0, 0.3, 0.6, 1, 1.1, 3, 7, 12, 180].map(stepAbove)).toEqual([0.5, 0.5, 1, 1, 2, 5, 10, 20, 200]);
  });
});

describe("withMeasured", () => {
  it("leaves the figure as it is with nothing overlaid", () => {
    const fig = base();
    expect(withMeasured(fig, [])).toBe(fig);
  });

  it("adds the measured curves on the two panels and the differences on a third with its own axes", () => {
    const fig = base();
    const before = JSON.stringify(fig);
    const o = overlay([0.4, -1.3], [3, -7]);
    const out = withMeasured(fig, [o]);
    expect(JSON.stringify(fig)).toBe(before); // the computed figure is not changed
    const added = out.data.slice(fig.data.length);
    expect(added.map((t) => t.yaxis)).toEqual(["y", "y2", "y3", "y4"]);
    // the measured curve as read from the file; the difference as compared
    expect(added[0].y).toEqual([-0.6, -7.3]);
    expect((added[2].y as number[]).map((v) => Math.round(v * 1e9) / 1e9)).toEqual([0.4, -1.3]);
    expect((added[3].y as number[]).map((v) => Math.round(v * 1e9) / 1e9)).toEqual([3, -7]);
    // hover events stay with the computed curves, whose index the readout uses
    expect(added.every((t) => t.hoverinfo === "skip")).toBe(true);
    const layout = out.layout as Record<string, { range?: number[]; domain?: number[]; anchor?: string; overlaying?: string }>;
    expect(layout.yaxis3.range).toEqual([-2, 2]); // 1.3 dB · 1.1 → 2
    expect(layout.yaxis4.range).toEqual([-10, 10]); // 7° · 1.1 → 10
    expect(layout.yaxis4.overlaying).toBe("y3");
    expect(layout.xaxis.anchor).toBe("y3");
    expect(layout.yaxis.domain![0]).toBeGreaterThan(layout.yaxis2.domain![1]);
    expect(layout.yaxis2.domain![0]).toBeGreaterThan(layout.yaxis3.domain![1]);
  });

  it("summarises the difference in one line", () => {
    expect(differenceSummary(overlay([0.4, -1.3], [3, -7]))).toBe("Δ rms 0.96 dB, largest −1.30 dB at 200 Hz; phase rms 5.4°, largest −7.0° at 200 Hz");
    expect(differenceSummary(overlay([0.4, -1.3], [3, -7]), true)).toBe("Δ rms 0.96 dB, largest −1.30 dB; phase largest −7.0°");
  });
});

describe("the example measured response (public/examples)", () => {
  it("reads cleanly and sits a small, non-zero difference from the demo hull channel at its converter", () => {
    const r = readResponseCsv(readFileSync("public/examples/keelwater-hull-vibration-measured.csv", "utf8"));
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.data.rows).toBe(44);
    const path = analyzeChain(hullVibration as unknown as Chain, { noise: false }).paths[0];
    expect(path.nodes.at(-1)).toBe("adc");
    const d = compareResponses(
      { f: r.data.freqs, db: r.data.magDb, ph: r.data.phaseDeg },
      { f: path.response.f, db: path.response.magDb.map((v) => v ?? NaN), ph: path.response.phaseDeg.map((v) => v ?? NaN) },
    );
    expect(d.outside).toBe(0);
    expect(d.compared).toBe(44);
    // plausible for a built board (component tolerances, a short delay in the set-up): under a dB and
    // some degrees everywhere, yet clearly not the computed curve itself
    expect(d.rmsDb).toBeGreaterThan(0.05);
    expect(Math.abs(d.worstDb!.value)).toBeLessThan(1);
    expect(Math.abs(d.worstDeg!.value)).toBeLessThan(15);
    expect(d.rmsDeg).toBeGreaterThan(0.5);
  });
});
