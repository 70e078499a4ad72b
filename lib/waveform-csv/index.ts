/**
 * Reading recorded waveforms and measured responses from CSV (papaparse), shared by the browser (in a
 * worker, for the preview), the upload routes (which check again before storing anything) and the
 * command line. Pure: no I/O, no DOM.
 *
 * Waveform: one row per sample, either `time, voltage` (seconds, volts) or one `voltage` column with
 * the sample rate given beside the file. An optional first line of column names is recognised by a
 * value that is not a number. Times must increase and be evenly spaced: every step within `tolerance`
 * (a fraction, default 1 %) of the average step. The sample rate is 1/average step.
 *
 * Measured response: `frequency, magnitude, phase` (Hz, dB, degrees), frequencies positive and
 * increasing.
 *
 * Problems name their line (1 = the first line of the file) and column; at most `MAX_LISTED` are
 * listed, with the total count.
 */
import Papa from "papaparse";

export const WAVEFORM_LIMITS = {
  /** bytes of CSV text */
  maxBytes: 24 * 1024 * 1024,
  /** rows of samples (the time-domain engine's largest record) */
  maxRows: 1_000_000,
  /** default allowed deviation of a time step from the average, as a fraction */
  tolerance: 0.01,
} as const;

export const RESPONSE_LIMITS = { maxBytes: 2 * 1024 * 1024, maxRows: 20_000 } as const;

export const MAX_LISTED = 50;

export interface CsvProblem {
  /** 1-based line of the file; null for the file as a whole */
  line: number | null;
  /** column name ("time", "voltage", "frequency", "magnitude", "phase", "sampleRate") or null */
  column: string | null;
  message: string;
}

export type CsvResult<T> = { ok: true; data: T } | { ok: false; errors: CsvProblem[]; errorCount: number };

export interface WaveformData {
  /** samples per second */
  sampleRate: number;
  /** time of the first sample, s (0 for a one-column file) */
  start: number;
  values: Float64Array;
  rows: number;
  columns: 1 | 2;
  /** the column names line, when the file has one */
  header: string[] | null;
}

export interface ResponseData {
  freqs: Float64Array;
  magDb: Float64Array;
  phaseDeg: Float64Array;
  rows: number;
  header: string[] | null;
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function byteLength(text: string): number {
  let n = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c < 0x80) n += 1;
    else if (c < 0x800) n += 2;
    else if (c >= 0xd800 && c < 0xdc00) {
      n += 4;
      i++;
    } else n += 3;
  }
  return n;
}

class Problems {
  list: CsvProblem[] = [];
  count = 0;
  add(line: number | null, column: string | null, message: string) {
    this.count++;
    if (this.list.length < MAX_LISTED) this.list.push({ line, column, message });
  }
  fail<T>(): CsvResult<T> {
    return { ok: false, errors: this.list, errorCount: this.count };
  }
}

/** Rows of cells with their 1-based line numbers, blank lines dropped, the header split off. */
function table(text: string, maxBytes: number, maxRows: number, p: Problems): { rows: string[][]; lines: number[]; header: string[] | null } | null {
  const bytes = text.length > maxBytes ? text.length : byteLength(text);
  if (bytes > maxBytes) {
    p.add(null, null, `the file is ${(bytes / 1048576).toFixed(1)} MB; at most ${maxBytes / 1048576} MB is accepted`);
    return null;
  }
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ""), { skipEmptyLines: false, delimitersToGuess: [",", "\t", ";", " "] });
  const rows: string[][] = [];
  const lines: number[] = [];
  parsed.data.forEach((cells, i) => {
    if (cells.every((c) => c.trim() === "")) return;
    rows.push(cells.map((c) => c.trim()));
    lines.push(i + 1);
  });
  let header: string[] | null = null;
  if (rows.length && rows[0].some((c) => c !== "" && !NUMBER.test(c))) {
    header = rows.shift()!;
    lines.shift();
  }
  if (!rows.length) {
    p.add(null, null, "the file has no rows of numbers");
    return null;
  }
  if (rows.length > maxRows) {
    p.add(lines[maxRows], null, `the file has ${rows.length} rows of numbers; at most ${maxRows} are accepted (line ${lines[maxRows]} is the first over the limit)`);
    return null;
  }
  return { rows, lines, header };
}

/** Reads each row's cells as numbers into columns; problems by line and column name. */
function numbers(t: { rows: string[][]; lines: number[] }, names: string[], p: Problems): Float64Array[] {
  const cols = names.map(() => new Float64Array(t.rows.length));
  t.rows.forEach((cells, r) => {
    const line = t.lines[r];
    if (cells.length !== names.length) {
      p.add(line, null, `${cells.length} value${cells.length === 1 ? "" : "s"} on this line; expected ${names.length} (${names.join(", ")})`);
      return;
    }
    cells.forEach((c, k) => {
      if (c === "") p.add(line, names[k], "missing value");
      else if (!NUMBER.test(c)) p.add(line, names[k], `“${c.length > 24 ? `${c.slice(0, 24)}…` : c}” is not a number`);
      else {
        const v = Number(c);
        if (!Number.isFinite(v)) p.add(line, names[k], `${c} is out of range`);
        else cols[k][r] = v;
      }
    });
  });
  return cols;
}

export interface WaveformOptions {
  /** required for a one-column file; ignored (the times decide) for two columns */
  sampleRate?: number | null;
  /** allowed deviation of each time step from the average, fraction (default 1 %) */
  tolerance?: number;
  maxRows?: number;
  maxBytes?: number;
}

