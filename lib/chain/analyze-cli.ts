/**
 * Argument parsing for `npm run analyze -- FILE.json [--freq 10,100,1e3] [--points N]`, kept apart from
 * scripts/analyze.ts so it can be tested without starting a process. Frequencies and points may be
 * written in engineering notation (`--freq 1k,10k`, `--points 2k`).
 */
import { parseQuantity } from "../units";
import type { ChainIssue } from "./types";
import { FREQ_RULE, MAX_FREQS, POINTS_RULE } from "./analyze-request";
import { meetsRule, numberMessage, ruleText, type NumberRule } from "./fields";

export interface AnalyzeArgs {
  /** a path, or "-" for standard input */
  file: string;
  freqs?: number[];
  points?: number;
  /** tolerance spread: builds and seed (the result gets a `spread` field) */
  trials?: number;
  seed?: number;
  /** time-domain run: a recorded waveform CSV through the chain; stage outputs as CSV */
  waveform?: string;
  /** sample rate of a one-column waveform file, Hz */
  sampleRate?: number;
  /** where the stage-output CSV goes (default: standard output) */
  out?: string;
  help?: boolean;
}

export const USAGE = `Usage: npm run -s analyze -- FILE.json [--freq 10,100,1e3] [--points N] [--trials N [--seed S]]
       npm run -s analyze -- FILE.json --waveform DATA.csv [--sample-rate R] [--out OUT.csv]

Analyses a complete chain document (chainwright.chain/1) and prints the analysis
(chainwright.analysis/1) as one JSON document on standard output.

  FILE.json        the chain document; - reads it from standard input
  --freq LIST      evaluate the response at exactly these frequencies in Hz,
                   comma-separated; engineering notation is fine (1k,10k,1.5MHz)
  --points N       points of the log-spaced response grid (2 to 20000),
                   instead of the document's analysis.points
  --trials N       add the tolerance spread (chainwright.spread/1) as "spread":
                   N Monte Carlo builds (1 to 100000) with every resistor and
                   capacitor uniform within its tolerance, worst-case corners
                   and sensitivities; its envelope uses the --points grid
  --seed S         seed of the spread's builds, an integer 0 to 4294967295
                   (default 1); the same seed gives the same result
  --waveform CSV   run a recorded source waveform through the chain instead:
                   CSV of time,voltage rows (or one voltage column with
                   --sample-rate); writes time and every node's output (V) as
                   CSV, each op-amp held to its usable swing and slew rate
  --sample-rate R  samples per second of a one-column waveform file (48k, 1M)
  --out FILE       write the waveform CSV to FILE and print a JSON summary of
                   where each stage clipped on standard output

Exit status: 0 when the analysis ran (whatever it found), 2 for invalid input,
with {"errors":[{"path","message"}]} on standard error, 1 if the analysis itself failed.`;

const TRIALS_RULE: NumberRule = { unit: "none", bound: "positive", integer: { min: 1, max: 100_000 } };
const SEED_RULE: NumberRule = { unit: "none", bound: "nonNegative", integer: { min: 0, max: 4_294_967_295 } };

export type ParseArgsResult = { ok: true; args: AnalyzeArgs } | { ok: false; errors: ChainIssue[] };

const OPTIONS = ["--freq", "--points", "--trials", "--seed", "--waveform", "--sample-rate", "--out"];
const SAMPLE_RATE_RULE: NumberRule = { unit: "hertz", bound: "positive" };

