/**
 * The hand-off routes (bill of materials, bring-up sheet, plot data, firmware scaling), chain export
 * and import: answers built from the same builders as the pages, refusals that name the field, and an
 * import that writes a whole chain or nothing.
 */
import { describe, expect, it, vi } from "vitest";
import { idContext, jsonRequest, sessionModule, signInAs } from "./session-mock";

vi.mock("@/lib/auth/session", () => sessionModule);

import { GET as bomGet } from "@/app/api/chains/[id]/outputs/bom/route";
import { GET as bringUpGet } from "@/app/api/chains/[id]/outputs/bring-up/route";
import { GET as plotGet } from "@/app/api/chains/[id]/outputs/plot-data/route";
import { GET as firmwareGet } from "@/app/api/chains/[id]/outputs/firmware/route";
import { GET as exportGet } from "@/app/api/chains/[id]/export/route";
import { POST as importPost } from "@/app/api/chains/import/route";
import { getDb } from "@/db/connection";
import { insertChain } from "@/db/queries/chains";
import { chains, revisions } from "@/db/schema";
import { hullVibration, turbidityPhotodiode } from "@/db/seed-data/chains";
import { validateChain } from "@/lib/chain/schema";
import { analyzeChain } from "@/lib/engine";
import { buildBom, buildFirmwareScaling } from "@/lib/handoff";
import { makeChain, makeTeam, makeUser, share } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest(() => signInAs(null));

function world() {
  const engineer = makeUser("engineer");
  const viewer = makeUser("viewer");
  const teamReviewer = makeUser("reviewer");
  const teamId = makeTeam("Keel", [
    [engineer, "engineer"],
    [teamReviewer, "reviewer"],
  ]);
  const hull = insertChain({ teamId, name: hullVibration.name, document: hullVibration, userId: engineer.id }).id;
  const draft = makeChain(teamId, engineer, "Sketch");
  share(hull, viewer, "viewer");
  return { engineer, viewer, teamReviewer, teamId, hull, draft };
}

const get = (handler: typeof bomGet, id: string, query = "") => handler(jsonRequest("GET", `/x${query}`), idContext(id) as never);
const counts = () => ({ chains: getDb().select().from(chains).all().length, revisions: getDb().select().from(revisions).all().length });

