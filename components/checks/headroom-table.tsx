"use client";
/**
 * Headroom of every analysed stage and converter in one sortable table (TanStack Table): DC interval,
 * interval with the signal peak, usable range, spare margin and the slew the signal needs. A row selects
 * its node.
 */
import { useMemo, useState } from "react";
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { StatusMark, type Status } from "@/components/ui/status-mark";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import type { NodeKind } from "@/lib/chain/types";
import { fmt, fmtVolts } from "@/components/editor/format";
import { marginOf } from "@/components/editor/stage-figures";

export interface HeadroomRow {
  id: string;
  name: string;
  kind: NodeKind;
  status: Status | null;
  dcMin: number | null;
  dcMax: number | null;
  peakMin: number | null;
  peakMax: number | null;
  low: number | null;
  high: number | null;
  margin: number | null;
  share: number | null;
  slew: number | null;
}

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
  return useMemo(() => {
    if (!live?.chain) return [];
    const rows: HeadroomRow[] = [];
    for (const n of live.chain.nodes) {
      const name = n.label ? `${n.id} ${n.label}` : n.id;
      const s = live.stageById[n.id];
      if (s && s.status) {
        const m = marginOf(s);
        rows.push({
          id: n.id, name, kind: n.kind, status: s.status,
          dcMin: s.dcOut?.min ?? null, dcMax: s.dcOut?.max ?? null,
          peakMin: s.peakOut?.min ?? null, peakMax: s.peakOut?.max ?? null,
          low: s.usable?.low ?? null, high: s.usable?.high ?? null,
          margin: m?.volts ?? null, share: m?.share ?? null, slew: s.slewNeeded ?? null,
        });
      }
      const a = live.adcById[n.id] as (typeof live.adcById)[string] & { dcIn?: { min: number; max: number } | null; peakIn?: { min: number; max: number } | null };
      if (a && n.kind === "adc") {
        const m = a.peakIn ? marginOf({ peakOut: a.peakIn, usable: { low: n.params.vinLow, high: n.params.vinHigh } }) : null;
        rows.push({
          id: n.id, name, kind: n.kind, status: a.status,
          dcMin: a.dcIn?.min ?? null, dcMax: a.dcIn?.max ?? null,
          peakMin: a.peakIn?.min ?? null, peakMax: a.peakIn?.max ?? null,
          low: n.params.vinLow, high: n.params.vinHigh,
          margin: m?.volts ?? null, share: m?.share ?? null, slew: null,
        });
      }
    }
    return rows;
  }, [live]);
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
