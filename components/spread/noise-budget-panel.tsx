"use client";
/**
 * The Noise budget tab: every source of noise with its rms at the path's end (over the noise band and
 * over all that the converter samples), its share and its stage, sortable; the output density (total
 * and the largest contributors); input-referred noise; quantisation against analog noise; SNR and
 * effective bits; and the alias attenuation over frequency with the bands that fold shaded. Every figure
 * is the engine's full analysis (lib/engine/analyze.ts); this panel only arranges them.
 */
import { useMemo, useState } from "react";
import type { AdcResult, PathResult } from "@/lib/chain/types";
import { useEditor } from "@/lib/store/editor-context";
import { fmt, fmtDb } from "@/components/editor/format";
import { LogFreqPlot } from "./svg-plots";

interface BudgetNoise {
  aliasCurve?: { f: number[]; attenuationDb: (number | null)[] };
  foldBands?: { low: number; high: number; k: number }[];
  analogOverQuantDb?: number | null;
  bandGain?: number | null;
  /** the source's own unit, which the input-referred figures are in (the band gain is V per it) */
  inputUnit?: "V" | "A" | "C";
  inputReferredRms?: number | null;
  inputReferredTotalRms?: number | null;
  inputDensity?: (number | null)[];
  topDensities?: { nodeId: string; element: string; density: (number | null)[] }[];
  density?: (number | null)[];
}

/** What a noise source is, in words. */
export function sourceWords(element: string): string {
  if (element === "source") return "source noise density";
  if (element === "resistance") return "source resistance (Johnson)";
  if (element === "shot") return "shot noise of the sensor current (2qI)";
  if (element === "shunt") return "sensor shunt resistance (Johnson)";
  if (element === "leakage") return "sensor leakage resistance (Johnson)";
  if (element === "en") return "op-amp voltage noise en";
  if (element === "in+") return "op-amp current noise at (+)";
  if (element === "in-") return "op-amp current noise at (−)";
  return `${element} (Johnson)`;
}

const LINE_CLASSES = ["stroke-accent-600", "stroke-status-tight", "stroke-status-clip", "stroke-status-ok", "stroke-graphite-500", "stroke-accent-300"];
const volts = (v: number | null | undefined) => fmt(v, "volt", 3);
/** an input-referred figure in the source's unit: 8.48 pA from a photodiode, 3.1 fC from a piezo */
const inSourceUnit = (v: number | null | undefined, unit: "V" | "A" | "C" = "V") =>
  unit === "V" ? volts(v) : unit === "A" ? fmt(v, "ampere", 3) : v === null || v === undefined ? "—" : `${fmt(v, "none", 3)}C`;
const share = (x: unknown) => (typeof x === "number" ? `${(x * 100).toFixed(1)} %` : "—");

type Key = "stage" | "source" | "rms" | "share" | "totalRms" | "totalShare";

export function NoiseBudgetPanel() {
  const full = useEditor((s) => s.live?.full ?? null);
  const [pathIdx, setPathIdx] = useState(0);
  if (!full) return <p className="p-3 text-[12.5px] text-graphite-500">The noise figures come with the full analysis, which runs after a pause in editing.</p>;
  const path = full.paths[Math.min(pathIdx, full.paths.length - 1)];
  if (!path) return <p className="p-3 text-[12.5px] text-graphite-500">No analysed path yet.</p>;
  return (
    <div className="h-full overflow-auto p-2 text-[12.5px]" data-testid="noise-budget">
      {full.paths.length > 1 && (
        <label className="mb-1 flex items-center gap-2">
          Path to
          <select value={pathIdx} onChange={(e) => setPathIdx(Number(e.target.value))} className="rounded-card border border-paper-rule px-1">
            {full.paths.map((p, i) => (
              <option key={i} value={i}>
                {p.nodes[p.nodes.length - 1]}
              </option>
            ))}
          </select>
        </label>
      )}
      <Budget path={path} />
    </div>
  );
}

