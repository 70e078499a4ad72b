"use client";
/**
 * The shelf of node kinds. Drag one onto the canvas, or press it (click, Enter, or its digit key) to
 * place it after the selected node, connected.
 */
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import { SHELF_ORDER, STAGE_CATALOG } from "@/lib/store/stage-catalog";
import { Pictogram } from "./pictograms";
import { SHELF_DRAG_TYPE } from "./flow-types";
import { SHELF_KEYS } from "./shortcuts";

export function Shelf() {
  const readOnly = useEditor((s) => s.readOnly);
  const after = useEditor((s) => (s.selected.length === 1 ? s.selected[0] : undefined));
  const actions = useEditorActions();
  return (
    <nav aria-label="Shelf of stages" className="flex flex-col gap-1 p-2" data-testid="shelf">
      <h2 className="px-1 text-[11px] font-semibold uppercase tracking-wide text-graphite-500">Shelf</h2>
      {SHELF_ORDER.map((kind) => {
        const spec = STAGE_CATALOG[kind];
        return (
          <button
            key={kind}
            type="button"
            disabled={readOnly}
            draggable={!readOnly}
            onDragStart={(e) => {
              e.dataTransfer.setData(SHELF_DRAG_TYPE, kind);
              e.dataTransfer.effectAllowed = "copy";
            }}
            onClick={() => actions.addNode(kind, undefined, { after })}
            title={SHELF_KEYS[kind] ? `${spec.blurb}. Key ${SHELF_KEYS[kind]}.` : `${spec.blurb}.`}
            data-kind={kind}
            className="group flex items-center gap-2 rounded-card border border-transparent px-1 py-1 text-left text-[12.5px] text-graphite-900 hover:border-paper-rule hover:bg-paper-raised disabled:cursor-not-allowed disabled:opacity-50"
          >
            <Pictogram kind={kind} className="shrink-0 text-graphite-700" />
            <span className="min-w-0 flex-1 leading-tight">{spec.title}</span>
            {SHELF_KEYS[kind] && (
              <kbd className="num rounded border border-paper-rule px-1 text-[10px] text-graphite-500">{SHELF_KEYS[kind]}</kbd>
            )}
          </button>
        );
      })}
    </nav>
  );
}