export function readWaveformCsv(text: string, opts: WaveformOptions = {}): CsvResult<WaveformData> {
  const p = new Problems();
  const tol = opts.tolerance ?? WAVEFORM_LIMITS.tolerance;
  if (!(tol > 0 && tol < 1)) {
    p.add(null, "tolerance", "the sampling tolerance must be a fraction between 0 and 1 (e.g. 0.01 for 1 %)");
    return p.fail();
  }
  const t = table(text, opts.maxBytes ?? WAVEFORM_LIMITS.maxBytes, opts.maxRows ?? WAVEFORM_LIMITS.maxRows, p);
  if (!t) return p.fail();
  const width = t.rows[0].length;
  if (width < 1 || width > 2) {
    p.add(t.lines[0], null, `${width} values on the first row; a waveform has one column (voltage, with a sample rate) or two (time, voltage)`);
    return p.fail();
  }
  if (width === 1) {
    const fs = opts.sampleRate;
    if (typeof fs !== "number" || !(fs > 0) || !Number.isFinite(fs)) {
      p.add(null, "sampleRate", "a one-column file needs its sample rate in Hz (a positive number)");
      return p.fail();
    }
    const [v] = numbers(t, ["voltage"], p);
    if (p.count) return p.fail();
    return { ok: true, data: { sampleRate: fs, start: 0, values: v, rows: v.length, columns: 1, header: t.header } };
  }
  const [time, v] = numbers(t, ["time", "voltage"], p);
  if (p.count) return p.fail();
  const n = time.length;
  if (n < 2) {
    p.add(t.lines[0], "time", "one row gives no sample rate; give at least two rows");
    return p.fail();
  }
  for (let i = 1; i < n; i++) {
    if (!(time[i] > time[i - 1])) p.add(t.lines[i], "time", `${time[i]} s is not after the previous row's ${time[i - 1]} s (times must increase)`);
  }
  if (p.count) return p.fail();
  const step = (time[n - 1] - time[0]) / (n - 1);
  for (let i = 1; i < n; i++) {
    const d = time[i] - time[i - 1];
    const off = Math.abs(d - step) / step;
    if (off > tol)
      p.add(t.lines[i], "time", `step ${d.toPrecision(4)} s from the previous row is ${(off * 100).toPrecision(3)} % off the average ${step.toPrecision(4)} s (uneven sampling; tolerance ${tol * 100} %)`);
  }
  if (p.count) return p.fail();
  return { ok: true, data: { sampleRate: 1 / step, start: time[0], values: v, rows: n, columns: 2, header: t.header } };
}

export function readResponseCsv(text: string, opts: { maxRows?: number; maxBytes?: number } = {}): CsvResult<ResponseData> {
  const p = new Problems();
  const t = table(text, opts.maxBytes ?? RESPONSE_LIMITS.maxBytes, opts.maxRows ?? RESPONSE_LIMITS.maxRows, p);
  if (!t) return p.fail();
  const [f, m, ph] = numbers(t, ["frequency", "magnitude", "phase"], p);
  if (p.count) return p.fail();
  for (let i = 0; i < f.length; i++) {
    if (!(f[i] > 0)) p.add(t.lines[i], "frequency", `${f[i]} Hz: frequencies must be positive`);
    else if (i > 0 && !(f[i] > f[i - 1])) p.add(t.lines[i], "frequency", `${f[i]} Hz is not above the previous row's ${f[i - 1]} Hz (frequencies must increase)`);
  }
  if (p.count) return p.fail();
  return { ok: true, data: { freqs: f, magDb: m, phaseDeg: ph, rows: f.length, header: t.header } };
}

/** One line per problem, for a command line or a plain-text notice. */
export function problemText(e: CsvProblem): string {
  const where = e.line === null ? (e.column ? `${e.column}: ` : "") : `line ${e.line}${e.column ? `, ${e.column}` : ""}: `;
  return `${where}${e.message}`;
}

/** Stage outputs of a run as CSV: time then one column per trace (volts), full precision. */
export function tracesCsv(sampleRate: number, start: number, columns: { name: string; v: ArrayLike<number> }[]): string {
  const n = columns.length ? columns[0].v.length : 0;
  const out: string[] = [["time", ...columns.map((c) => c.name)].join(",")];
  for (let i = 0; i < n; i++) {
    let line = String(start + i / sampleRate);
    for (const c of columns) line += `,${c.v[i]}`;
    out.push(line);
  }
  return `${out.join("\n")}\n`;
}

/** The columns of `responseDifferenceCsv`, in order. */
export const DIFFERENCE_COLUMNS = ["frequency_Hz", "measured_dB", "measured_deg", "computed_dB", "computed_deg", "difference_dB", "difference_deg"] as const;

/**
 * A measured response against the computed one as CSV: one row per measured frequency with both
 * responses and measured − computed (lib/engine/measured-response); a value the comparison could not
 * give (outside the computed grid) is left empty. Full precision.
 */
export function responseDifferenceCsv(d: { f: ArrayLike<number>; measuredDb: ArrayLike<number>; measuredDeg: ArrayLike<number>; computedDb: ArrayLike<number>; computedDeg: ArrayLike<number>; diffDb: ArrayLike<number>; diffDeg: ArrayLike<number> }): string {
  const cell = (v: number) => (Number.isFinite(v) ? String(v) : "");
  const out: string[] = [DIFFERENCE_COLUMNS.join(",")];
  for (let k = 0; k < d.f.length; k++) {
    out.push([d.f[k], d.measuredDb[k], d.measuredDeg[k], d.computedDb[k], d.computedDeg[k], d.diffDb[k], d.diffDeg[k]].map(cell).join(","));
  }
  return `${out.join("\n")}\n`;
}
