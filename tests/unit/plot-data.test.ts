import { describe, expect, it } from "vitest";
import Papa from "papaparse";
import { ACCENT, GROUPED, OTHERS_COLOUR, buildFigure, dbPhase, figureMarks, figureShape, labelRows, hoverIndex, magnitudeTitle, plotCsv, plotLegend, plotMarkers, plotSeries, readoutAt, withGaps, type PlotInput } from "@/components/plots/plot-data";
import type { LiveCurves } from "@/lib/store/live-analysis";
import type { StageResult } from "@/lib/chain/types";

// A hand-made grid: 1 Hz, 10 Hz, 100 Hz, 1 kHz, 10 kHz. u1 is a first-order low-pass with fc = 100 Hz
// (|H| = 1/√(1+(f/fc)²), phase −atan(f/fc); derived from the first-order formula), the ADC passes it on.
const f = Float64Array.from([1, 10, 100, 1000, 10000]);
// H = 1/(1 + j·f/fc) = (1 − j·x)/(1 + x²) with x = f/fc
const lpRe = Float64Array.from(f, (x) => 1 / (1 + (x / 100) ** 2));
const lpIm = Float64Array.from(f, (x) => -(x / 100) / (1 + (x / 100) ** 2));
const one = () => new Float64Array(5).fill(1);
const curves: LiveCurves = {
  f,
  index: { src: 0, u1: 1, adc: 2 },
  cumRe: [one(), lpRe, lpRe],
  cumIm: [new Float64Array(5), lpIm, lpIm],
  indRe: [one(), lpRe, one()],
  indIm: [new Float64Array(5), lpIm, new Float64Array(5)],
};
const u1 = { id: "u1", kind: "lossyIntegrator", dcGain: -1, f0: 100, q: null, dcOut: null, acPeak: null, peakOut: null } as StageResult;

function input(over: Partial<PlotInput> = {}): PlotInput {
  return {
    curves,
    path: ["src", "u1", "adc"],
    mode: "cumulative",
    names: { u1: "u1 Low-pass", adc: "adc" },
    stages: { u1 },
    band: { fLow: 0, fHigh: 200 },
    sampleRate: 2000,
    ...over,
  };
}

describe("plotSeries", () => {
  it("draws the cascade to every node after the source, the chosen node emphasised", () => {
    const s = plotSeries(input());
    expect(s.map((x) => x.id)).toEqual(["u1", "adc"]);
    expect(s.map((x) => x.emphasis)).toEqual([false, true]);
    expect(s[0].db[2]).toBeCloseTo(-3.0103, 4); // −3.01 dB at the corner (first-order formula)
  });

  it("draws each stage on its own in the other mode, leaving out the converter's flat unity", () => {
    const s = plotSeries(input({ mode: "individual" }));
    expect(s.map((x) => x.id)).toEqual(["u1"]);
    expect(s[0].ph[2]).toBeCloseTo(-45, 9);
  });
});

describe("plotMarkers", () => {
  it("marks the source band, the corner, Nyquist and the alias frequency", () => {
    const m = plotMarkers(input());
    expect(m).toContainEqual({ kind: "band", f: 1, f2: 200, label: "source band" }); // fLow 0 clipped to the grid start
    expect(m).toContainEqual({ kind: "corner", f: 100, label: "u1 fc" });
    expect(m).toContainEqual({ kind: "nyquist", f: 1000, label: "Nyquist" }); // sampleRate / 2
    expect(m).toContainEqual({ kind: "alias", f: 1800, label: "alias" }); // sampleRate − fHigh
  });

  it("leaves out markers outside the plotted range and converter markers on a path without one", () => {
    const m = plotMarkers(input({ sampleRate: null, stages: { u1: { ...u1, f0: 1e6 } } }));
    expect(m.map((x) => x.kind)).toEqual(["band"]);
  });
});

describe("dbPhase", () => {
  it("gives 20·log10|H| and the wrapped phase, +180° for a negative real gain", () => {
    const r = dbPhase(Float64Array.from([-10, 0, 1]), Float64Array.from([0, 1, -1]));
    expect(r.db[0]).toBeCloseTo(20, 12);
    expect(r.ph[0]).toBe(180);
    expect(r.ph[1]).toBeCloseTo(90, 12);
    expect(r.db[2]).toBeCloseTo(10 * Math.log10(2), 12);
    expect(r.ph[2]).toBeCloseTo(-45, 12);
  });
  it("marks a zero magnitude as no value rather than −Infinity", () => {
    expect(Number.isNaN(dbPhase(Float64Array.from([0]), Float64Array.from([0])).db[0])).toBe(true);
  });
});

