/** The waveform panel's figure and clip table from a run (pure parts of components/waveform). */
import { describe, expect, it } from "vitest";
import { planTimeDomain, stimulusWave } from "@/lib/engine/time-domain";
import { clipRows, rowsOf, waveformFigure } from "@/components/waveform/waveform-figure";
import { line, source } from "./engine-fixtures";

const chain = line(
  [
    source("src"),
    { id: "g", kind: "noninverting", params: { rf: 9e3, rg: 1e3, vref: 0 }, part: "p", rails: { low: -5, high: 5 } },
    { id: "adc", kind: "adc", params: { bits: 12, sampleRate: 1e4, vinLow: -5, vinHigh: 5, inputResistance: null } },
  ],
  { p: { swingLow: 0.5, swingHigh: 0.5 } },
);
const fs = 1e5;
const run = planTimeDomain(chain, fs).run(stimulusWave({ kind: "burst", at: 0.001, frequency: 1000, cycles: 3, amplitude: 1 }, fs, 10_000));

describe("waveform figure", () => {
  it("stacks the EMF and each node (not a source equal to the EMF) with rails, band and clip shading", () => {
    const rows = rowsOf(run, { g: "g gain" });
    expect(rows.map((r) => r.name)).toEqual(["source EMF", "g gain", "adc"]);
    const fig = waveformFigure(run, rows, null);
    expect(fig.data).toHaveLength(3);
    const shapes = fig.layout.shapes as { type: string; y0: number }[];
    expect(shapes.filter((s) => s.type === "line").map((s) => s.y0)).toEqual(expect.arrayContaining([-5, 5, -4.5, 4.5]));
    expect(shapes.filter((s) => s.type === "rect")).toHaveLength(6); // 3 cycles, a clip per half cycle
    const y = (fig.data[1] as { y: number[] }).y;
    expect(Math.max(...y)).toBe(4.5); // decimation keeps the clipped peak
  });

  it("decimates only the zoomed window", () => {
    const rows = rowsOf(run, {});
    const fig = waveformFigure(run, rows, [1, 2]);
    const x = (fig.data[0] as { x: number[] }).x;
    expect(x[0]).toBeGreaterThanOrEqual(0.98);
    expect(x[x.length - 1]).toBeLessThanOrEqual(2.03);
  });

  it("tables each clipped stretch in time order with its length", () => {
    const t = clipRows(run, {});
    expect(t.total).toBe(6);
    expect(t.rows[0]).toMatchObject({ node: "g", side: "high" });
    expect(t.rows[0].fromMs).toBeGreaterThan(1);
    expect(t.rows[0].ms).toBeCloseTo(((Math.PI - 2 * Math.asin(0.45)) / (2 * Math.PI * 1000)) * 1000, 1);
  });
});
