"use client";
/**
 * Import a chain file: pick a `chainwright.chain/1` JSON file (or paste its text), check it (nothing is
 * written: the server answers with a preview or every problem with its field), then import it as a new
 * chain. The server writes the whole chain or nothing.
 */
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiFailure, fetchJson } from "@/lib/api/client/fetch-json";

interface Preview {
  name: string;
  nodes: number;
  edges: number;
  parts: number;
  kinds: { kind: string; words: string; count: number }[];
  complete: boolean;
  incomplete: { path: string; message: string }[];
}

type Problem = { path: string; message: string };

export function ImportForm({ teams }: { teams: { id: string; name: string }[] }) {
  const router = useRouter();
  const [text, setText] = useState("");
  const [fileName, setFileName] = useState<string | null>(null);
  const [teamId, setTeamId] = useState(teams[0]?.id ?? "");
  const [preview, setPreview] = useState<Preview | null>(null);
  const [problems, setProblems] = useState<Problem[] | null>(null);
  const [busy, setBusy] = useState(false);

  const fail = (e: unknown) => {
    if (e instanceof ApiFailure && e.body.errors?.length) setProblems(e.body.errors);
    else setProblems([{ path: "", message: e instanceof Error ? e.message : String(e) }]);
  };

  async function send(previewOnly: boolean) {
    setBusy(true);
    setProblems(null);
    if (previewOnly) setPreview(null);
    try {
      const body = { document: text, teamId: teamId || undefined, preview: previewOnly };
      if (previewOnly) {
        const r = await fetchJson<{ preview: Preview }>("/api/chains/import", { method: "POST", body });
        setPreview(r.preview);
      } else {
        const r = await fetchJson<{ chain: { id: string } }>("/api/chains/import", { method: "POST", body });
        router.push(`/chains/${r.chain.id}`);
      }
    } catch (e) {
      fail(e);
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="flex max-w-3xl flex-col gap-4">
      <div className="flex flex-col gap-2">
        <label htmlFor="import-file" className="text-sm font-medium text-graphite-900">
          Chain file (.json)
        </label>
        <input
          id="import-file"
          type="file"
          accept=".json,application/json"
          onChange={async (e) => {
            const f = e.target.files?.[0];
            if (!f) return;
            setFileName(f.name);
            setText(await f.text());
            setPreview(null);
            setProblems(null);
          }}
        />
        <label htmlFor="import-text" className="text-sm text-graphite-700">
          or paste the document
        </label>
        <textarea
          id="import-text"
          value={text}
          onChange={(e) => {
            setText(e.target.value);
            setFileName(null);
            setPreview(null);
          }}
          rows={8}
          spellCheck={false}
          className="num rounded-card border border-paper-rule bg-paper-raised p-2 text-[12px]"
        />
      </div>
      {teams.length > 1 && (
        <div className="flex items-center gap-2 text-sm">
          <label htmlFor="import-team">Into team</label>
          <select id="import-team" value={teamId} onChange={(e) => setTeamId(e.target.value)} className="rounded-card border border-paper-rule bg-paper-raised px-2 py-1">
            {teams.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name}
              </option>
            ))}
          </select>
        </div>
      )}
      <div className="flex gap-2">
        <button type="button" disabled={busy || !text.trim()} onClick={() => send(true)} className="rounded-card border border-paper-rule bg-paper-raised px-3 py-1.5 text-sm hover:bg-paper-sunk disabled:opacity-50">
          Check {fileName ?? "the document"}
        </button>
        <button type="button" disabled={busy || !preview} onClick={() => send(false)} className="rounded-card bg-accent-700 px-3 py-1.5 text-sm text-white hover:bg-accent-600 disabled:opacity-50">
          Import as a new chain
        </button>
      </div>
      {problems && (
        <div role="alert" data-testid="import-errors" className="rounded-card border border-status-clip p-3 text-sm">
          <p className="font-medium">The document was not imported ({problems.length} {problems.length === 1 ? "problem" : "problems"}):</p>
          <ul className="mt-1 list-disc pl-5">
            {problems.map((p, k) => (
              <li key={k}>
                {p.path && <code className="num">{p.path}</code>} {p.message}
              </li>
            ))}
          </ul>
        </div>
      )}
      {preview && (
        <div data-testid="import-preview" className="rounded-card border border-paper-rule p-3 text-sm">
          <p>
            <b>{preview.name}</b>: {preview.nodes} nodes, {preview.edges} connections, {preview.parts} op-amp models.
          </p>
          <p className="text-graphite-700">{preview.kinds.map((k) => `${k.count} × ${k.words.replace(/^an? /, "")}`).join(", ")}</p>
          {preview.complete ? (
            <p className="mt-1">Complete: it can be analysed as it is.</p>
          ) : (
            <>
              <p className="mt-1">A draft: it imports as it is, and still needs:</p>
              <ul className="list-disc pl-5">
                {preview.incomplete.slice(0, 12).map((p, k) => (
                  <li key={k}>
                    <code className="num">{p.path}</code> {p.message}
                  </li>
                ))}
              </ul>
            </>
          )}
        </div>
      )}
    </div>
  );
}
