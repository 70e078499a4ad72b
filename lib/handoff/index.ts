/**
 * Hand-offs built from a complete chain and its engine result: bill of materials, bring-up sheet,
 * firmware scaling, CSV of each, the spread summary of the design report. Pure (no React, no I/O); the routes and pages only serve them.
 */
export { buildBom, seriesForTolerance } from "./bom";
export type { Bom, BomGroup, BomLine, OpAmpGroup } from "./bom";
export { buildBringUpSheet, defaultTestFrequencies, nominalOf, TEST_FREQUENCY_LIMIT } from "./bring-up";
export type { BringUpSheet, TestPoint, TestPointAc } from "./bring-up";
export { buildFirmwareScaling, codeOf, measurandOf, scalingHeader, sourceVoltsOf, SCALING_FORMAT, SOURCE_QUANTITY } from "./firmware";
export type { FirmwareScaling, ScalingResult } from "./firmware";
export { bringUpSpread, withSpread, BRING_UP_SEED, BRING_UP_TRIALS } from "./bring-up-spread";
export type { BringUpSpread, PointSpread, Range } from "./bring-up-spread";
export { bomCsv, bomGroupsCsv, bringUpCsv, plotCsv, PLOT_TABLES, toCsv } from "./csv";
export type { PlotTable } from "./csv";
export { nodeTitle, signalOrder } from "./order";
export { headroomRows, marginOf } from "./headroom";
export type { HeadroomRow } from "./headroom";
export { pathCurves, safetyCalls } from "./report";
export type { CurveSet } from "./report";
export { REPORT_SPREAD, REPORT_TOP_PARTS, reportSpread, spreadSummary } from "./spread-summary";
export type { FigureSpread, SpreadSummary, StageSpread } from "./spread-summary";
