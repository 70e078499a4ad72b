"use client";
/**
 * The team library inside a chain's parts panel: copy a library model into the chain (the chain keeps
 * its own copy), and see which copies no longer match the library, with the figures that differ.
 * A copy is matched to its library model by name (the copy's label is the library model's name).
 */
import { useState } from "react";
import { useQuery } from "@tanstack/react-query";
import { fetchJson, problemText } from "@/lib/api/client/fetch-json";
import { useChainQuery } from "@/lib/api/client/chains";
import type { Part } from "@/lib/chain/types";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import { formatQuantity } from "@/lib/units";
import { FIGURES } from "@/components/parts/part-figures";

interface LibraryModel {
  id: string;
  name: string;
  model: Part;
}

/** Figures of a chain's copy that differ from the library model, as "gbw 1.00 MHz → 2.00 MHz". */
export function copyDifferences(copy: Part, library: Part): string[] {
  const out: string[] = [];
  for (const f of FIGURES) {
    const a = (copy as Record<string, number | undefined>)[f.key];
    const b = (library as Record<string, number | undefined>)[f.key];
    if (a !== b) out.push(`${f.title} ${a === undefined ? "ideal" : formatQuantity(a, f.unit)} → ${b === undefined ? "ideal" : formatQuantity(b, f.unit)}`);
  }
  return out;
}

export function LibraryModels({ readOnly }: { readOnly: boolean }) {
  const chainId = useEditor((s) => s.chainId);
  const chain = useChainQuery(chainId ?? "");
  const teamId = chain.data?.teamId;
  const library = useQuery({
    queryKey: ["team-parts", teamId],
    queryFn: () => fetchJson<{ parts: LibraryModel[] }>(`/api/parts?teamId=${teamId}`),
    enabled: !!teamId,
    retry: false,
  });
  const parts = useEditor((s) => s.doc.parts);
  const actions = useEditorActions();
  const [choice, setChoice] = useState("");
  if (!teamId || library.isPending) return null;
  if (library.isError) {
    // Someone outside the chain's team (a guest with a share) has no access to its library.
    return library.error && "status" in library.error && (library.error as { status: number }).status === 404 ? null : <p className="mt-2 text-[12px] text-status-clip">■ {problemText(library.error)}</p>;
  }
  const models = library.data.parts;
  const byName = new Map(models.map((m) => [m.name, m]));
  const copies = Object.entries(parts).filter(([, p]) => p.label && byName.has(p.label));
  const differing = copies.map(([key, p]) => ({ key, p, lib: byName.get(p.label!)!, diff: copyDifferences(p, byName.get(p.label!)!.model) })).filter((c) => c.diff.length > 0);
  return (
    <div className="mt-2 border-t border-paper-rule pt-2" data-testid="library-models">
      <p className="text-[12px] font-semibold uppercase tracking-wide text-graphite-500">Team library</p>
      {differing.map((c) => (
        <div key={c.key} className="mt-1 rounded-card border border-status-tight/40 bg-[#f5eddf] p-1.5 text-[12px]" data-testid="copy-differs">
          <p>
            <span aria-hidden="true" className="text-status-tight">▲ </span>
            This chain&apos;s copy of <strong>{c.lib.name}</strong> differs from the library: {c.diff.join("; ")}.
          </p>
          {!readOnly && (
            <button type="button" className="mt-0.5 text-accent-700 hover:underline" onClick={() => actions.upsertPart(c.key, { ...c.lib.model, label: c.lib.name })}>
              Take the library&apos;s figures
            </button>
          )}
        </div>
      ))}
      {!readOnly &&
        (models.length === 0 ? (
          <p className="mt-1 text-[12px] text-graphite-500">The team library is empty.</p>
        ) : (
          <div className="mt-1 flex gap-1">
            <select aria-label="Model from the team library" value={choice} onChange={(e) => setChoice(e.target.value)} className="min-w-0 flex-1 rounded-card border border-paper-rule bg-paper-raised px-1 py-0.5 text-[12px]">
              <option value="">Choose a model…</option>
              {models.map((m) => (
                <option key={m.id} value={m.id}>
                  {m.name}
                </option>
              ))}
            </select>
            <button
              type="button"
              disabled={!choice}
              className="rounded px-1.5 py-0.5 text-[12px] text-accent-700 hover:bg-accent-50 disabled:text-graphite-300"
              onClick={() => {
                const m = models.find((x) => x.id === choice);
                if (m) actions.addPart({ ...m.model, label: m.name });
                setChoice("");
              }}
            >
              Copy into chain
            </button>
          </div>
        ))}
    </div>
  );
}
