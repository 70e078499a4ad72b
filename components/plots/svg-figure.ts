/**
 * The response figure drawn as plain SVG, without Plotly: what a chain shows while Plotly is not loaded.
 *
 * Plotly is several megabytes of script, and evaluating it holds the main thread for a second or more on
 * a slow machine; a chain that waited for it could neither show its plot nor answer a keystroke in that
 * time. So the response plot draws the same figure (`buildFigure` in plot-data.ts: its traces, axes,
 * domains, ranges, marker lines and labels) with this function first, and Plotly takes over when it has
 * loaded (response-plot.tsx says when that is). The drawing is static: no hover, no zoom; those are what
 * Plotly is loaded for.
 *
 * Geometry as Plotly lays out a figure: the plot area is the size less the margins, an axis's domain is
 * its share of that area, a log axis's range is in decades (log10 of the values).
 */
import type { Figure } from "./plot-data";
import { linePath } from "./direct-draw";

type Trace = {
  x?: ArrayLike<number | null>;
  y?: ArrayLike<number | null>;
  mode?: string;
  xaxis?: string;
  yaxis?: string;
  line?: { color?: string; width?: number; dash?: string };
  marker?: { color?: string; size?: number };
  visible?: boolean | string;
};
type AxisLayout = { type?: string; range?: [number, number]; domain?: [number, number]; title?: { text?: string }; gridcolor?: string; zerolinecolor?: string; tickvals?: number[] };
type Shape = { type?: string; xref?: string; yref?: string; x0?: number; x1?: number; y0?: number; y1?: number; fillcolor?: string; opacity?: number; line?: { color?: string; width?: number; dash?: string } };
type Annotation = { x?: number; y?: number; yshift?: number; text?: string; font?: { size?: number; color?: string } };

/** SVG stroke-dasharray for Plotly's dash names (at a line width of 1). */
const DASHES: Record<string, string> = { dot: "2,2", dash: "6,4", dashdot: "6,3,2,3", longdash: "10,4" };

const esc = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
const r2 = (v: number) => Math.round(v * 100) / 100;

const SI = ["p", "n", "µ", "m", "", "k", "M", "G", "T"];

/** A tick value the way the axes label it: 1, 10, 100, 1k, 10k, 1M, 100m (SI prefixes, no unit). */
export function siTick(v: number): string {
  if (v === 0) return "0";
  const e3 = Math.max(-4, Math.min(4, Math.floor(Math.log10(Math.abs(v)) / 3 + 1e-9)));
  const m = v / 10 ** (e3 * 3);
  return `${Number(m.toPrecision(3))}${SI[e3 + 4]}`;
}

/**
 * Tick values on a log axis over [lo, hi] decades: every decade, and 2 and 5 in between when the axis
 * spans fewer than four decades (as a wide axis would crowd them).
 */
export function logTicks(lo: number, hi: number): number[] {
  const out: number[] = [];
  const steps = hi - lo < 4 ? [1, 2, 5] : [1];
  for (let d = Math.floor(lo); d <= Math.ceil(hi); d++) {
    for (const s of steps) {
      const v = s * 10 ** d;
      const l = Math.log10(v);
      if (l >= lo - 1e-9 && l <= hi + 1e-9) out.push(v);
    }
  }
  return out;
}

/** Evenly spaced ticks over a linear range at a 1, 2 or 5 step that gives about `count` of them. */
export function linearTicks(lo: number, hi: number, count = 5): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((s) => s * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + 1e-9 * step; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : r2(v));
  return out;
}