describe("withGaps", () => {
  it("breaks a wrapped phase where it jumps a full turn, and at values that are not finite", () => {
    expect(withGaps(Float64Array.from([-170, -179, 179, 170]), true)).toEqual([-170, -179, null, 170]);
    expect(withGaps(Float64Array.from([1, NaN, 3]), false)).toEqual([1, null, 3]);
  });
});

describe("buildFigure", () => {
  it("puts magnitude over phase on one log-frequency axis, a line per marker", () => {
    const s = plotSeries(input());
    const fig = buildFigure(s, plotMarkers(input()), f);
    expect(fig.data).toHaveLength(4);
    expect(fig.data.map((d) => d.yaxis)).toEqual(["y", "y2", "y", "y2"]);
    // the chosen node (adc) is drawn last, in the accent
    expect((fig.data[2].line as { color: string }).color).toBe(ACCENT);
    expect(fig.data[2].y).toEqual(withGaps(s[1].db, false));
    expect(new Set(fig.data.map((d) => d.xaxis))).toEqual(new Set(["x"]));
    const layout = fig.layout as { xaxis: { type: string }; shapes: unknown[]; yaxis: { domain: number[] }; yaxis2: { domain: number[] } };
    expect(layout.xaxis.type).toBe("log");
    expect(layout.yaxis.domain[0]).toBeGreaterThan(layout.yaxis2.domain[1]);
    expect(layout.shapes).toHaveLength(4);
  });
});

describe("buildFigure with many stages", () => {
  it("draws every other stage in one muted trace per panel, curves separated by gaps", () => {
    const many = { ...curves, index: { ...curves.index, u2: 1, u3: 1 } };
    const s = plotSeries(input({ curves: many, path: ["src", "u1", "u2", "u3", "adc"], stages: { u1, u2: u1, u3: u1 } }));
    expect(s).toHaveLength(4);
    const fig = buildFigure(s, [], f);
    expect(fig.data).toHaveLength(4);
    const grouped = fig.data[0] as { x: (number | null)[]; y: (number | null)[]; meta: unknown };
    expect(grouped.x).toHaveLength(3 * (f.length + 1));
    expect(grouped.x[f.length]).toBeNull();
    expect(grouped.meta).toBe(GROUPED);
    // a hovered point of the third grouped curve maps back to its frequency index
    expect(hoverIndex(2 * (f.length + 1) + 3, GROUPED, f.length)).toBe(3);
    expect(hoverIndex(3, undefined, f.length)).toBe(3);
  });
});

describe("figureShape and figureMarks", () => {
  it("keep the shape when only curve values or markers change, and tell a moved marker apart", () => {
    const a = buildFigure(plotSeries(input()), plotMarkers(input()), f);
    const shifted = { ...curves, cumRe: curves.cumRe.map((r) => r.map((v) => v * 0.99)) };
    const b = buildFigure(plotSeries(input({ curves: shifted })), plotMarkers(input({ curves: shifted })), f);
    expect(figureShape(b)).toBe(figureShape(a));
    expect(figureMarks(b)).toBe(figureMarks(a));
    const moved = { ...input(), stages: { u1: { ...u1, f0: 120 } } };
    const c = buildFigure(plotSeries(moved), plotMarkers(moved), f);
    expect(figureShape(c)).toBe(figureShape(a));
    expect(figureMarks(c)).not.toBe(figureMarks(a));
    // a curve more on the plot is a new shape
    const fewer = buildFigure(plotSeries(input()).slice(1), plotMarkers(input()), f);
    expect(figureShape(fewer)).not.toBe(figureShape(a));
  });
});

describe("plotLegend", () => {
  it("names the chosen curve and counts the others", () => {
    const many = { ...curves, index: { ...curves.index, u2: 1 } };
    const s = plotSeries(input({ curves: many, path: ["src", "u1", "u2", "adc"], stages: { u1, u2: u1 } }));
    expect(plotLegend(s)).toEqual([
      { name: "adc", colour: ACCENT, emphasis: true },
      { name: "2 other stages", colour: OTHERS_COLOUR, emphasis: false },
    ]);
  });
});

