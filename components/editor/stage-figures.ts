/** Figures the workspace derives from an engine stage result (display only; the engine decides status). */
import { isSourceKind, type SourceKind } from "@/lib/chain/types";
import { useEditor } from "@/lib/store/editor-context";

export { marginOf } from "@/lib/handoff/headroom";

/** The kind of the draft's source (what a front end's gain and the path's gain are per), if it has one. */
export const useSourceKind = (): SourceKind | undefined =>
  useEditor((s) => s.doc.nodes.find((n) => isSourceKind(n.kind))?.kind as SourceKind | undefined);
