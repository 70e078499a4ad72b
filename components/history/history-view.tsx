"use client";
/**
 * The history of a chain: every revision with author, time and summary; two chosen revisions compared
 * (stages and values, old → new in engineering notation, and the key results); restore of an old one
 * as a new revision.
 */
import { useState } from "react";
import { useRouter } from "next/navigation";
import { QueryClient, QueryClientProvider, useQuery } from "@tanstack/react-query";
import { Notice } from "@/components/ui/notice";
import { fetchJson, problemText } from "@/lib/api/client/fetch-json";
import { shortTime } from "@/components/review/review-words";
import type { ChainDiff } from "@/lib/history/diff";
import type { KeyResultChange } from "@/lib/history/key-results";

export interface RevisionItem {
  id: string;
  number: number;
  summary: string;
  pinned: boolean;
  saves: number;
  createdAt: string;
  updatedAt: string | null;
  author: { id: string; name: string | null } | null;
}

interface Comparison {
  from: { number: number };
  to: { number: number };
  changed: boolean;
  diff: ChainDiff;
  keyResults: { changes: KeyResultChange[]; from: { note: string | null }; to: { note: string | null } };
}

export function HistoryView(props: { chainId: string; version: number; revisions: RevisionItem[]; canRestore: boolean }) {
  const [client] = useState(() => new QueryClient());
  return (
    <QueryClientProvider client={client}>
      <HistoryBody {...props} />
    </QueryClientProvider>
  );
}

