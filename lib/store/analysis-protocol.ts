/** Messages between the workspace and its analysis workers. */
import type { DraftDoc } from "./draft";
import type { FullTier, QuickTier } from "./live-analysis";

export type AnalysisRequest = { tier: "quick" | "full"; seq: number; doc: DraftDoc };
export type AnalysisResponse =
  | { tier: "quick"; seq: number; quick: QuickTier }
  | { tier: "full"; seq: number; full: FullTier };