describe("hand-off downloads", () => {
  it("BOM as JSON equals the builder's, and as CSV is a download; a viewer may export", async () => {
    const w = world();
    signInAs(w.viewer);
    const res = await get(bomGet, w.hull, "?format=json");
    expect(res.status).toBe(200);
    const body = await res.json();
    const chain = validateChain(hullVibration);
    if (!chain.ok) throw new Error("demo");
    expect(body.bom).toEqual(JSON.parse(JSON.stringify(buildBom(chain.chain))));
    expect(body.revision).toBe(1);
    const csv = await get(bomGet, w.hull, "?layout=grouped");
    expect(csv.headers.get("content-type")).toMatch(/text\/csv/);
    expect(csv.headers.get("content-disposition")).toMatch(/attachment; filename="hull-vibration-channel-aft-bay-bom-grouped\.csv"/);
    expect(await csv.text()).toMatch(/^type,value,value_text/);
  });

  it("refuses an unknown format or layout naming the query field", async () => {
    const w = world();
    signInAs(w.engineer);
    const a = await get(bomGet, w.hull, "?format=xml");
    expect(a.status).toBe(400);
    expect((await a.json()).errors).toEqual([expect.objectContaining({ path: "format" })]);
    const b = await get(bomGet, w.hull, "?layout=sideways");
    expect((await b.json()).errors[0].path).toBe("layout");
    const c = await get(plotGet, w.hull, "?table=phase");
    expect(c.status).toBe(400);
    expect((await c.json()).errors[0].path).toBe("table");
  });

  it("bring-up sheet takes test frequencies in engineering notation and names a bad one", async () => {
    const w = world();
    signInAs(w.teamReviewer);
    const res = await get(bringUpGet, w.hull, "?format=json&f=2,1k");
    expect(res.status).toBe(200);
    const { sheet } = await res.json();
    expect(sheet.frequencies).toEqual([2, 1000]);
    expect(sheet.points).toHaveLength(4);
    // the spread rides along, seeded: the same request gives the same numbers
    expect(sheet.spread).toMatchObject({ trials: 200, seed: 1, distribution: "uniform" });
    expect(sheet.spread.points.map((p: { nodeId: string }) => p.nodeId)).toEqual(sheet.points.map((p: { nodeId: string }) => p.nodeId));
    const again = await (await get(bringUpGet, w.hull, "?format=json&f=2,1k")).json();
    expect(again.sheet.spread).toEqual(sheet.spread);
    const csv = await (await get(bringUpGet, w.hull, "?f=2,1k")).text();
    expect(csv.split("\r\n")[0]).toMatch(/,spread_dc_min_V,spread_dc_max_V,.*,spread_builds,spread_seed$/);
    const bad = await get(bringUpGet, w.hull, "?f=2,-5");
    expect(bad.status).toBe(400);
    expect((await bad.json()).errors).toEqual([expect.objectContaining({ path: "f[1]" })]);
    const many = await get(bringUpGet, w.hull, `?f=${Array.from({ length: 13 }, (_, i) => i + 1).join(",")}`);
    expect((await many.json()).errors[0]).toMatchObject({ path: "f", message: expect.stringMatching(/at most 12/) });
  });

  it("an incomplete chain has no hand-offs: 409 with what is missing", async () => {
    const w = world();
    signInAs(w.engineer);
    const res = await get(bomGet, w.draft);
    expect(res.status).toBe(409);
    const body = await res.json();
    expect(body.error).toMatch(/not complete/);
    expect(body.errors[0].path).toMatch(/^document/);
  });

  it("firmware scaling as JSON equals the builder's; as a C header it is a .h download", async () => {
    const w = world();
    signInAs(w.engineer);
    const body = await (await get(firmwareGet, w.hull)).json();
    const chain = validateChain(hullVibration);
    if (!chain.ok) throw new Error("demo");
    const want = buildFirmwareScaling(chain.chain, analyzeChain(chain.chain));
    expect(body.scalings).toEqual(want.flatMap((r) => (r.ok ? [JSON.parse(JSON.stringify(r.scaling))] : [])));
    const h = await get(firmwareGet, w.hull, "?format=h");
    expect(h.headers.get("content-disposition")).toMatch(/scaling\.h"/);
    expect(await h.text()).toMatch(/#define CW_ADC_SOURCE_COULOMBS_PER_CODE /);
  });

  it("plot data: response and noise tables as CSV", async () => {
    const w = world();
    signInAs(w.engineer);
    const r = await (await get(plotGet, w.hull, "?table=response")).text();
    expect(r.split("\r\n")[0]).toMatch(/^frequency_Hz,Charge amplifier \(ca\) magnitude_dB/);
    expect(r.trim().split("\r\n")).toHaveLength(1 + hullVibration.analysis.points);
    const n = await (await get(plotGet, w.hull, "?table=noise")).text();
    expect(n.split("\r\n")[0]).toBe("frequency_Hz,adc noise_density_V_per_rtHz");
  });

  it("signed out 401, not shared 404", async () => {
    const w = world();
    expect((await get(bomGet, w.hull)).status).toBe(401);
    signInAs(makeUser("stranger"));
    expect((await get(firmwareGet, w.hull)).status).toBe(404);
  });
});

describe("chain exchange", () => {
  const post = (body: unknown) => importPost(jsonRequest("POST", "/api/chains/import", body), undefined as never);

  it("exports the document as saved, and the export imports back unchanged", async () => {
    const w = world();
    signInAs(w.engineer);
    const res = await get(exportGet, w.hull);
    expect(res.headers.get("content-disposition")).toMatch(/\.chain\.json"/);
    const text = await res.text();
    const preview = await post({ document: text, teamId: w.teamId, preview: true });
    expect(preview.status).toBe(200);
    expect((await preview.json()).preview).toMatchObject({ name: hullVibration.name, nodes: hullVibration.nodes.length, edges: hullVibration.edges.length, complete: true, incomplete: [] });
    const created = await post({ document: text, teamId: w.teamId });
    expect(created.status).toBe(201);
    const id = (await created.json()).chain.id as string;
    const again = await (await get(exportGet, id)).text();
    expect(JSON.parse(again)).toEqual(JSON.parse(text));
  });

  it("a preview writes nothing; an incomplete draft imports with what it still needs listed", async () => {
    const w = world();
    signInAs(w.engineer);
    const before = counts();
    const doc = { format: "chainwright.chain/1", name: "Half done", nodes: [{ id: "s", kind: "source", params: { dc: 0 } }], edges: [] };
    const res = await post({ document: doc, preview: true });
    const { preview } = await res.json();
    expect(preview.complete).toBe(false);
    expect(preview.incomplete.map((e: { path: string }) => e.path)).toContain("document.nodes[0].params.amplitude");
    expect(counts()).toEqual(before);
    expect((await post({ document: doc })).status).toBe(201);
    expect(counts()).toEqual({ chains: before.chains + 1, revisions: before.revisions + 1 });
  });

  const bad: [string, unknown, string][] = [
    ["a negative resistor", { ...turbidityPhotodiode, nodes: turbidityPhotodiode.nodes.map((n) => (n.id === "tia" ? { ...n, params: { ...n.params, rf: -1 } } : n)) }, "document.nodes[1].params.rf"],
    ["an unknown field", { ...hullVibration, colour: "red" }, "document.colour"],
    ["a later format", { ...hullVibration, format: "chainwright.chain/9" }, "document.format"],
    ["an edge to nowhere", { ...hullVibration, edges: [...hullVibration.edges, { from: "aa", to: "ghost" }] }, `document.edges[${hullVibration.edges.length}].to`],
    ["no name", { ...hullVibration, name: "" }, "document.name"],
    ["a bad sensitivity", { ...hullVibration, nodes: hullVibration.nodes.map((n, i) => (i === 0 ? { ...n, params: { ...n.params, sensitivity: 0 } } : n)) }, "document.nodes[0].params.sensitivity"],
    ["text that is not JSON", "{ not json", "document"],
    ["a list instead of a document", [1, 2], "document"],
  ];
  for (const [what, document, path] of bad) {
    it(`refuses ${what}, naming ${path}, and writes nothing`, async () => {
      const w = world();
      signInAs(w.engineer);
      const before = counts();
      for (const preview of [true, false]) {
        const res = await post({ document, teamId: w.teamId, preview });
        expect(res.status).toBe(400);
        const { errors } = await res.json();
        expect(errors.map((e: { path: string }) => e.path)).toContain(path);
      }
      expect(counts()).toEqual(before);
    });
  }

  it("refuses a missing document and a team the caller may not create chains in", async () => {
    const w = world();
    signInAs(w.engineer);
    const res = await post({ teamId: w.teamId });
    expect(res.status).toBe(400);
    expect((await res.json()).errors[0].path).toBe("document");
    signInAs(w.teamReviewer);
    expect((await post({ document: hullVibration, teamId: w.teamId })).status).toBe(403);
    signInAs(null);
    expect((await post({ document: hullVibration })).status).toBe(401);
  });
});
