"use client";
/**
 * A team's op-amp models: a sortable table (TanStack Table), a form to add or change one (figures in
 * engineering notation, checked by the shared part schema on the server), and CSV: upload with a
 * row-by-row preview before anything is stored, and download.
 */
import { useMemo, useState } from "react";
import { useRouter } from "next/navigation";
import { createColumnHelper, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { Button, buttonClass } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { SortableTable } from "@/components/ui/sortable-table";
import { fetchJson, problemText } from "@/lib/api/client/fetch-json";
import type { Part } from "@/lib/chain/types";
import { formatQuantity, parseQuantity } from "@/lib/units";
import { FIGURES } from "./part-figures";

export interface LibraryPartView {
  id: string;
  name: string;
  notes: string;
  model: Part;
  updatedAt: string;
}

interface CsvRowView {
  line: number;
  name: string;
  model: Part | null;
  errors: Array<{ column: string; message: string }>;
}
interface CsvPreviewView {
  rows: CsvRowView[];
  valid: number;
  invalid: number;
}

const col = createColumnHelper<LibraryPartView>();
const SHOWN = ["gbw", "aol", "slewRate", "vos", "ib", "en", "swingLow", "swingHigh"];

function fig(model: Part, key: string): string {
  const f = FIGURES.find((x) => x.key === key)!;
  const v = (model as Record<string, number | undefined>)[key];
  return typeof v === "number" ? formatQuantity(v, f.unit) : "—";
}

export function PartsLibrary({ teamId, parts, canEdit, limits }: { teamId: string; parts: LibraryPartView[]; canEdit: boolean; limits: { bytes: number; rows: number } }) {
  const router = useRouter();
  const [sorting, setSorting] = useState<SortingState>([{ id: "name", desc: false }]);
  const [editing, setEditing] = useState<LibraryPartView | "new" | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const columns = useMemo(
    () => [
      col.accessor("name", { header: "Name", cell: (c) => <span className="font-medium text-graphite-950">{c.getValue()}</span> }),
      ...SHOWN.map((key) =>
        col.accessor((p) => (p.model as Record<string, number | undefined>)[key] ?? -Infinity, {
          id: key,
          header: FIGURES.find((f) => f.key === key)!.title,
          cell: (c) => <span className="num whitespace-nowrap">{fig(c.row.original.model, key)}</span>,
        }),
      ),
      col.display({
        id: "commands",
        header: () => <span className="sr-only">Commands</span>,
        cell: (c) =>
          canEdit ? (
            <span className="flex gap-1 whitespace-nowrap">
              <button type="button" className="text-[12.5px] text-accent-700 hover:underline" onClick={() => setEditing(c.row.original)}>
                Edit
              </button>
              <button
                type="button"
                className="text-[12.5px] text-graphite-500 hover:text-status-clip"
                onClick={async () => {
                  if (!window.confirm(`Delete “${c.row.original.name}” from the library? Chains that copied it keep their copy.`)) return;
                  try {
                    await fetchJson(`/api/parts/${c.row.original.id}`, { method: "DELETE" });
                    router.refresh();
                  } catch (e) {
                    setProblem(problemText(e));
                  }
                }}
              >
                Delete
              </button>
            </span>
          ) : null,
      }),
    ],
    [canEdit, router],
  );
  // eslint-disable-next-line react-hooks/incompatible-library -- the table object is mutable by design; no React Compiler in this build
  const table = useReactTable({ data: parts, columns, state: { sorting }, onSortingChange: setSorting, getCoreRowModel: getCoreRowModel(), getSortedRowModel: getSortedRowModel() });
  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-wrap items-center gap-2">
        {canEdit && <Button onClick={() => setEditing("new")}>Add a model</Button>}
        <a href={`/api/parts/export?teamId=${teamId}`} className={buttonClass("secondary")} download>
          Download CSV
        </a>
      </div>
      {problem && <Notice tone="problem">{problem}</Notice>}
      {editing && <PartForm teamId={teamId} part={editing === "new" ? null : editing} onDone={() => { setEditing(null); router.refresh(); }} onCancel={() => setEditing(null)} />}
      <SortableTable table={table} caption="Op-amp models of the team" testId="parts-table" rowTestId="part-row" empty="No models in the library yet." compact />
      {canEdit && <CsvImport teamId={teamId} limits={limits} onStored={() => router.refresh()} />}
    </div>
  );
}

