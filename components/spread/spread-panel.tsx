"use client";
/**
 * The Spread tab: builds of the analysed chain with every resistor and capacitor drawn within its
 * tolerance (lib/engine/spread.ts, run in a worker), streamed in as they come: progress and cancel, the
 * response envelope, histograms per stage, the worst-case corners, the parts ranked by how far their
 * tolerance moves each figure, and the share of builds that clip. Every number is the engine's.
 */
import { memo, useDeferredValue, useEffect, useMemo, useRef, useState } from "react";
import type { Chain } from "@/lib/chain/types";
import { stageGainUnits } from "@/lib/engine/sensors";
import type { SpreadDistribution, SpreadMetric, SpreadResult, SpreadStat } from "@/lib/engine/spread";
import { SPREAD_LIMITS } from "@/lib/engine/spread";
import { useEditor } from "@/lib/store/editor-context";
import { createSpreadClient, type SpreadClient } from "@/lib/store/spread-client";
import type { SpreadMessage } from "@/lib/store/spread-protocol";
import { fmt, fmtCompact, fmtVolts, perUnitName } from "@/components/editor/format";
import { Histogram, LogFreqPlot } from "./svg-plots";
import { SnapPanel } from "./snap-panel";

type RunState =
  | { phase: "idle" }
  | { phase: "running"; id: number; done: number; total: number; chain: Chain }
  | { phase: "done"; ms: number; chain: Chain }
  | { phase: "cancelled"; done: number; total: number; chain: Chain }
  | { phase: "error"; message: string };

const METRIC_WORDS: Record<SpreadMetric, string> = { dcGain: "DC gain", f0: "f0 / corner", q: "Q", margin: "worst margin" };

export function formatMetric(metric: SpreadMetric, v: number | null | undefined): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "—";
  if (metric === "f0") return fmt(v, "hertz", 4);
  if (metric === "margin") return fmtVolts(v);
  return fmtCompact(v, "none", 4).replace("-", "−");
}

const pct = (x: number | null | undefined, digits = 1) => (x === null || x === undefined || !Number.isFinite(x) ? "—" : `${(x * 100).toFixed(digits)} %`);

