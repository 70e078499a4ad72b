/**
 * What the response plot draws, computed apart from the drawing: the series along the path to the chosen
 * node (each stage's cascade up to it, or each stage on its own), the markers (corners, source band,
 * Nyquist, alias frequency), the Plotly figure, and the CSV of exactly what is plotted.
 */
import Papa from "papaparse";
import type { StageResult } from "@/lib/chain/types";
import type { LiveCurves } from "@/lib/store/live-analysis";
import type { PlotMode } from "@/lib/store/editor-store";
import { formatQuantity } from "@/lib/units";
import { magnitudeDbLabel } from "@/lib/engine/sensors";

export interface PlotSeries {
  id: string;
  name: string;
  db: Float64Array;
  ph: Float64Array;
  /** the chosen node's own trace */
  emphasis: boolean;
}

export type MarkerKind = "corner" | "band" | "nyquist" | "alias";

export interface Marker {
  kind: MarkerKind;
  /** Hz; for the band its low edge */
  f: number;
  /** Hz; the band's high edge */
  f2?: number;
  label: string;
}

export interface PlotInput {
  curves: LiveCurves;
  /** node ids from the source to the chosen node */
  path: string[];
  mode: PlotMode;
  names: Record<string, string>;
  stages: Record<string, StageResult>;
  band: { fLow: number; fHigh: number } | null;
  /** sample rate of the ADC that ends the path, when it does */
  sampleRate: number | null;
  /** what the source puts out, per unit of which the cascade is (V, A or C; V when left out) */
  perUnit?: "V" | "A" | "C";
}

/**
 * The magnitude axis's title: from the source, the cascade is per unit of the source's quantity (dB re
 * 1 V/A from a photodiode); each stage on its own is shown as it is (the front end's own transfer is
 * per that unit too, the others V/V), so that view keeps plain "dB".
 */
export function magnitudeTitle(mode: PlotMode, perUnit: "V" | "A" | "C" = "V"): string {
  return mode === "cumulative" ? magnitudeDbLabel(perUnit) : "dB";
}

const RAD_TO_DEG = 180 / Math.PI;
const dbCache = new WeakMap<Float64Array, { im: Float64Array; db: Float64Array; ph: Float64Array }>();

/**
 * Magnitude 20·log10|H| (dB) and phase atan2 (degrees, wrapped to (−180, 180]) of a complex response;
 * cached per pair of arrays, so switching back and forth between modes costs nothing, and neither do
 * the curves an edit left unchanged (the live analysis keeps their arrays).
 */
export function dbPhase(re: Float64Array, im: Float64Array): { db: Float64Array; ph: Float64Array } {
  const hit = dbCache.get(re);
  if (hit && hit.im === im) return hit;
  const db = new Float64Array(re.length);
  const ph = new Float64Array(re.length);
  for (let k = 0; k < re.length; k++) {
    const m = Math.hypot(re[k], im[k]);
    db[k] = m > 0 && Number.isFinite(m) ? 20 * Math.log10(m) : NaN;
    let p = Math.atan2(im[k], re[k]) * RAD_TO_DEG;
    if (p <= -180) p += 360;
    ph[k] = Number.isFinite(m) ? p : NaN;
  }
  const out = { im, db, ph };
  dbCache.set(re, out);
  return out;
}

/** Series along the path, source left out; in "individual" mode the ADC (a flat 1) is left out too. */
export function plotSeries(input: PlotInput): PlotSeries[] {
  const { curves, path, mode } = input;
  const target = path[path.length - 1];
  const out: PlotSeries[] = [];
  for (const id of path.slice(1)) {
    const i = curves.index[id];
    if (i === undefined) continue;
    const stage = input.stages[id];
    if (mode === "individual" && !stage) continue;
    const { db, ph } = mode === "cumulative" ? dbPhase(curves.cumRe[i], curves.cumIm[i]) : dbPhase(curves.indRe[i], curves.indIm[i]);
    out.push({ id, name: input.names[id] ?? id, db, ph, emphasis: id === target });
  }
  return out;
}

export function plotMarkers(input: PlotInput): Marker[] {
  const f = input.curves.f;
  const lo = f[0];
  const hi = f[f.length - 1];
  const inRange = (x: number) => Number.isFinite(x) && x >= lo && x <= hi;
  const out: Marker[] = [];
  if (input.band) {
    const a = Math.max(input.band.fLow, lo);
    const b = Math.min(input.band.fHigh, hi);
    if (b > a) out.push({ kind: "band", f: a, f2: b, label: "source band" });
  }
  for (const id of input.path) {
    const s = input.stages[id];
    if (s?.f0 != null && inRange(s.f0)) out.push({ kind: "corner", f: s.f0, label: `${id} ${s.q === null ? "fc" : "f0"}` });
  }
  if (input.sampleRate) {
    const ny = input.sampleRate / 2;
    if (inRange(ny)) out.push({ kind: "nyquist", f: ny, label: "Nyquist" });
    if (input.band) {
      const alias = input.sampleRate - input.band.fHigh;
      if (alias > 0 && inRange(alias)) out.push({ kind: "alias", f: alias, label: "alias" });
    }
  }
  return out;
}

