import { describe, expect, it } from "vitest";
import { parseAnalyzeArgs, parseFreqList } from "@/lib/chain/analyze-cli";

describe("parseAnalyzeArgs", () => {
  it("reads the file and both options, in either spelling", () => {
    expect(parseAnalyzeArgs(["chain.json"])).toEqual({ ok: true, args: { file: "chain.json" } });
    expect(parseAnalyzeArgs(["chain.json", "--freq", "10,100,1e3", "--points", "50"])).toEqual({
      ok: true,
      args: { file: "chain.json", freqs: [10, 100, 1000], points: 50 },
    });
    expect(parseAnalyzeArgs(["--points=2k", "--freq=1k,10k", "-"])).toEqual({
      ok: true,
      args: { file: "-", freqs: [1000, 10000], points: 2000 },
    });
  });

  it("refuses bad points, naming the flag", () => {
    for (const p of ["0", "1", "20001", "2.5", "abc", "-3"]) {
      const r = parseAnalyzeArgs(["c.json", "--points", p]);
      expect(r.ok, p).toBe(false);
      if (!r.ok) {
        expect(r.errors[0].path).toBe("--points");
        expect(r.errors[0].message).toMatch(/integer from 2 to 20000/);
      }
    }
  });

  it("refuses unknown flags, missing values, repeats, no file and two files", () => {
    const errs = (argv: string[]) => {
      const r = parseAnalyzeArgs(argv);
      return r.ok ? [] : r.errors;
    };
    expect(errs(["c.json", "--frequency", "1"])[0]).toMatchObject({ path: "--frequency", message: expect.stringMatching(/not an option/) });
    expect(errs(["c.json", "--freq"])[0]).toMatchObject({ path: "--freq", message: expect.stringMatching(/needs a list/) });
    expect(errs(["c.json", "--points", "5", "--points", "6"])[0].message).toMatch(/twice/);
    expect(errs([])[0]).toMatchObject({ path: "file", message: expect.stringMatching(/^is required/) });
    expect(errs(["a.json", "b.json"])[0].message).toMatch(/one document at a time/);
  });

  it("recognises --help", () => {
    const r = parseAnalyzeArgs(["--help"]);
    expect(r.ok && r.args.help).toBe(true);
  });
});

describe("parseFreqList", () => {
  it("reads plain and engineering notation, keeping the order given", () => {
    expect(parseFreqList("10,100,1e3")).toEqual({ ok: true, freqs: [10, 100, 1000] });
    expect(parseFreqList("1k, 10k,1.5MHz, 2 kHz")).toEqual({ ok: true, freqs: [1e3, 1e4, 1.5e6, 2e3] });
    expect(parseFreqList("100,10")).toEqual({ ok: true, freqs: [100, 10] });
  });

  it("refuses text, empty items, zero, negatives and other units", () => {
    expect(parseFreqList("abc")).toMatchObject({ ok: false, error: expect.stringMatching(/item 1/) });
    expect(parseFreqList("10,,100")).toMatchObject({ ok: false, error: expect.stringMatching(/item 2 is empty/) });
    expect(parseFreqList("0")).toMatchObject({ ok: false, error: expect.stringMatching(/positive number of hertz/) });
    expect(parseFreqList("-10")).toMatchObject({ ok: false, error: expect.stringMatching(/positive/) });
    expect(parseFreqList("10 V")).toMatchObject({ ok: false, error: expect.stringMatching(/volts.*hertz/) });
  });
});
