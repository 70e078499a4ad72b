/**
 * The waveform panel's figure: one stacked row per trace (the source EMF, then every node in chain
 * order) on a shared time axis in ms, each row min/max-decimated over the visible window so no peak is
 * lost, with the rails (dashed), the usable band (dotted) and clipped stretches (shaded) drawn.
 * Pure: the panel hands the result to Plotly.
 */
import { minMaxDecimate, type NodeTrace, type WaveformRun } from "@/lib/engine/time-domain";

export interface Row {
  name: string;
  v: Float64Array;
  trace: NodeTrace | null;
}

/** Rows to draw: the EMF, then each node except a source that is the EMF itself and ADCs (their input is the node above). */
export function rowsOf(run: WaveformRun, names: Record<string, string>): Row[] {
  const rows: Row[] = [{ name: "source EMF", v: run.emf, trace: null }];
  for (const n of run.nodes) {
    if (n.kind === "source" && n.v === run.emf) continue;
    if (n.kind === "source" && n.v.every((x, i) => x === run.emf[i])) continue;
    rows.push({ name: names[n.id] ?? n.id, v: n.v, trace: n });
  }
  return rows;
}

const BUCKETS = 1200;

export function waveformFigure(run: WaveformRun, rows: Row[], window: [number, number] | null) {
  const fs = run.sampleRate;
  const N = run.samples;
  const from = window ? Math.max(0, Math.floor((window[0] / 1000) * fs) - 1) : 0;
  const to = window ? Math.min(N, Math.ceil((window[1] / 1000) * fs) + 2) : N;
  const R = rows.length;
  const gap = 0.02;
  const h = (1 - gap * (R - 1)) / R;
  const data: Record<string, unknown>[] = [];
  const shapes: Record<string, unknown>[] = [];
  const layout: Record<string, unknown> = {
    margin: { l: 64, r: 12, t: 8, b: 36 },
    showlegend: false,
    hovermode: "x",
    dragmode: "zoom",
    uirevision: "waveform",
    font: { size: 11 },
    xaxis: { title: { text: "time (ms)" }, anchor: `y${R}`, ...(window ? { range: window } : {}) },
    shapes,
  };
  rows.forEach((row, r) => {
    const axis = r === 0 ? "y" : `y${r + 1}`;
    const top = 1 - r * (h + gap);
    const d = minMaxDecimate(row.v, BUCKETS, from, to);
    const x = Array.from(d.index, (i) => (i / fs) * 1000);
    data.push({ type: "scatter", mode: "lines", x, y: Array.from(d.value), name: row.name, yaxis: axis, xaxis: "x", line: { width: 1.2, color: row.trace?.clippedSamples ? "#b4412f" : "#2f5d8a" }, hovertemplate: `${row.name}: %{y:.4g} V<extra></extra>` });
    const yl: Record<string, unknown> = { domain: [Math.max(0, top - h), top], title: { text: row.name, font: { size: 10 } }, zeroline: false };
    const t = row.trace;
    if (t?.rails || t?.band) {
      let lo = Infinity;
      let hi = -Infinity;
      for (const v of d.value) {
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
      const marks = [t.rails?.low, t.rails?.high, t.band?.low, t.band?.high].filter((v): v is number => v !== undefined);
      lo = Math.min(lo, ...marks);
      hi = Math.max(hi, ...marks);
      const pad = (hi - lo) * 0.06 || 0.1;
      yl.range = [lo - pad, hi + pad];
      const line = (y: number, dash: string, color: string) =>
        shapes.push({ type: "line", xref: "x domain", yref: axis, x0: 0, x1: 1, y0: y, y1: y, line: { dash, width: 1, color } });
      if (t.rails) {
        line(t.rails.low, "dash", "#7a7a7a");
        line(t.rails.high, "dash", "#7a7a7a");
      }
      if (t.band) {
        line(t.band.low, "dot", "#c28a12");
        line(t.band.high, "dot", "#c28a12");
      }
      for (const c of t.clips) {
        if (c.end < from || c.start > to) continue;
        shapes.push({ type: "rect", xref: "x", yref: `${axis} domain`, x0: (c.start / fs) * 1000, x1: (c.end / fs) * 1000, y0: 0, y1: 1, fillcolor: "rgba(180,65,47,0.18)", line: { width: 0 } });
      }
    }
    layout[r === 0 ? "yaxis" : `yaxis${r + 1}`] = yl;
  });
  return { data, layout };
}

/** Rows of the clip table: where (ms) and how long each stage clipped or slewed. */
export function clipRows(run: WaveformRun, names: Record<string, string>, max = 200) {
  const fs = run.sampleRate;
  const out: { node: string; side: string; fromMs: number; ms: number; peak: number }[] = [];
  for (const n of run.nodes) {
    for (const c of [...n.clips, ...n.slews]) out.push({ node: names[n.id] ?? n.id, side: c.side, fromMs: (c.start / fs) * 1000, ms: ((c.end - c.start) / fs) * 1000, peak: c.peak });
  }
  out.sort((a, b) => a.fromMs - b.fromMs);
  return { rows: out.slice(0, max), total: out.length };
}