const gapCache = new WeakMap<Float64Array, { plain?: (number | null)[]; wrapped?: (number | null)[] }>();

/**
 * Plain arrays with gaps (null) where a value is not finite and where the wrapped phase jumps a turn.
 * Cached per array: the result is handed to Plotly and must not be changed.
 */
export function withGaps(values: Float64Array, wrap: boolean): (number | null)[] {
  let entry = gapCache.get(values);
  if (!entry) gapCache.set(values, (entry = {}));
  const hit = wrap ? entry.wrapped : entry.plain;
  if (hit) return hit;
  const out = gapsOf(values, wrap);
  if (wrap) entry.wrapped = out;
  else entry.plain = out;
  return out;
}

function gapsOf(values: Float64Array, wrap: boolean): (number | null)[] {
  const out: (number | null)[] = new Array(values.length);
  let prev: number | null = null;
  for (let k = 0; k < values.length; k++) {
    const v = values[k];
    if (!Number.isFinite(v)) {
      out[k] = null;
      prev = null;
      continue;
    }
    out[k] = wrap && prev !== null && Math.abs(v - prev) > 180 ? null : v;
    prev = v;
  }
  return out;
}

/** Our own palette: the chosen node in the accent, the other stages in a muted graphite. */
export const ACCENT = "#1e6d6a";
export const OTHERS_COLOUR = "#a1a5ab";
/** `meta` of the grouped trace: its point index runs over the curves one after another, each f.length + 1 long. */
export const GROUPED = "grouped";

/** Frequency index of a hovered point, for a grouped trace or a single curve. */
export function hoverIndex(pointIndex: number, meta: unknown, points: number): number {
  return meta === GROUPED ? pointIndex % (points + 1) : pointIndex;
}

const xCache = new WeakMap<Float64Array, number[]>();

/** The grid as a plain array for Plotly, once per grid (the live analysis keeps the grid's array). */
function plainX(f: Float64Array): number[] {
  let x = xCache.get(f);
  if (!x) xCache.set(f, (x = Array.from(f)));
  return x;
}

let lastGroup: { f: Float64Array; members: Float64Array[]; gx: (number | null)[]; gm: (number | null)[]; gp: (number | null)[] } | null = null;

/**
 * The muted curves one after another, each followed by a gap: x, magnitude and phase. The last result is
 * kept, so an edit that leaves these curves alone (the stage the plot follows, typically) gives the very
 * same arrays and the plot does not redraw them.
 */
function grouped(others: PlotSeries[], f: Float64Array) {
  const members = others.flatMap((s) => [s.db, s.ph]);
  if (lastGroup && lastGroup.f === f && lastGroup.members.length === members.length && lastGroup.members.every((m, i) => m === members[i])) return lastGroup;
  const x = plainX(f);
  const n = x.length + 1;
  const gx: (number | null)[] = new Array(others.length * n);
  const gm: (number | null)[] = new Array(others.length * n);
  const gp: (number | null)[] = new Array(others.length * n);
  others.forEach((s, j) => {
    const m = withGaps(s.db, false);
    const p = withGaps(s.ph, true);
    for (let k = 0; k < x.length; k++) {
      gx[j * n + k] = x[k];
      gm[j * n + k] = m[k];
      gp[j * n + k] = p[k];
    }
    gx[j * n + x.length] = gm[j * n + x.length] = gp[j * n + x.length] = null;
  });
  lastGroup = { f, members, gx, gm, gp };
  return lastGroup;
}

const extremeCache = new WeakMap<Float64Array, { top: number; bottom: number }>();

/** Largest and smallest finite value of an array (−Infinity and Infinity when there is none). */
function extremes(values: Float64Array): { top: number; bottom: number } {
  let e = extremeCache.get(values);
  if (!e) {
    e = { top: -Infinity, bottom: Infinity };
    for (const v of values) {
      if (!Number.isFinite(v)) continue;
      if (v > e.top) e.top = v;
      if (v < e.bottom) e.bottom = v;
    }
    extremeCache.set(values, e);
  }
  return e;
}

const LABEL_ROW_PX = 11;
const LABEL_CHAR_PX = 5.6; // a 10 px label, about this wide per character
const LABEL_ROWS = 3;

