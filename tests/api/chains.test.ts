import { describe, expect, it, vi } from "vitest";
import { idContext, jsonRequest, sessionModule, signInAs } from "./session-mock";

vi.mock("@/lib/auth/session", () => sessionModule);

import { DELETE, GET as getOne, PUT } from "@/app/api/chains/[id]/route";
import { GET as list, POST as create } from "@/app/api/chains/route";
import { getChainRow } from "@/db/queries/chains";
import { draftDocument, makeChain, makeTeam, makeUser, share } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest(() => signInAs(null));

function world() {
  const admin = makeUser("admin");
  const engineer = makeUser("engineer");
  const other = makeUser("other");
  const reviewer = makeUser("reviewer");
  const outsider = makeUser("outsider");
  const teamId = makeTeam("Keel", [
    [admin, "admin"],
    [engineer, "engineer"],
    [other, "engineer"],
    [reviewer, "reviewer"],
  ]);
  const chainId = makeChain(teamId, engineer, "Channel A");
  return { admin, engineer, other, reviewer, outsider, teamId, chainId };
}

describe("GET /api/chains", () => {
  it("answers 401 with a JSON body when signed out", async () => {
    const res = await list(jsonRequest("GET", "/api/chains"), undefined);
    expect(res.status).toBe(401);
    expect(await res.json()).toEqual({ error: expect.any(String) });
  });

  it("lists what each user may see, with their role", async () => {
    const w = world();
    share(w.chainId, w.outsider, "viewer");
    signInAs(w.reviewer);
    const asReviewer = await (await list(jsonRequest("GET", "/api/chains"), undefined)).json();
    expect(asReviewer.chains).toEqual([
      expect.objectContaining({ id: w.chainId, name: "Channel A", role: "reviewer", team: { id: w.teamId, name: "Keel" } }),
    ]);
    signInAs(w.outsider);
    const asOutsider = await (await list(jsonRequest("GET", "/api/chains"), undefined)).json();
    expect(asOutsider.chains).toEqual([expect.objectContaining({ id: w.chainId, role: "viewer", actions: ["view", "export"] })]);
    signInAs(makeUser("nobody"));
    expect((await (await list(jsonRequest("GET", "/api/chains"), undefined)).json()).chains).toEqual([]);
  });

  it("with a query answers one searched page with its total, and refuses a bad filter by name", async () => {
    const w = world();
    makeChain(w.teamId, w.engineer, "Channel B");
    makeChain(w.teamId, w.engineer, "Spare");
    signInAs(w.engineer);
    const res = await list(jsonRequest("GET", "/api/chains?q=channel&sort=name&dir=asc&pageSize=1"), undefined);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body).toMatchObject({ total: 2, page: 1, pageSize: 1 });
    expect(body.chains).toEqual([expect.objectContaining({ name: "Channel A", team: { id: w.teamId, name: "Keel" }, role: "owner", archived: false })]);
    // With no direction given the API orders names A to Z, as the library page does.
    const byName = await (await list(jsonRequest("GET", "/api/chains?q=channel&sort=name"), undefined)).json();
    expect(byName.chains.map((c: { name: string }) => c.name)).toEqual(["Channel A", "Channel B"]);
    const bad = await list(jsonRequest("GET", "/api/chains?reviewState=lost"), undefined);
    expect(bad.status).toBe(400);
    expect((await bad.json()).errors.map((e: { path: string }) => e.path)).toEqual(["reviewState"]);
  });
});

describe("POST /api/chains", () => {
  it("creates a chain in the caller's team and makes them owner", async () => {
    const w = world();
    signInAs(w.other);
    const res = await create(jsonRequest("POST", "/api/chains", { name: "New channel" }), undefined);
    expect(res.status).toBe(201);
    const { chain } = await res.json();
    expect(chain).toMatchObject({ name: "New channel", teamId: w.teamId, version: 1, role: "owner" });
    expect(chain.document).toMatchObject({ format: "chainwright.chain/1", name: "New channel" });
    expect(res.headers.get("location")).toBe(`/api/chains/${chain.id}`);
  });

  it("takes a draft document and writes the request's name into it", async () => {
    const w = world();
    signInAs(w.engineer);
    const res = await create(jsonRequest("POST", "/api/chains", { name: "Renamed", document: draftDocument("Old") }), undefined);
    expect(res.status).toBe(201);
    const { chain } = await res.json();
    expect(chain.name).toBe("Renamed");
    expect(chain.document.name).toBe("Renamed");
  });

  it("answers 400 naming the field for a bad document", async () => {
    const w = world();
    signInAs(w.engineer);
    const doc = { ...draftDocument("Bad"), nodes: [{ id: "u1", kind: "inverting", params: { r1: -5 } }] };
    const res = await create(jsonRequest("POST", "/api/chains", { document: doc }), undefined);
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.errors).toEqual(expect.arrayContaining([expect.objectContaining({ path: expect.stringMatching(/^document\.nodes\[0\]/) })]));
  });

  it("answers 400 for malformed JSON, a wrong type and an empty name", async () => {
    const w = world();
    signInAs(w.engineer);
    const broken = await create(jsonRequest("POST", "/api/chains", undefined, "{not json"), undefined);
    expect(broken.status).toBe(400);
    expect((await broken.json()).errors[0].message).toMatch(/not valid JSON/);
    const wrongType = await create(jsonRequest("POST", "/api/chains", { name: 42 }), undefined);
    expect(wrongType.status).toBe(400);
    expect((await wrongType.json()).errors[0].path).toBe("name");
    const empty = await create(jsonRequest("POST", "/api/chains", { name: "   " }), undefined);
    expect(empty.status).toBe(400);
    const array = await create(jsonRequest("POST", "/api/chains", [1, 2]), undefined);
    expect(array.status).toBe(400);
  });

  it("refuses a team reviewer (403) and a team the caller is not in (404)", async () => {
    const w = world();
    signInAs(w.reviewer);
    expect((await create(jsonRequest("POST", "/api/chains", { name: "x" }), undefined)).status).toBe(403);
    expect((await create(jsonRequest("POST", "/api/chains", { name: "x", teamId: w.teamId }), undefined)).status).toBe(403);
    signInAs(w.outsider);
    expect((await create(jsonRequest("POST", "/api/chains", { name: "x", teamId: w.teamId }), undefined)).status).toBe(404);
  });

  it("answers 413 for a body over 1 MB", async () => {
    const w = world();
    signInAs(w.engineer);
    const res = await create(jsonRequest("POST", "/api/chains", { name: "x", notes: "n".repeat(1_100_000) }), undefined);
    expect(res.status).toBe(413);
  });
});

