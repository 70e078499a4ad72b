"use client";
/**
 * The design report's response plots as static images: each path's figure is laid out by Plotly off
 * screen and turned into a PNG (Plotly.toImage), so the printed page holds plain pictures. Plotly is
 * loaded from its own chunk (no inline script, as the content security policy asks). The container says
 * `data-plots="ready"` once every image is in, which printing waits for.
 */
import { useEffect, useState } from "react";
import type { CurveSet } from "@/lib/handoff/report";
import { buildFigure, type Marker, type PlotSeries } from "@/components/plots/plot-data";
import { loadPlotly, type PlotlyLike } from "@/components/plots/plotly-loader";

type WithImage = PlotlyLike & { toImage(fig: { data: unknown[]; layout: unknown }, opts: { format: "png"; width: number; height: number; scale?: number }): Promise<string> };

const WIDTH = 720;
const HEIGHT = 380;

function figureOf(set: CurveSet) {
  const f = Float64Array.from(set.f);
  const series: PlotSeries[] = set.series.map((s) => ({
    id: s.id,
    name: s.name,
    db: Float64Array.from(s.db, (v) => (v === null ? NaN : v)),
    ph: Float64Array.from(s.ph, (v) => (v === null ? NaN : v)),
    emphasis: s.emphasis,
  }));
  const markers: Marker[] = [];
  if (set.band) markers.push({ kind: "band", f: Math.max(set.band.fLow, set.f[0]), f2: set.band.fHigh, label: "band" });
  if (set.sampleRate && set.sampleRate / 2 < set.f[set.f.length - 1]) markers.push({ kind: "nyquist", f: set.sampleRate / 2, label: "fs/2" });
  const fig = buildFigure(series, markers, f, WIDTH, set.magnitudeAxis);
  const layout = { ...fig.layout, width: WIDTH, height: HEIGHT, font: { family: "Helvetica, Arial, sans-serif", size: 11, color: "#3c4047" }, paper_bgcolor: "#ffffff", plot_bgcolor: "#ffffff" };
  return { data: fig.data, layout };
}

export function ReportPlots({ sets }: { sets: CurveSet[] }) {
  const [images, setImages] = useState<(string | null)[] | null>(null);
  const [failed, setFailed] = useState<string | null>(null);
  useEffect(() => {
    let live = true;
    (async () => {
      try {
        const plotly = (await loadPlotly()) as WithImage;
        const out: string[] = [];
        for (const set of sets) out.push(await plotly.toImage(figureOf(set), { format: "png", width: WIDTH, height: HEIGHT, scale: 2 }));
        if (live) setImages(out);
      } catch (e) {
        if (live) setFailed(e instanceof Error ? e.message : "the plots could not be drawn");
      }
    })();
    return () => {
      live = false;
    };
  }, [sets]);
  const state = failed ? "failed" : images ? "ready" : "drawing";
  return (
    <div data-plots={state} className="flex flex-col gap-4">
      {failed && <p className="text-sm text-status-clip">The response plots could not be drawn ({failed}); the data is in the CSV download.</p>}
      {sets.map((set, k) => (
        <figure key={set.end} className="report-keep">
          {images?.[k] ? (
            // eslint-disable-next-line @next/next/no-img-element -- a data URL made in the page; nothing to optimise
            <img src={images[k]!} alt={`Response from the source to ${set.end}: magnitude and phase of every stage on the path`} width={WIDTH} height={HEIGHT} className="h-auto w-full max-w-[720px]" />
          ) : (
            <div className="flex h-[200px] w-full max-w-[720px] items-center justify-center border border-paper-rule text-sm text-graphite-500">{failed ? "No plot" : "Drawing the plot…"}</div>
          )}
          <figcaption className="mt-1 text-[12px] text-graphite-500">
            {set.title}: magnitude (dB) and phase (°) from the source; the path&apos;s end in colour, the stages before it in grey; shaded: the source band.
          </figcaption>
        </figure>
      ))}
    </div>
  );
}