function PartForm({ teamId, part, onDone, onCancel }: { teamId: string; part: LibraryPartView | null; onDone: () => void; onCancel: () => void }) {
  const [name, setName] = useState(part?.name ?? "");
  const [notes, setNotes] = useState(part?.notes ?? "");
  const [label, setLabel] = useState(part?.model.label ?? "");
  const [texts, setTexts] = useState<Record<string, string>>(() => {
    const out: Record<string, string> = {};
    for (const f of FIGURES) {
      const v = (part?.model as Record<string, number | undefined> | undefined)?.[f.key];
      out[f.key] = typeof v === "number" ? formatQuantity(v, f.unit, 4) : "";
    }
    return out;
  });
  const [problem, setProblem] = useState<string | null>(null);
  const read = FIGURES.map((f) => ({ f, text: texts[f.key], parsed: texts[f.key].trim() ? parseQuantity(texts[f.key], { unit: f.unit }) : null }));
  const bad = read.filter((r) => r.parsed && !r.parsed.ok);
  const submit = async () => {
    const model: Record<string, unknown> = {};
    if (label.trim()) model.label = label.trim();
    for (const r of read) if (r.parsed?.ok) model[r.f.key] = r.parsed.value;
    try {
      if (part) await fetchJson(`/api/parts/${part.id}`, { method: "PUT", body: { name, notes, model } });
      else await fetchJson(`/api/parts`, { method: "POST", body: { teamId, name, notes, model } });
      onDone();
    } catch (e) {
      setProblem(problemText(e));
    }
  };
  const input = "rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-sm";
  return (
    <form
      className="rounded-card border border-accent-300 bg-paper-raised p-4"
      aria-label={part ? `Edit ${part.name}` : "New model"}
      onSubmit={(e) => {
        e.preventDefault();
        if (!bad.length) void submit();
      }}
    >
      <h2 className="mb-3 text-base font-semibold text-graphite-950">{part ? `Edit ${part.name}` : "New op-amp model"}</h2>
      <div className="grid grid-cols-3 gap-3">
        <label className="flex flex-col gap-1 text-[12.5px] text-graphite-700">
          Name
          <input value={name} onChange={(e) => setName(e.target.value)} maxLength={100} className={input} />
        </label>
        <label className="flex flex-col gap-1 text-[12.5px] text-graphite-700">
          Label in chains
          <input value={label} onChange={(e) => setLabel(e.target.value)} maxLength={200} className={input} />
        </label>
        <label className="flex flex-col gap-1 text-[12.5px] text-graphite-700">
          Notes
          <input value={notes} onChange={(e) => setNotes(e.target.value)} maxLength={2000} className={input} />
        </label>
        {read.map(({ f, text, parsed }) => (
          <label key={f.key} className="flex flex-col gap-1 text-[12.5px] text-graphite-700">
            {f.title}
            <input value={text} onChange={(e) => setTexts({ ...texts, [f.key]: e.target.value })} placeholder="empty: ideal" aria-invalid={parsed && !parsed.ok ? true : undefined} className={`num ${input}`} />
            <span className={parsed && !parsed.ok ? "text-status-clip" : "text-graphite-400"}>{parsed ? (parsed.ok ? formatQuantity(parsed.value, f.unit) : parsed.error) : " "}</span>
          </label>
        ))}
      </div>
      {problem && <Notice tone="problem" className="mt-3">{problem}</Notice>}
      <div className="mt-3 flex gap-2">
        <Button type="submit" disabled={!name.trim() || bad.length > 0}>
          {part ? "Save" : "Add"}
        </Button>
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

function CsvImport({ teamId, limits, onStored }: { teamId: string; limits: { bytes: number; rows: number }; onStored: () => void }) {
  const [csv, setCsv] = useState<string | null>(null);
  const [fileName, setFileName] = useState("");
  const [preview, setPreview] = useState<CsvPreviewView | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [stored, setStored] = useState<string | null>(null);
  const run = async (text: string, commit: boolean) => {
    setProblem(null);
    try {
      const r = await fetchJson<{ preview: CsvPreviewView; stored?: number; skipped?: number }>(`/api/parts/import`, { method: "POST", body: { teamId, csv: text, commit } });
      if (commit) {
        setStored(`${r.stored} ${r.stored === 1 ? "model" : "models"} stored${r.skipped ? `; ${r.skipped} ${r.skipped === 1 ? "row" : "rows"} with errors left out` : ""}.`);
        setPreview(null);
        setCsv(null);
        onStored();
      } else setPreview(r.preview);
    } catch (e) {
      setPreview(null);
      setProblem(problemText(e));
    }
  };
  return (
    <section className="flex flex-col gap-3 rounded-card border border-paper-rule bg-paper-raised p-4" aria-label="Import from CSV">
      <h2 className="text-base font-semibold text-graphite-950">Import models from CSV</h2>
      <p className="text-[12.5px] text-graphite-500">
        A header line naming the columns (name, label, gbw, aol, slewRate, vos, ib, en, in, enCorner, inCorner, swingLow, swingHigh, inputLow, inputHigh,
        notes), one model per line; figures in SI units, engineering notation allowed (1M, 4n7). At most {limits.rows} rows and {limits.bytes / 1024} kB.
        Nothing is stored until you confirm the preview.
      </p>
      <label className="flex flex-col gap-1 text-sm text-graphite-700">
        CSV file
        <input
          type="file"
          accept=".csv,text/csv"
          data-testid="csv-file"
          onChange={async (e) => {
            const file = e.target.files?.[0];
            setStored(null);
            setPreview(null);
            if (!file) return;
            if (file.size > limits.bytes) {
              setProblem(`The file is ${Math.ceil(file.size / 1024)} kB; at most ${limits.bytes / 1024} kB is accepted.`);
              return;
            }
            const text = await file.text();
            setFileName(file.name);
            setCsv(text);
            await run(text, false);
          }}
        />
      </label>
      {problem && <Notice tone="problem">{problem}</Notice>}
      {preview && (
        <div className="flex flex-col gap-2" data-testid="csv-preview">
          <p className="text-sm text-graphite-900">
            {fileName}: <strong>{preview.valid}</strong> {preview.valid === 1 ? "row" : "rows"} ready, <strong>{preview.invalid}</strong> with errors.
          </p>
          <table className="w-full text-left text-[12.5px]">
            <thead className="border-b border-paper-rule text-graphite-500">
              <tr>
                <th className="py-1 pr-2 font-medium">Line</th>
                <th className="py-1 pr-2 font-medium">Name</th>
                <th className="py-1 font-medium">Result</th>
              </tr>
            </thead>
            <tbody>
              {preview.rows.map((r) => (
                <tr key={r.line} className="border-b border-paper-rule/60 align-top" data-testid="csv-row" data-ok={r.errors.length === 0}>
                  <td className="num py-1 pr-2">{r.line}</td>
                  <td className="py-1 pr-2">{r.name || "—"}</td>
                  <td className="py-1">
                    {r.errors.length === 0 ? (
                      <span>● ready</span>
                    ) : (
                      <ul className="text-status-clip">
                        {r.errors.map((e, i) => (
                          <li key={i}>
                            ■ {e.column ? `${e.column}: ` : ""}
                            {e.message}
                          </li>
                        ))}
                      </ul>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <div className="flex gap-2">
            <Button onClick={() => csv && run(csv, true)} disabled={preview.valid === 0}>
              Import {preview.valid} {preview.valid === 1 ? "model" : "models"}
            </Button>
            <Button variant="secondary" onClick={() => { setPreview(null); setCsv(null); }}>
              Cancel
            </Button>
          </div>
        </div>
      )}
      {stored && (
        <p role="status" className="text-sm text-graphite-700" data-testid="csv-stored">
          ○ {stored}
        </p>
      )}
    </section>
  );
}
