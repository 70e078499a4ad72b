/**
 * `npm run -s analyze -- FILE.json [--freq 10,100,1e3] [--points N] [--trials N [--seed S]]`: the analysis of a complete chain as
 * one JSON document on stdout (chain-format.md, "Analysis result"). Thin on purpose: arguments, reading
 * the file, then the same runAnalysis the API route uses.
 *
 * Exit 0 when the analysis ran, 2 for invalid input ({"errors":[{path,message}]} on stderr, nothing on
 * stdout), 1 when the analysis itself failed.
 */
import { readFileSync } from "node:fs";
import { parseAnalyzeArgs, USAGE } from "../lib/chain/analyze-cli";
import { runAnalysis, type Analyzer } from "../lib/chain/analyze-request";
import { analyzeChain } from "../lib/engine";
import { runSpread } from "../lib/engine/spread";
import type { ChainIssue } from "../lib/chain/types";

function refuse(errors: ChainIssue[], code = 2): void {
  process.stderr.write(`${JSON.stringify({ errors })}\n`);
  process.exitCode = code;
}

function readInput(file: string): { ok: true; text: string } | { ok: false; error: ChainIssue } {
  try {
    return { ok: true, text: readFileSync(file === "-" ? 0 : file, "utf8") };
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why =
      code === "ENOENT" ? "no such file" : code === "EISDIR" ? "it is a directory" : code === "EACCES" ? "permission denied" : String((e as Error).message);
    return { ok: false, error: { path: "file", message: `cannot be read (${why}): ${file === "-" ? "standard input" : file}` } };
  }
}

function main(argv: string[]): void {
  const parsed = parseAnalyzeArgs(argv);
  if (!parsed.ok) return refuse(parsed.errors);
  const { file, freqs, points, trials, seed, help } = parsed.args;
  if (help) {
    process.stdout.write(`${USAGE}\n`);
    return;
  }
  const input = readInput(file);
  if (!input.ok) return refuse([input.error]);
  let doc: unknown;
  try {
    doc = JSON.parse(input.text.replace(/^\uFEFF/, ""));
  } catch (e) {
    return refuse([{ path: "", message: `is not JSON (${(e as Error).message})` }]);
  }
  let outcome;
  try {
    // with --trials, the same validated chain also goes through the tolerance spread
    const analyze: Analyzer | undefined =
      trials === undefined ? undefined : (chain, opts) => ({ ...analyzeChain(chain, opts), spread: runSpread(chain, { trials, seed: seed ?? 1, points: opts?.points }) });
    outcome = runAnalysis({ chain: doc, ...(freqs ? { freqs } : {}), ...(points !== undefined ? { points } : {}) }, analyze);
  } catch (e) {
    return refuse([{ path: "", message: `the analysis failed: ${(e as Error)?.message ?? String(e)}` }], 1);
  }
  if (!outcome.ok) return refuse(outcome.errors);
  process.stdout.write(`${JSON.stringify(outcome.result)}\n`);
}

main(process.argv.slice(2));
