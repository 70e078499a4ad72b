"use client";
/**
 * The chains library: TanStack Table in manual mode. Searching, sorting, filtering and paging change
 * the address (?q=…&sort=…), and the server answers with that page only; the table draws what it is
 * given. Each row has its commands: open, duplicate, rename, move to a team, archive, delete.
 */
import { useMemo, useState, useTransition } from "react";
import Link from "next/link";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { createColumnHelper, getCoreRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { StatusMark } from "@/components/ui/status-mark";
import { SortableTable } from "@/components/ui/sortable-table";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { ReviewBadge } from "@/components/review/review-badge";
import { ROLE_WORDS, shortTime } from "@/components/review/review-words";
import { fetchJson, problemText } from "@/lib/api/client/fetch-json";

export interface LibraryRowView {
  id: string;
  name: string;
  teamId: string;
  teamName: string;
  owners: string | null;
  role: string | null;
  actions: string[];
  reviewState: string;
  worstStatus: "ok" | "tight" | "clip" | null;
  version: number;
  updatedAt: string;
  archived: boolean;
}

export interface LibraryProps {
  rows: LibraryRowView[];
  total: number;
  page: number;
  pageSize: number;
  facets: { teams: Array<{ id: string; name: string }>; owners: Array<{ id: string; name: string }> };
  /** teams the user may create chains in (for duplicate and move) */
  creatableTeams: Array<{ id: string; name: string }>;
  anyChains: boolean;
}

const col = createColumnHelper<LibraryRowView>();
const SORTABLE: Record<string, string> = { name: "name", teamName: "team", reviewState: "reviewState", worstStatus: "worstStatus", updatedAt: "updatedAt" };

export function ChainLibrary({ rows, total, page, pageSize, facets, creatableTeams, anyChains }: LibraryProps) {
  const router = useRouter();
  const pathname = usePathname();
  const params = useSearchParams();
  const [pending, startTransition] = useTransition();
  const [problem, setProblem] = useState<string | null>(null);
  const [dialog, setDialog] = useState<null | { kind: "rename" | "move" | "delete"; row: LibraryRowView }>(null);

  const setParams = (changes: Record<string, string | null>) => {
    const next = new URLSearchParams(params.toString());
    for (const [k, v] of Object.entries(changes)) {
      if (v === null || v === "") next.delete(k);
      else next.set(k, v);
    }
    if (!("page" in changes)) next.delete("page");
    startTransition(() => router.push(`${pathname}?${next.toString()}`));
  };

  const sortKey = params.get("sort") ?? "updatedAt";
  const dir = params.get("dir") ?? (sortKey === "updatedAt" ? "desc" : "asc");
  const sorting: SortingState = Object.entries(SORTABLE)
    .filter(([, v]) => v === sortKey)
    .map(([id]) => ({ id, desc: dir === "desc" }));

  const act = async (fn: () => Promise<unknown>) => {
    setProblem(null);
    try {
      await fn();
      setDialog(null);
      startTransition(() => router.refresh());
    } catch (e) {
      setProblem(problemText(e));
    }
  };

  const columns = useMemo(
    () => [
      col.accessor("name", {
        header: "Name",
        cell: (c) => (
          <Link href={`/chains/${c.row.original.id}`} className="font-medium text-graphite-950">
            {c.getValue()}
          </Link>
        ),
      }),
      col.accessor("teamName", { header: "Team" }),
      col.accessor("owners", { header: "Owner", enableSorting: false, cell: (c) => c.getValue() ?? "—" }),
      col.accessor("role", { header: "Your role", enableSorting: false, cell: (c) => (c.getValue() ? ROLE_WORDS[c.getValue()!] : "—") }),
      col.accessor("reviewState", { header: "Review", cell: (c) => <ReviewBadge state={c.getValue()} /> }),
      col.accessor("worstStatus", { header: "Headroom", cell: (c) => <StatusMark status={c.getValue()} className="whitespace-nowrap" /> }),
      col.accessor("updatedAt", { header: "Last saved (UTC)", cell: (c) => <span className="num whitespace-nowrap text-graphite-500">{shortTime(c.getValue())}</span> }),
      col.display({
        id: "commands",
        header: () => <span className="sr-only">Commands</span>,
        cell: (c) => <RowCommands row={c.row.original} creatable={creatableTeams} onDialog={(kind) => setDialog({ kind, row: c.row.original })} act={act} />,
      }),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [creatableTeams],
  );

  // eslint-disable-next-line react-hooks/incompatible-library -- the table object is mutable by design; no React Compiler in this build
  const table = useReactTable({
    data: rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualFiltering: true,
    manualPagination: true,
    rowCount: total,
    state: { sorting, pagination: { pageIndex: page - 1, pageSize } },
    onSortingChange: (updater) => {
      const next = typeof updater === "function" ? updater(sorting) : updater;
      const first = next[0];
      if (!first) setParams({ sort: null, dir: null });
      else setParams({ sort: SORTABLE[first.id] ?? null, dir: first.desc ? "desc" : "asc" });
    },
  });

  const pages = Math.max(1, Math.ceil(total / pageSize));
  const select = "rounded-card border border-paper-rule bg-paper-raised px-2 py-1.5 text-sm";
  return (
    <div className="flex flex-col gap-3" aria-busy={pending}>
      <form
        role="search"
        className="flex flex-wrap items-end gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          const q = new FormData(e.currentTarget).get("q");
          setParams({ q: typeof q === "string" ? q : null });
        }}
      >
        <label className="flex flex-col gap-1 text-[12.5px] text-graphite-700">
          Search names
          <input name="q" type="search" defaultValue={params.get("q") ?? ""} className={`${select} w-60`} />
        </label>
        <label className="flex flex-col gap-1 text-[12.5px] text-graphite-700">
          Team
          <select aria-label="Team" value={params.get("team") ?? ""} onChange={(e) => setParams({ team: e.target.value })} className={select}>
            <option value="">All teams</option>
            {facets.teams.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-[12.5px] text-graphite-700">
          Owner
          <select aria-label="Owner" value={params.get("owner") ?? ""} onChange={(e) => setParams({ owner: e.target.value })} className={select}>
            <option value="">Anyone</option>
            {facets.owners.map((o) => (
              <option key={o.id} value={o.id}>
                {o.name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-[12.5px] text-graphite-700">
          Review
          <select aria-label="Review state" value={params.get("review") ?? ""} onChange={(e) => setParams({ review: e.target.value })} className={select}>
            <option value="">Any state</option>
            <option value="draft">Draft</option>
            <option value="in-review">In review</option>
            <option value="changes-requested">Changes requested</option>
            <option value="approved">Approved</option>
          </select>
        </label>
        <label className="flex flex-col gap-1 text-[12.5px] text-graphite-700">
          Headroom
          <select aria-label="Worst headroom" value={params.get("status") ?? ""} onChange={(e) => setParams({ status: e.target.value })} className={select}>
            <option value="">Any</option>
            <option value="clip">Hits a rail</option>
            <option value="tight">Little margin</option>
            <option value="ok">Within rails</option>
            <option value="none">Not analysed</option>
          </select>
        </label>
        <label className="flex items-center gap-1.5 pb-2 text-[12.5px] text-graphite-700">
          <input type="checkbox" checked={params.get("archived") === "1"} onChange={(e) => setParams({ archived: e.target.checked ? "1" : null })} />
          Archived
        </label>
        <Button type="submit" variant="secondary">
          Search
        </Button>
      </form>
      {problem && <Notice tone="problem">{problem}</Notice>}
      {!anyChains ? (
        <div className="rounded-card border border-dashed border-paper-rule bg-paper-raised p-8 text-center text-graphite-700">
          No chains yet. Chains your team creates, or that someone shares with you, appear here.
        </div>
      ) : (
        <SortableTable table={table} caption={`Chains you can open, ${total} in all`} testId="chain-list" rowTestId="library-row" empty="No chain matches these filters." />
      )}
      {pages > 1 && (
        <nav aria-label="Pages" className="flex items-center gap-2 text-sm">
          <Button variant="secondary" disabled={page <= 1} onClick={() => setParams({ page: String(page - 1) })}>
            Previous
          </Button>
          <span className="num text-graphite-700">
            page {page} of {pages} · {total} chains
          </span>
          <Button variant="secondary" disabled={page >= pages} onClick={() => setParams({ page: String(page + 1) })}>
            Next
          </Button>
        </nav>
      )}
      {dialog && <RowDialog dialog={dialog} creatable={creatableTeams} onClose={() => setDialog(null)} act={act} problem={problem} />}
    </div>
  );
}

function RowCommands({ row, creatable, onDialog, act }: { row: LibraryRowView; creatable: LibraryProps["creatableTeams"]; onDialog: (k: "rename" | "move" | "delete") => void; act: (fn: () => Promise<unknown>) => Promise<void> }) {
  const can = (a: string) => row.actions.includes(a);
  const link = "rounded px-1.5 py-0.5 text-[12.5px] text-accent-700 hover:bg-accent-50";
  return (
    <div className="flex flex-wrap justify-end gap-0.5 whitespace-nowrap">
      {creatable.length > 0 && (
        <button type="button" className={link} onClick={() => act(() => fetchJson(`/api/chains/${row.id}/duplicate`, { method: "POST", body: {} }))}>
          Duplicate
        </button>
      )}
      {can("edit") && (
        <button type="button" className={link} onClick={() => onDialog("rename")}>
          Rename
        </button>
      )}
      {can("delete") && creatable.some((t) => t.id !== row.teamId) && (
        <button type="button" className={link} onClick={() => onDialog("move")}>
          Move
        </button>
      )}
      {can("delete") && (
        <button type="button" className={link} onClick={() => act(() => fetchJson(`/api/chains/${row.id}`, { method: "PATCH", body: { archived: !row.archived } }))}>
          {row.archived ? "Bring back" : "Archive"}
        </button>
      )}
      {can("delete") && (
        <button type="button" className="rounded px-1.5 py-0.5 text-[12.5px] text-status-clip hover:bg-paper-sunk" onClick={() => onDialog("delete")}>
          Delete
        </button>
      )}
    </div>
  );
}

function RowDialog({
  dialog,
  creatable,
  onClose,
  act,
  problem,
}: {
  dialog: { kind: "rename" | "move" | "delete"; row: LibraryRowView };
  creatable: LibraryProps["creatableTeams"];
  onClose: () => void;
  act: (fn: () => Promise<unknown>) => Promise<void>;
  problem: string | null;
}) {
  const { kind, row } = dialog;
  const [name, setName] = useState(row.name);
  const [team, setTeam] = useState(creatable.find((t) => t.id !== row.teamId)?.id ?? "");
  const title = kind === "rename" ? "Rename the chain" : kind === "move" ? "Move to another team" : "Delete the chain?";
  return (
    <div className="fixed inset-0 z-40 flex items-center justify-center bg-graphite-950/20" role="presentation" onKeyDown={(e) => e.key === "Escape" && onClose()}>
      <div role="dialog" aria-modal="true" aria-labelledby="row-dialog-title" className="w-[420px] rounded-card border border-paper-rule bg-paper-raised p-5 shadow-card">
        <h2 id="row-dialog-title" className="text-lg font-semibold text-graphite-950">
          {title}
        </h2>
        {kind === "rename" && (
          <label className="mt-3 flex flex-col gap-1 text-sm">
            New name
            <input autoFocus value={name} onChange={(e) => setName(e.target.value)} maxLength={200} className="rounded-card border border-paper-rule px-2 py-1.5" />
          </label>
        )}
        {kind === "move" && (
          <label className="mt-3 flex flex-col gap-1 text-sm">
            Team
            <select autoFocus value={team} onChange={(e) => setTeam(e.target.value)} className="rounded-card border border-paper-rule px-2 py-1.5">
              {creatable
                .filter((t) => t.id !== row.teamId)
                .map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.name}
                  </option>
                ))}
            </select>
          </label>
        )}
        {kind === "delete" && (
          <p className="mt-2 text-sm text-graphite-700">
            “{row.name}” and all its revisions, comments and reviews will be gone for everyone. Archiving keeps them instead.
            {row.reviewState === "approved" ? " It is approved: only its owner may delete it." : ""}
          </p>
        )}
        {problem && <Notice tone="problem" className="mt-3">{problem}</Notice>}
        <div className="mt-4 flex justify-end gap-2">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          {kind === "rename" && (
            <Button onClick={() => act(() => fetchJson(`/api/chains/${row.id}`, { method: "PATCH", body: { name, baseVersion: row.version } }))} disabled={!name.trim()}>
              Rename
            </Button>
          )}
          {kind === "move" && (
            <Button onClick={() => act(() => fetchJson(`/api/chains/${row.id}`, { method: "PATCH", body: { teamId: team } }))} disabled={!team}>
              Move
            </Button>
          )}
          {kind === "delete" && (
            <Button onClick={() => act(() => fetchJson(`/api/chains/${row.id}`, { method: "DELETE" }))} className="bg-status-clip hover:bg-status-clip">
              Delete for good
            </Button>
          )}
        </div>
      </div>
    </div>
  );
}
