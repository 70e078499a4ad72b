"use client";
/**
 * A small mark on each stage card that has open comment threads, drawn in the canvas's own coordinate
 * space (React Flow's viewport portal) so it follows the card when the view pans or zooms. Clicking it
 * selects the stage and opens its threads.
 */
import { useNodes, ViewportPortal } from "@xyflow/react";
import type { ThreadData } from "@/components/review/queries";

export function CommentMarkers({ threads, onOpen }: { threads: ThreadData[]; onOpen: (nodeId: string) => void }) {
  const nodes = useNodes();
  const open = new Map<string, number>();
  for (const t of threads) if (t.nodeId && !t.resolvedAt) open.set(t.nodeId, (open.get(t.nodeId) ?? 0) + 1);
  if (open.size === 0) return null;
  return (
    <ViewportPortal>
      {nodes
        .filter((n) => open.has(n.id))
        .map((n) => {
          const width = n.measured?.width ?? n.width ?? 180;
          const count = open.get(n.id)!;
          return (
            <button
              key={n.id}
              type="button"
              data-testid="comment-marker"
              data-node={n.id}
              onClick={() => onOpen(n.id)}
              title={`${count} open comment thread${count === 1 ? "" : "s"} on ${n.id}`}
              aria-label={`${count} open comment thread${count === 1 ? "" : "s"} on ${n.id}`}
              className="nodrag nopan absolute flex items-center gap-0.5 rounded-full border border-accent-600 bg-paper-raised px-1.5 text-[11px] font-medium text-accent-700 shadow-card hover:bg-accent-50"
              style={{ transform: `translate(${n.position.x + width - 14}px, ${n.position.y - 10}px)`, pointerEvents: "all" }}
            >
              <span aria-hidden="true">✎</span>
              <span className="num">{count}</span>
            </button>
          );
        })}
    </ViewportPortal>
  );
}
