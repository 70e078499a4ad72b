"use client";
/**
 * Measured responses on the response plot: the chain's stored measured-response CSVs (frequency,
 * magnitude dB, phase degrees), each shown or not and read at a chosen node (by default the converter
 * input, the end of the first path), compared with the computed cascade to that node
 * (lib/engine/measured-response) and handed to the plot as overlays (measured-figure.ts). Also the upload
 * of a new one, an example to try, and the difference as CSV.
 */
import { useMemo, useState } from "react";
import { useQueries } from "@tanstack/react-query";
import { compareResponses } from "@/lib/engine/measured-response";
import { useEditor } from "@/lib/store/editor-context";
import { problemText, readResponseCsv, responseDifferenceCsv, type CsvProblem, type ResponseData } from "@/lib/waveform-csv";
import { deleteStoredFile, readStoredFile, storeChainFile, useChainFiles } from "@/components/waveform/chain-files-client";
import { downloadText } from "./download";
import { differenceSummary, MEASURED_COLOURS, type MeasuredOverlay } from "./measured-figure";
import { dbPhase } from "./plot-data";

export const MEASURED_EXAMPLE = { href: "/examples/keelwater-hull-vibration-measured.csv", label: "hull vibration channel, bench sweep at the ADC input" };

type Parsed = { ok: true; data: ResponseData } | { ok: false; message: string };

export interface MeasuredState {
  overlays: MeasuredOverlay[];
  /** what the controls need */
  controls: {
    chainId: string;
    files: { id: string; name: string; rows: number }[];
    canChange: boolean;
    shown: Record<string, string | null>;
    nodes: { id: string; name: string }[];
    defaultNode: string | null;
    parsed: Record<string, Parsed | undefined>;
    toggle: (id: string) => void;
    setNode: (id: string, node: string) => void;
    refresh: () => Promise<void>;
  } | null;
}

/** The measured overlays of the chain open in the workspace, recomputed as the computed curves change. */
const NO_OVERLAYS: MeasuredOverlay[] = [];

export function useMeasured(visible: boolean): MeasuredState {
  const chainId = useEditor((s) => s.chainId);
  const readOnly = useEditor((s) => s.readOnly);
  const curves = useEditor((s) => s.live?.curves);
  const paths = useEditor((s) => s.live?.paths);
  const chainNodes = useEditor((s) => s.live?.chain?.nodes);
  const { files: all, canUpload, refresh } = useChainFiles(chainId, visible);
  const files = useMemo(() => all.filter((f) => f.kind === "response"), [all]);
  const [shown, setShown] = useState<Record<string, string | null>>({});

  const nodes = useMemo(
    () => (chainNodes ?? []).filter((n) => n.kind !== "source" && curves?.index[n.id] !== undefined).map((n) => ({ id: n.id, name: n.label ? `${n.id} ${n.label}` : n.id })),
    [chainNodes, curves],
  );
  const defaultNode = useMemo(() => {
    const ends = (paths ?? []).map((p) => p[p.length - 1]);
    const adc = ends.find((id) => chainNodes?.find((n) => n.id === id)?.kind === "adc");
    return adc ?? ends[0] ?? null;
  }, [paths, chainNodes]);

  const shownIds = files.filter((f) => f.id in shown).map((f) => f.id);
  const texts = useQueries({
    queries: shownIds.map((id) => ({
      queryKey: ["chain-file-response", chainId, id],
      staleTime: Infinity,
      queryFn: async (): Promise<Parsed> => {
        const got = await readStoredFile(chainId!, id);
        if ("status" in got) return { ok: false, message: `the file did not load (${got.status})` };
        const r = readResponseCsv(got.text);
        return r.ok ? { ok: true, data: r.data } : { ok: false, message: r.errors.map(problemText).join("; ") };
      },
    })),
  });
  const parsed: Record<string, Parsed | undefined> = {};
  shownIds.forEach((id, i) => (parsed[id] = texts[i]?.data));

  const parsedKey = shownIds.map((id) => `${id}:${parsed[id] ? "1" : "0"}`).join(",");
  const overlays = useMemo<MeasuredOverlay[]>(() => {
    if (!curves) return NO_OVERLAYS;
    const out: MeasuredOverlay[] = [];
    shownIds.forEach((id, k) => {
      const p = parsed[id];
      const node = shown[id] ?? defaultNode;
      const i = node ? curves.index[node] : undefined;
      if (!p?.ok || i === undefined) return;
      const { db, ph } = dbPhase(curves.cumRe[i], curves.cumIm[i]);
      const diff = compareResponses({ f: p.data.freqs, db: p.data.magDb, ph: p.data.phaseDeg }, { f: curves.f, db, ph });
      const name = files.find((f) => f.id === id)?.name ?? id;
      out.push({ id, label: `${name} at ${node}`, colour: MEASURED_COLOURS[k % MEASURED_COLOURS.length], diff });
    });
    // the same empty list every time: the plot redraws when its overlays change, and a file list arriving
    // with nothing ticked changes nothing it draws
    return out.length ? out : NO_OVERLAYS;
    // parsedKey stands for the parsed files (useQueries gives new arrays each render)
  }, [curves, shown, defaultNode, files, parsedKey]); // eslint-disable-line react-hooks/exhaustive-deps

  if (!chainId) return { overlays: [], controls: null };
  return {
    overlays,
    controls: {
      chainId,
      files,
      canChange: canUpload && !readOnly,
      shown,
      nodes,
      defaultNode,
      parsed,
      toggle: (id) =>
        setShown((s) => {
          const next = { ...s };
          if (id in next) delete next[id];
          else next[id] = null;
          return next;
        }),
      setNode: (id, node) => setShown((s) => ({ ...s, [id]: node })),
      refresh,
    },
  };
}