export function SpreadPanel() {
  const chain = useEditor((s) => s.live?.chain ?? null);
  const [trials, setTrials] = useState("1000");
  const [seed, setSeed] = useState("1");
  const [distribution, setDistribution] = useState<SpreadDistribution>("uniform");
  const [state, setState] = useState<RunState>({ phase: "idle" });
  const [result, setResult] = useState<SpreadResult | null>(null);
  const client = useRef<SpreadClient | null>(null);
  const idRef = useRef(0);
  const pending = useRef<{ done: number; total: number; result?: SpreadResult } | null>(null);

  useEffect(() => {
    // progress comes after every slice of the worker (about 50 a second): it is drawn once per frame,
    // the latest of it, with the newest partial result that came since
    const flush = () => {
      const p = pending.current;
      pending.current = null;
      if (!p) return;
      setState((s) => (s.phase === "running" ? { ...s, done: p.done, total: p.total } : s));
      if (p.result) setResult(p.result);
    };
    const c = createSpreadClient((m: SpreadMessage) => {
      if (m.id !== idRef.current) return; // an older run's last words
      if (m.type === "progress") {
        if (!pending.current) requestAnimationFrame(flush);
        pending.current = { done: m.done, total: m.total, result: m.result ?? pending.current?.result };
        return;
      }
      pending.current = null; // the run's last word replaces whatever progress was waiting to be drawn
      if (m.type === "done") {
        setResult(m.result);
        setState((s) => (s.phase === "running" ? { phase: "done", ms: m.ms, chain: s.chain } : s));
      } else if (m.type === "cancelled") {
        setState((s) => (s.phase === "running" ? { phase: "cancelled", done: m.done, total: m.total, chain: s.chain } : s));
      } else setState({ phase: "error", message: m.message });
    });
    client.current = c;
    return () => c.dispose();
  }, []);

  const trialsN = Number(trials);
  const seedN = Number(seed);
  const trialsBad = !(Number.isInteger(trialsN) && trialsN >= SPREAD_LIMITS.trials.min && trialsN <= SPREAD_LIMITS.trials.max);
  const seedBad = !(Number.isInteger(seedN) && seedN >= 0 && seedN <= 0xffffffff);
  const running = state.phase === "running";

  const start = () => {
    if (!chain || trialsBad || seedBad || !client.current) return;
    setResult(null);
    pending.current = null;
    const id = client.current.start(chain, { trials: trialsN, seed: seedN, distribution });
    idRef.current = id;
    setState({ phase: "running", id, done: 0, total: 1, chain });
  };
  const cancel = () => client.current?.cancel();
  // the results redraw at a lower priority than typing and the progress bar, and only when a new
  // (partial) result arrives, not with every progress message
  const shown = useDeferredValue(result);
  const ranOn = state.phase === "running" || state.phase === "done" || state.phase === "cancelled" ? state.chain : null;
  const stale = ranOn !== null && chain !== null && ranOn !== chain;

  return (
    <div className="h-full overflow-auto p-2 text-[12.5px]" data-testid="spread-panel">
      <form
        className="flex flex-wrap items-end gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          start();
        }}
      >
        <label className="flex flex-col gap-0.5">
          <span className="text-[11.5px] text-graphite-700">Builds</span>
          <input value={trials} onChange={(e) => setTrials(e.target.value.trim())} inputMode="numeric" aria-invalid={trialsBad} aria-describedby="spread-trials-rule" className="num w-24 rounded-card border border-paper-rule bg-paper-raised px-1.5 py-0.5" data-testid="spread-trials" />
        </label>
        <label className="flex flex-col gap-0.5">
          <span className="text-[11.5px] text-graphite-700">Seed</span>
          <input value={seed} onChange={(e) => setSeed(e.target.value.trim())} inputMode="numeric" aria-invalid={seedBad} className="num w-28 rounded-card border border-paper-rule bg-paper-raised px-1.5 py-0.5" data-testid="spread-seed" />
        </label>
        <label className="flex flex-col gap-0.5">
          <span className="text-[11.5px] text-graphite-700">Within tolerance</span>
          <select value={distribution} onChange={(e) => setDistribution(e.target.value as SpreadDistribution)} className="rounded-card border border-paper-rule bg-paper-raised px-1 py-0.5">
            <option value="uniform">uniform</option>
            <option value="normal">normal, tolerance = 3σ</option>
          </select>
        </label>
        <button type="submit" disabled={!chain || trialsBad || seedBad} className="rounded-card bg-accent-700 px-2.5 py-1 font-medium text-white hover:bg-accent-800 disabled:bg-graphite-300" data-testid="spread-run">
          {running ? "Restart" : "Run spread"}
        </button>
        <button type="button" onClick={cancel} disabled={!running} className="rounded-card border border-paper-rule px-2.5 py-1 hover:bg-paper-sunk disabled:text-graphite-300" data-testid="spread-cancel">
          Cancel
        </button>
        <Progress state={state} result={result} />
      </form>
      {(trialsBad || seedBad) && (
        <p id="spread-trials-rule" className="mt-1 text-status-clip">
          ■ {trialsBad ? `Builds must be a whole number from ${SPREAD_LIMITS.trials.min} to ${SPREAD_LIMITS.trials.max}.` : "The seed must be a whole number from 0 to 4294967295."}
        </p>
      )}
      {!chain && <p className="mt-2 text-graphite-500">Nothing is analysed yet: complete a path from the source first.</p>}
      {stale && <p className="mt-1 text-status-tight">▲ The chain has changed since this run; run it again to see the spread of the present values.</p>}
      <div className="mt-2">
        <SnapPanel />
      </div>
      {shown && <SpreadResults result={shown} chain={ranOn} />}
    </div>
  );
}

function Progress({ state, result }: { state: RunState; result: SpreadResult | null }) {
  if (state.phase === "idle") return null;
  if (state.phase === "error") return <span className="text-status-clip">■ {state.message}</span>;
  const share = state.phase === "running" ? state.done / Math.max(1, state.total) : state.phase === "done" ? 1 : state.done / Math.max(1, state.total);
  const words =
    state.phase === "running"
      ? `${result?.done ?? 0} of ${result?.trials ?? "…"} builds`
      : state.phase === "done"
        ? `${result?.done ?? 0} builds in ${(state.ms / 1000).toFixed(2)} s`
        : `cancelled after ${result?.done ?? 0} builds`;
  return (
    <span className="flex items-center gap-2" data-testid="spread-status" data-phase={state.phase}>
      <span role="progressbar" aria-label="Spread progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(share * 100)} className="block h-2 w-40 overflow-hidden rounded-full bg-paper-sunk">
        <span className="block h-full bg-accent-600 transition-[width]" style={{ width: `${(share * 100).toFixed(1)}%` }} />
      </span>
      <span className="text-graphite-700">{words}</span>
    </span>
  );
}

