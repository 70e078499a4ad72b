"use client";
/** Creating a chain: a name and a starting point (blank, or a plain example chain), then the workspace. */
import { useState } from "react";
import { useRouter } from "next/navigation";
import type { NodeKind } from "@/lib/chain/types";
import { cx } from "@/components/ui/cx";
import { Notice } from "@/components/ui/notice";
import { findTemplate } from "@/lib/templates";
import { ApiFailure, createChain } from "@/lib/api/client/chains";
import { Pictogram } from "./pictograms";

export interface TemplateSummary {
  key: string;
  title: string;
  summary: string;
  kinds: NodeKind[];
}

export function NewChainChooser({ templates }: { templates: TemplateSummary[] }) {
  const router = useRouter();
  const [choice, setChoice] = useState(templates[0]?.key ?? "blank");
  const [name, setName] = useState("");
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const nameProblem = name.length > 200 ? "at most 200 characters" : null;

  const create = async (e: React.FormEvent) => {
    e.preventDefault();
    const t = findTemplate(choice);
    if (!t || nameProblem) return;
    setBusy(true);
    setProblem(null);
    const doc = t.make();
    const finalName = name.trim() || (t.key === "blank" ? "New chain" : t.title);
    try {
      const chain = await createChain({ name: finalName, document: { ...doc, name: finalName } });
      router.push(`/chains/${chain.id}`);
    } catch (err) {
      setProblem(err instanceof ApiFailure ? err.message : String(err));
      setBusy(false);
    }
  };

  return (
    <form onSubmit={create} className="flex flex-col gap-5">
      <fieldset>
        <legend className="mb-2 text-sm font-medium text-graphite-700">Start from</legend>
        <div className="grid grid-cols-2 gap-3" role="radiogroup">
          {templates.map((t) => (
            <label
              key={t.key}
              className={cx(
                "flex cursor-pointer flex-col gap-2 rounded-card border bg-paper-raised p-3 shadow-card",
                choice === t.key ? "border-accent-600 ring-2 ring-accent-100" : "border-paper-rule hover:border-graphite-300",
              )}
            >
              <span className="flex items-center gap-2">
                <input type="radio" name="template" value={t.key} checked={choice === t.key} onChange={() => setChoice(t.key)} className="accent-[#1e6d6a]" />
                <span className="font-medium text-graphite-950">{t.title}</span>
              </span>
              <span className="text-sm text-graphite-700">{t.summary}</span>
              <span className="flex flex-wrap items-center gap-0.5 text-graphite-500" aria-hidden>
                {t.kinds.length === 0 ? <span className="text-xs">(empty)</span> : t.kinds.map((k, i) => <Pictogram key={i} kind={k} />)}
              </span>
            </label>
          ))}
        </div>
      </fieldset>
      <div className="flex max-w-md flex-col gap-1">
        <label htmlFor="new-chain-name" className="text-sm font-medium text-graphite-700">
          Name
        </label>
        <input
          id="new-chain-name"
          value={name}
          onChange={(e) => setName(e.target.value)}
          placeholder={findTemplate(choice)?.key === "blank" ? "New chain" : findTemplate(choice)?.title}
          aria-invalid={nameProblem ? true : undefined}
          className="rounded-card border border-paper-rule bg-paper-raised px-3 py-2 text-sm"
        />
        {nameProblem && <p className="text-xs text-status-clip">■ {nameProblem}</p>}
      </div>
      {problem && (
        <Notice tone="problem" title="The chain was not created">
          {problem}
        </Notice>
      )}
      <div>
        <button type="submit" disabled={busy || !!nameProblem} className="rounded-card bg-accent-700 px-4 py-2 text-sm font-medium text-white hover:bg-accent-800 disabled:bg-graphite-300">
          {busy ? "Creating…" : "Create and open"}
        </button>
      </div>
    </form>
  );
}
