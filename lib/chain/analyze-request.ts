/**
 * "Request in, analysis or errors out": the one piece shared by `POST /api/analyze` and
 * `npm run analyze`, so both refuse the same input with the same `{path, message}` list and return the
 * same `chainwright.analysis/1` object (chain-format.md, "Analysis result").
 */
import { analyzeChain } from "../engine";
import type { AnalysisResult, AnalyzeOptions, Chain, ChainIssue } from "./types";
import { describeFound, meetsRule, numberMessage, type NumberRule } from "./fields";
import { isPlainObject } from "./graph";
import { formatPath, validateChain } from "./schema";
import { toPlainJson } from "./plain-json";

export type AnalyzeRequestResult = { ok: true; result: AnalysisResult } | { ok: false; errors: ChainIssue[] };

export type Analyzer = (chain: Chain, opts?: AnalyzeOptions) => AnalysisResult;

/** Most frequencies one request may ask for (the same ceiling as `analysis.points`). */
export const MAX_FREQS = 20_000;

export const POINTS_RULE: NumberRule = { unit: "none", bound: "positive", integer: { min: 2, max: 20_000 } };
export const FREQ_RULE: NumberRule = { unit: "hertz", bound: "positive" };

const REQUEST_KEYS = ["chain", "freqs", "points"];

/**
 * Check the options of an analysis request: `freqs` a list of 1 to MAX_FREQS positive frequencies in Hz
 * (evaluated in the order given), `points` an integer from 2 to 20,000.
 */
export function checkOptions(freqs: unknown, points: unknown): { ok: true; opts: AnalyzeOptions } | { ok: false; errors: ChainIssue[] } {
  const errors: ChainIssue[] = [];
  const opts: AnalyzeOptions = {};
  if (freqs !== undefined) {
    if (!Array.isArray(freqs)) {
      errors.push({ path: "freqs", message: `must be a list of frequencies in hertz (found ${describeFound(freqs)})` });
    } else if (freqs.length === 0 || freqs.length > MAX_FREQS) {
      errors.push({ path: "freqs", message: `must list 1 to ${MAX_FREQS} frequencies (found ${freqs.length})` });
    } else {
      const bad = freqs.findIndex((f) => !meetsRule(f, FREQ_RULE));
      if (bad >= 0) errors.push({ path: `freqs[${bad}]`, message: numberMessage(FREQ_RULE, freqs[bad]) });
      else opts.freqs = freqs as number[];
    }
  }
  if (points !== undefined) {
    if (!meetsRule(points, POINTS_RULE)) errors.push({ path: "points", message: numberMessage(POINTS_RULE, points) });
    else opts.points = points as number;
  }
  return errors.length ? { ok: false, errors } : { ok: true, opts };
}

/**
 * Validate `{ chain, freqs?, points? }` and analyse it. Invalid input gives `{ ok: false, errors }`
 * with paths inside the chain as in chain-format.md (`nodes[1].params.r1`), and `freqs`, `points` for
 * the options. A failure of the engine itself is not the caller's input problem and is thrown.
 */
export function runAnalysis(input: unknown, analyze: Analyzer = analyzeChain): AnalyzeRequestResult {
  const copied = toPlainJson(input);
  if (!copied.ok) return { ok: false, errors: [{ path: formatPath(copied.path), message: copied.message }] };
  const body = copied.value;
  if (!isPlainObject(body)) {
    return { ok: false, errors: [{ path: "", message: `must be an object {chain, freqs?, points?} (found ${describeFound(body)})` }] };
  }
  const errors: ChainIssue[] = [];
  for (const key of Object.keys(body)) {
    if (!REQUEST_KEYS.includes(key)) {
      // an empty key still needs a visible name in the error
      errors.push({ path: key === "" ? '[""]' : key, message: `is not a field of an analysis request; the fields are ${REQUEST_KEYS.join(", ")}` });
    }
  }
  const options = checkOptions(body.freqs, body.points);
  if (!options.ok) errors.push(...options.errors);
  let chain: Chain | null = null;
  if (body.chain === undefined) {
    errors.push({ path: "chain", message: "is required: a chain document (chainwright.chain/1)" });
  } else {
    const v = validateChain(body.chain);
    if (v.ok) chain = v.chain;
    // a problem with the document as a whole (not an object, too deep) is the `chain` field's
    else errors.push(...v.errors.map((e) => (e.path ? e : { ...e, path: "chain" })));
  }
  if (errors.length || !chain || !options.ok) return { ok: false, errors };
  return { ok: true, result: analyze(chain, options.opts) };
}
