/**
 * Chainwright analysis engine: pure TypeScript, no React, no Next, no I/O.
 * See README.md in this folder for the model, internal units and how to add a stage kind.
 */
export { ENGINE_VERSION } from "./version";
export { analyzeChain } from "./analyze";
export { compileChain } from "./compile-chain";
export type { CompiledChain, CompiledPath, SweepResult, TransferSource, TransferSourceType } from "./compile-chain";
export { idealCharacteristics, sallenKeyGain } from "./ideal";
export type { IdealCharacteristics } from "./ideal";
export { referenceResponse, referenceTransfer } from "./reference-path";
export { toMagnitudePhase } from "./response";
export { BOLTZMANN } from "./constants";
export { solveStage, figuresOf, sensitivities, isSolvableKind, SOLVE_TARGETS, SOLVED_PARAMS } from "./solve";
export type { SolvableKind, SolveTargets, SolveResult, SolvedSet, SolvedParams, Figures, TargetName } from "./solve";
export { designLowpass, prototypeSections, prototypePoles, prototypeMagnitude, FILTER_RESPONSES, SECTION_ORDER_RULE } from "./filter-design";
export type { FilterResponse, LowpassSpec, LowpassDesign, DesignedSection, PrototypeSection, SecondOrderKind } from "./filter-design";
export { adviseGainStaging } from "./gain-staging";
export type { AdviceOptions, GainAdvice, SplitFigures, SplitStage, StageEdit } from "./gain-staging";
export {
  MAX_SAMPLES,
  STIMULUS_KINDS,
  minMaxDecimate,
  planTimeDomain,
  runWaveform,
  stimulusWave,
} from "./time-domain";
export type { ClipSpan, NodeTrace, RunOptions, Stimulus, TimeDomainPlan, WaveformRun } from "./time-domain";
export { sourceSignal, sourceOutputOf, stageGainPerUnit, stageGainUnits, chainSourceUnit, transferPerUnit, magnitudeDbLabel, bridgeOutput, bridgeFullScaleVolts, tiaStability, differenceAmpGains, differenceAmpCmSpread } from "./sensors";
export type { SourceSignal, SourceOutput, TiaStability } from "./sensors";
