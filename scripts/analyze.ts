/**
 * `npm run -s analyze -- FILE.json [--freq 10,100,1e3] [--points N] [--trials N [--seed S]]`: the analysis of a complete chain as
 * one JSON document on stdout (chain-format.md, "Analysis result").
 * `--waveform DATA.csv [--sample-rate R] [--out OUT.csv]`: a recorded source waveform through the chain,
 * every node's output as CSV (lib/waveform-csv, lib/engine/time-domain.ts). Thin on purpose: arguments, reading
 * the file, then the same runAnalysis the API route uses.
 *
 * Exit 0 when the analysis ran, 2 for invalid input ({"errors":[{path,message}]} on stderr, nothing on
 * stdout), 1 when the analysis itself failed.
 */
import { readFileSync, writeFileSync } from "node:fs";
import { validateChain } from "../lib/chain/schema";
import { planTimeDomain } from "../lib/engine/time-domain";
import { problemText, readWaveformCsv, tracesCsv } from "../lib/waveform-csv";
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
  if (parsed.args.waveform !== undefined) return waveformRun(doc, parsed.args.waveform, parsed.args.sampleRate, parsed.args.out);
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

/** The recording through the chain: CSV of every node's output, a clip summary when it goes to a file. */
function waveformRun(doc: unknown, csvFile: string, sampleRate: number | undefined, out: string | undefined): void {
  const v = validateChain(doc);
  if (!v.ok) return refuse(v.errors);
  const input = readInput(csvFile);
  if (!input.ok) return refuse([{ path: "--waveform", message: input.error.message }]);
  const rec = readWaveformCsv(input.text, { sampleRate: sampleRate ?? null });
  if (!rec.ok) {
    const more = rec.errorCount > rec.errors.length ? [{ path: "--waveform", message: `and ${rec.errorCount - rec.errors.length} more problems` }] : [];
    return refuse([...rec.errors.map((e) => ({ path: e.column === "sampleRate" ? "--sample-rate" : "--waveform", message: problemText(e) })), ...more]);
  }
  let run;
  try {
    run = planTimeDomain(v.chain, rec.data.sampleRate).run(rec.data.values);
  } catch (e) {
    return refuse([{ path: "", message: `the time-domain run failed: ${(e as Error)?.message ?? String(e)}` }], 1);
  }
  const csv = tracesCsv(rec.data.sampleRate, rec.data.start, [{ name: "emf", v: run.emf }, ...run.nodes.map((n) => ({ name: n.id, v: n.v }))]);
  if (out === undefined) {
    process.stdout.write(csv);
    return;
  }
  try {
    writeFileSync(out, csv);
  } catch (e) {
    return refuse([{ path: "--out", message: `cannot be written: ${(e as Error).message}` }]);
  }
  const summary = {
    waveform: csvFile,
    out,
    sampleRate: rec.data.sampleRate,
    samples: run.samples,
    nodes: run.nodes.map((n) => ({
      id: n.id,
      kind: n.kind,
      band: n.band,
      clippedSamples: n.clippedSamples,
      clips: n.clips.map((c) => ({ side: c.side, from: rec.data.start + c.start / rec.data.sampleRate, seconds: (c.end - c.start) / rec.data.sampleRate })),
      slewLimitedSamples: n.slews.reduce((t, s) => t + s.end - s.start, 0),
    })),
  };
  process.stdout.write(`${JSON.stringify(summary)}\n`);
}

main(process.argv.slice(2));
