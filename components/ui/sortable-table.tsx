import type { ReactNode } from "react";
import { flexRender, type Table } from "@tanstack/react-table";

/**
 * The framed list table of the library pages, drawn from a TanStack table the caller has set up.
 * A sortable column's header is a button that toggles the table's sorting; the arrow and aria-sort
 * say the direction. Whether sorting happens here (client row model) or on the server (manual mode)
 * is the caller's table's business, so the same shell serves both. With no rows, one spanning line
 * says so.
 */
export function SortableTable<Row>({
  table,
  caption,
  empty,
  testId,
  rowTestId,
  compact = false,
}: {
  table: Table<Row>;
  /** read by screen readers only */
  caption: string;
  /** shown across the table when there are no rows */
  empty: ReactNode;
  testId?: string;
  rowTestId?: string;
  /** tighter rows, for tables with many figure columns */
  compact?: boolean;
}) {
  const pad = compact ? "px-3 py-2" : "px-3 py-2.5";
  const rows = table.getRowModel().rows;
  return (
    <div className="overflow-x-auto rounded-card border border-paper-rule bg-paper-raised shadow-card">
      <table className="w-full text-left text-sm" data-testid={testId}>
        <caption className="sr-only">{caption}</caption>
        <thead className="border-b border-paper-rule bg-paper-sunk/60 text-xs uppercase tracking-wide text-graphite-500">
          {table.getHeaderGroups().map((g) => (
            <tr key={g.id}>
              {g.headers.map((h) => {
                const sorted = h.column.getIsSorted();
                return (
                  <th key={h.id} scope="col" className={`${pad} font-medium`} aria-sort={sorted ? (sorted === "desc" ? "descending" : "ascending") : undefined}>
                    {h.column.getCanSort() ? (
                      <button type="button" onClick={h.column.getToggleSortingHandler()} className="uppercase tracking-wide hover:text-graphite-900">
                        {flexRender(h.column.columnDef.header, h.getContext())}
                        <span aria-hidden="true">{sorted === "asc" ? " ↑" : sorted === "desc" ? " ↓" : ""}</span>
                      </button>
                    ) : (
                      flexRender(h.column.columnDef.header, h.getContext())
                    )}
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.id} className="border-b border-paper-rule last:border-b-0" data-testid={rowTestId}>
              {r.getVisibleCells().map((c) => (
                <td key={c.id} className={`${pad} text-graphite-700`}>
                  {flexRender(c.column.columnDef.cell, c.getContext())}
                </td>
              ))}
            </tr>
          ))}
          {rows.length === 0 && (
            <tr>
              <td colSpan={table.getVisibleLeafColumns().length} className="px-3 py-6 text-center text-graphite-500">
                {empty}
              </td>
            </tr>
          )}
        </tbody>
      </table>
    </div>
  );
}