function Budget({ path }: { path: PathResult }) {
  const nz = path.noise as PathResult["noise"] & BudgetNoise;
  const adc = path.adc as AdcResult | null;
  const f = path.response.f;
  return (
    <div className="grid gap-3">
      <dl className="grid grid-cols-[auto_1fr_auto_1fr] gap-x-3 gap-y-0.5" data-testid="noise-summary">
        <dt className="text-graphite-700">Noise over {fmt(nz.low, "hertz")} … {fmt(nz.high, "hertz")}</dt>
        <dd className="num">{volts(nz.outputRms)} rms</dd>
        <dt className="text-graphite-700">over all the converter samples (to fMax)</dt>
        <dd className="num" data-testid="noise-total">{volts(nz.totalRms)} rms</dd>
        <dt className="text-graphite-700">
          referred to the input (÷ band gain {nz.bandGain ? fmt(nz.bandGain, "none", 4) : "—"}
          {nz.inputUnit && nz.inputUnit !== "V" ? `V/${nz.inputUnit}` : ""})
        </dt>
        <dd className="num" data-testid="noise-input-referred">{inSourceUnit(nz.inputReferredRms, nz.inputUnit)} rms</dd>
        <dt className="text-graphite-700">input-referred, to fMax</dt>
        <dd className="num">{inSourceUnit(nz.inputReferredTotalRms, nz.inputUnit)} rms</dd>
        {adc && (
          <>
            <dt className="text-graphite-700">quantisation noise (LSB/√12)</dt>
            <dd className="num">{volts(adc.quantNoiseRms)} rms</dd>
            <dt className="text-graphite-700">analog against quantisation</dt>
            <dd className="num">{nz.analogOverQuantDb === null || nz.analogOverQuantDb === undefined ? "—" : `${fmtDb(nz.analogOverQuantDb)} (${nz.analogOverQuantDb > 0 ? "analog noise dominates" : "quantisation dominates"})`}</dd>
            <dt className="text-graphite-700">SNR, full-scale sine</dt>
            <dd className="num" data-testid="noise-snr">{fmtDb(adc.snrDb, 2)} (ideal {fmtDb(adc.idealSnrDb, 2)})</dd>
            <dt className="text-graphite-700">effective bits</dt>
            <dd className="num">{adc.enob === null ? "—" : adc.enob.toFixed(2)}</dd>
          </>
        )}
      </dl>
      <ContributionTable path={path} />
      <div className="grid grid-cols-2 gap-3">
        {nz.density && nz.density.length > 1 && (
          <section aria-label="Noise density">
            <h3 className="text-[12.5px] font-medium">Output noise density (V/√Hz)</h3>
            <LogFreqPlot
              f={f}
              logY
              yLabel="V/√Hz"
              title="Output noise density, total and the largest contributors"
              testId="noise-density"
              lines={[
                { y: nz.density, className: "stroke-graphite-950", label: "total" },
                ...(nz.topDensities ?? []).map((t, i) => ({ y: t.density, className: LINE_CLASSES[i % LINE_CLASSES.length], label: `${t.nodeId} ${sourceWords(t.element)}`, dashed: true })),
              ]}
            />
          </section>
        )}
        {adc && nz.aliasCurve && (
          <section aria-label="Alias attenuation">
            <h3 className="text-[12.5px] font-medium">Alias attenuation below the band&apos;s gain (dB); shaded: frequencies that fold into the band</h3>
            <LogFreqPlot
              f={nz.aliasCurve.f}
              yLabel="dB"
              title="Alias attenuation over frequency, with the bands that fold into the source band shaded"
              testId="noise-alias"
              spans={(nz.foldBands ?? []).map((b) => ({ lo: b.low, hi: b.high }))}
              lines={[{ y: nz.aliasCurve.attenuationDb, className: "stroke-accent-700", label: "attenuation" }]}
            />
            <p className="text-[11.5px] text-graphite-700">Worst over the alias band: {fmtDb(adc.aliasAttenuationDb)}.</p>
          </section>
        )}
      </div>
    </div>
  );
}

function ContributionTable({ path }: { path: PathResult }) {
  const [sort, setSort] = useState<{ key: Key; desc: boolean }>({ key: "totalRms", desc: true });
  const rows = useMemo(() => {
    const val = (c: PathResult["noise"]["contributions"][number]): string | number => {
      switch (sort.key) {
        case "stage":
          return c.nodeId;
        case "source":
          return sourceWords(c.element);
        case "rms":
          return c.rms;
        case "share":
          return c.share;
        case "totalRms":
          return (c.totalRms as number) ?? 0;
        case "totalShare":
          return (c.totalShare as number) ?? 0;
      }
    };
    return [...path.noise.contributions].sort((a, b) => {
      const x = val(a);
      const y = val(b);
      const c = typeof x === "string" ? x.localeCompare(String(y)) : x - (y as number);
      return sort.desc ? -c : c;
    });
  }, [path, sort]);
  const head = (key: Key, label: string) => (
    <th scope="col" aria-sort={sort.key === key ? (sort.desc ? "descending" : "ascending") : "none"} className="border-b border-paper-rule px-2 py-0.5 text-left font-medium text-graphite-700">
      <button type="button" onClick={() => setSort((s) => ({ key, desc: s.key === key ? !s.desc : key !== "stage" && key !== "source" }))} className="hover:text-graphite-950">
        {label} <span aria-hidden className="text-graphite-400">{sort.key === key ? (sort.desc ? "↓" : "↑") : "↕"}</span>
      </button>
    </th>
  );
  if (path.noise.skipped) return <p className="text-graphite-500">Noise was not computed for this result.</p>;
  return (
    <table className="w-full border-collapse text-[12px]" data-testid="noise-contributions">
      <caption className="sr-only">Noise contributions at the end of the path</caption>
      <thead>
        <tr>
          {head("stage", "Stage")}
          {head("source", "Source")}
          {head("rms", "rms in band")}
          {head("share", "share")}
          {head("totalRms", "rms at converter")}
          {head("totalShare", "share")}
        </tr>
      </thead>
      <tbody>
        {rows.map((c) => (
          <tr key={`${c.nodeId}:${c.element}`} className="num border-b border-paper-rule/60" data-source={`${c.nodeId}:${c.element}`}>
            <td className="px-2 py-0.5 font-sans">{c.nodeId}</td>
            <td className="px-2 py-0.5 font-sans">{sourceWords(c.element)}</td>
            <td className="px-2 py-0.5">{volts(c.rms)}</td>
            <td className="px-2 py-0.5">{share(c.share)}</td>
            <td className="px-2 py-0.5">{volts(c.totalRms as number)}</td>
            <td className="px-2 py-0.5">{share(c.totalShare)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