function HistoryBody({ chainId, version, revisions, canRestore }: { chainId: string; version: number; revisions: RevisionItem[]; canRestore: boolean }) {
  const router = useRouter();
  const [from, setFrom] = useState(revisions[1]?.id ?? revisions[0]?.id ?? "");
  const [to, setTo] = useState(revisions[0]?.id ?? "");
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const compare = useQuery({
    queryKey: ["compare", chainId, from, to],
    queryFn: () => fetchJson<Comparison>(`/api/chains/${chainId}/revisions/compare?from=${from}&to=${to}`),
    enabled: !!from && !!to && from !== to,
  });
  const restore = async (r: RevisionItem) => {
    if (!window.confirm(`Make revision ${r.number} the chain's newest version? Nothing is lost: it becomes a new revision.`)) return;
    setBusy(true);
    setProblem(null);
    try {
      await fetchJson(`/api/chains/${chainId}/revisions/${r.id}/restore`, { method: "POST", body: { baseVersion: version } });
      router.refresh();
    } catch (e) {
      setProblem(problemText(e));
    } finally {
      setBusy(false);
    }
  };
  return (
    <div className="grid grid-cols-[minmax(0,5fr)_minmax(0,6fr)] gap-6">
      <section aria-label="Revisions">
        <table className="w-full text-left text-sm" data-testid="revisions">
          <thead className="border-b border-paper-rule text-xs uppercase tracking-wide text-graphite-500">
            <tr>
              <th className="py-2 pr-2 font-medium">From</th>
              <th className="py-2 pr-2 font-medium">To</th>
              <th className="py-2 pr-2 font-medium">Revision</th>
              <th className="py-2 font-medium">What changed</th>
            </tr>
          </thead>
          <tbody>
            {revisions.map((r) => (
              <tr key={r.id} className="border-b border-paper-rule align-top" data-testid="revision-row">
                <td className="py-2 pr-2">
                  <input type="radio" name="from" aria-label={`Compare from revision ${r.number}`} checked={from === r.id} onChange={() => setFrom(r.id)} />
                </td>
                <td className="py-2 pr-2">
                  <input type="radio" name="to" aria-label={`Compare to revision ${r.number}`} checked={to === r.id} onChange={() => setTo(r.id)} />
                </td>
                <td className="num whitespace-nowrap py-2 pr-2">
                  {r.number}
                  {r.pinned && (
                    <span className="ml-1 text-accent-700" title="Named by a review request or an approval">
                      ◆
                    </span>
                  )}
                </td>
                <td className="py-2">
                  <p className="text-graphite-950">{r.summary || "—"}</p>
                  <p className="text-[12px] text-graphite-500">
                    {r.author?.name ?? "Former member"} · <span className="num">{shortTime(r.updatedAt ?? r.createdAt)}</span>
                    {r.saves > 1 ? ` · ${r.saves} saves folded` : ""}
                  </p>
                  {canRestore && r.number !== version && (
                    <button type="button" disabled={busy} onClick={() => restore(r)} className="mt-1 text-[12.5px] text-accent-700 hover:underline">
                      Restore revision {r.number}
                    </button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        {problem && <Notice tone="problem" className="mt-3">{problem}</Notice>}
      </section>
      <section aria-label="Comparison" data-testid="comparison">
        {from === to ? (
          <p className="text-sm text-graphite-500">Choose two different revisions to compare.</p>
        ) : compare.isPending ? (
          <p className="text-sm text-graphite-500">Comparing…</p>
        ) : compare.isError ? (
          <Notice tone="problem">{problemText(compare.error)}</Notice>
        ) : (
          <DiffView data={compare.data} />
        )}
      </section>
    </div>
  );
}

const CHANGE_MARK: Record<string, string> = { added: "+", removed: "−", changed: "~" };

function ValueTable({ rows }: { rows: Array<{ field: string; old: string; new: string }> }) {
  return (
    <table className="mt-1 w-full text-[12.5px]">
      <tbody>
        {rows.map((v) => (
          <tr key={v.field} className="border-b border-paper-rule/60 last:border-b-0">
            <td className="num w-28 py-0.5 pr-2 text-graphite-500">{v.field}</td>
            <td className="num py-0.5 pr-2 text-graphite-700 line-through decoration-graphite-300">{v.old}</td>
            <td className="py-0.5 pr-2 text-graphite-400" aria-hidden="true">
              →
            </td>
            <td className="num py-0.5 font-medium text-graphite-950">{v.new}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function DiffView({ data }: { data: Comparison }) {
  const d = data.diff;
  return (
    <div className="flex flex-col gap-4 text-sm">
      <h2 className="text-base font-semibold text-graphite-950">
        Revision {data.from.number} → {data.to.number}
      </h2>
      {!data.changed && <p className="text-graphite-500">No change in stages or values{d.moved.length ? ` (only ${d.moved.length} stage${d.moved.length === 1 ? "" : "s"} moved on the canvas)` : ""}.</p>}
      {d.name && <ValueTable rows={[d.name]} />}
      {d.stages.map((s) => (
        <div key={s.id} className="rounded-card border border-paper-rule bg-paper-raised p-2.5" data-testid="stage-diff">
          <p className="font-medium text-graphite-950">
            <span aria-hidden="true" className="num mr-1 text-accent-700">
              {CHANGE_MARK[s.change]}
            </span>
            {s.label ? `${s.label} ` : ""}
            <span className="num text-graphite-500">{s.id}</span> · {s.kind} · {s.change}
          </p>
          <ValueTable rows={s.values} />
        </div>
      ))}
      {(d.edges.added.length > 0 || d.edges.removed.length > 0) && (
        <p className="text-[12.5px] text-graphite-700">
          Connections: {[...d.edges.added.map((e) => `+ ${e.from} → ${e.to}`), ...d.edges.removed.map((e) => `− ${e.from} → ${e.to}`)].join(", ")}
        </p>
      )}
      {d.parts.map((p) => (
        <div key={p.key} className="rounded-card border border-paper-rule p-2.5">
          <p className="font-medium">
            Op-amp model {p.label ?? p.key} · {p.change}
          </p>
          <ValueTable rows={p.values} />
        </div>
      ))}
      {d.settings.length > 0 && <ValueTable rows={d.settings} />}
      {d.notesChanged && <p className="text-[12.5px] text-graphite-700">The notes were edited.</p>}
      <section className="border-t border-paper-rule pt-3" data-testid="key-results">
        <h3 className="text-[12px] font-semibold uppercase tracking-wide text-graphite-500">Key results</h3>
        {data.keyResults.changes.length === 0 ? (
          <p className="mt-1 text-[12.5px] text-graphite-500">Gain, corners and worst margin are the same.</p>
        ) : (
          <ValueTable rows={data.keyResults.changes.map((c) => ({ field: `${c.path}: ${c.figure}`, old: c.old, new: c.new }))} />
        )}
        {[data.keyResults.from.note, data.keyResults.to.note].filter(Boolean).map((n) => (
          <p key={n} className="mt-1 text-[12px] text-graphite-500">
            ○ {n}
          </p>
        ))}
      </section>
    </div>
  );
}
