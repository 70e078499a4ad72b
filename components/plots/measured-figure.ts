/**
 * Measured responses laid over the response plot's figure: each measured magnitude and phase on the
 * computed panels, and a third panel below them with the difference, measured − computed (dB on the
 * left axis, degrees on the right), all on the one shared log-frequency axis. Pure: it takes the figure
 * `buildFigure` made and returns a new one, leaving that untouched when nothing is overlaid.
 */
import type { ResponseDifference } from "@/lib/engine/measured-response";
import { formatQuantity } from "@/lib/units";
import { withGaps, type Figure } from "./plot-data";

export interface MeasuredOverlay {
  /** the stored file's id */
  id: string;
  /** "bench.csv at adc" */
  label: string;
  colour: string;
  diff: ResponseDifference;
}

/** Our own colours for measured curves, apart from the accent and the muted stage tone. */
export const MEASURED_COLOURS = ["#b5562a", "#5b4a9e", "#2f6f9f", "#8a6d1f"] as const;

/** The smallest of 0.5, 1, 2, 5, 10, 20, … at or above x: a difference axis that moves only in steps. */
export function stepAbove(x: number): number {
  if (!(x > 0.5)) return 0.5;
  const p = 10 ** Math.floor(Math.log10(x));
  for (const m of [1, 2, 5, 10]) if (m * p >= x) return m * p;
  return 10 * p;
}

function largest(values: Float64Array): number {
  let m = 0;
  for (const v of values) if (Number.isFinite(v) && Math.abs(v) > m) m = Math.abs(v);
  return m;
}

export function withMeasured(fig: Figure, overlays: MeasuredOverlay[]): Figure {
  if (!overlays.length) return fig;
  const data = [...fig.data];
  for (const o of overlays) {
    const x = Array.from(o.diff.f);
    const common = { type: "scatter", legendgroup: `measured-${o.id}`, x, hoverinfo: "skip", meta: "measured" };
    const measuredLine = { color: o.colour, width: 1.4, dash: "dash" };
    data.push({ ...common, mode: "lines+markers", name: `${o.label} measured`, y: withGaps(o.diff.measuredDb, false), yaxis: "y", line: measuredLine, marker: { size: 4, color: o.colour } });
    data.push({ ...common, mode: "lines+markers", name: `${o.label} measured`, showlegend: false, y: withGaps(o.diff.measuredDeg, true), yaxis: "y2", line: measuredLine, marker: { size: 4, color: o.colour } });
    data.push({ ...common, mode: "lines", name: `${o.label} − computed, dB`, y: withGaps(o.diff.diffDb, false), yaxis: "y3", line: { color: o.colour, width: 1.8 } });
    data.push({ ...common, mode: "lines", name: `${o.label} − computed, °`, y: withGaps(o.diff.diffDeg, true), yaxis: "y4", line: { color: o.colour, width: 1.2, dash: "dot" } });
  }
  const dbSpan = stepAbove(Math.max(...overlays.map((o) => largest(o.diff.diffDb))) * 1.1);
  const degSpan = Math.min(180, stepAbove(Math.max(...overlays.map((o) => largest(o.diff.diffDeg))) * 1.1));
  const layout = fig.layout as Record<string, Record<string, unknown> | unknown>;
  const xaxis = { ...(layout.xaxis as Record<string, unknown>), anchor: "y3" };
  const yaxis = { ...(layout.yaxis as Record<string, unknown>), domain: [0.66, 1] };
  const yaxis2 = { ...(layout.yaxis2 as Record<string, unknown>), domain: [0.35, 0.6] };
  const grid = (layout.yaxis as Record<string, unknown>).gridcolor;
  const yaxis3 = { domain: [0, 0.27], title: { text: "Δ dB", standoff: 4 }, gridcolor: grid, zerolinecolor: "#5a5f67", range: [-dbSpan, dbSpan], fixedrange: true };
  const yaxis4 = {
    overlaying: "y3",
    side: "right",
    title: { text: "Δ °", standoff: 2 },
    showgrid: false,
    zeroline: false,
    range: [-degSpan, degSpan],
    fixedrange: true,
  };
  const margin = { ...(layout.margin as Record<string, number>), r: 44 };
  return { data, layout: { ...fig.layout, margin, xaxis, yaxis, yaxis2, yaxis3, yaxis4 } };
}

const signed = (v: number, d: number) => `${v > 0 ? "+" : v < 0 ? "−" : ""}${Math.abs(v).toFixed(d)}`;

/**
 * One line about a comparison: rms and the largest difference in dB and degrees, points left out;
 * `short`: rms and largest in dB, largest in degrees, without frequencies.
 */
export function differenceSummary(o: MeasuredOverlay, short = false): string {
  const d = o.diff;
  if (!d.compared) return "no measured point lies within the computed frequency range";
  if (short) return `Δ rms ${d.rmsDb.toFixed(2)} dB, largest ${signed(d.worstDb!.value, 2)} dB; phase largest ${signed(d.worstDeg!.value, 1)}°`;
  const hz = (f: number) => formatQuantity(f, "hertz", 3);
  const parts = [
    `Δ rms ${d.rmsDb.toFixed(2)} dB, largest ${signed(d.worstDb!.value, 2)} dB at ${hz(d.worstDb!.f)}`,
    `phase rms ${d.rmsDeg.toFixed(1)}°, largest ${signed(d.worstDeg!.value, 1)}° at ${hz(d.worstDeg!.f)}`,
  ];
  if (d.outside) parts.push(`${d.outside} point${d.outside === 1 ? "" : "s"} outside the computed range left out`);
  return parts.join("; ");
}
