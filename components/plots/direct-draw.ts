/**
 * Writing changed curves straight into a drawn Plotly plot.
 *
 * Plotly has no way to replace one curve cheaply: restyle, react and animate all rerun the defaults and
 * the calc step of every trace before drawing, about 17 ms of main-thread time for the twenty curves of
 * a ten-stage chain at 1,000 points. While a user edits a value, only the curves from the edited stage on
 * change, so the response plot writes those into the line paths Plotly already drew, mapped to pixels
 * with Plotly's own axis objects, and lets Plotly catch up once the edits pause (response-plot.tsx).
 *
 * This reads two internals of the pinned plotly.js: the axis objects in `_fullLayout` (their `l2p`
 * mapping) and the d3 datum on each trace group. When either is missing it changes nothing and answers
 * false, and the caller draws through Plotly's public API instead. A browser test compares a path
 * written here with the one Plotly draws for the same values.
 */

type Axis = { type?: string; l2p?: (v: number) => number };
type PlotDiv = HTMLElement & {
  _fullLayout?: Record<string, unknown>;
  _fullData?: { index?: number; xaxis?: string; yaxis?: string }[];
};

export interface CurveUpdate {
  /** the trace's index in the figure's data */
  trace: number;
  x: ArrayLike<number | null>;
  y: ArrayLike<number | null>;
}

/** "x" → "xaxis", "y2" → "yaxis2" (Plotly's names for an axis and its layout key). */
function axisKey(id: string | undefined, letter: "x" | "y"): string {
  const rest = (id ?? letter).slice(1);
  return `${letter}axis${rest}`;
}

/**
 * The SVG path of a line through the points, in pixels: a new subpath after every gap (a null or a
 * non-finite value, or an x that a log axis cannot show), as Plotly leaves gaps unconnected.
 */
export function linePath(x: ArrayLike<number | null>, y: ArrayLike<number | null>, px: (v: number) => number, py: (v: number) => number): string {
  const parts: string[] = [];
  let open = false;
  for (let k = 0; k < x.length; k++) {
    const xv = x[k];
    const yv = y[k];
    const X = xv === null ? NaN : px(xv);
    const Y = yv === null ? NaN : py(yv);
    if (!Number.isFinite(X) || !Number.isFinite(Y)) {
      open = false;
      continue;
    }
    parts.push(`${open ? "L" : "M"}${Math.round(X * 100) / 100},${Math.round(Y * 100) / 100}`);
    open = true;
  }
  return parts.join("");
}

/** Pixel mapping of a data value on an axis (log axes take log10 of the value first). */
function mapping(ax: Axis): (v: number) => number {
  const l2p = ax.l2p!;
  return ax.type === "log" ? (v) => (v > 0 ? l2p(Math.log10(v)) : NaN) : (v) => l2p(v);
}

/**
 * Replaces the drawn lines of the given traces. All or nothing: false (and no change) when a trace, its
 * axes or its line path cannot be found.
 */
export function drawCurvesDirectly(gd: HTMLElement, updates: CurveUpdate[]): boolean {
  const div = gd as PlotDiv;
  const layout = div._fullLayout;
  const fullData = div._fullData;
  if (!layout || !fullData) return false;
  const groups = new Map<number, Element>();
  gd.querySelectorAll("g.trace.scatter").forEach((g) => {
    const datum = (g as Element & { __data__?: { trace?: { index?: number } }[] }).__data__;
    const index = datum?.[0]?.trace?.index;
    if (typeof index === "number") groups.set(index, g);
  });
  const plans: { paths: NodeListOf<SVGPathElement>; d: () => string }[] = [];
  for (const u of updates) {
    const trace = fullData.find((t) => t.index === u.trace);
    const group = groups.get(u.trace);
    if (!trace || !group) return false;
    const xa = layout[axisKey(trace.xaxis, "x")] as Axis | undefined;
    const ya = layout[axisKey(trace.yaxis, "y")] as Axis | undefined;
    if (typeof xa?.l2p !== "function" || typeof ya?.l2p !== "function") return false;
    const paths = group.querySelectorAll<SVGPathElement>("path.js-line");
    if (!paths.length) return false;
    plans.push({ paths, d: () => linePath(u.x, u.y, mapping(xa), mapping(ya)) });
  }
  for (const plan of plans) {
    // Plotly draws one path per unbroken run; the first now carries every run, the rest are emptied
    plan.paths[0].setAttribute("d", plan.d() || "M0,0");
    for (let i = 1; i < plan.paths.length; i++) plan.paths[i].setAttribute("d", "M0,0");
  }
  return true;
}
