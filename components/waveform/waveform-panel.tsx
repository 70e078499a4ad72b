"use client";
/**
 * The Waveforms tab: a step, pulse, sine burst or chirp, or a recorded waveform (a CSV read in a worker,
 * previewed with its problems by line, optionally stored on the chain), run through every stage in the
 * time domain with each op-amp held to its rails and slew rate. Stacked, zoomable plots of the source
 * and every node with rails, usable band and clipped stretches; a table of where and how long each
 * stage clipped.
 */
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { useEditor } from "@/lib/store/editor-context";
import { MAX_SAMPLES, type Stimulus, type WaveformRun } from "@/lib/engine/time-domain";
import { OUTPUT_UNIT, sourceSignal } from "@/lib/engine/sensors";
import { isSourceKind } from "@/lib/chain/types";
import { problemText, type CsvResult, type WaveformData } from "@/lib/waveform-csv";
import { loadPlotly, type PlotlyLike } from "@/components/plots/plotly-loader";
import type { WaveformRequest, WaveformResponse } from "./waveform-protocol";
import { clipRows, rowsOf, waveformFigure } from "./waveform-figure";
import { deleteStoredFile, readStoredFile, storeChainFile, useChainFiles, type StoredFile } from "./chain-files-client";

type Kind = Stimulus["kind"] | "recording";
const KINDS: { id: Kind; label: string }[] = [
  { id: "step", label: "Step" },
  { id: "pulse", label: "Pulse" },
  { id: "burst", label: "Sine burst" },
  { id: "chirp", label: "Chirp" },
  { id: "recording", label: "Recording (CSV)" },
];

const EXAMPLES = [
  { href: "/examples/keelwater-hull-knock-burst.csv", label: "hull knock burst (20 kS/s)" },
  { href: "/examples/keelwater-ballast-pressure-step.csv", label: "ballast pressure step with offset (1 kS/s)" },
];

const fmt = (x: number, d = 3) => (Number.isFinite(x) ? Number(x.toPrecision(d)).toString() : "—");

type WithoutId<T> = T extends unknown ? Omit<T, "id"> : never;

function useWorker() {
  const ref = useRef<Worker | null>(null);
  const waiting = useRef(new Map<number, (r: WaveformResponse) => void>());
  const seq = useRef(0);
  useEffect(() => {
    const w = new Worker(new URL("./waveform.worker.ts", import.meta.url), { type: "module", name: "cw-waveform" });
    const pending = waiting.current;
    w.onmessage = (e: MessageEvent<WaveformResponse>) => {
      const done = pending.get(e.data.id);
      pending.delete(e.data.id);
      done?.(e.data);
    };
    ref.current = w;
    return () => {
      w.terminate();
      ref.current = null;
      pending.clear();
    };
  }, []);
  return useCallback((msg: WithoutId<WaveformRequest>, transfer: Transferable[] = []) => {
    const id = ++seq.current;
    return new Promise<WaveformResponse>((resolve) => {
      waiting.current.set(id, resolve);
      ref.current?.postMessage({ ...msg, id } as WaveformRequest, transfer);
    });
  }, []);
}