export function parseAnalyzeArgs(argv: readonly string[]): ParseArgsResult {
  const errors: ChainIssue[] = [];
  const files: string[] = [];
  const seen = new Set<string>();
  let freqs: number[] | undefined;
  let points: number | undefined;
  let trials: number | undefined;
  let seed: number | undefined;
  let waveform: string | undefined;
  let sampleRate: number | undefined;
  let out: string | undefined;
  let help = false;

  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--help" || arg === "-h") {
      help = true;
      continue;
    }
    if (arg === "-" || !arg.startsWith("-") || /^-\d/.test(arg)) {
      files.push(arg);
      continue;
    }
    const eq = arg.indexOf("=");
    const name = eq >= 0 ? arg.slice(0, eq) : arg;
    if (!OPTIONS.includes(name)) {
      errors.push({ path: name, message: `is not an option; the options are ${OPTIONS.join(", ")} (see --help)` });
      continue;
    }
    let value: string | undefined;
    if (eq >= 0) value = arg.slice(eq + 1);
    else if (i + 1 < argv.length) value = argv[++i];
    if (value === undefined || value === "") {
      const wants: Record<string, string> = {
        "--freq": "needs a list of frequencies, e.g. --freq 10,100,1k",
        "--waveform": "needs a CSV file, e.g. --waveform recording.csv",
        "--out": "needs a file to write, e.g. --out stages.csv",
        "--sample-rate": "needs a rate in Hz, e.g. --sample-rate 48k",
      };
      errors.push({ path: name, message: wants[name] ?? `needs a number, e.g. ${name} ${name === "--seed" ? 7 : 400}` });
      continue;
    }
    if (seen.has(name)) {
      errors.push({ path: name, message: "is given twice; give it once" });
      continue;
    }
    seen.add(name);
    if (name === "--waveform") waveform = value;
    else if (name === "--out") out = value;
    else if (name === "--sample-rate") {
      const r = parseQuantity(value, { unit: "hertz" });
      if (!r.ok) errors.push({ path: name, message: `must be ${ruleText(SAMPLE_RATE_RULE)}: ${r.error}` });
      else if (!meetsRule(r.value, SAMPLE_RATE_RULE)) errors.push({ path: name, message: numberMessage(SAMPLE_RATE_RULE, r.value) });
      else sampleRate = r.value;
    } else if (name === "--freq") {
      const r = parseFreqList(value);
      if (r.ok) freqs = r.freqs;
      else errors.push({ path: name, message: r.error });
    } else {
      const rule = name === "--trials" ? TRIALS_RULE : name === "--seed" ? SEED_RULE : POINTS_RULE;
      const r = parseQuantity(value, { unit: "none" });
      if (!r.ok) errors.push({ path: name, message: `must be ${ruleText(rule)}: ${r.error}` });
      else if (!meetsRule(r.value, rule)) errors.push({ path: name, message: numberMessage(rule, r.value) });
      else if (name === "--trials") trials = r.value;
      else if (name === "--seed") seed = r.value;
      else points = r.value;
    }
  }
  if (seed !== undefined && trials === undefined) errors.push({ path: "--seed", message: "applies to the tolerance spread: give --trials N as well" });
  if (waveform === undefined) {
    if (sampleRate !== undefined) errors.push({ path: "--sample-rate", message: "applies to a waveform file: give --waveform CSV as well" });
    if (out !== undefined) errors.push({ path: "--out", message: "applies to a waveform run: give --waveform CSV as well" });
  } else {
    for (const other of ["--freq", "--points", "--trials"]) if (seen.has(other)) errors.push({ path: other, message: "does not apply to a waveform run (--waveform)" });
  }
  if (help) return { ok: true, args: { file: files[0] ?? "", help: true } };
  if (files.length === 0) errors.push({ path: "file", message: "is required: the chain document to analyse (or - for standard input)" });
  if (files.length > 1) errors.push({ path: "file", message: `only one document at a time (found ${files.length}: ${files.join(", ")})` });
  if (errors.length) return { ok: false, errors };
  return {
    ok: true,
    args: {
      file: files[0],
      ...(freqs ? { freqs } : {}),
      ...(points !== undefined ? { points } : {}),
      ...(trials !== undefined ? { trials, seed: seed ?? 1 } : {}),
      ...(waveform !== undefined ? { waveform } : {}),
      ...(sampleRate !== undefined ? { sampleRate } : {}),
      ...(out !== undefined ? { out } : {}),
    },
  };
}

/** `10,100,1e3` or `1k, 10k, 1.5 MHz` → hertz; every item a positive frequency. */
export function parseFreqList(text: string): { ok: true; freqs: number[] } | { ok: false; error: string } {
  const items = text.split(",").map((s) => s.trim());
  if (items.length > MAX_FREQS) return { ok: false, error: `lists ${items.length} frequencies; at most ${MAX_FREQS}` };
  const freqs: number[] = [];
  for (const [i, item] of items.entries()) {
    if (item === "") return { ok: false, error: `item ${i + 1} is empty; separate frequencies with single commas` };
    const r = parseQuantity(item, { unit: "hertz" });
    if (!r.ok) return { ok: false, error: `item ${i + 1}: ${r.error}` };
    if (!meetsRule(r.value, FREQ_RULE)) return { ok: false, error: `item ${i + 1} (${item}) ${numberMessage(FREQ_RULE, r.value)}` };
    freqs.push(r.value);
  }
  return { ok: true, freqs };
}
