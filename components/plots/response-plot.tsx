"use client";
/**
 * The response plot: magnitude over phase, one shared log-frequency axis, the cascade along the path to
 * the chosen node (each stage's cascade up to it, or each stage on its own), with markers at corners, the
 * source band, Nyquist and the alias frequency, a readout at the cursor and CSV export of what is drawn.
 * Measured responses stored on the chain are laid over it with their difference (measured-overlay.tsx).
 */
import { useCallback, useDeferredValue, useEffect, useLayoutEffect, useMemo, useRef, useState } from "react";
import { useEditor, useEditorActions, useEditorStoreApi } from "@/lib/store/editor-context";
import type { PlotMode } from "@/lib/store/editor-store";
import { pathTo } from "@/lib/store/graph";
import { isSourceKind } from "@/lib/chain/types";
import { sourceSignal, transferPerUnit } from "@/lib/engine/sensors";
import { buildFigure, figureMarks, figureShape, hoverIndex, magnitudeTitle, plotCsv, plotLegend, plotMarkers, plotSeries, readoutAt, type Figure, type PlotInput } from "./plot-data";
import { loadPlotlyWhenWanted, type PlotlyLike } from "./plotly-loader";
import { drawCurvesDirectly } from "./direct-draw";
import { figureSvg } from "./svg-figure";
import { downloadText } from "./download";
import { withMeasured } from "./measured-figure";
import { MeasuredControls, useMeasured } from "./measured-overlay";

/** How long after the last direct redraw Plotly redraws the figure itself (its hover and zoom state). */
const CATCH_UP_MS = 250;
const PLOT_CONFIG = { displaylogo: false, responsive: true, displayModeBar: false, doubleClick: "reset" };

