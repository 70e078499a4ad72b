"use client";
/**
 * Marks the moment a new live analysis is on screen in the cards (their rail spans render in the same
 * commit as this component), for the browser benchmark: `cw:spans:N` with N the analysis revision.
 */
import { useLayoutEffect } from "react";
import { useEditor } from "@/lib/store/editor-context";

export function LiveProbe() {
  const rev = useEditor((s) => s.live?.rev);
  useLayoutEffect(() => {
    if (rev !== undefined) performance.mark(`cw:spans:${rev}`);
  }, [rev]);
  return null;
}