const SpreadResults = memo(function SpreadResults({ result, chain }: { result: SpreadResult; chain: Chain | null }) {
  const [pathIdx, setPathIdx] = useState(0);
  const stages = result.stages.filter((s) => s.dcGain || s.f0 || s.q || s.margin);
  const [stageId, setStageId] = useState<string | null>(null);
  const stage = stages.find((s) => s.id === stageId) ?? stages.find((s) => s.id === result.criticalNode) ?? stages[0];
  const env = result.response.paths[Math.min(pathIdx, result.response.paths.length - 1)];
  return (
    // contained: a redraw of the results lays out and paints only them
    <div className="mt-2 grid gap-3 [contain:content]">
      <p data-testid="spread-clip-share">
        <strong className={result.clipShare > 0 ? "text-status-clip" : "text-status-ok"}>{pct(result.clipShare)}</strong> of {result.done} builds clip somewhere
        {result.clipCount > 0 ? ` (${result.clipCount})` : ""}
        {result.criticalNode ? `; least margin at ${result.criticalNode}` : ""}.
      </p>
      <div className="grid grid-cols-[minmax(0,560px)_minmax(0,1fr)] gap-3">
        <section aria-label="Response envelope">
          <div className="flex items-center gap-2">
            <h3 className="text-[12.5px] font-medium">Response envelope</h3>
            {result.response.paths.length > 1 && (
              <select value={pathIdx} onChange={(e) => setPathIdx(Number(e.target.value))} className="rounded-card border border-paper-rule px-1 text-[12px]">
                {result.response.paths.map((p, i) => (
                  <option key={p.end} value={i}>
                    to {p.end}
                  </option>
                ))}
              </select>
            )}
          </div>
          {env && (
            <LogFreqPlot
              f={result.response.f}
              title={`Response to ${env.end}: nominal, 5 to 95 % of builds, and every build`}
              yLabel="dB"
              floor={100}
              testId="spread-envelope"
              bands={[
                { lo: env.min, hi: env.max, className: "fill-accent-100", label: "min to max" },
                { lo: env.p5, hi: env.p95, className: "fill-accent-300/70", label: "5 to 95 %" },
              ]}
              lines={[{ y: env.nominal, className: "stroke-graphite-950", label: "nominal" }]}
            />
          )}
        </section>
        <section aria-label="Histograms">
          <div className="flex items-center gap-2">
            <h3 className="text-[12.5px] font-medium">Spread of</h3>
            <select value={stage?.id ?? ""} onChange={(e) => setStageId(e.target.value)} className="rounded-card border border-paper-rule px-1 text-[12px]" data-testid="spread-stage">
              {stages.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.label ? `${s.id} ${s.label}` : s.id}
                </option>
              ))}
            </select>
            {stage && <span className="text-graphite-700">clips in {pct(stage.clipShare)}</span>}
          </div>
          {stage && (
            <div className="grid grid-cols-2 gap-2" data-testid="spread-histograms">
              {(["dcGain", "f0", "q", "margin"] as SpreadMetric[]).map((m) => {
                const st = stage[m];
                return st && st.count > 0 ? <StatHistogram key={m} metric={m} stat={st} label={figureWordsFor(chain)(stage.id, m)} /> : null;
              })}
            </div>
          )}
        </section>
      </div>
      <WorstCaseTable result={result} chain={chain} />
      <SensitivityTable result={result} />
    </div>
  );
});

function StatHistogram({ metric, stat, label }: { metric: SpreadMetric; stat: SpreadStat; label: string }) {
  return (
    <div>
      <Histogram
        counts={stat.histogram.counts}
        lo={stat.histogram.lo}
        hi={stat.histogram.hi}
        nominal={stat.nominal}
        label={label}
        format={(v) => formatMetric(metric, v)}
        testId={`spread-hist-${metric}`}
      />
      <p className="num text-[10.5px] text-graphite-700">
        mean {formatMetric(metric, stat.mean)} · σ {metric === "margin" ? fmtVolts(stat.sd) : stat.nominal ? pct(stat.sd / Math.abs(stat.nominal), 2) : "—"} · 5–95 % {formatMetric(metric, stat.p5)} … {formatMetric(metric, stat.p95)}
      </p>
    </div>
  );
}

/** A figure's name; a front end's DC gain is per ampere or coulomb of the sensor, and the name says so. */
function figureWordsFor(chain: Chain | null) {
  const units = chain ? stageGainUnits(chain.nodes) : null;
  return (nodeId: string, metric: SpreadMetric) => perUnitName(METRIC_WORDS[metric], metric === "dcGain" ? (units?.get(nodeId) ?? "V") : "V");
}