describe("plotCsv", () => {
  it("writes the frequency and each plotted series' magnitude and phase", () => {
    const s = plotSeries(input());
    const parsed = Papa.parse<string[]>(plotCsv(s, f, "cumulative"), { skipEmptyLines: true }).data;
    expect(parsed[0]).toEqual(["frequency_Hz", "u1 from source magnitude_dB", "u1 from source phase_deg", "adc from source magnitude_dB", "adc from source phase_deg"]);
    expect(parsed).toHaveLength(6);
    expect(Number(parsed[3][0])).toBe(100);
    expect(Number(parsed[3][1])).toBeCloseTo(-3.0103, 4);
    expect(Number(parsed[3][2])).toBeCloseTo(-45, 9);
  });

  it("says what the dB are relative to when the cascade starts at a current or charge source", () => {
    const s = plotSeries(input());
    const head = (mode: "cumulative" | "individual", unit: "V" | "A" | "C") => Papa.parse<string[]>(plotCsv(s, f, mode, unit), { skipEmptyLines: true }).data[0];
    expect(head("cumulative", "A")[1]).toBe("u1 from source magnitude_dB re 1 V/A");
    expect(head("cumulative", "C")[3]).toBe("adc from source magnitude_dB re 1 V/C");
    expect(head("cumulative", "V")[1]).toBe("u1 from source magnitude_dB");
    // each stage on its own is mostly V/V: the plain label stays
    expect(head("individual", "A")[1]).toBe("u1 own magnitude_dB");
  });
});

describe("magnitudeTitle", () => {
  it("labels the magnitude axis per unit of the source for the cascade only", () => {
    expect(magnitudeTitle("cumulative", "A")).toBe("dB re 1 V/A");
    expect(magnitudeTitle("cumulative", "C")).toBe("dB re 1 V/C");
    expect(magnitudeTitle("cumulative", "V")).toBe("dB");
    expect(magnitudeTitle("individual", "C")).toBe("dB");
    const fig = buildFigure(plotSeries(input()), [], f, 700, magnitudeTitle("cumulative", "A"));
    expect((fig.layout.yaxis as { title: { text: string } }).title.text).toBe("dB re 1 V/A");
  });
});

describe("readoutAt", () => {
  it("reads every series at the cursor's frequency", () => {
    const r = readoutAt(plotSeries(input()), f, 2);
    expect(r.f).toBe("100.0 Hz");
    expect(r.items[0]).toEqual({ id: "u1", name: "u1 Low-pass", db: "−3.01 dB", ph: "−45.0°" });
  });
});

describe("labelRows", () => {
  // 1 Hz … 1 MHz over 658 px of plot: 100 px per decade; a 6-character label is about 34 px wide
  const grid = Float64Array.of(1, 1e6);
  const at = (f: number, label = "u1 f0 ") => ({ kind: "corner" as const, f, label });
  it("keeps labels that clear each other on the row next to the plot", () => {
    const ms = [at(10), at(1e3), at(1e5)];
    const rows = labelRows(ms, grid, 700);
    expect(ms.map((m) => rows.get(m))).toEqual([0, 0, 0]);
  });
  it("lifts a label that would overlap its neighbour, and reuses a lower row once it is clear", () => {
    // 0.1 decade apart = 10 px: each overlaps the one before; the fourth clears the first row again
    const ms = [at(100), at(100 * 10 ** 0.1), at(100 * 10 ** 0.2), at(100 * 10 ** 0.5)];
    const rows = labelRows(ms, grid, 700);
    expect(ms.map((m) => rows.get(m))).toEqual([0, 1, 2, 0]);
  });
  it("puts a label that fits nowhere on the row that ends furthest left", () => {
    const ms = [at(100, "a long label"), at(101, "b"), at(102, "c"), at(103, "d")];
    const rows = labelRows(ms, grid, 700);
    // rows 0 (long label), 1 (b), 2 (c) are all in the way; b's row ends first
    expect(ms.map((m) => rows.get(m))).toEqual([0, 1, 2, 1]);
  });
  it("gives the figure room above the plot for every row it uses", () => {
    const one = buildFigure([], [at(10)], Float64Array.of(1, 10, 1e6));
    const three = buildFigure([], [at(100), at(101), at(102)], Float64Array.of(1, 10, 1e6));
    const top = (fig: ReturnType<typeof buildFigure>) => (fig.layout.margin as { t: number }).t;
    expect(top(three) - top(one)).toBe(22);
  });
});
