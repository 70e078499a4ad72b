/**
 * The workspace's frame while a chain loads: the same columns, the shelf drawn from the same catalogue
 * and pictograms, and quiet placeholders where the canvas, dock and inspector will be.
 */
import { SHELF_ORDER, STAGE_CATALOG } from "@/lib/store/stage-catalog";
import { Pictogram } from "./pictograms";

export function WorkspaceFrame() {
  return (
    <div data-workspace className="flex h-[calc(100dvh-57px)] min-h-[600px] flex-col bg-paper" aria-busy="true">
      <div className="flex items-center gap-3 border-b border-paper-rule bg-paper-raised px-3 py-1.5">
        <span className="h-4 w-56 rounded bg-paper-sunk" />
        <span className="text-[12.5px] text-graphite-500">Loading the chain…</span>
      </div>
      <div className="grid min-h-0 flex-1 grid-cols-[156px_minmax(0,1fr)_316px]">
        <aside className="border-r border-paper-rule bg-paper-sunk/40 p-2">
          <p className="px-1 text-[11px] font-semibold uppercase tracking-wide text-graphite-500">Shelf</p>
          {SHELF_ORDER.map((k) => (
            <div key={k} className="flex items-center gap-2 px-1 py-1 text-[12.5px] text-graphite-400">
              <Pictogram kind={k} className="text-graphite-300" />
              {STAGE_CATALOG[k].title}
            </div>
          ))}
        </aside>
        <div className="grid min-h-0 grid-rows-[minmax(0,1fr)_316px]">
          <div className="bg-[radial-gradient(#d6d2c8_1px,transparent_1px)] [background-size:20px_20px]" />
          <div className="border-t border-paper-rule bg-paper-raised" />
        </div>
        <aside className="border-l border-paper-rule bg-paper-raised" />
      </div>
    </div>
  );
}
