/** Reading waveform and response CSV: every refusal names its line and column; good files read exactly. */
import { describe, expect, it } from "vitest";
import { parseAnalyzeArgs } from "@/lib/chain/analyze-cli";
import { compareResponses } from "@/lib/engine/measured-response";
import { DIFFERENCE_COLUMNS, problemText, readResponseCsv, readWaveformCsv, responseDifferenceCsv, tracesCsv } from "@/lib/waveform-csv";

const rows = (n: number, fs = 1000, f = (i: number) => Math.sin(i / 10)) => Array.from({ length: n }, (_, i) => `${i / fs},${f(i)}`).join("\n");

describe("readWaveformCsv", () => {
  it("reads time,voltage with a header; sample rate from the average step", () => {
    const r = readWaveformCsv(`time,volts\n${rows(100)}\n`);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.data.rows).toBe(100);
    expect(r.data.sampleRate).toBeCloseTo(1000, 9);
    expect(r.data.header).toEqual(["time", "volts"]);
    expect(r.data.values[10]).toBeCloseTo(Math.sin(1), 12);
  });

  it("reads one voltage column with a stated sample rate; refuses it without one", () => {
    const ok = readWaveformCsv("0.1\n0.2\n\n0.3\n", { sampleRate: 48e3 });
    expect(ok.ok && ok.data.sampleRate === 48e3 && ok.data.rows === 3).toBe(true);
    const bad = readWaveformCsv("0.1\n0.2\n");
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.errors[0]).toMatchObject({ line: null, column: "sampleRate" });
  });

  const refusals: [string, string, { line: number | null; column: string | null }, RegExp][] = [
    ["missing value", "t,v\n0,1\n0.001,\n0.002,3\n", { line: 3, column: "voltage" }, /missing/],
    ["non-numeric value", "t,v\n0,1\n0.001,abc\n", { line: 3, column: "voltage" }, /not a number/],
    ["non-numeric time", "0,1\n1e-3x,2\n", { line: 2, column: "time" }, /not a number/],
    ["non-monotonic time", "0,1\n0.001,1\n0.0005,1\n", { line: 3, column: "time" }, /not after/],
    ["repeated time", "0,1\n0.001,1\n0.001,1\n", { line: 3, column: "time" }, /not after/],
    ["uneven sampling", "0,1\n0.001,1\n0.002,1\n0.0035,1\n0.004,1\n", { line: 5, column: null }, /uneven/],
    ["wrong column count", "0,1\n0.001,1,7\n", { line: 2, column: null }, /3 values/],
    ["three columns", "0,1,2\n", { line: 1, column: null }, /one column/],
  ];
  for (const [what, text, where, msg] of refusals) {
    it(`refuses ${what}, naming the line`, () => {
      const r = readWaveformCsv(text);
      expect(r.ok).toBe(false);
      if (r.ok) return;
      const hit = r.errors.find((e) => e.line === where.line && (where.column === null || e.column === where.column));
      expect(hit, JSON.stringify(r.errors)).toBeDefined();
      expect(problemText(hit!)).toMatch(msg);
    });
  }

  it("holds uneven sampling to the stated tolerance", () => {
    const text = "0,1\n0.001,1\n0.00202,1\n0.003,1\n";
    expect(readWaveformCsv(text).ok).toBe(false); // 2 % off at 1 %
    expect(readWaveformCsv(text, { tolerance: 0.05 }).ok).toBe(true);
  });

  it("refuses too many rows and too large a file", () => {
    const many = readWaveformCsv(rows(30), { maxRows: 20 });
    expect(many.ok).toBe(false);
    if (!many.ok) expect(many.errors[0].line).toBe(21);
    const big = readWaveformCsv(rows(1000), { maxBytes: 1000 });
    expect(big.ok).toBe(false);
    if (!big.ok) expect(big.errors[0].message).toMatch(/MB/);
  });

  it("lists at most 50 problems and counts them all", () => {
    const text = `t,v\n${Array.from({ length: 80 }, (_, i) => `${i},x`).join("\n")}`;
    const r = readWaveformCsv(text);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors.length).toBe(50);
      expect(r.errorCount).toBe(80);
    }
  });
});

describe("readResponseCsv", () => {
  it("reads frequency, magnitude dB, phase deg", () => {
    const r = readResponseCsv("f,dB,deg\n10,0,-1\n100,-0.5,-10\n1000,-3,-90\n");
    expect(r.ok && Array.from(r.data.magDb)).toEqual([0, -0.5, -3]);
  });
  it("refuses frequencies that are not positive or not increasing, and missing phase", () => {
    const a = readResponseCsv("10,0,0\n10,0,0\n");
    expect(!a.ok && a.errors[0]).toMatchObject({ line: 2, column: "frequency" });
    const b = readResponseCsv("0,0,0\n");
    expect(!b.ok && b.errors[0]).toMatchObject({ line: 1, column: "frequency" });
    const c = readResponseCsv("10,0,\n");
    expect(!c.ok && c.errors[0]).toMatchObject({ line: 1, column: "phase" });
  });
});

describe("stage outputs as CSV and the --waveform arguments", () => {
  it("writes time and one column per trace", () => {
    expect(tracesCsv(10, 0.5, [{ name: "a", v: [1, 2] }, { name: "b", v: [3, 4] }])).toBe("time,a,b\n0.5,1,3\n0.6,2,4\n");
  });
  it("parses --waveform, --sample-rate and --out, and refuses them out of place", () => {
    expect(parseAnalyzeArgs(["c.json", "--waveform", "d.csv", "--sample-rate", "48k", "--out", "o.csv"])).toEqual({
      ok: true,
      args: { file: "c.json", waveform: "d.csv", sampleRate: 48000, out: "o.csv" },
    });
    const r = parseAnalyzeArgs(["c.json", "--out", "o.csv"]);
    expect(r.ok || r.errors.map((e) => e.path)).toEqual(["--out"]);
    const t = parseAnalyzeArgs(["c.json", "--waveform", "d.csv", "--trials", "5"]);
    expect(t.ok || t.errors.map((e) => e.path)).toEqual(["--trials"]);
  });
});

describe("responseDifferenceCsv", () => {
  it("writes both responses and the difference per measured frequency, blank where there is none, and reads back", () => {
    // computed: a flat −6 dB, −90° over 10 Hz … 10 kHz; measured 1 dB above it, one point outside the grid
    const computed = { f: [10, 100, 1000, 10000], db: [-6, -6, -6, -6], ph: [-90, -90, -90, -90] };
    const measured = readResponseCsv("frequency,magnitude,phase\n31.6,-5,-88\n1000,-5,-95\n20000,-5,-90\n");
    if (!measured.ok) throw new Error("fixture");
    const d = compareResponses({ f: measured.data.freqs, db: measured.data.magDb, ph: measured.data.phaseDeg }, computed);
    const csv = responseDifferenceCsv(d);
    const lines = csv.trim().split("\n");
    expect(lines[0]).toBe(DIFFERENCE_COLUMNS.join(","));
    expect(lines[1].split(",").map(Number)).toEqual([31.6, -5, -88, -6, -90, 1, 2]);
    expect(lines[2].split(",").map(Number)).toEqual([1000, -5, -95, -6, -90, 1, -5]);
    expect(lines[3]).toBe("20000,-5,-90,,,,");
  });
});
