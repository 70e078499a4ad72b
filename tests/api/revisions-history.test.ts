import { describe, expect, it, vi } from "vitest";
import { idContext, jsonRequest, paramsContext, sessionModule, signInAs } from "./session-mock";

vi.mock("@/lib/auth/session", () => sessionModule);

import { PATCH as patchChain, PUT as save } from "@/app/api/chains/[id]/route";
import { GET as listRevisions } from "@/app/api/chains/[id]/revisions/route";
import { GET as compare } from "@/app/api/chains/[id]/revisions/compare/route";
import { POST as restore } from "@/app/api/chains/[id]/revisions/[revisionId]/restore/route";
import { getChainRow, insertChain } from "@/db/queries/chains";
import { saveChainWithHistory } from "@/db/queries/history";
import { hullVibration } from "@/db/seed-data/chains";
import { makeTeam, makeUser } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest();

const clone = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

function world() {
  const ann = makeUser("ann");
  const ben = makeUser("ben");
  const teamId = makeTeam("Keel", [
    [ann, "admin"],
    [ben, "admin"],
  ]);
  const chainId = insertChain({ teamId, name: hullVibration.name, document: hullVibration, userId: ann.id, summary: "Created" }).id;
  return { ann, ben, chainId };
}

function withGain(rf: number) {
  const doc = clone(hullVibration);
  (doc.nodes.find((n) => n.id === "gain")!.params as unknown as Record<string, number>).rf = rf;
  return doc;
}

async function put(chainId: string, document: unknown, summary?: string) {
  const res = await save(jsonRequest("PUT", "/x", { baseVersion: getChainRow(chainId)!.version, document, summary }), idContext(chainId));
  expect(res.status).toBe(200);
  return res.json();
}

async function revisions(chainId: string) {
  return (await (await listRevisions(jsonRequest("GET", "/x"), idContext(chainId))).json()).revisions as Array<{ id: string; number: number; summary: string; saves: number; author: { id: string } }>;
}

describe("revisions", () => {
  it("folds one author's consecutive autosaves into one revision, summarised against the revision before", async () => {
    const w = world();
    signInAs(w.ann);
    const first = await put(w.chainId, withGain(20e3));
    expect(first.revision.folded).toBe(false);
    const second = await put(w.chainId, withGain(30e3));
    expect(second.revision).toMatchObject({ folded: true, number: 3, id: first.revision.id });
    const list = await revisions(w.chainId);
    expect(list.map((r) => r.number)).toEqual([3, 1]);
    expect(list[0]).toMatchObject({ saves: 2, summary: "Gain ×2 (gain): rf 10.0 kΩ → 30.0 kΩ" });
    expect(getChainRow(w.chainId)!.version).toBe(3);
  });

  it("starts a new revision for another author and for a save with its own summary", async () => {
    const w = world();
    signInAs(w.ann);
    await put(w.chainId, withGain(20e3));
    signInAs(w.ben);
    await put(w.chainId, withGain(30e3));
    await put(w.chainId, withGain(40e3), "Settled on 40k");
    const list = await revisions(w.chainId);
    expect(list.map((r) => [r.number, r.author.id])).toEqual([
      [4, w.ben.id],
      [3, w.ben.id],
      [2, w.ann.id],
      [1, w.ann.id],
    ]);
    expect(list[0].summary).toBe("Settled on 40k");
  });

  it("folds only within the window", () => {
    const w = world();
    const t = Date.now();
    const at = (min: number) => new Date(t + min * 60_000);
    const s = (doc: unknown, min: number) => saveChainWithHistory({ id: w.chainId, baseVersion: getChainRow(w.chainId)!.version, name: "x", document: doc, userId: w.ann.id, worstStatus: null, now: at(min) });
    expect(s(withGain(11e3), 0)).toMatchObject({ ok: true, folded: false });
    expect(s(withGain(12e3), 4)).toMatchObject({ ok: true, folded: true });
    expect(s(withGain(13e3), 8)).toMatchObject({ ok: true, folded: true });
    expect(s(withGain(14e3), 14)).toMatchObject({ ok: true, folded: false });
  });

  it("compares two revisions: values in engineering notation and the key results", async () => {
    const w = world();
    signInAs(w.ann);
    await put(w.chainId, withGain(30e3));
    const [newer, older] = await revisions(w.chainId);
    const res = await compare(jsonRequest("GET", `/x?from=${older.id}&to=${newer.id}`), idContext(w.chainId));
    const body = await res.json();
    expect(body.changed).toBe(true);
    expect(body.diff.stages).toEqual([expect.objectContaining({ id: "gain", change: "changed", values: [{ field: "rf", old: "10.0 kΩ", new: "30.0 kΩ" }] })]);
    // gain 1 + rf/rg goes from 2 to 4 (ideal non-inverting gain, chain-format.md): the AC peak doubles, so the
    // margin to the rails shrinks; the AC coupling keeps the source-to-ADC DC gain unchanged
    const margin = body.keyResults.changes.find((c: { figure: string }) => c.figure === "worst margin");
    expect(margin).toBeDefined();
    expect(margin.old).not.toBe(margin.new);
    expect(body.keyResults.changes.some((c: { figure: string }) => c.figure === "DC gain")).toBe(false);
    expect((await compare(jsonRequest("GET", `/x?from=${older.id}`), idContext(w.chainId))).status).toBe(400);
    expect((await compare(jsonRequest("GET", `/x?from=${older.id}&to=nope`), idContext(w.chainId))).status).toBe(404);
  });

  it("restores an old revision as a new revision, refusing a stale base version", async () => {
    const w = world();
    signInAs(w.ann);
    await put(w.chainId, withGain(30e3));
    const [, first] = await revisions(w.chainId);
    const stale = await restore(jsonRequest("POST", "/x", { baseVersion: 1 }), paramsContext({ id: w.chainId, revisionId: first.id }));
    expect(stale.status).toBe(409);
    const res = await restore(jsonRequest("POST", "/x", { baseVersion: getChainRow(w.chainId)!.version }), paramsContext({ id: w.chainId, revisionId: first.id }));
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body.revision.summary).toBe("Restored revision 1");
    expect(body.chain.document.nodes.find((n: { id: string }) => n.id === "gain").params.rf).toBe(10e3);
    expect((await revisions(w.chainId)).map((r) => r.number)).toEqual([3, 2, 1]);
  });

  it("keeps the worst headroom status up to date on each save, for the library", async () => {
    const w = world();
    signInAs(w.ann);
    await put(w.chainId, withGain(10e3));
    expect(getChainRow(w.chainId)!.worstStatus).not.toBeNull();
    await put(w.chainId, withGain(10e6));
    expect(getChainRow(w.chainId)!.worstStatus).toBe("clip");
  });

  it("renames through PATCH as a revision of its own", async () => {
    const w = world();
    signInAs(w.ann);
    const res = await patchChain(jsonRequest("PATCH", "/x", { name: "Aft bay, rev B", baseVersion: 1 }), idContext(w.chainId));
    expect(res.status).toBe(200);
    expect(getChainRow(w.chainId)!.name).toBe("Aft bay, rev B");
    expect(JSON.parse(getChainRow(w.chainId)!.document).name).toBe("Aft bay, rev B");
    expect((await revisions(w.chainId))[0].summary).toBe("Renamed to “Aft bay, rev B”");
    expect((await patchChain(jsonRequest("PATCH", "/x", { name: "No base" }), idContext(w.chainId))).status).toBe(400);
  });
});
