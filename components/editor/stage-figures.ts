/** Figures the workspace derives from an engine stage result (display only; the engine decides status). */
import type { StageResult } from "@/lib/chain/types";

/**
 * Spare output swing at the tighter end: min(peak.min − usable.low, usable.high − peak.max), in volts
 * and as a share of the usable span. Negative means past the usable swing. Null when unknown.
 */
export function marginOf(stage: Pick<StageResult, "peakOut" | "usable">): { volts: number; share: number } | null {
  const p = stage.peakOut;
  const u = stage.usable;
  if (!p || !u || !(u.high > u.low)) return null;
  const volts = Math.min(p.min - u.low, u.high - p.max);
  return { volts, share: volts / (u.high - u.low) };
}
