import { describe, expect, it } from "vitest";
import Papa from "papaparse";
import { CSV_COLUMNS, CSV_MAX_BYTES, CSV_MAX_ROWS, readPartsCsv, writePartsCsv } from "@/lib/parts-csv";

describe("readPartsCsv", () => {
  it("reads figures in engineering notation with or without units into SI numbers", () => {
    const p = readPartsCsv("name,gbw,aol,slewRate,vos,en,swingLow\nGeneral bipolar,1 MHz,200k,500k,2m,18n,1.5\n");
    expect(p.fileErrors).toEqual([]);
    expect(p.rows).toHaveLength(1);
    expect(p.rows[0]).toMatchObject({ line: 2, name: "General bipolar", errors: [] });
    const m = p.rows[0].model!;
    expect(m.gbw).toBeCloseTo(1e6, 6);
    expect(m.aol).toBeCloseTo(2e5, 6);
    expect(m.slewRate).toBeCloseTo(5e5, 6);
    expect(m.vos).toBeCloseTo(2e-3, 12);
    expect(m.en).toBeCloseTo(18e-9, 18);
    expect(m.swingLow).toBe(1.5);
    expect(p).toMatchObject({ valid: 1, invalid: 0 });
  });

  it("lists every bad row with the column and the reason, and keeps the good ones", () => {
    const csv = ["name,gbw,vos,inputLow", "Good one,1M,1m,-0.1", ",1M,,", "Bad gbw,fast,,", "Negative offset,1M,-2m,", "Good one,2M,,"].join("\n");
    const p = readPartsCsv(csv);
    expect(p.valid).toBe(1);
    expect(p.invalid).toBe(4);
    const byLine = Object.fromEntries(p.rows.map((r) => [r.line, r]));
    expect(byLine[2].model).toMatchObject({ gbw: 1e6, inputLow: -0.1 });
    expect(byLine[3].errors).toEqual([{ column: "name", message: "a model needs a name" }]);
    expect(byLine[4].errors).toEqual([{ column: "gbw", message: expect.any(String) }]);
    expect(byLine[5].errors[0].column).toBe("vos");
    expect(byLine[6].errors).toEqual([{ column: "name", message: "“Good one” appears on an earlier line" }]);
    for (const r of p.rows.filter((x) => x.errors.length)) expect(r.model).toBeNull();
  });

  it("refuses names the library already holds", () => {
    const p = readPartsCsv("name,gbw\nTaken,1M\n", new Set(["Taken"]));
    expect(p.rows[0].errors[0]).toEqual({ column: "name", message: "the library already has a model named “Taken”" });
  });

  it("flags a row with the wrong number of fields", () => {
    const p = readPartsCsv("name,gbw\nShort\nLong,1M,extra\n");
    expect(p.rows.some((r) => r.errors.some((e) => e.column === ""))).toBe(true);
  });

  it("refuses a file without a name column, with unknown columns, too many rows or too many bytes", () => {
    expect(readPartsCsv("model,gbw\nx,1M\n").fileErrors[0]).toMatch(/“name” column/);
    expect(readPartsCsv("name,gbww\nx,1M\n").fileErrors[0]).toMatch(/unknown column: gbww/);
    const rows = ["name", ...Array.from({ length: CSV_MAX_ROWS + 1 }, (_, i) => `m${i}`)].join("\n");
    expect(readPartsCsv(rows).fileErrors[0]).toMatch(new RegExp(`${CSV_MAX_ROWS + 1} rows`));
    expect(readPartsCsv(`name\n${"x".repeat(CSV_MAX_BYTES)}`).fileErrors[0]).toMatch(/kB/);
  });

  it("accepts headers in any case and a byte-order mark", () => {
    const p = readPartsCsv("\uFEFFName,GBW\nx,3M\n");
    expect(p.rows[0].model).toEqual({ gbw: 3e6 });
  });
});

describe("writePartsCsv", () => {
  it("writes every column and reads back to the same models", () => {
    const models = [
      { name: "Precision CMOS", notes: "rail to rail", model: { label: "Precision CMOS", gbw: 1e6, aol: 1e6, vos: 5e-5, inputLow: -0.1 } },
      { name: "Plain", notes: "", model: {} },
    ];
    const text = writePartsCsv(models);
    expect(Papa.parse<string[]>(text).data[0]).toEqual([...CSV_COLUMNS]);
    const back = readPartsCsv(text);
    expect(back.invalid).toBe(0);
    expect(back.rows.map((r) => ({ name: r.name, notes: r.notes, model: r.model }))).toEqual(models);
  });

  it("keeps a text cell that looks like a spreadsheet formula from running", () => {
    expect(writePartsCsv([{ name: "=cmd()", notes: "", model: {} }])).toContain("'=cmd()");
  });
});