/**
 * The row (0 nearest the plot) of each marker label above the plot: left to right, each label takes the
 * lowest row where it clears the label before it by a few pixels, judged from its length and the plot's
 * width in pixels; when no row is clear it takes the one whose last label ends furthest left.
 */
export function labelRows(markers: Marker[], f: Float64Array, plotWidthPx: number): Map<Marker, number> {
  const out = new Map<Marker, number>();
  if (!f.length) return out;
  const decades = Math.max(1e-9, Math.log10(f[f.length - 1] / f[0]));
  const pxPerDecade = Math.max(50, plotWidthPx - 58) / decades; // less the plot's side margins
  const ends = new Array<number>(LABEL_ROWS).fill(-Infinity); // right edge of each row so far, in px
  for (const m of [...markers].sort((a, b) => a.f - b.f)) {
    const centre = Math.log10(m.f / f[0]) * pxPerDecade;
    const half = (m.label.length * LABEL_CHAR_PX) / 2;
    let row = ends.findIndex((end) => end + 4 <= centre - half);
    if (row < 0) row = ends.indexOf(Math.min(...ends));
    ends[row] = centre + half;
    out.set(m, row);
  }
  return out;
}

export interface Figure {
  data: Record<string, unknown>[];
  layout: Record<string, unknown>;
}

/**
 * The Plotly figure. The chosen node's curve is drawn in the accent; every other stage on the path is
 * drawn in one muted trace per panel (the curves one after another, separated by gaps), so the cost of a
 * redraw does not grow with the number of stages. The cursor readout names each curve.
 */
export function buildFigure(series: PlotSeries[], markers: Marker[], f: Float64Array, plotWidthPx = 700, magnitudeAxis = "dB"): Figure {
  const x = plainX(f);
  const data: Record<string, unknown>[] = [];
  const others = series.filter((s) => !s.emphasis);
  const chosen = series.filter((s) => s.emphasis);
  if (others.length) {
    const { gx, gm, gp } = grouped(others, f);
    const line = { color: OTHERS_COLOUR, width: 1 };
    const name = others.length === 1 ? others[0].name : `${others.length} other stages`;
    data.push({ type: "scatter", mode: "lines", name, legendgroup: "others", x: gx, y: gm, xaxis: "x", yaxis: "y", line, hoverinfo: "none", meta: GROUPED });
    data.push({ type: "scatter", mode: "lines", name, legendgroup: "others", showlegend: false, x: gx, y: gp, xaxis: "x", yaxis: "y2", line, hoverinfo: "none", meta: GROUPED });
  }
  for (const s of chosen) {
    const line = { color: ACCENT, width: 2.4 };
    data.push({ type: "scatter", mode: "lines", name: s.name, legendgroup: s.id, x, y: withGaps(s.db, false), xaxis: "x", yaxis: "y", line, hoverinfo: "none" });
    data.push({ type: "scatter", mode: "lines", name: s.name, legendgroup: s.id, showlegend: false, x, y: withGaps(s.ph, true), xaxis: "x", yaxis: "y2", line, hoverinfo: "none" });
  }
  const shapes: Record<string, unknown>[] = [];
  const annotations: Record<string, unknown>[] = [];
  const sorted = [...markers].sort((a, b) => a.f - b.f);
  const placed = labelRows(
    sorted.filter((m) => m.kind !== "band"),
    f,
    plotWidthPx,
  );
  for (const m of sorted) {
    if (m.kind === "band") {
      shapes.push({ type: "rect", xref: "x", yref: "paper", x0: m.f, x1: m.f2, y0: 0, y1: 1, fillcolor: "#cfe3e1", opacity: 0.35, line: { width: 0 }, layer: "below" });
      continue;
    }
    const dash = m.kind === "corner" ? "dot" : m.kind === "nyquist" ? "dash" : "dashdot";
    const colour = m.kind === "corner" ? "#7b8088" : m.kind === "nyquist" ? "#24272c" : "#946019";
    shapes.push({ type: "line", xref: "x", yref: "paper", x0: m.f, x1: m.f, y0: 0, y1: 1, line: { color: colour, width: 1, dash } });
    annotations.push({ x: Math.log10(m.f), xref: "x", y: 1, yref: "paper", yanchor: "bottom", yshift: placed.get(m)! * LABEL_ROW_PX, text: m.label, showarrow: false, font: { size: 10, color: colour } });
  }
  const labelRowsUsed = Math.max(0, ...placed.values()) + 1;
  let top = -Infinity;
  let bottom = Infinity;
  for (const s of series) {
    const e = extremes(s.db);
    if (e.top > top) top = e.top;
    if (e.bottom < bottom) bottom = e.bottom;
  }
  // Steps of 10 dB, so most edits leave the range alone and the plot can update its curves only.
  const yTop = Number.isFinite(top) ? Math.ceil((top + 2) / 10) * 10 : undefined;
  const yRange = yTop === undefined ? undefined : [Math.floor(Math.max(bottom - 2, yTop - 150) / 10) * 10, yTop];
  const layout = {
    margin: { l: 46, r: 12, t: 15 + labelRowsUsed * LABEL_ROW_PX, b: 34 },
    paper_bgcolor: "#fbfaf7",
    plot_bgcolor: "#fbfaf7",
    font: { family: "var(--font-geist-sans), system-ui, sans-serif", size: 11, color: "#3c4047" },
    // the legend is drawn in the page beside the plot (plotLegend); Plotly's own costs a redraw each time
    showlegend: false,
    hovermode: "x",
    dragmode: "zoom",
    xaxis: {
      type: "log",
      // a fixed range spares Plotly an autorange pass on every redraw
      range: [Math.log10(f[0]), Math.log10(f[f.length - 1])],
      autorange: false,
      anchor: "y2",
      title: { text: "Hz", standoff: 2 },
      gridcolor: "#e3dfd6",
      zeroline: false,
      showspikes: true,
      spikemode: "across",
      spikethickness: 1,
      spikecolor: "#5a5f67",
      spikedash: "solid",
      exponentformat: "SI",
    },
    yaxis: { domain: [0.53, 1], title: { text: magnitudeAxis, standoff: 4 }, gridcolor: "#e3dfd6", zerolinecolor: "#a1a5ab", range: yRange },
    yaxis2: { domain: [0, 0.45], title: { text: "phase °", standoff: 4 }, gridcolor: "#e3dfd6", zerolinecolor: "#a1a5ab", range: [-185, 185], tickvals: [-180, -90, 0, 90, 180] },
    shapes,
    annotations,
    uirevision: "keep-zoom",
  };
  return { data, layout };
}