describe("GET /api/chains/:id", () => {
  it("returns the document and the caller's actions; 404 for those who may not see it", async () => {
    const w = world();
    signInAs(w.other);
    const res = await getOne(jsonRequest("GET", `/api/chains/${w.chainId}`), idContext(w.chainId));
    expect(res.status).toBe(200);
    const { chain } = await res.json();
    expect(chain).toMatchObject({ id: w.chainId, role: "viewer", actions: ["view", "export"], version: 1 });
    expect(chain.document.name).toBe("Channel A");
    signInAs(w.outsider);
    expect((await getOne(jsonRequest("GET", `/api/chains/${w.chainId}`), idContext(w.chainId))).status).toBe(404);
    signInAs(w.engineer);
    expect((await getOne(jsonRequest("GET", "/api/chains/nope"), idContext("nope"))).status).toBe(404);
  });
});

describe("PUT /api/chains/:id", () => {
  it("saves from the current version and bumps it", async () => {
    const w = world();
    signInAs(w.engineer);
    const res = await PUT(
      jsonRequest("PUT", `/api/chains/${w.chainId}`, { baseVersion: 1, document: draftDocument("Channel A2"), summary: "rename" }),
      idContext(w.chainId),
    );
    expect(res.status).toBe(200);
    expect((await res.json()).chain).toMatchObject({ version: 2, name: "Channel A2" });
  });

  it("lets exactly one of two saves from the same version through; the other gets 409 and the current version", async () => {
    const w = world();
    signInAs(w.engineer); // e.g. the same chain open in two tabs
    const first = PUT(jsonRequest("PUT", "/x", { baseVersion: 1, document: draftDocument("Tab one") }), idContext(w.chainId));
    const second = PUT(jsonRequest("PUT", "/x", { baseVersion: 1, document: draftDocument("Tab two") }), idContext(w.chainId));
    const statuses = (await Promise.all([first, second])).map((r) => r.status).sort();
    expect(statuses).toEqual([200, 409]);
    const stale = await PUT(jsonRequest("PUT", "/x", { baseVersion: 1, document: draftDocument("Late") }), idContext(w.chainId));
    expect(stale.status).toBe(409);
    expect(await stale.json()).toMatchObject({ currentVersion: 2, baseVersion: 1, error: expect.stringMatching(/saved this chain/) });
    expect(getChainRow(w.chainId)?.version).toBe(2);
  });

  it("refuses viewers (403), validates the body (400) and writes nothing on refusal", async () => {
    const w = world();
    signInAs(w.other);
    const refused = await PUT(jsonRequest("PUT", "/x", { baseVersion: 1, document: draftDocument("x") }), idContext(w.chainId));
    expect(refused.status).toBe(403);
    signInAs(w.engineer);
    const noVersion = await PUT(jsonRequest("PUT", "/x", { document: draftDocument("x") }), idContext(w.chainId));
    expect(noVersion.status).toBe(400);
    expect((await noVersion.json()).errors[0].path).toBe("baseVersion");
    const badDoc = await PUT(jsonRequest("PUT", "/x", { baseVersion: 1, document: { format: "something/9" } }), idContext(w.chainId));
    expect(badDoc.status).toBe(400);
    expect(getChainRow(w.chainId)).toMatchObject({ version: 1, name: "Channel A" });
  });
});

describe("DELETE /api/chains/:id", () => {
  it("is for owners and team admins only", async () => {
    const w = world();
    share(w.chainId, w.other, "editor");
    signInAs(w.other);
    expect((await DELETE(jsonRequest("DELETE", "/x"), idContext(w.chainId))).status).toBe(403);
    signInAs(w.admin);
    const res = await DELETE(jsonRequest("DELETE", "/x"), idContext(w.chainId));
    expect(res.status).toBe(200);
    expect(getChainRow(w.chainId)).toBeUndefined();
    expect((await DELETE(jsonRequest("DELETE", "/x"), idContext(w.chainId))).status).toBe(404);
  });
});
