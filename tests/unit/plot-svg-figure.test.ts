import { describe, expect, it } from "vitest";
import { buildFigure, type Figure, type PlotSeries } from "@/components/plots/plot-data";
import { figureSvg, linearTicks, logTicks, siTick } from "@/components/plots/svg-figure";

/** The `d` of every curve drawn in the given colour, in document order. */
function pathsOf(svg: string, colour: string): string[] {
  return [...svg.matchAll(/<path class="curve" d="([^"]*)" stroke="([^"]*)"/g)].filter((m) => m[2] === colour).map((m) => m[1]);
}

describe("axis ticks", () => {
  it("labels ticks with SI prefixes and no unit", () => {
    expect([1, 10, 100, 1e3, 2e4, 5e5, 1e6, 0.1, 2e-6, 0].map(siTick)).toEqual(["1", "10", "100", "1k", "20k", "500k", "1M", "100m", "2µ", "0"]);
  });

  it("puts a tick on every decade of a wide log axis, and on 2 and 5 as well on a narrow one", () => {
    expect(logTicks(0, 5)).toEqual([1, 10, 100, 1e3, 1e4, 1e5]);
    // 10 Hz to 1 kHz: two decades
    expect(logTicks(1, 3)).toEqual([10, 20, 50, 100, 200, 500, 1000]);
    // the range's ends need not be decades: only ticks inside it
    expect(logTicks(Math.log10(30), Math.log10(3000))).toEqual([50, 100, 200, 500, 1000, 2000]);
  });

  it("steps a linear axis by 1, 2 or 5 times a power of ten", () => {
    expect(linearTicks(-150, 10)).toEqual([-150, -100, -50, 0]);
    expect(linearTicks(-12, 3)).toEqual([-10, -5, 0]);
    expect(linearTicks(0, 1)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
  });
});

describe("figureSvg", () => {
  // two panels as buildFigure lays them out: margins, domains and ranges from the layout
  const fig: Figure = {
    data: [
      { type: "scatter", mode: "lines", x: [10, 100, 1000], y: [0, -20, -40], xaxis: "x", yaxis: "y", line: { color: "#111111", width: 2 } },
      { type: "scatter", mode: "lines", x: [10, 100, 1000], y: [0, -90, null], xaxis: "x", yaxis: "y2", line: { color: "#222222", width: 1 } },
    ],
    layout: {
      margin: { l: 40, r: 10, t: 20, b: 30 },
      xaxis: { type: "log", range: [1, 3] },
      yaxis: { domain: [0.5, 1], range: [-40, 0] },
      yaxis2: { domain: [0, 0.5], range: [-180, 180], tickvals: [-180, 0, 180] },
      shapes: [{ type: "line", xref: "x", yref: "paper", x0: 100, x1: 100, y0: 0, y1: 1, line: { color: "#333333", width: 1, dash: "dot" } }],
      annotations: [{ x: 2, y: 1, yshift: 0, text: "a <label>", font: { size: 10, color: "#444444" } }],
    },
  };
  // 250 × 150: plot area x 40…240 (200 px for two decades), y 20…120 (100 px; each panel 50 px)
  const svg = figureSvg(fig, 250, 150);

  it("maps each point as Plotly places it: log x by decades, y by the panel's domain and range", () => {
    // derived from the linear maps: x = 40 + (log10 f − 1)·100, magnitude y = 70 − (dB + 40)/40·50
    expect(pathsOf(svg, "#111111")).toEqual(["M40,20L140,45L240,70"]);
    // phase panel 70…120: y = 120 − (deg + 180)/360·50; the null is a gap, so one point is left
    expect(pathsOf(svg, "#222222")).toEqual(["M40,95L140,107.5"]);
  });

  it("cuts each panel's curves at the panel's edges", () => {
    const clip = svg.match(/<g clip-path="url\(#([^)]+)\)"><path class="curve" d="M40,20/)?.[1];
    expect(clip).toBeDefined();
    // the magnitude panel: x 40…240, y 20…70
    expect(svg).toContain(`<clipPath id="${clip}"><rect x="40" y="20" width="200" height="50"/></clipPath>`);
    // a second drawing names its clip paths afresh, as both may be in one page
    expect(figureSvg(fig, 250, 150)).not.toContain(`id="${clip}"`);
  });

  it("draws marker lines across the plot with their dash, and escapes label text", () => {
    expect(svg).toContain('<path d="M140,120V20" stroke="#333333" stroke-width="1" stroke-dasharray="2,2"/>');
    expect(svg).toContain(">a &lt;label&gt;</text>");
    // the label sits above the plot area, centred on 100 Hz
    expect(svg).toMatch(/<text x="140" y="18" text-anchor="middle" font-size="10" fill="#444444">/);
  });

  it("labels the axes' ticks: decades with SI prefixes, the phase at its given values", () => {
    for (const label of [">10<", ">20<", ">50<", ">100<", ">1k<", ">−180<", ">180<"]) expect(svg).toContain(label);
    expect(svg).not.toContain(">90<"); // not among the phase axis's tickvals
  });

  it("draws the response plot's own figure with every curve in it", () => {
    const f = Float64Array.from({ length: 50 }, (_, k) => 10 ** (1 + (4 * k) / 49));
    const series: PlotSeries[] = ["u1", "u2", "u3"].map((id, j) => ({
      id,
      name: id,
      db: Float64Array.from(f, (v) => -10 * j * Math.log10(1 + (v / 1e3) ** 2)),
      ph: Float64Array.from(f, (v) => (-j * Math.atan(v / 1e3) * 180) / Math.PI),
      emphasis: id === "u3",
    }));
    const full = buildFigure(series, [{ kind: "corner", f: 1e3, label: "u3 fc" }], f, 600);
    const out = figureSvg(full, 600, 300);
    // the chosen stage in the accent, magnitude and phase; the other two in one muted trace per panel,
    // each curve its own subpath
    expect(pathsOf(out, "#1e6d6a")).toHaveLength(2);
    const muted = pathsOf(out, "#a1a5ab");
    expect(muted).toHaveLength(2);
    expect(muted[0].match(/M/g)).toHaveLength(2);
    expect(out).toContain(">u3 fc</text>");
    expect(out.startsWith('<svg xmlns="http://www.w3.org/2000/svg" width="600" height="300"')).toBe(true);
  });
});
