/**
 * Units at the edges: engineering notation in and out, and E-series preferred values.
 * Pure TypeScript with no dependencies, so the editor, the CLI and the server share it.
 */
export { parseQuantity, QUANTITY_UNITS, SI_PREFIX_EXPONENT, UNIT_WORDS } from "./parse";
export type { ParseOptions, ParseResult, QuantityUnit } from "./parse";
export { formatCompact, formatQuantity, UNIT_SYMBOLS } from "./format";
export { E_SERIES, E_SERIES_NAMES, nearestPreferred, neighbours } from "./eseries";
export type { ESeries } from "./eseries";
