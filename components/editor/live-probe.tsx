"use client";
/**
 * Marks the moment a new live analysis is on screen in the cards (their rail spans render in the same
 * commit as this component), for the browser benchmark: `cw:spans:N` with N the analysis revision.
 */
import { useLayoutEffect } from "react";
import { useEditor } from "@/lib/store/editor-context";

export function LiveProbe() {
  const rev = useEditor((s) => s.live?.rev);
  const ms = useEditor((s) => s.live?.ms);
  useLayoutEffect(() => {
    if (rev === undefined) return;
    performance.mark(`cw:spans:${rev}`);
    // the quick tier's own time in its worker, for the benchmark's report
    document.documentElement.dataset.cwQuickMs = String(ms ?? "");
  }, [rev, ms]);
  return null;
}