/** The range of an axis: its layout range, else the finite values drawn on it with a little room. */
function rangeOf(ax: AxisLayout | undefined, values: ArrayLike<number | null>[]): [number, number] {
  if (ax?.range && Number.isFinite(ax.range[0]) && Number.isFinite(ax.range[1])) return ax.range;
  let lo = Infinity;
  let hi = -Infinity;
  for (const vs of values)
    for (let k = 0; k < vs.length; k++) {
      const v = vs[k];
      if (v === null || !Number.isFinite(v)) continue;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  if (!Number.isFinite(lo)) return [-1, 1];
  const pad = hi > lo ? (hi - lo) * 0.05 : 1;
  return [lo - pad, hi + pad];
}

let drawings = 0;

/**
 * The figure as one SVG element's markup, `width` × `height` pixels. Axes named by the traces (x, y, y2,
 * …) are read from the layout; a trace on an axis the layout does not describe is left out.
 */
export function figureSvg(fig: Figure, width: number, height: number): string {
  const layout = fig.layout as {
    margin?: { l?: number; r?: number; t?: number; b?: number };
    paper_bgcolor?: string;
    plot_bgcolor?: string;
    font?: { family?: string; size?: number; color?: string };
    shapes?: Shape[];
    annotations?: Annotation[];
  } & Record<string, unknown>;
  const m = { l: 80, r: 80, t: 100, b: 80, ...layout.margin };
  const plotW = Math.max(10, width - m.l - m.r);
  const plotH = Math.max(10, height - m.t - m.b);
  const font = layout.font ?? {};
  const fontSize = font.size ?? 12;
  const traces = (fig.data as Trace[]).filter((t) => t.visible !== false && t.visible !== "legendonly");

  const xa = (layout.xaxis ?? {}) as AxisLayout;
  const xLog = xa.type === "log";
  const xRange = rangeOf(xa, traces.filter((t) => (t.xaxis ?? "x") === "x").map((t) => (xLog ? logOf(t.x ?? []) : (t.x ?? []))));
  const px = (v: number) => m.l + ((xLog ? (v > 0 ? Math.log10(v) : NaN) : v) - xRange[0]) / (xRange[1] - xRange[0]) * plotW;

  // every y axis a trace uses, in the order of the layout's keys
  const yIds = [...new Set(traces.map((t) => t.yaxis ?? "y"))].filter((id) => layout[`yaxis${id.slice(1)}`] !== undefined || id === "y");
  const yAxes = yIds.map((id) => {
    const ax = (layout[`yaxis${id.slice(1)}`] ?? {}) as AxisLayout;
    const domain = ax.domain ?? [0, 1];
    const range = rangeOf(ax, traces.filter((t) => (t.yaxis ?? "y") === id).map((t) => t.y ?? []));
    const top = m.t + (1 - domain[1]) * plotH;
    const bottom = m.t + (1 - domain[0]) * plotH;
    const py = (v: number) => bottom - ((v - range[0]) / (range[1] - range[0])) * (bottom - top);
    return { id, ax, range, top, bottom, py };
  });
  const lowest = yAxes.reduce((a, b) => (b.bottom > a.bottom ? b : a), yAxes[0]);

  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" role="img" aria-label="Response plot" ` +
      `style="font-family:${esc(font.family ?? "sans-serif")};font-size:${fontSize}px" fill="${esc(font.color ?? "#444")}">`,
  );
  out.push(`<rect width="${width}" height="${height}" fill="${esc(layout.paper_bgcolor ?? "#fff")}"/>`);
  const xTicks = xLog ? logTicks(xRange[0], xRange[1]) : linearTicks(xRange[0], xRange[1]);
  for (const y of yAxes) {
    out.push(`<rect x="${m.l}" y="${r2(y.top)}" width="${plotW}" height="${r2(y.bottom - y.top)}" fill="${esc(layout.plot_bgcolor ?? "#fff")}"/>`);
    const grid = esc(y.ax.gridcolor ?? "#eee");
    for (const t of xTicks) out.push(`<path d="M${r2(px(t))},${r2(y.top)}V${r2(y.bottom)}" stroke="${grid}" stroke-width="1"/>`);
    const yTicks = y.ax.tickvals ?? linearTicks(y.range[0], y.range[1]);
    for (const t of yTicks) {
      if (t < Math.min(...y.range) || t > Math.max(...y.range)) continue;
      const Y = r2(y.py(t));
      const line = t === 0 && y.ax.zerolinecolor ? esc(y.ax.zerolinecolor) : grid;
      out.push(`<path d="M${m.l},${Y}H${m.l + plotW}" stroke="${line}" stroke-width="1"/>`);
      out.push(`<text x="${m.l - 4}" y="${Y}" text-anchor="end" dominant-baseline="middle">${esc(String(t).replace("-", "−"))}</text>`);
    }
    if (y.ax.title?.text) {
      const cy = r2((y.top + y.bottom) / 2);
      out.push(`<text transform="translate(${Math.max(fontSize, m.l - 34)},${cy}) rotate(-90)" text-anchor="middle">${esc(y.ax.title.text)}</text>`);
    }
  }
  if (lowest) {
    for (const t of xTicks) out.push(`<text x="${r2(px(t))}" y="${r2(lowest.bottom + fontSize + 2)}" text-anchor="middle">${esc(xLog ? siTick(t) : String(t))}</text>`);
    if (xa.title?.text) out.push(`<text x="${r2(m.l + plotW / 2)}" y="${r2(lowest.bottom + 2 * fontSize + 6)}" text-anchor="middle">${esc(xa.title.text)}</text>`);
  }

  const paperY = (v: number) => m.t + (1 - v) * plotH;
  const clipX = (v: number) => Math.max(m.l, Math.min(m.l + plotW, v));
  const shapes = layout.shapes ?? [];
  const drawShape = (s: Shape) => {
    if (s.xref !== "x" || s.yref !== "paper" || s.x0 === undefined) return;
    const x0 = clipX(px(s.x0));
    const y0 = paperY(s.y0 ?? 0);
    const y1 = paperY(s.y1 ?? 1);
    if (s.type === "rect" && s.x1 !== undefined) {
      const x1 = clipX(px(s.x1));
      out.push(`<rect x="${r2(Math.min(x0, x1))}" y="${r2(Math.min(y0, y1))}" width="${r2(Math.abs(x1 - x0))}" height="${r2(Math.abs(y1 - y0))}" fill="${esc(s.fillcolor ?? "#ccc")}" fill-opacity="${s.opacity ?? 1}"/>`);
    } else if (s.type === "line") {
      const dash = s.line?.dash ? DASHES[s.line.dash] : undefined;
      out.push(`<path d="M${r2(x0)},${r2(y0)}V${r2(y1)}" stroke="${esc(s.line?.color ?? "#444")}" stroke-width="${s.line?.width ?? 1}"${dash ? ` stroke-dasharray="${dash}"` : ""}/>`);
    }
  };
  // Plotly draws shapes on layer "below" under the curves, the others over them
  shapes.filter((s) => (s as { layer?: string }).layer === "below").forEach(drawShape);

  // each panel's curves are cut at its edges, as Plotly cuts them (ids unique in the page)
  const clip = `cw-svg-${++drawings}`;
  out.push("<defs>");
  yAxes.forEach((y, i) => out.push(`<clipPath id="${clip}-${i}"><rect x="${m.l}" y="${r2(y.top)}" width="${plotW}" height="${r2(y.bottom - y.top)}"/></clipPath>`));
  out.push("</defs>");
  out.push(`<g fill="none" stroke-linejoin="round" stroke-linecap="round">`);
  for (const t of traces) {
    const y = yAxes.find((a) => a.id === (t.yaxis ?? "y"));
    if (!y || !t.x || !t.y) continue;
    out.push(`<g clip-path="url(#${clip}-${yAxes.indexOf(y)})">`);
    const colour = esc(t.line?.color ?? t.marker?.color ?? "#1f77b4");
    const mode = t.mode ?? "lines";
    if (mode.includes("lines")) {
      const dash = t.line?.dash ? DASHES[t.line.dash] : undefined;
      const d = linePath(t.x, t.y, px, y.py);
      if (d) out.push(`<path class="curve" d="${d}" stroke="${colour}" stroke-width="${t.line?.width ?? 2}"${dash ? ` stroke-dasharray="${dash}"` : ""}/>`);
    }
    if (mode.includes("markers")) {
      const rad = (t.marker?.size ?? 6) / 2;
      const dots: string[] = [];
      for (let k = 0; k < t.x.length; k++) {
        const xv = t.x[k];
        const yv = t.y[k];
        if (xv === null || yv === null) continue;
        const X = px(xv);
        const Y = y.py(yv);
        if (Number.isFinite(X) && Number.isFinite(Y)) dots.push(`M${r2(X - rad)},${r2(Y)}a${rad},${rad} 0 1,0 ${2 * rad},0a${rad},${rad} 0 1,0 ${-2 * rad},0`);
      }
      if (dots.length) out.push(`<path d="${dots.join("")}" fill="${colour}" stroke="none"/>`);
    }
    out.push("</g>");
  }
  out.push(`</g>`);
  shapes.filter((s) => (s as { layer?: string }).layer !== "below").forEach(drawShape);
  for (const a of layout.annotations ?? []) {
    if (a.x === undefined || !a.text) continue;
    // annotation x on a log axis is given in decades, as Plotly takes it
    const X = m.l + ((a.x - xRange[0]) / (xRange[1] - xRange[0])) * plotW;
    const Y = paperY(a.y ?? 1) - (a.yshift ?? 0) - 2;
    const size = a.font?.size ?? fontSize;
    out.push(`<text x="${r2(X)}" y="${r2(Y)}" text-anchor="middle" font-size="${size}" fill="${esc(a.font?.color ?? font.color ?? "#444")}">${esc(a.text)}</text>`);
  }
  out.push(`</svg>`);
  return out.join("");
}

/** log10 of the positive values (the others as null), for finding a log axis's range. */
function logOf(values: ArrayLike<number | null>): (number | null)[] {
  const out: (number | null)[] = new Array(values.length);
  for (let k = 0; k < values.length; k++) {
    const v = values[k];
    out[k] = v !== null && v > 0 ? Math.log10(v) : null;
  }
  return out;
}
