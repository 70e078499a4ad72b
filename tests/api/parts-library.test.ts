import { describe, expect, it, vi } from "vitest";
import { idContext, jsonRequest, sessionModule, signInAs } from "./session-mock";

vi.mock("@/lib/auth/session", () => sessionModule);

import { GET as list, POST as create } from "@/app/api/parts/route";
import { PUT as update } from "@/app/api/parts/[id]/route";
import { POST as importCsv } from "@/app/api/parts/import/route";
import { GET as exportCsv } from "@/app/api/parts/export/route";
import { listParts } from "@/db/queries/parts";
import { CSV_MAX_BYTES } from "@/lib/parts-csv";
import { makeTeam, makeUser } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest();

function world() {
  const engineer = makeUser("engineer");
  const teamId = makeTeam("Keel", [[engineer, "engineer"]]);
  const otherTeam = makeTeam("Elsewhere", []);
  return { engineer, teamId, otherTeam };
}

describe("the team's op-amp library", () => {
  it("creates a model checked by the part schema, refusing a bad figure by field and a taken name with 409", async () => {
    const w = world();
    signInAs(w.engineer);
    const ok = await create(jsonRequest("POST", "/api/parts", { teamId: w.teamId, name: "Precision CMOS", model: { gbw: 1e6, aol: 1e6, inputLow: -0.1 } }), undefined);
    expect(ok.status).toBe(201);
    const bad = await create(jsonRequest("POST", "/api/parts", { teamId: w.teamId, name: "Odd", model: { gbw: -1, speed: 3 } }), undefined);
    expect(bad.status).toBe(400);
    const paths = (await bad.json()).errors.map((e: { path: string }) => e.path);
    expect(paths).toEqual(expect.arrayContaining(["model.gbw"]));
    expect((await create(jsonRequest("POST", "/api/parts", { teamId: w.teamId, name: "Precision CMOS", model: {} }), undefined)).status).toBe(409);
    const { part } = await ok.json();
    const changed = await update(jsonRequest("PUT", "/x", { name: "Precision CMOS", model: { gbw: 2e6 } }), idContext(part.id));
    expect((await changed.json()).part.model).toEqual({ gbw: 2e6 });
  });

  it("previews a CSV without storing, then stores only the rows without errors", async () => {
    const w = world();
    signInAs(w.engineer);
    const csv = "name,gbw,vos\nGood A,1M,1m\nBad,fast,\nGood B,3M,\n";
    const preview = await importCsv(jsonRequest("POST", "/api/parts/import", { teamId: w.teamId, csv }), undefined);
    expect(preview.status).toBe(200);
    const p = (await preview.json()).preview;
    expect(p).toMatchObject({ valid: 2, invalid: 1 });
    expect(p.rows[1]).toMatchObject({ line: 3, errors: [{ column: "gbw" }] });
    expect(listParts(w.teamId)).toEqual([]);
    const stored = await importCsv(jsonRequest("POST", "/api/parts/import", { teamId: w.teamId, csv, commit: true }), undefined);
    expect(stored.status).toBe(201);
    expect(await stored.json()).toMatchObject({ stored: 2, skipped: 1 });
    expect(listParts(w.teamId).map((x) => x.name)).toEqual(["Good A", "Good B"]);
    // the same file again: every name is now taken, nothing is stored
    const again = await importCsv(jsonRequest("POST", "/api/parts/import", { teamId: w.teamId, csv, commit: true }), undefined);
    expect(again.status).toBe(400);
    expect(listParts(w.teamId)).toHaveLength(2);
  });

  it("refuses a file over the size limit and one without a name column", async () => {
    const w = world();
    signInAs(w.engineer);
    const big = await importCsv(jsonRequest("POST", "/api/parts/import", { teamId: w.teamId, csv: `name\n${"x".repeat(CSV_MAX_BYTES)}` }), undefined);
    expect(big.status).toBe(400);
    expect((await big.json()).errors[0]).toMatchObject({ path: "csv", message: expect.stringMatching(/kB/) });
    const noName = await importCsv(jsonRequest("POST", "/api/parts/import", { teamId: w.teamId, csv: "gbw\n1M\n" }), undefined);
    expect(noName.status).toBe(400);
  });

  it("downloads the library as CSV that imports back unchanged", async () => {
    const w = world();
    signInAs(w.engineer);
    await importCsv(jsonRequest("POST", "/api/parts/import", { teamId: w.teamId, csv: "name,label,gbw,en,notes\nLow noise,Low-noise bipolar,8M,3n,quiet\n", commit: true }), undefined);
    const res = await exportCsv(jsonRequest("GET", `/api/parts/export?teamId=${w.teamId}`), undefined);
    expect(res.headers.get("content-disposition")).toBe('attachment; filename="keel-op-amp-models.csv"');
    const text = await res.text();
    const other = makeTeam("Copy", [[w.engineer, "engineer"]]);
    await importCsv(jsonRequest("POST", "/api/parts/import", { teamId: other, csv: text, commit: true }), undefined);
    const [a] = listParts(w.teamId);
    const [b] = listParts(other);
    expect({ name: b.name, notes: b.notes, model: b.model }).toEqual({ name: a.name, notes: a.notes, model: a.model });
  });

  it("answers 404 for another team's library and 400 without a team", async () => {
    const w = world();
    signInAs(w.engineer);
    expect((await list(jsonRequest("GET", `/api/parts?teamId=${w.otherTeam}`), undefined)).status).toBe(404);
    expect((await list(jsonRequest("GET", "/api/parts"), undefined)).status).toBe(400);
  });
});
