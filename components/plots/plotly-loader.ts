/**
 * Plotly is large, so it is loaded only when a plot mounts (the workspace), never in another page's
 * JavaScript. The one promise is shared by every plot on the page.
 *
 * Evaluating it holds the main thread for a second or more on a slow machine, so the workspace's response
 * plot does not load it as it opens: it draws its figures as plain SVG (svg-figure.ts) and asks for
 * Plotly through `loadPlotlyWhenWanted`, when someone reaches for the plot.
 */
export interface PlotlyLike {
  react(el: HTMLElement, data: unknown[], layout: unknown, config?: unknown): Promise<unknown>;
  purge(el: HTMLElement): void;
  Plots: { resize(el: HTMLElement): Promise<unknown> | void };
}

let loading: Promise<PlotlyLike> | null = null;

export function loadPlotly(): Promise<PlotlyLike> {
  loading ??= import("plotly.js-dist-min").then((mod: { default?: unknown }) => {
    performance.mark("cw:plotly-ready"); // for the browser benchmark (npm run bench:ui)
    return (mod.default ?? mod) as PlotlyLike;
  });
  return loading;
}

/**
 * Reaching for the plot itself: Plotly is loaded then (its cursor readout and zoom are what it is for).
 * pointermove as well as pointerenter: a pointer that was over the plot when the page drew it has entered
 * before anyone listened, and only moves.
 */
const WANT_EVENTS = ["pointerenter", "pointermove", "pointerdown", "focusin"] as const;

/**
 * Loads Plotly when it is wanted: when a pointer enters `area` or the focus moves into it, and not
 * before, so its evaluation never falls into typing elsewhere in the page (a page that has loaded it
 * already gets it at once). Answers a function that stops waiting.
 */
export function loadPlotlyWhenWanted(area: HTMLElement, onReady: (p: PlotlyLike) => void, onError: (e: unknown) => void): () => void {
  let done = false;
  const stopWaiting = () => {
    for (const ev of WANT_EVENTS) area.removeEventListener(ev, start);
  };
  function start() {
    if (done) return;
    done = true;
    stopWaiting();
    loadPlotly().then(onReady, onError);
  }
  if (loading) {
    // already asked for (another plot on the page, or this one before a remount): nothing to wait for
    start();
    return () => {};
  }
  for (const ev of WANT_EVENTS) area.addEventListener(ev, start);
  return () => {
    done = true;
    stopWaiting();
  };
}
