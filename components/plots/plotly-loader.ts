/**
 * Plotly is large, so it is loaded only when a plot mounts (the workspace), never in another page's
 * JavaScript. The one promise is shared by every plot on the page.
 */
export interface PlotlyLike {
  react(el: HTMLElement, data: unknown[], layout: unknown, config?: unknown): Promise<unknown>;
  purge(el: HTMLElement): void;
  Plots: { resize(el: HTMLElement): void };
}

let loading: Promise<PlotlyLike> | null = null;

export function loadPlotly(): Promise<PlotlyLike> {
  loading ??= import("plotly.js-dist-min").then((mod: { default?: unknown }) => (mod.default ?? mod) as PlotlyLike);
  return loading;
}
