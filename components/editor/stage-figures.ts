/** Figures the workspace derives from an engine stage result (display only; the engine decides status). */
export { marginOf } from "@/lib/handoff/headroom";
