/**
 * Plotly is large, so it is loaded only when a plot mounts (the workspace), never in another page's
 * JavaScript. The one promise is shared by every plot on the page.
 *
 * Evaluating it holds the main thread for a second or more on a slow machine, so the workspace's response
 * plot does not load it as it opens: it draws its first figures as plain SVG (svg-figure.ts) and asks for
 * Plotly through `loadPlotlyWhenWanted`, when someone reaches for the plot or the page has been left alone.
 */
export interface PlotlyLike {
  react(el: HTMLElement, data: unknown[], layout: unknown, config?: unknown): Promise<unknown>;
  purge(el: HTMLElement): void;
  Plots: { resize(el: HTMLElement): void };
}

let loading: Promise<PlotlyLike> | null = null;

export function loadPlotly(): Promise<PlotlyLike> {
  loading ??= import("plotly.js-dist-min").then((mod: { default?: unknown }) => {
    performance.mark("cw:plotly-ready"); // for the browser benchmark (npm run bench:ui)
    return (mod.default ?? mod) as PlotlyLike;
  });
  return loading;
}

/** Input that means someone is working in the page: Plotly waits for a pause in it. */
const BUSY_EVENTS = ["keydown", "input", "pointerdown", "wheel"] as const;
/** Reaching for the plot itself: Plotly is loaded at once (its cursor readout and zoom are wanted). */
const WANT_EVENTS = ["pointerenter", "pointerdown", "focusin"] as const;
/** How long the page must go without input before Plotly is loaded unasked. */
export const QUIET_MS = 3000;

/**
 * Loads Plotly when it is wanted: at once when a pointer enters `area` or the focus moves into it, else
 * once the page has had no key, pointer or wheel input for `quietMs` (in the browser's idle time after
 * that), so its evaluation does not fall into a run of typing. Answers a function that stops waiting.
 */
export function loadPlotlyWhenWanted(area: HTMLElement, onReady: (p: PlotlyLike) => void, onError: (e: unknown) => void, quietMs = QUIET_MS): () => void {
  let done = false;
  let timer: ReturnType<typeof setTimeout> | null = null;
  let idle: number | null = null;
  const stopWaiting = () => {
    if (timer) clearTimeout(timer);
    if (idle !== null && typeof cancelIdleCallback === "function") cancelIdleCallback(idle);
    timer = null;
    idle = null;
    for (const ev of BUSY_EVENTS) window.removeEventListener(ev, restart, true);
    for (const ev of WANT_EVENTS) area.removeEventListener(ev, start);
  };
  function start() {
    if (done) return;
    done = true;
    stopWaiting();
    loadPlotly().then(onReady, onError);
  }
  function restart() {
    if (timer) clearTimeout(timer);
    if (idle !== null && typeof cancelIdleCallback === "function") cancelIdleCallback(idle);
    idle = null;
    timer = setTimeout(() => {
      timer = null;
      if (typeof requestIdleCallback === "function") idle = requestIdleCallback(start, { timeout: 2000 });
      else start();
    }, quietMs);
  }
  if (loading) {
    // already asked for (another plot on the page, or this one before a remount): nothing to wait for
    start();
    return () => {};
  }
  for (const ev of BUSY_EVENTS) window.addEventListener(ev, restart, { capture: true, passive: true });
  for (const ev of WANT_EVENTS) area.addEventListener(ev, start);
  restart();
  return () => {
    done = true;
    stopWaiting();
  };
}