/**
 * Everything about a figure except its curve values and its markers: when two figures share it, the
 * second can be drawn by replacing the curves (and, if they moved, the markers) instead of starting over.
 */
export function figureShape(fig: Figure): string {
  return JSON.stringify({
    traces: fig.data.map((t) => [t.name, t.yaxis, t.meta, t.line, (t.x as unknown[]).length]),
    layout: { ...fig.layout, shapes: undefined, annotations: undefined }, // undefined: left out of the text
  });
}

/** The markers of a figure (corner, band, Nyquist and alias lines with their labels), as one string. */
export function figureMarks(fig: Figure): string {
  return JSON.stringify([fig.layout.shapes, fig.layout.annotations]);
}

/** What the plot's legend shows: the chosen curve in the accent and the other stages in the muted tone. */
export function plotLegend(series: PlotSeries[]): { name: string; colour: string; emphasis: boolean }[] {
  const others = series.filter((s) => !s.emphasis);
  const out = series.filter((s) => s.emphasis).map((s) => ({ name: s.name, colour: ACCENT, emphasis: true }));
  if (others.length) out.push({ name: others.length === 1 ? others[0].name : `${others.length} other stages`, colour: OTHERS_COLOUR, emphasis: false });
  return out;
}

/** CSV of what is plotted: frequency, then magnitude (with its reference when it is not V/V) and phase per series. */
export function plotCsv(series: PlotSeries[], f: Float64Array, mode: PlotMode, perUnit: "V" | "A" | "C" = "V"): string {
  const what = mode === "cumulative" ? "from source" : "own";
  const mag = `magnitude_${magnitudeTitle(mode, perUnit)}`;
  const fields = ["frequency_Hz", ...series.flatMap((s) => [`${s.id} ${what} ${mag}`, `${s.id} ${what} phase_deg`])];
  const rows: (number | string)[][] = [];
  for (let k = 0; k < f.length; k++) {
    const row: (number | string)[] = [f[k]];
    for (const s of series) row.push(Number.isFinite(s.db[k]) ? s.db[k] : "", Number.isFinite(s.ph[k]) ? s.ph[k] : "");
    rows.push(row);
  }
  return Papa.unparse({ fields, data: rows });
}

/** One line of readout at frequency index k: "1.23 kHz · u2 −3.01 dB −45.0°". */
export function readoutAt(series: PlotSeries[], f: Float64Array, k: number): { f: string; items: { id: string; name: string; db: string; ph: string }[] } {
  const n = (v: number, d: number) => (Number.isFinite(v) ? v.toFixed(d).replace("-", "−") : "—");
  return {
    f: formatQuantity(f[k], "hertz", 4),
    items: series.map((s) => ({ id: s.id, name: s.name, db: `${n(s.db[k], 2)} dB`, ph: `${n(s.ph[k], 1)}°` })),
  };
}