function sameValues(a: (number | null)[], b: (number | null)[] | undefined): boolean {
  if (a === b) return true; // unchanged curves keep their arrays (keepCurves, withGaps)
  if (!b || a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/** The node the plot follows: the selected node when it is analysed, else the chosen path's end. */
function useTarget(): { target: string | null; following: "selection" | "path" } {
  const selected = useEditor((s) => (s.selected.length === 1 ? s.selected[0] : null));
  const live = useEditor((s) => s.live);
  const pathEnd = useEditor((s) => s.plotPathEnd);
  if (live?.curves && selected && live.curves.index[selected] !== undefined && !isSourceKind(live.doc.nodes.find((n) => n.id === selected)?.kind)) {
    return { target: selected, following: "selection" };
  }
  const ends = live?.paths.map((p) => p[p.length - 1]) ?? [];
  return { target: pathEnd && ends.includes(pathEnd) ? pathEnd : (ends[0] ?? null), following: "path" };
}

/** `visible`: false while the plot's tab is hidden; it draws nothing then, and redraws in full when shown. */
export function ResponsePlot({ visible = true }: { visible?: boolean }) {
  const curves = useEditor((s) => s.live?.curves);
  const chain = useEditor((s) => s.live?.chain);
  const stageById = useEditor((s) => s.live?.stageById);
  const issue = useEditor((s) => s.live?.issues[0]?.message);
  const paths = useEditor((s) => s.live?.paths);
  const store = useEditorStoreApi();
  const mode = useEditor((s) => s.plotMode);
  const name = useEditor((s) => s.doc.name);
  const pathEnd = useEditor((s) => s.plotPathEnd);
  const actions = useEditorActions();
  // A new selection redraws the plot in a render of its own after the one that opens the inspector, so
  // clicking a card shows its values without waiting for the plot of its path. The first target (nothing
  // drawn before it) is taken at once: the first plot comes with the first analysis.
  const now = useTarget();
  const deferredTarget = useDeferredValue(now.target);
  const deferredFollowing = useDeferredValue(now.following);
  const target = deferredTarget ?? now.target;
  const following = deferredTarget === null ? now.following : deferredFollowing;
  const el = useRef<HTMLDivElement>(null);
  const sectionRef = useRef<HTMLElement>(null);
  // the figure drawn as plain SVG until Plotly has loaded and drawn it (svg-figure.ts)
  const svgEl = useRef<HTMLDivElement>(null);
  const [drawnBy, setDrawnBy] = useState<"none" | "svg" | "plotly">("none");
  const plotly = useRef<PlotlyLike | null>(null);
  const [ready, setReady] = useState(false);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [hoverK, setHoverK] = useState<number | null>(null);
  const measured = useMeasured(visible);

  // Only what is drawn: a full-tier result with the same curves and figures does not redraw.
  const input = useMemo<PlotInput | null>(() => {
    if (!curves || !chain || !stageById || !target) return null;
    const path = pathTo(chain, target);
    if (path.length < 2) return null;
    const names: Record<string, string> = {};
    for (const n of chain.nodes) names[n.id] = n.label ? `${n.id} ${n.label}` : n.id;
    const src = chain.nodes.find((n) => isSourceKind(n.kind));
    const end = chain.nodes.find((n) => n.id === target);
    const signal = src ? sourceSignal(src) : null;
    return {
      curves,
      path,
      mode,
      names,
      stages: stageById,
      band: signal ? { fLow: signal.fLow, fHigh: signal.fHigh } : null,
      sampleRate: end?.kind === "adc" ? end.params.sampleRate : null,
      perUnit: signal ? transferPerUnit(signal.output) : "V",
    };
  }, [curves, chain, stageById, target, mode]);

  const series = useMemo(() => (input ? plotSeries(input) : []), [input]);
  const pointsRef = useRef(0);
  const shapeRef = useRef("");
  const marksRef = useRef("");
  const drawnRef = useRef<(number | null)[][]>([]);
  const figRef = useRef<Figure | null>(null);
  const markers = useMemo(() => (input ? plotMarkers(input) : []), [input]);
  // true while the screen shows curves written directly (direct-draw) that Plotly has not drawn itself; moved
  // markers wait for that moment too
  const behindRef = useRef(false);
  const catchUpRef = useRef<ReturnType<typeof setTimeout> | null>(null);

  /**
   * Plotly draws the whole figure again (the curves written directly, moved markers), so its own state
   * matches the screen. A full react and not an animate of the changed traces: an animate leaves out the
   * curves of a panel none of whose traces it names.
   */
  const catchUp = useCallback((): Promise<unknown> => {
    if (catchUpRef.current) clearTimeout(catchUpRef.current);
    catchUpRef.current = null;
    const node = el.current;
    const p = plotly.current;
    const fig = figRef.current;
    const behind = behindRef.current;
    behindRef.current = false;
    if (!node || !p || !fig || !behind) return Promise.resolve();
    return p.react(node, fig.data, fig.layout, PLOT_CONFIG);
  }, []);

  // the plot's width for placing marker labels, from a ResizeObserver: reading clientWidth while drawing
  // would force a layout of the page on every edit
  const widthRef = useRef(0);
  /** the box the SVG drawing was made for */
  const svgSizeRef = useRef("");
  const drawSvg = useCallback((fig: Figure, width: number, height: number) => {
    if (!svgEl.current) return;
    svgEl.current.innerHTML = figureSvg(fig, width, height);
    svgSizeRef.current = `${width}x${height}`;
  }, []);
  useEffect(() => {
    const node = el.current;
    if (!node || typeof ResizeObserver === "undefined") return;
    const watch = new ResizeObserver((entries) => {
      const box = entries[0]?.contentRect;
      widthRef.current = box?.width ?? 0;
      // the SVG has a fixed size: drawn again at a new one (not for the first report, of the size it was drawn at)
      if (box && svgEl.current?.firstChild && figRef.current) {
        if (svgSizeRef.current !== `${box.width}x${box.height}`) drawSvg(figRef.current, box.width, box.height);
      }
      // Plotly follows the window's size by itself, not its box's (the measured-response list unfolding above it)
      // (only while displayed: a hidden tab's plot has no box, and Plotly refuses to resize it)
      else if (plotly.current && (node as { _fullLayout?: unknown })._fullLayout && box && box.width > 0 && box.height > 0)
        void Promise.resolve(plotly.current.Plots.resize(node)).catch(() => undefined);
    });
    watch.observe(node);
    return () => watch.disconnect();
  }, [drawSvg]);

  useEffect(() => {
    let gone = false;
    const stop = loadPlotlyWhenWanted(
      sectionRef.current!,
      (p) => {
        if (gone) return;
        plotly.current = p;
        setReady(true);
      },
      (e: unknown) => setLoadError(e instanceof Error ? e.message : String(e)),
    );
    const node = el.current;
    return () => {
      gone = true;
      stop();
      if (catchUpRef.current) clearTimeout(catchUpRef.current);
      if (node && plotly.current) plotly.current.purge(node);
    };
  }, []);

  // Drawn in a layout effect: the new curves reach the screen in the same frame as the cards.
  useLayoutEffect(() => {
    const node = el.current;
    const p = plotly.current;
    if (!node || !input) return;
    if (!visible) {
      shapeRef.current = "";
      return;
    }
    pointsRef.current = input.curves.f.length;
    const rev = store.getState().live?.rev;
    performance.mark(`cw:plot-start:${rev}`);
    if (!ready || !p) {
      // Plotly not loaded yet: the whole figure as SVG, under where Plotly will draw
      const box = node.getBoundingClientRect();
      widthRef.current ||= box.width;
      const fig = buildFigure(series, markers, input.curves.f, widthRef.current || undefined, magnitudeTitle(input.mode, input.perUnit));
      figRef.current = fig;
      drawSvg(fig, box.width, box.height);
      setDrawnBy("svg");
      performance.mark(`cw:plot:${rev}`);
      return;
    }
    // measured responses are drawn by Plotly only (the plain SVG shows the computed curves)
    const fig = withMeasured(buildFigure(series, markers, input.curves.f, widthRef.current || undefined, magnitudeTitle(input.mode, input.perUnit)), measured.overlays);
    figRef.current = fig;
    const shape = figureShape(fig);
    const marks = figureMarks(fig);
    const ys = fig.data.map((t) => t.y as (number | null)[]);
    let drawn: Promise<unknown> | null = null;
    const changed = shape === shapeRef.current ? ys.flatMap((y, i) => (sameValues(y, drawnRef.current[i]) ? [] : [i])) : [];
    if (shape === shapeRef.current && changed.length) {
      // Same traces and axes as on screen: only the curves whose values changed are replaced (editing the
      // stage the plot follows leaves every curve before it as it was). They are written into the drawn
      // paths at once, and Plotly catches up (moved markers with it) when the edits pause; where that
      // cannot be done, Plotly draws the figure now.
      behindRef.current = true;
      if (drawCurvesDirectly(node, changed.map((i) => ({ trace: i, x: fig.data[i].x as (number | null)[], y: ys[i] })))) {
        if (catchUpRef.current) clearTimeout(catchUpRef.current);
        catchUpRef.current = setTimeout(catchUp, CATCH_UP_MS);
      } else {
        drawn = catchUp();
      }
    } else if (shape === shapeRef.current && marks === marksRef.current) {
      drawn = Promise.resolve();
    } else {
      if (catchUpRef.current) clearTimeout(catchUpRef.current);
      catchUpRef.current = null;
      behindRef.current = false;
      drawn = p.react(node, fig.data, fig.layout, PLOT_CONFIG);
      if (svgEl.current?.firstChild) {
        // Plotly's first drawing covers the SVG; then the SVG goes
        void drawn.then(() => {
          if (svgEl.current) svgEl.current.innerHTML = "";
          setDrawnBy("plotly");
        });
      }
    }
    shapeRef.current = shape;
    marksRef.current = marks;
    drawnRef.current = ys;
    // For the browser benchmark: the plot of analysis revision N is drawn (direct writes are on screen
    // with this frame; Plotly's redraws when their promise settles).
    if (drawn) void drawn.then(() => performance.mark(`cw:plot:${rev}`));
    else performance.mark(`cw:plot:${rev}`);
  }, [ready, input, series, markers, store, visible, catchUp, measured.overlays]);

  useEffect(() => {
    const node = el.current as (HTMLDivElement & { on?: (ev: string, fn: (d: { points?: { pointIndex?: number; pointNumber?: number; data?: { meta?: unknown } }[] }) => void) => void }) | null;
    if (!ready || !node?.on) return;
    node.on("plotly_hover", (d) => {
      const pt = d.points?.[0];
      const p = pt?.pointIndex ?? pt?.pointNumber;
      const n = pointsRef.current;
      if (typeof p === "number" && n > 0) setHoverK(hoverIndex(p, pt?.data?.meta, n));
    });
    node.on("plotly_unhover", () => setHoverK(null));
    // a zoom or resize redraws from Plotly's own data: bring it up to date with the curves on screen
    const behind = () => {
      if (behindRef.current) void catchUp();
    };
    node.on("plotly_relayout", behind);
    node.on("plotly_afterplot", behind);
  }, [ready, input !== null]); // eslint-disable-line react-hooks/exhaustive-deps

  const legend = plotLegend(series);
  const readout = input && hoverK !== null && hoverK < input.curves.f.length ? readoutAt(series, input.curves.f, hoverK) : null;

  const exportCsv = () => {
    if (!input) return;
    downloadText(`${name.replace(/[^\w.-]+/g, "-").replace(/^-+|-+$/g, "") || "chain"}-response-${target}.csv`, plotCsv(series, input.curves.f, mode, input.perUnit));
  };

  return (
    <section ref={sectionRef} className="flex h-full min-h-0 flex-col" aria-label="Response" data-testid="response-plot">
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1 border-b border-paper-rule px-3 py-1.5 text-[12px]">
        <div role="radiogroup" aria-label="Curves" className="flex overflow-hidden rounded-card border border-paper-rule">
          {(["cumulative", "individual"] as PlotMode[]).map((m) => (
            <button
              key={m}
              type="button"
              role="radio"
              aria-checked={mode === m}
              onClick={() => actions.setPlotMode(m)}
              className={`px-2 py-0.5 ${mode === m ? "bg-accent-700 text-white" : "bg-paper-raised text-graphite-700 hover:bg-paper-sunk"}`}
            >
              {m === "cumulative" ? "Cascade" : "Each stage"}
            </button>
          ))}
        </div>
        {following === "selection" ? (
          <span className="text-graphite-500">
            up to <span className="num text-graphite-900">{target}</span> (selected)
          </span>
        ) : (paths?.length ?? 0) > 1 ? (
          <label className="flex items-center gap-1 text-graphite-500">
            path to
            <select
              value={pathEnd ?? target ?? ""}
              onChange={(e) => actions.setPlotPathEnd(e.target.value)}
              className="num rounded-card border border-paper-rule bg-paper-raised px-1 py-0.5 text-graphite-900"
              aria-label="Path to plot"
            >
              {paths!.map((p) => {
                const end = p[p.length - 1];
                return (
                  <option key={end} value={end}>
                    {end}
                  </option>
                );
              })}
            </select>
          </label>
        ) : target ? (
          <span className="text-graphite-500">
            path to <span className="num text-graphite-900">{target}</span>
          </span>
        ) : null}
        <ul className="flex items-center gap-2 text-[11.5px] text-graphite-700" aria-label="Curves drawn" data-testid="plot-legend">
          {legend.map((l) => (
            <li key={l.name} className="flex items-center gap-1">
              <span aria-hidden className="inline-block h-0 w-4 border-t-2" style={{ borderColor: l.colour, borderTopWidth: l.emphasis ? 2.5 : 1.5 }} />
              {l.name}
            </li>
          ))}
        </ul>
        <span className="num min-w-0 flex-1 truncate text-graphite-700" aria-live="off" data-testid="plot-readout">
          {readout
            ? `${readout.f}: ${readout.items.map((r) => `${r.id} ${r.db} ${r.ph}`).join(" · ")}`
            : loadError && drawnBy === "svg"
              ? `a still drawing: the plot's readout and zoom could not load (${loadError})`
              : "point for values; drag to zoom, double-click to reset"}
        </span>
        <button type="button" onClick={exportCsv} disabled={!input} className="rounded-card border border-paper-rule bg-paper-raised px-2 py-0.5 text-graphite-900 hover:bg-paper-sunk disabled:opacity-50">
          Export CSV
        </button>
      </div>
      <MeasuredControls state={measured} />
      <div className="relative min-h-0 flex-1">
        <div ref={svgEl} className="absolute inset-0" data-testid="plot-svg" aria-hidden={drawnBy !== "svg"} />
        <div ref={el} className="absolute inset-0" data-testid="plot-area" data-ready={ready && input ? "1" : "0"} data-drawn={input ? drawnBy : "none"} />
        {(!input || (!ready && drawnBy === "none")) && (
          <p className="absolute inset-0 flex items-center justify-center p-4 text-center text-[13px] text-graphite-500">
            {loadError
              ? `The plot could not load (${loadError}).`
              : !input
                ? issue
                  ? `Nothing to plot yet: ${issue}.`
                  : "Nothing to plot yet: place a source and connect a stage to it."
                : "Loading the plot…"}
          </p>
        )}
      </div>
    </section>
  );
}
