export { diffChains, hasChanges, summarizeDiff } from "./diff";
export type { ChainDiff, ChangeKind, PartChange, StageChange, ValueChange } from "./diff";
export { FOLD_WINDOW_MS, shouldFold } from "./fold";
export type { IncomingSave, LastRevision } from "./fold";
export { diffKeyResults, keyResults, keyResultsOf } from "./key-results";
export type { KeyResultChange, KeyResults, PathKeyResults } from "./key-results";
export { formatParam, formatPartFigure, formatValue, paramUnit } from "./values";