export function WaveformPanel({ chainId, visible }: { chainId: string | null; visible: boolean }) {
  const chain = useEditor((s) => s.live?.chain ?? null);
  const readOnly = useEditor((s) => s.readOnly);
  const ask = useWorker();
  // any source kind: its output (volts, differential volts, amperes or coulombs) is what the stimulus drives
  const src = chain?.nodes.find((n) => isSourceKind(n.kind));
  const sp = useMemo(() => (src ? sourceSignal(src) : null), [src]);
  const unit = sp ? OUTPUT_UNIT[sp.output] : "V";
  const [kind, setKind] = useState<Kind>("step");
  const [amplitude, setAmplitude] = useState<number | null>(null);
  const [frequency, setFrequency] = useState<number | null>(null);
  const [duration, setDuration] = useState(0.02);
  const [sampleRate, setSampleRate] = useState<number | null>(null);
  const [csvRate, setCsvRate] = useState<number | null>(null);
  const [recording, setRecording] = useState<{ name: string; text: string; parsed: CsvResult<WaveformData> } | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [run, setRun] = useState<WaveformRun | null>(null);
  const [ms, setMs] = useState(0);
  const [windowMs, setWindowMs] = useState<[number, number] | null>(null);

  const amp = amplitude ?? sp?.amplitude ?? 0.1;
  const freq = frequency ?? (sp ? Math.sqrt(Math.max(sp.fLow, 1) * Math.max(sp.fHigh, 1)) : 100);
  const fs = sampleRate ?? Math.min(2e6, Math.max(1e3, 100 * (sp?.fHigh ?? 1e3)));

  const stored = useChainFiles(chainId, visible);
  const files = stored.files.filter((f) => f.kind === "waveform");
  const canUpload = stored.canUpload;
  const refreshFiles = stored.refresh;

  const readText = async (name: string, text: string) => {
    const r = await ask({ type: "parse", kind: "waveform", text, sampleRate: csvRate });
    if (r.type === "parsed" && r.kind === "waveform") setRecording({ name, text, parsed: r.result });
  };
  const onFile = async (file: File | undefined) => {
    if (!file) return;
    setMessage(null);
    await readText(file.name, await file.text());
  };
  const pickStored = async (f: StoredFile) => {
    if (!chainId) return;
    const got = await readStoredFile(chainId, f.id);
    if ("status" in got) return setMessage(`Could not read ${f.name} (${got.status}).`);
    if (f.sampleRate) setCsvRate(f.sampleRate);
    const text = got.text;
    const r = await ask({ type: "parse", kind: "waveform", text, sampleRate: f.sampleRate });
    if (r.type === "parsed" && r.kind === "waveform") setRecording({ name: f.name, text, parsed: r.result });
    setKind("recording");
  };
  const store = async () => {
    if (!chainId || !recording?.parsed.ok) return;
    const r = await storeChainFile(chainId, { kind: "waveform", name: recording.name, csv: recording.text, sampleRate: recording.parsed.data.columns === 1 ? recording.parsed.data.sampleRate : null });
    setMessage(r.ok ? `Stored ${recording.name} on this chain.` : r.message);
    void refreshFiles();
  };
  const removeStored = async (f: StoredFile) => {
    if (!chainId) return;
    setMessage((await deleteStoredFile(chainId, f.id)) ? `Deleted ${f.name}.` : `Could not delete ${f.name}.`);
    void refreshFiles();
  };

  const samples = Math.round(duration * fs);
  const start = async () => {
    if (!chain) return;
    setBusy(true);
    setMessage(null);
    let r: WaveformResponse;
    if (kind === "recording") {
      if (!recording?.parsed.ok) {
        setBusy(false);
        return setMessage("Choose a recording without problems first.");
      }
      const d = recording.parsed.data;
      const emf = Float64Array.from(d.values);
      r = await ask({ type: "run", chain, sampleRate: d.sampleRate, emf }, [emf.buffer]);
    } else {
      if (!(samples >= 2 && samples <= MAX_SAMPLES)) {
        setBusy(false);
        return setMessage(`duration × sample rate gives ${samples} samples; between 2 and ${MAX_SAMPLES.toLocaleString("en")} are allowed.`);
      }
      const at = duration * 0.1;
      const stim: Stimulus =
        kind === "step"
          ? { kind, at, amplitude: amp }
          : kind === "pulse"
            ? { kind, at, width: duration * 0.3, amplitude: amp }
            : kind === "burst"
              ? { kind, at, frequency: freq, cycles: Math.max(1, Math.round(freq * duration * 0.4)), amplitude: amp }
              : { kind, at, duration: duration * 0.8, f1: sp ? Math.max(sp.fLow, 1) : 10, f2: sp?.fHigh ?? 1e3, amplitude: amp };
      r = await ask({ type: "run", chain, sampleRate: fs, stimulus: stim, samples, offset: sp?.dc ?? 0 });
    }
    setBusy(false);
    if (r.type === "ran") {
      setRun(r.run);
      setMs(r.ms);
      setWindowMs(null);
    } else if (r.type === "failed") setMessage(`The run failed: ${r.message}`);
  };

  const names = useMemo(() => Object.fromEntries((chain?.nodes ?? []).map((n) => [n.id, n.label ? `${n.id} ${n.label}` : n.id])), [chain]);
  const rows = useMemo(() => (run ? rowsOf(run, names) : []), [run, names]);
  const clips = useMemo(() => (run ? clipRows(run, names) : null), [run, names]);

  const el = useRef<HTMLDivElement>(null);
  const plotly = useRef<PlotlyLike | null>(null);
  const [ready, setReady] = useState(false);
  useEffect(() => {
    let gone = false;
    void loadPlotly().then((p) => {
      if (gone) return;
      plotly.current = p;
      setReady(true);
    });
    const node = el.current;
    return () => {
      gone = true;
      if (node && plotly.current) plotly.current.purge(node);
    };
  }, []);
  useEffect(() => {
    const node = el.current;
    const p = plotly.current;
    if (!ready || !node || !p || !run || !visible) return;
    const fig = waveformFigure(run, rows, windowMs);
    void p.react(node, fig.data, fig.layout, { displaylogo: false, responsive: true, displayModeBar: false, doubleClick: "reset" });
  }, [ready, run, rows, windowMs, visible]);
  useEffect(() => {
    const node = el.current as (HTMLDivElement & { on?: (ev: string, fn: (d: Record<string, unknown>) => void) => void; removeAllListeners?: (ev: string) => void }) | null;
    if (!ready || !node?.on || !run) return;
    node.removeAllListeners?.("plotly_relayout");
    node.on("plotly_relayout", (d) => {
      const a = d["xaxis.range[0]"];
      const b = d["xaxis.range[1]"];
      if (typeof a === "number" && typeof b === "number") setWindowMs([a, b]);
      else if (d["xaxis.autorange"]) setWindowMs(null);
    });
  }, [ready, run]);

  const field = "w-24 rounded border border-paper-rule bg-paper px-1.5 py-0.5 text-[12px]";
  return (
    <div className="flex h-full min-h-0 flex-col gap-2 overflow-auto p-2 text-[12.5px]" data-testid="waveform-panel">
      <div className="flex flex-wrap items-end gap-3">
        <label className="flex flex-col gap-0.5">
          <span className="text-graphite-500">Drive</span>
          <select aria-label="Drive" className={field.replace("w-24", "w-40")} value={kind} onChange={(e) => setKind(e.target.value as Kind)}>
            {KINDS.map((k) => (
              <option key={k.id} value={k.id}>
                {k.label}
              </option>
            ))}
          </select>
        </label>
        {kind !== "recording" ? (
          <>
            <label className="flex flex-col gap-0.5">
              <span className="text-graphite-500">Amplitude ({unit})</span>
              <input aria-label={`Amplitude (${unit})`} type="number" step="any" className={field} value={amp} onChange={(e) => setAmplitude(Number(e.target.value))} />
            </label>
            {kind === "burst" && (
              <label className="flex flex-col gap-0.5">
                <span className="text-graphite-500">Frequency (Hz)</span>
                <input aria-label="Frequency (Hz)" type="number" step="any" className={field} value={fmt(freq, 4)} onChange={(e) => setFrequency(Number(e.target.value))} />
              </label>
            )}
            <label className="flex flex-col gap-0.5">
              <span className="text-graphite-500">Duration (s)</span>
              <input aria-label="Duration (s)" type="number" step="any" className={field} value={duration} onChange={(e) => setDuration(Number(e.target.value))} />
            </label>
            <label className="flex flex-col gap-0.5">
              <span className="text-graphite-500">Sample rate (Hz)</span>
              <input aria-label="Sample rate (Hz)" type="number" step="any" className={field} value={fs} onChange={(e) => setSampleRate(Number(e.target.value))} />
            </label>
            <span className="text-graphite-500">{samples.toLocaleString("en")} samples</span>
          </>
        ) : (
          <>
            <label className="flex flex-col gap-0.5">
              <span className="text-graphite-500">CSV (time,voltage or one voltage column)</span>
              <input aria-label="Recording CSV" type="file" accept=".csv,text/csv" onChange={(e) => void onFile(e.target.files?.[0])} />
            </label>
            <label className="flex flex-col gap-0.5">
              <span className="text-graphite-500">Rate of a one-column file (Hz)</span>
              <input aria-label="Rate of a one-column file (Hz)" type="number" step="any" className={field} value={csvRate ?? ""} onChange={(e) => setCsvRate(e.target.value ? Number(e.target.value) : null)} />
            </label>
          </>
        )}
        <button type="button" data-testid="waveform-run" disabled={!chain || busy} onClick={() => void start()} className="rounded-card border border-graphite-700 bg-graphite-900 px-3 py-1 text-paper disabled:opacity-50">
          {busy ? "Running…" : "Run"}
        </button>
        {run && (
          <span className="text-graphite-500" data-testid="waveform-summary">
            {run.samples.toLocaleString("en")} samples at {fmt(run.sampleRate)} S/s in {ms.toFixed(0)} ms
          </span>
        )}
      </div>
      {!chain && <p className="text-graphite-500">The chain is not complete enough to run yet.</p>}
      {kind === "recording" && (
        <div className="flex flex-col gap-1">
          <p className="text-graphite-500">
            Examples to try:{" "}
            {EXAMPLES.map((x, i) => (
              <span key={x.href}>
                {i > 0 && " · "}
                <a className="underline" href={x.href} download>
                  {x.label}
                </a>
              </span>
            ))}
            . Times must rise evenly (within 1 %).
          </p>
          {recording && recording.parsed.ok && (
            <p data-testid="recording-preview">
              {recording.name}: {recording.parsed.data.rows.toLocaleString("en")} rows, {fmt(recording.parsed.data.sampleRate)} S/s, {fmt(recording.parsed.data.rows / recording.parsed.data.sampleRate)} s; first values{" "}
              {Array.from(recording.parsed.data.values.subarray(0, 4), (v) => fmt(v, 4)).join(", ")} V
              {canUpload && chainId && !readOnly && (
                <button type="button" className="ml-2 underline" onClick={() => void store()}>
                  Store on this chain
                </button>
              )}
            </p>
          )}
          {recording && !recording.parsed.ok && (
            <div role="alert" className="text-[#b4412f]" data-testid="recording-problems">
              {recording.name} cannot be used ({recording.parsed.errorCount} problem{recording.parsed.errorCount === 1 ? "" : "s"}):
              <ul className="list-disc pl-5">
                {recording.parsed.errors.map((e, i) => (
                  <li key={i}>{problemText(e)}</li>
                ))}
              </ul>
            </div>
          )}
          {files.length > 0 && (
            <ul className="flex flex-col gap-0.5">
              {files.map((f) => (
                <li key={f.id}>
                  {f.name} ({f.rows.toLocaleString("en")} rows{f.sampleRate ? `, ${fmt(f.sampleRate)} S/s` : ""}){" "}
                  <button type="button" className="underline" onClick={() => void pickStored(f)}>
                    use
                  </button>
                  {canUpload && (
                    <button type="button" className="ml-2 underline" onClick={() => void removeStored(f)}>
                      delete
                    </button>
                  )}
                </li>
              ))}
            </ul>
          )}
        </div>
      )}
      {message && <p role="status">{message}</p>}
      <div ref={el} data-testid="waveform-plot" className="w-full" style={{ height: run ? Math.max(260, rows.length * 120) : 0 }} />
      {clips && run && (
        <div data-testid="waveform-clip-table">
          {clips.total === 0 ? (
            <p className="text-graphite-600">No stage clipped or slewed in this run.</p>
          ) : (
            <table className="w-full text-[12px]">
              <caption className="text-left text-graphite-600">
                Where each stage clipped or was slew-limited ({clips.total} stretch{clips.total === 1 ? "" : "es"}
                {clips.total > clips.rows.length ? `, first ${clips.rows.length} shown` : ""})
              </caption>
              <thead>
                <tr className="text-left text-graphite-500">
                  <th>Stage</th>
                  <th>Limit</th>
                  <th>From (ms)</th>
                  <th>For (ms)</th>
                  <th>Asked for</th>
                </tr>
              </thead>
              <tbody>
                {clips.rows.map((c, i) => (
                  <tr key={i}>
                    <td>{c.node}</td>
                    <td>{c.side === "slew" ? "slew rate" : c.side === "high" ? "upper swing" : "lower swing"}</td>
                    <td>{fmt(c.fromMs, 4)}</td>
                    <td>{fmt(c.ms, 3)}</td>
                    <td>{c.side === "slew" ? `${fmt(c.peak, 3)} V step` : `${fmt(c.peak, 4)} V`}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </div>
      )}
    </div>
  );
}
