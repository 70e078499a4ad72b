"use client";
/**
 * Findings: every warning of the live analysis with its cause in the engine's plain words, most serious
 * first, and the reasons parts of the draft are not analysed yet. A finding selects its node.
 */
import { useMemo } from "react";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import { SEVERITY_LOOK, warningWords } from "./warning-words";

export function ChecksPanel({ onFocusNode }: { onFocusNode?: (id: string) => void }) {
  const live = useEditor((s) => s.live);
  const nodes = useEditor((s) => s.doc.nodes);
  const actions = useEditorActions();
  const findings = useMemo(() => {
    const list = (live?.warnings ?? []).map((w, i) => ({ ...w, i, ...warningWords(w.code) }));
    return list.sort((a, b) => SEVERITY_LOOK[a.severity].rank - SEVERITY_LOOK[b.severity].rank || a.i - b.i);
  }, [live]);
  const waiting = useMemo(() => {
    if (!live) return [];
    return live.issues.map((issue) => {
      const m = /^nodes\[(\d+)\]/.exec(issue.path);
      const id = m ? nodes[Number(m[1])]?.id : undefined;
      return { id, message: issue.message };
    });
  }, [live, nodes]);
  const go = (id: string | undefined) => {
    if (!id) return;
    actions.select([id]);
    onFocusNode?.(id);
  };

  return (
    <section className="h-full overflow-auto px-3 py-2" aria-label="Findings" data-testid="checks-panel">
      {live?.error && (
        <p className="mb-2 rounded-card border border-status-clip/40 bg-[#f6e9e6] px-2 py-1 text-[12.5px]" role="alert">
          ■ The analysis failed: {live.error}
        </p>
      )}
      {findings.length === 0 && waiting.length === 0 && (
        <p className="text-[13px] text-graphite-500">
          {live?.result ? "○ Nothing to report: every analysed stage is within its rails and the converter checks pass." : "No analysis yet."}
        </p>
      )}
      {findings.length > 0 && (
        <ul className="flex flex-col gap-1" data-testid="findings">
          {findings.map((w) => {
            const look = SEVERITY_LOOK[w.severity];
            return (
              <li key={`${w.nodeId}-${w.code}-${w.i}`}>
                <button
                  type="button"
                  onClick={() => go(w.nodeId)}
                  className="flex w-full items-start gap-2 rounded-card px-2 py-1 text-left hover:bg-paper-sunk"
                  data-code={w.code}
                  data-node={w.nodeId}
                >
                  <span className={`mt-px w-14 shrink-0 text-[11.5px] font-medium ${look.tone}`}>
                    <span aria-hidden>{look.shape} </span>
                    {look.word}
                  </span>
                  <span className="num w-12 shrink-0 pt-px text-[11.5px] text-graphite-500">{w.nodeId}</span>
                  <span className="min-w-0 text-[12.5px] text-graphite-900">
                    <span className="font-medium">{w.title}.</span> {w.message}
                  </span>
                </button>
              </li>
            );
          })}
        </ul>
      )}
      {waiting.length > 0 && (
        <>
          <h3 className="mt-3 text-[11px] font-semibold uppercase tracking-wide text-graphite-500">Not analysed yet</h3>
          <ul className="mt-1 flex flex-col gap-0.5" data-testid="waiting">
            {waiting.map((w, i) => (
              <li key={i}>
                <button type="button" onClick={() => go(w.id)} disabled={!w.id} className="flex w-full items-start gap-2 rounded-card px-2 py-0.5 text-left text-[12.5px] text-graphite-700 hover:bg-paper-sunk disabled:hover:bg-transparent">
                  <span className="w-14 shrink-0 text-[11.5px] text-graphite-500">○ Waiting</span>
                  <span className="min-w-0">{w.message}</span>
                </button>
              </li>
            ))}
          </ul>
        </>
      )}
    </section>
  );
}
