import { describe, expect, it } from "vitest";
import { CURRENT_VERSION, migrateChain, readFormat } from "@/lib/chain/migrate";

describe("readFormat", () => {
  it("recognises version 1", () => {
    expect(readFormat("chainwright.chain/1")).toEqual({ ok: true, version: 1 });
    expect(CURRENT_VERSION).toBe(1);
  });

  it("refuses future versions, naming the version, and versions that never existed", () => {
    const r = readFormat("chainwright.chain/7");
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/version 7 .*newer .*up to version 1/);
    const zero = readFormat("chainwright.chain/0");
    expect(!zero.ok && zero.message).toMatch(/never existed/);
  });

  it("refuses other strings and non-strings", () => {
    for (const f of ["chainwright.chain/", "chainwright.chain/1.0", "Chainwright.chain/1", "chainwright.analysis/1", "", "x".repeat(500)]) {
      const r = readFormat(f);
      expect(r.ok, f).toBe(false);
      if (!r.ok) expect(r.message.length).toBeLessThan(200);
    }
    expect(readFormat(1).ok).toBe(false);
    expect(readFormat(undefined)).toEqual({ ok: false, message: 'is required: "chainwright.chain/1"' });
  });
});

describe("migrateChain", () => {
  it("passes a version-1 document through untouched", () => {
    const doc = { format: "chainwright.chain/1", name: "x", nodes: [], edges: [] };
    const r = migrateChain(doc);
    expect(r).toEqual({ ok: true, doc, from: 1 });
    if (r.ok) expect(r.doc).toBe(doc);
  });

  it("stops a newer or foreign format with one error on `format`", () => {
    expect(migrateChain({ format: "chainwright.chain/2" })).toEqual({
      ok: false,
      errors: [{ path: "format", message: expect.stringMatching(/newer/) }],
    });
    expect(migrateChain({ format: 3 }).ok).toBe(false);
  });

  it("leaves input without a format (or not an object) for the schema to report in full", () => {
    expect(migrateChain({ name: "x" }).ok).toBe(true);
    expect(migrateChain("text").ok).toBe(true);
    expect(migrateChain(null).ok).toBe(true);
  });
});
