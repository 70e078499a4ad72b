/**
 * Live analysis of the draft while the user edits. (Types first; the driver is added once the engine's
 * fast path is in place.)
 */
import type { AdcResult, AnalysisResult, AnalysisWarning, Chain, ChainIssue, StageResult } from "@/lib/chain/types";
import type { DraftDoc } from "./draft";

export interface LiveAnalysis {
  /** the document this analysis belongs to (by reference) */
  doc: DraftDoc;
  /** the part of the draft complete enough to analyse */
  chain: Chain | null;
  /** why the rest is not analysed yet */
  issues: ChainIssue[];
  result: AnalysisResult | null;
  stageById: Record<string, StageResult>;
  adcById: Record<string, AdcResult>;
  warningsByNode: Record<string, AnalysisWarning[]>;
  /** for nodes left out of the analysis: why, in words */
  reasonById: Record<string, string>;
  /** wall time of the analysis, ms */
  ms: number;
  /** an engine failure, in words (never expected; shown rather than swallowed) */
  error: string | null;
}
