"use client";
/**
 * Headroom of every analysed stage and converter in one sortable table (TanStack Table): DC interval,
 * interval with the signal peak, usable range, spare margin and the slew the signal needs. A row selects
 * its node.
 */
import { useMemo, useState } from "react";
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { StatusMark } from "@/components/ui/status-mark";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import { fmt, fmtVolts } from "@/components/editor/format";
import { headroomRows, type HeadroomRow } from "@/lib/handoff/headroom";

export type { HeadroomRow } from "@/lib/handoff/headroom";

const STATUS_RANK: Record<string, number> = { clip: 0, tight: 1, ok: 2 };
const col = createColumnHelper<HeadroomRow>();
const volts = (v: number | null) => (v === null ? "—" : fmtVolts(v));
/** nulls last whichever way the column is sorted */
const nullsLast = { sortUndefined: "last" as const };

const columns = [
  col.accessor("name", { header: "Stage", cell: (c) => <span className="font-sans">{c.getValue()}</span> }),
  col.accessor((r) => (r.status ? STATUS_RANK[r.status] : undefined), {
    id: "status",
    header: "Status",
    cell: (c) => <StatusMark status={c.row.original.status} className="font-sans text-[12px]!" />,
    ...nullsLast,
  }),
  col.accessor((r) => r.dcMin ?? undefined, { id: "dcMin", header: "DC min", cell: (c) => volts(c.row.original.dcMin), ...nullsLast }),
  col.accessor((r) => r.dcMax ?? undefined, { id: "dcMax", header: "DC max", cell: (c) => volts(c.row.original.dcMax), ...nullsLast }),
  col.accessor((r) => r.peakMin ?? undefined, { id: "peakMin", header: "Peak min", cell: (c) => volts(c.row.original.peakMin), ...nullsLast }),
  col.accessor((r) => r.peakMax ?? undefined, { id: "peakMax", header: "Peak max", cell: (c) => volts(c.row.original.peakMax), ...nullsLast }),
  col.accessor((r) => r.low ?? undefined, { id: "range", header: "Usable", cell: (c) => (c.row.original.low === null ? "—" : `${volts(c.row.original.low)} … ${volts(c.row.original.high)}`), ...nullsLast }),
  col.accessor((r) => r.margin ?? undefined, { id: "margin", header: "Margin", cell: (c) => volts(c.row.original.margin), ...nullsLast }),
  col.accessor((r) => r.share ?? undefined, { id: "share", header: "Margin %", cell: (c) => (c.row.original.share === null ? "—" : `${(c.row.original.share * 100).toFixed(0)} %`), ...nullsLast }),
  col.accessor((r) => r.slew ?? undefined, { id: "slew", header: "Slew needed", cell: (c) => fmt(c.row.original.slew, "V/s"), ...nullsLast }),
];

export function useHeadroomRows(): HeadroomRow[] {
  const live = useEditor((s) => s.live);
  return useMemo(() => (live?.chain ? headroomRows(live.chain.nodes, live.stageById, live.adcById) : []), [live]);
}

export function HeadroomTable({ onFocusNode }: { onFocusNode?: (id: string) => void }) {
  const data = useHeadroomRows();
  const selected = useEditor((s) => s.selected);
  const actions = useEditorActions();
  const [sorting, setSorting] = useState<SortingState>([]);
  // ascending first: the smallest margin (the stage nearest a rail) comes to the top with one click
  // eslint-disable-next-line react-hooks/incompatible-library -- the table object is mutable by design; no React Compiler in this build
  const table = useReactTable({ data, columns, state: { sorting }, onSortingChange: setSorting, sortDescFirst: false, getCoreRowModel: getCoreRowModel(), getSortedRowModel: getSortedRowModel() });
  if (data.length === 0) return <p className="p-3 text-[13px] text-graphite-500">No analysed op-amp stage or converter yet.</p>;
  return (
    <div className="h-full overflow-auto" data-testid="headroom-table">
      <table className="w-full border-collapse text-[12px]">
        <thead className="sticky top-0 bg-paper-raised">
          {table.getHeaderGroups().map((hg) => (
            <tr key={hg.id}>
              {hg.headers.map((h) => {
                const dir = h.column.getIsSorted();
                return (
                  <th key={h.id} scope="col" aria-sort={dir === "asc" ? "ascending" : dir === "desc" ? "descending" : "none"} className="border-b border-paper-rule px-2 py-1 text-left font-medium text-graphite-700">
                    <button type="button" onClick={h.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 hover:text-graphite-950">
                      {flexRender(h.column.columnDef.header, h.getContext())}
                      <span aria-hidden className="text-graphite-400">{dir === "asc" ? "↑" : dir === "desc" ? "↓" : "↕"}</span>
                    </button>
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((row) => (
            <tr
              key={row.id}
              tabIndex={0}
              onClick={() => {
                actions.select([row.original.id]);
                onFocusNode?.(row.original.id);
              }}
              onKeyDown={(e) => {
                if (e.key !== "Enter" && e.key !== " ") return;
                e.preventDefault();
                actions.select([row.original.id]);
                onFocusNode?.(row.original.id);
              }}
              className={`cursor-pointer border-b border-paper-rule/60 hover:bg-paper-sunk ${selected.includes(row.original.id) ? "bg-accent-50" : ""}`}
              data-row={row.original.id}
            >
              {row.getVisibleCells().map((cell) => (
                <td key={cell.id} className="num whitespace-nowrap px-2 py-1 text-graphite-900">
                  {flexRender(cell.column.columnDef.cell, cell.getContext())}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