/** The controls under the plot's toolbar: stored measured responses, their node, upload, CSV of the difference. */
export function MeasuredControls({ state }: { state: MeasuredState }) {
  const c = state.controls;
  const [problems, setProblems] = useState<{ name: string; list: CsvProblem[]; count: number } | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  if (!c) return null;
  const byId = new Map(state.overlays.map((o) => [o.id, o]));

  const upload = async (file: File | undefined) => {
    if (!file) return;
    setProblems(null);
    setMessage(null);
    const text = await file.text();
    const r = readResponseCsv(text);
    if (!r.ok) return setProblems({ name: file.name, list: r.errors, count: r.errorCount });
    const stored = await storeChainFile(c.chainId, { kind: "response", name: file.name, csv: text });
    if (!stored.ok) return setMessage(`${file.name} was not stored: ${stored.message}`);
    await c.refresh();
    c.toggle(stored.file.id);
    setMessage(`Stored ${file.name} (${stored.file.rows} rows) on this chain.`);
  };
  const remove = async (id: string, name: string) => {
    if (c.shown[id] !== undefined) c.toggle(id);
    setMessage((await deleteStoredFile(c.chainId, id)) ? `Deleted ${name}.` : `Could not delete ${name}.`);
    await c.refresh();
  };
  const field = "num rounded-card border border-paper-rule bg-paper-raised px-1 py-0.5 text-graphite-900";

  return (
    <details className="min-w-0 border-b border-paper-rule px-3 py-1 text-[12px] [contain:inline-size]" data-testid="measured-controls">
      {/* the summary line stays when the list is folded away, so the plot keeps its height */}
      <summary className="cursor-pointer truncate text-graphite-700" data-testid="measured-headline">
        Measured responses
        {state.overlays.length ? (
          <span className="num">
            {" "}
            · {state.overlays[0].label}: {differenceSummary(state.overlays[0], true)}
            {state.overlays.length > 1 ? ` (+${state.overlays.length - 1} more)` : ""}
          </span>
        ) : c.files.length ? (
          ` (${c.files.length} stored)`
        ) : (
          ""
        )}
      </summary>
      <div className="flex flex-col gap-0.5 pb-1">
        {c.files.length === 0 && <p className="text-graphite-500">No measured response is stored on this chain yet.</p>}
        <ul className="flex flex-col gap-0.5" aria-label="Stored measured responses">
          {c.files.map((f) => {
            const on = f.id in c.shown;
            const o = byId.get(f.id);
            const p = c.parsed[f.id];
            return (
              <li key={f.id} className="flex flex-wrap items-center gap-x-2 gap-y-0.5" data-testid="measured-file">
                <label className="flex items-center gap-1">
                  <input type="checkbox" checked={on} onChange={() => c.toggle(f.id)} />
                  {o && <span aria-hidden className="inline-block h-0 w-4 border-t-2 border-dashed" style={{ borderColor: o.colour }} />}
                  {f.name}
                </label>
                {on && (
                  <label className="flex items-center gap-1 text-graphite-500">
                    measured at
                    <select aria-label={`Node ${f.name} was measured at`} className={field} value={c.shown[f.id] ?? c.defaultNode ?? ""} onChange={(e) => c.setNode(f.id, e.target.value)}>
                      {c.nodes.map((n) => (
                        <option key={n.id} value={n.id}>
                          {n.name}
                          {n.id === c.defaultNode ? " (converter input)" : ""}
                        </option>
                      ))}
                    </select>
                  </label>
                )}
                {o && (
                  <>
                    <span className="num text-graphite-700" data-testid="measured-summary">
                      {differenceSummary(o)}
                    </span>
                    <button
                      type="button"
                      className="underline"
                      onClick={() => downloadText(`${f.name.replace(/\.csv$/i, "")}-difference-${c.shown[f.id] ?? c.defaultNode}.csv`, responseDifferenceCsv(o.diff))}
                    >
                      Difference CSV
                    </button>
                  </>
                )}
                {on && p && !p.ok && <span className="text-[#b4412f]">{p.message}</span>}
                {on && !p && <span className="text-graphite-500">loading…</span>}
                {c.canChange && (
                  <button type="button" className="underline text-graphite-500" onClick={() => void remove(f.id, f.name)}>
                    delete
                  </button>
                )}
              </li>
            );
          })}
        </ul>
        <div className="flex flex-wrap items-center gap-2 text-graphite-500">
          {c.canChange && (
            <label className="flex items-center gap-1">
              Add (CSV of Hz, dB, °)
              <input aria-label="Measured response CSV" type="file" accept=".csv,text/csv" onChange={(e) => void upload(e.target.files?.[0])} />
            </label>
          )}
          <span>
            Example:{" "}
            <a className="underline" href={MEASURED_EXAMPLE.href} download>
              {MEASURED_EXAMPLE.label}
            </a>
          </span>
        </div>
        {problems && (
          <div role="alert" className="text-[#b4412f]" data-testid="measured-problems">
            {problems.name} cannot be used ({problems.count} problem{problems.count === 1 ? "" : "s"}):
            <ul className="list-disc pl-5">
              {problems.list.map((e, i) => (
                <li key={i}>{problemText(e)}</li>
              ))}
            </ul>
          </div>
        )}
        {message && <p role="status">{message}</p>}
      </div>
    </details>
  );
}