function WorstCaseTable({ result, chain }: { result: SpreadResult; chain: Chain | null }) {
  const rows = result.worstCase;
  const figureWords = figureWordsFor(chain);
  return (
    <section aria-label="Worst case">
      <h3 className="text-[12.5px] font-medium">Worst case: every part at the end of its tolerance that pushes the figure down, then up</h3>
      <table className="mt-1 w-full border-collapse text-[12px]" data-testid="spread-worst-case">
        <thead>
          <tr className="text-left text-graphite-700">
            {["Node", "Figure", "Nominal", "Worst low", "Worst high", "Builds min", "Builds max", "Outside"].map((h) => (
              <th key={h} scope="col" className="border-b border-paper-rule px-2 py-0.5 font-medium">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((w) => {
            const st = result.stages.find((s) => s.id === w.nodeId)?.[w.metric];
            return (
              <tr key={`${w.nodeId}-${w.metric}`} className="num border-b border-paper-rule/60">
                <td className="px-2 py-0.5 font-sans">{w.nodeId}</td>
                <td className="px-2 py-0.5 font-sans">{figureWords(w.nodeId, w.metric)}</td>
                <td className="px-2 py-0.5">{formatMetric(w.metric, w.nominal)}</td>
                <td className={`px-2 py-0.5 ${w.metric === "margin" && (w.low ?? 0) < 0 ? "text-status-clip" : ""}`}>{formatMetric(w.metric, w.low)}</td>
                <td className="px-2 py-0.5">{formatMetric(w.metric, w.high)}</td>
                <td className="px-2 py-0.5">{formatMetric(w.metric, st?.count ? st.min : null)}</td>
                <td className="px-2 py-0.5">{formatMetric(w.metric, st?.count ? st.max : null)}</td>
                <td className="px-2 py-0.5">{w.outside}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </section>
  );
}

type SensKey = "part" | "tolerance" | "dcGain" | "f0" | "q" | "margin";

function SensitivityTable({ result }: { result: SpreadResult }) {
  const [sort, setSort] = useState<{ key: SensKey; desc: boolean }>({ key: "margin", desc: true });
  const rows = useMemo(() => {
    const val = (r: SpreadResult["sensitivity"][number]): number | string | null =>
      sort.key === "part" ? r.key : sort.key === "tolerance" ? r.tolerance : r.effect[sort.key];
    return [...result.sensitivity].sort((a, b) => {
      const x = val(a);
      const y = val(b);
      if (x === null) return y === null ? 0 : 1;
      if (y === null) return -1;
      const c = typeof x === "string" ? x.localeCompare(String(y)) : (x as number) - (y as number);
      return sort.desc ? -c : c;
    });
  }, [result.sensitivity, sort]);
  const head = (key: SensKey, label: string) => (
    <th scope="col" aria-sort={sort.key === key ? (sort.desc ? "descending" : "ascending") : "none"} className="border-b border-paper-rule px-2 py-0.5 text-left font-medium text-graphite-700">
      <button type="button" onClick={() => setSort((s) => ({ key, desc: s.key === key ? !s.desc : key !== "part" }))} className="hover:text-graphite-950">
        {label} <span aria-hidden className="text-graphite-400">{sort.key === key ? (sort.desc ? "↓" : "↑") : "↕"}</span>
      </button>
    </th>
  );
  return (
    <section aria-label="Sensitivity ranking">
      <h3 className="text-[12.5px] font-medium">
        Which part moves what: the change at the part&apos;s tolerance (|S|·t) of its own stage&apos;s gain, f0 and Q, and of the least margin
        {result.criticalNode ? ` (at ${result.criticalNode})` : ""}
      </h3>
      <table className="mt-1 w-full border-collapse text-[12px]" data-testid="spread-sensitivity">
        <thead>
          <tr>
            {head("part", "Part")}
            {head("tolerance", "Tolerance")}
            {head("dcGain", "Gain")}
            {head("f0", "f0")}
            {head("q", "Q")}
            {head("margin", "Margin")}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key} className="num border-b border-paper-rule/60" data-part={r.key}>
              <td className="px-2 py-0.5">{r.key}</td>
              <td className="px-2 py-0.5">{pct(r.tolerance, 2)}</td>
              <td className="px-2 py-0.5">{pct(r.effect.dcGain, 3)}</td>
              <td className="px-2 py-0.5">{pct(r.effect.f0, 3)}</td>
              <td className="px-2 py-0.5">{pct(r.effect.q, 3)}</td>
              <td className="px-2 py-0.5">{r.effect.margin === null ? "—" : fmtVolts(r.effect.margin)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
