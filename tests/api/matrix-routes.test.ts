/**
 * The authorisation matrix: every route handler in app/ against every position a person can hold,
 * asserting the status code and that nothing leaks in the body: never another team's chain name,
 * never an address of someone outside the chain and its team, and for a refusal nothing of the chain
 * at all. The routes are read from the app folder (tests/support/app-surface.ts): a route without a
 * row here fails the first test, which says what to add. Server actions have their own sweep in
 * matrix-actions.test.ts.
 *
 * Adding a row: `name` starts with "METHOD /path/:param" exactly as the first test prints it (a
 * note in parentheses may follow), `expect` lists the eight statuses in ROLES order, and `call`
 * builds the request against the world of tests/support/team-world.ts.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { idContext, jsonRequest, paramsContext, sessionModule, signInAs } from "./session-mock";
import { mailModule } from "./mail-mock";

vi.mock("@/lib/auth/session", () => sessionModule);
vi.mock("@/lib/mail/transport", () => mailModule);

import * as chainsRoute from "@/app/api/chains/route";
import * as chainRoute from "@/app/api/chains/[id]/route";
import * as duplicateRoute from "@/app/api/chains/[id]/duplicate/route";
import * as membersRoute from "@/app/api/chains/[id]/members/route";
import * as memberRoute from "@/app/api/chains/[id]/members/[userId]/route";
import * as chainInvitesRoute from "@/app/api/chains/[id]/invitations/route";
import * as chainInviteRoute from "@/app/api/chains/[id]/invitations/[invitationId]/route";
import * as reviewsRoute from "@/app/api/chains/[id]/reviews/route";
import * as decisionRoute from "@/app/api/chains/[id]/reviews/decision/route";
import * as commentsRoute from "@/app/api/chains/[id]/comments/route";
import * as commentRoute from "@/app/api/chains/[id]/comments/[commentId]/route";
import * as revisionsRoute from "@/app/api/chains/[id]/revisions/route";
import * as revisionRoute from "@/app/api/chains/[id]/revisions/[revisionId]/route";
import * as compareRoute from "@/app/api/chains/[id]/revisions/compare/route";
import * as restoreRoute from "@/app/api/chains/[id]/revisions/[revisionId]/restore/route";
import * as uploadsRoute from "@/app/api/chains/[id]/uploads/route";
import * as uploadRoute from "@/app/api/chains/[id]/uploads/[fileId]/route";
import * as teamsRoute from "@/app/api/teams/route";
import * as teamRoute from "@/app/api/teams/[id]/route";
import * as teamMemberRoute from "@/app/api/teams/[id]/members/[userId]/route";
import * as teamInvitesRoute from "@/app/api/teams/[id]/invitations/route";
import * as teamInviteRoute from "@/app/api/teams/[id]/invitations/[invitationId]/route";
import * as partsRoute from "@/app/api/parts/route";
import * as partRoute from "@/app/api/parts/[id]/route";
import * as importRoute from "@/app/api/parts/import/route";
import * as exportRoute from "@/app/api/parts/export/route";
import * as invitationRoute from "@/app/api/invitations/[token]/route";
import * as acceptRoute from "@/app/api/invitations/[token]/accept/route";
import * as analyzeRoute from "@/app/api/analyze/route";
import * as mailboxRoute from "@/app/api/mailbox/route";
import * as bomRoute from "@/app/api/chains/[id]/outputs/bom/route";
import * as bringUpRoute from "@/app/api/chains/[id]/outputs/bring-up/route";
import * as plotDataRoute from "@/app/api/chains/[id]/outputs/plot-data/route";
import * as firmwareRoute from "@/app/api/chains/[id]/outputs/firmware/route";
import * as chainExportRoute from "@/app/api/chains/[id]/export/route";
import * as chainImportRoute from "@/app/api/chains/import/route";
import { getDb } from "@/db/connection";
import { chains as chainsTable } from "@/db/schema";
import { eq } from "drizzle-orm";
import { getChainRow } from "@/db/queries/chains";
import { insertChainFile } from "@/db/queries/chain-files";
import { fileStore } from "@/lib/storage/file-store";
import { createInvitation } from "@/db/queries/invitations";
import type { User } from "@/db/schema";
import { teamWorld, type TeamWorld } from "../support/team-world";
import { useTempDatabase } from "../support/temp-db";
import { appRoutes, importProjectModule } from "../support/app-surface";
import { hullVibration } from "@/db/seed-data/chains";

const ROLES = ["owner", "editor", "reviewer", "viewer", "member", "admin", "other", "signedOut"] as const;
type Role = (typeof ROLES)[number];

type Handler = (request: Request, context: never) => Promise<Response>;
interface Call {
  handler: Handler;
  request: Request;
  context: unknown;
}

interface RouteCase {
  name: string;
  /** expected status per role, in ROLES order */
  expect: string;
  /** the link's token is the credential: whoever holds it may read what the invitation is for */
  tokenHolderReads?: boolean;
  call: (w: TeamWorld, me: User | null) => Call;
}

const h = (f: unknown) => f as Handler;
/** Hand-offs need a complete chain: the world's chain gets the hull demo as its document. */
const completed = (w: TeamWorld) => {
  getDb().update(chainsTable).set({ document: JSON.stringify(hullVibration) }).where(eq(chainsTable.id, w.chainId)).run();
  return w.chainId;
};

/** A stored waveform of the world's chain, made for one call (the put writes synchronously). */
function seedFile(w: TeamWorld): string {
  const id = crypto.randomUUID();
  const csv = "time,voltage\n0,0\n0.001,1\n";
  void fileStore().put(`waveform-${id}`, Buffer.from(csv));
  insertChainFile({ id, chainId: w.chainId, kind: "waveform", name: "burst.csv", storageKey: `waveform-${id}`, size: csv.length, sha256: "0".repeat(64), rows: 2, sampleRate: 1000, createdBy: null });
  return id;
}
const version = (w: TeamWorld) => getChainRow(w.chainId)!.version;

// Expected statuses, columns: owner editor reviewer viewer member admin other signedOut
const VIEW = "200 200 200 200 200 200 404 401";
const EDIT = "200 200 403 403 403 200 404 401";
const SHARE = "200 403 403 403 403 200 404 401";
const SHARE_CREATE = "201 403 403 403 403 201 404 401";
const COMMENT = "201 201 201 403 403 201 404 401";
const TEAM_VIEW = "200 200 200 404 200 200 404 401";
const TEAM_MANAGE = "403 403 403 404 403 200 404 401";
const PARTS_EDIT = "200 200 403 404 200 200 404 401";

/** Routes that are not in the matrix, each with the reason and where it is tested instead. */
const NOT_IN_MATRIX: Record<string, string> = {
  "GET /api/auth/*nextauth": "Auth.js's own handler (sign-in pages, session, CSRF token); tests/e2e/sign-in.e2e.ts and tests/unit/auth-config.test.ts",
  "POST /api/auth/*nextauth": "Auth.js's own handler (checks its CSRF token, then the same-origin check); tests/e2e/sign-in.e2e.ts, tests/unit/security-headers.test.ts",
};

const ROUTES: RouteCase[] = [
  { name: "GET /api/chains", expect: "200 200 200 200 200 200 200 401", call: () => ({ handler: h(chainsRoute.GET), request: jsonRequest("GET", "/api/chains"), context: undefined }) },
  {
    name: "POST /api/chains (into the team)",
    expect: "201 201 403 404 201 201 404 401",
    call: (w) => ({ handler: h(chainsRoute.POST), request: jsonRequest("POST", "/api/chains", { name: "New", teamId: w.teamId }), context: undefined }),
  },
  { name: "GET /api/chains/:id", expect: VIEW, call: (w) => ({ handler: h(chainRoute.GET), request: jsonRequest("GET", `/api/chains/${w.chainId}`), context: idContext(w.chainId) }) },
  {
    name: "PUT /api/chains/:id",
    expect: EDIT,
    call: (w) => ({
      handler: h(chainRoute.PUT),
      request: jsonRequest("PUT", `/api/chains/${w.chainId}`, { baseVersion: version(w), document: { format: "chainwright.chain/1", name: "Channel A", nodes: [], edges: [], notes: "edited" } }),
      context: idContext(w.chainId),
    }),
  },
  {
    name: "PATCH /api/chains/:id (rename)",
    expect: EDIT,
    call: (w) => ({ handler: h(chainRoute.PATCH), request: jsonRequest("PATCH", `/api/chains/${w.chainId}`, { name: "Channel B", baseVersion: version(w) }), context: idContext(w.chainId) }),
  },
  {
    name: "PATCH /api/chains/:id (archive)",
    expect: SHARE,
    call: (w) => ({ handler: h(chainRoute.PATCH), request: jsonRequest("PATCH", `/api/chains/${w.chainId}`, { archived: true }), context: idContext(w.chainId) }),
  },
  {
    name: "PATCH /api/chains/:id (move to the other team)",
    expect: "404 403 403 403 403 404 404 401",
    call: (w) => ({ handler: h(chainRoute.PATCH), request: jsonRequest("PATCH", `/api/chains/${w.chainId}`, { teamId: w.otherTeamId }), context: idContext(w.chainId) }),
  },
  { name: "DELETE /api/chains/:id", expect: SHARE, call: (w) => ({ handler: h(chainRoute.DELETE), request: jsonRequest("DELETE", `/api/chains/${w.chainId}`), context: idContext(w.chainId) }) },
  {
    name: "POST /api/chains/:id/duplicate",
    expect: "201 201 403 403 201 201 404 401",
    call: (w) => ({ handler: h(duplicateRoute.POST), request: jsonRequest("POST", `/api/chains/${w.chainId}/duplicate`, {}), context: idContext(w.chainId) }),
  },
  { name: "GET /api/chains/:id/members", expect: VIEW, call: (w) => ({ handler: h(membersRoute.GET), request: jsonRequest("GET", "/x"), context: idContext(w.chainId) }) },
  {
    name: "POST /api/chains/:id/members",
    expect: SHARE_CREATE,
    call: (w) => ({ handler: h(membersRoute.POST), request: jsonRequest("POST", "/x", { userId: w.member.id, role: "viewer" }), context: idContext(w.chainId) }),
  },
  {
    name: "PATCH /api/chains/:id/members/:userId",
    expect: SHARE,
    call: (w) => ({ handler: h(memberRoute.PATCH), request: jsonRequest("PATCH", "/x", { role: "viewer" }), context: paramsContext({ id: w.chainId, userId: w.editor.id }) }),
  },
  {
    name: "DELETE /api/chains/:id/members/:userId",
    expect: SHARE,
    call: (w) => ({ handler: h(memberRoute.DELETE), request: jsonRequest("DELETE", "/x"), context: paramsContext({ id: w.chainId, userId: w.viewer.id }) }),
  },
  { name: "GET /api/chains/:id/invitations", expect: SHARE, call: (w) => ({ handler: h(chainInvitesRoute.GET), request: jsonRequest("GET", "/x"), context: idContext(w.chainId) }) },
  {
    name: "POST /api/chains/:id/invitations",
    expect: SHARE_CREATE,
    call: (w) => ({ handler: h(chainInvitesRoute.POST), request: jsonRequest("POST", "/x", { email: "newcomer@test.example", role: "reviewer" }), context: idContext(w.chainId) }),
  },
  {
    name: "DELETE /api/chains/:id/invitations/:invitationId",
    expect: SHARE,
    call: (w) => ({ handler: h(chainInviteRoute.DELETE), request: jsonRequest("DELETE", "/x"), context: paramsContext({ id: w.chainId, invitationId: w.chainInvitationId }) }),
  },
  { name: "GET /api/chains/:id/reviews", expect: VIEW, call: (w) => ({ handler: h(reviewsRoute.GET), request: jsonRequest("GET", "/x"), context: idContext(w.chainId) }) },
  {
    name: "POST /api/chains/:id/reviews",
    expect: "201 201 403 403 403 201 404 401",
    call: (w) => ({ handler: h(reviewsRoute.POST), request: jsonRequest("POST", "/x", { reviewerIds: [w.reviewer.id] }), context: idContext(w.chainId) }),
  },
  { name: "DELETE /api/chains/:id/reviews", expect: EDIT, call: (w) => ({ handler: h(reviewsRoute.DELETE), request: jsonRequest("DELETE", "/x"), context: idContext(w.chainId) }) },
  {
    name: "POST /api/chains/:id/reviews/decision",
    // owners and admins hold "review" but were not asked; only the chosen reviewer decides
    expect: "403 403 200 403 403 403 404 401",
    call: (w) => ({ handler: h(decisionRoute.POST), request: jsonRequest("POST", "/x", { decision: "changes-requested", version: version(w) }), context: idContext(w.chainId) }),
  },
  { name: "GET /api/chains/:id/comments", expect: VIEW, call: (w) => ({ handler: h(commentsRoute.GET), request: jsonRequest("GET", "/x"), context: idContext(w.chainId) }) },
  { name: "POST /api/chains/:id/comments", expect: COMMENT, call: (w) => ({ handler: h(commentsRoute.POST), request: jsonRequest("POST", "/x", { body: "A remark" }), context: idContext(w.chainId) }) },
  {
    name: "PATCH /api/chains/:id/comments/:commentId",
    expect: "200 200 200 403 403 200 404 401",
    call: (w) => ({ handler: h(commentRoute.PATCH), request: jsonRequest("PATCH", "/x", { resolved: true }), context: paramsContext({ id: w.chainId, commentId: w.threadId }) }),
  },
  {
    name: "DELETE /api/chains/:id/comments/:commentId (the reviewer's thread)",
    expect: "200 403 200 403 403 200 404 401",
    call: (w) => ({ handler: h(commentRoute.DELETE), request: jsonRequest("DELETE", "/x"), context: paramsContext({ id: w.chainId, commentId: w.threadId }) }),
  },
  { name: "GET /api/chains/:id/uploads", expect: VIEW, call: (w) => ({ handler: h(uploadsRoute.GET), request: jsonRequest("GET", "/x"), context: idContext(w.chainId) }) },
  {
    name: "POST /api/chains/:id/uploads",
    expect: "201 201 403 403 403 201 404 401",
    call: (w) => ({
      handler: h(uploadsRoute.POST),
      request: jsonRequest("POST", "/x", { kind: "waveform", name: "step.csv", csv: "time,voltage\n0,0\n0.001,1\n0.002,1\n" }),
      context: idContext(w.chainId),
    }),
  },
  {
    name: "GET /api/chains/:id/uploads/:fileId",
    expect: VIEW,
    call: (w) => ({ handler: h(uploadRoute.GET), request: jsonRequest("GET", "/x"), context: paramsContext({ id: w.chainId, fileId: seedFile(w) }) }),
  },
  {
    name: "DELETE /api/chains/:id/uploads/:fileId",
    expect: EDIT,
    call: (w) => ({ handler: h(uploadRoute.DELETE), request: jsonRequest("DELETE", "/x"), context: paramsContext({ id: w.chainId, fileId: seedFile(w) }) }),
  },
  { name: "GET /api/chains/:id/revisions", expect: VIEW, call: (w) => ({ handler: h(revisionsRoute.GET), request: jsonRequest("GET", "/x"), context: idContext(w.chainId) }) },
  {
    name: "GET /api/chains/:id/revisions/:revisionId",
    expect: VIEW,
    call: (w) => ({ handler: h(revisionRoute.GET), request: jsonRequest("GET", "/x"), context: paramsContext({ id: w.chainId, revisionId: w.firstRevisionId }) }),
  },
  {
    name: "GET /api/chains/:id/revisions/compare",
    expect: VIEW,
    call: (w) => ({ handler: h(compareRoute.GET), request: jsonRequest("GET", `/x?from=${w.firstRevisionId}&to=${w.lastRevisionId}`), context: idContext(w.chainId) }),
  },
  {
    name: "POST /api/chains/:id/revisions/:revisionId/restore",
    expect: "201 201 403 403 403 201 404 401",
    call: (w) => ({ handler: h(restoreRoute.POST), request: jsonRequest("POST", "/x", { baseVersion: version(w) }), context: paramsContext({ id: w.chainId, revisionId: w.firstRevisionId }) }),
  },
  { name: "GET /api/teams", expect: "200 200 200 200 200 200 200 401", call: () => ({ handler: h(teamsRoute.GET), request: jsonRequest("GET", "/api/teams"), context: undefined }) },
  { name: "GET /api/teams/:id", expect: TEAM_VIEW, call: (w) => ({ handler: h(teamRoute.GET), request: jsonRequest("GET", "/x"), context: idContext(w.teamId) }) },
  { name: "PATCH /api/teams/:id", expect: TEAM_MANAGE, call: (w) => ({ handler: h(teamRoute.PATCH), request: jsonRequest("PATCH", "/x", { name: "Keel II" }), context: idContext(w.teamId) }) },
  {
    name: "PATCH /api/teams/:id/members/:userId",
    expect: TEAM_MANAGE,
    call: (w) => ({ handler: h(teamMemberRoute.PATCH), request: jsonRequest("PATCH", "/x", { role: "reviewer" }), context: paramsContext({ id: w.teamId, userId: w.member.id }) }),
  },
  {
    name: "DELETE /api/teams/:id/members/:userId",
    expect: TEAM_MANAGE,
    call: (w) => ({ handler: h(teamMemberRoute.DELETE), request: jsonRequest("DELETE", "/x"), context: paramsContext({ id: w.teamId, userId: w.member.id }) }),
  },
  { name: "GET /api/teams/:id/invitations", expect: TEAM_MANAGE, call: (w) => ({ handler: h(teamInvitesRoute.GET), request: jsonRequest("GET", "/x"), context: idContext(w.teamId) }) },
  {
    name: "POST /api/teams/:id/invitations",
    expect: "403 403 403 404 403 201 404 401",
    call: (w) => ({ handler: h(teamInvitesRoute.POST), request: jsonRequest("POST", "/x", { email: "recruit@test.example", role: "engineer" }), context: idContext(w.teamId) }),
  },
  {
    name: "DELETE /api/teams/:id/invitations/:invitationId",
    expect: TEAM_MANAGE,
    call: (w) => ({ handler: h(teamInviteRoute.DELETE), request: jsonRequest("DELETE", "/x"), context: paramsContext({ id: w.teamId, invitationId: w.teamInvitationId }) }),
  },
  { name: "GET /api/parts", expect: TEAM_VIEW, call: (w) => ({ handler: h(partsRoute.GET), request: jsonRequest("GET", `/api/parts?teamId=${w.teamId}`), context: undefined }) },
  {
    name: "POST /api/parts",
    expect: "201 201 403 404 201 201 404 401",
    call: (w) => ({ handler: h(partsRoute.POST), request: jsonRequest("POST", "/api/parts", { teamId: w.teamId, name: "Fast JFET", model: { gbw: 4e6 } }), context: undefined }),
  },
  { name: "GET /api/parts/:id", expect: TEAM_VIEW, call: (w) => ({ handler: h(partRoute.GET), request: jsonRequest("GET", "/x"), context: idContext(w.partId) }) },
  {
    name: "PUT /api/parts/:id",
    expect: PARTS_EDIT,
    call: (w) => ({ handler: h(partRoute.PUT), request: jsonRequest("PUT", "/x", { name: "Generic precision", model: { gbw: 2e6 } }), context: idContext(w.partId) }),
  },
  { name: "DELETE /api/parts/:id", expect: PARTS_EDIT, call: (w) => ({ handler: h(partRoute.DELETE), request: jsonRequest("DELETE", "/x"), context: idContext(w.partId) }) },
  {
    name: "POST /api/parts/import (preview)",
    expect: PARTS_EDIT,
    call: (w) => ({ handler: h(importRoute.POST), request: jsonRequest("POST", "/api/parts/import", { teamId: w.teamId, csv: "name,gbw\nNew one,1M\n" }), context: undefined }),
  },
  { name: "GET /api/parts/export", expect: TEAM_VIEW, call: (w) => ({ handler: h(exportRoute.GET), request: jsonRequest("GET", `/api/parts/export?teamId=${w.teamId}`), context: undefined }) },
  {
    name: "GET /api/invitations/:token",
    expect: "200 200 200 200 200 200 200 200",
    tokenHolderReads: true,
    call: (w) => {
      const { token } = createInvitation("someone@test.example", { chainId: w.chainId, teamId: w.teamId, role: "viewer" }, w.owner.id);
      return { handler: h(invitationRoute.GET), request: jsonRequest("GET", "/x"), context: paramsContext({ token }) };
    },
  },
  {
    name: "POST /api/invitations/:token/accept (sent to the caller)",
    expect: "200 200 200 200 200 200 200 401",
    call: (w, me) => {
      const { token } = createInvitation(me?.email ?? "nobody@test.example", { chainId: w.chainId, teamId: w.teamId, role: "viewer" }, w.owner.id);
      return { handler: h(acceptRoute.POST), request: jsonRequest("POST", "/x"), context: paramsContext({ token }) };
    },
  },
  {
    name: "POST /api/invitations/:token/accept (sent to someone else)",
    expect: "403 403 403 403 403 403 403 401",
    call: (w) => {
      const { token } = createInvitation(w.stranger.email!, { chainId: w.chainId, teamId: w.teamId, role: "editor" }, w.owner.id);
      return { handler: h(acceptRoute.POST), request: jsonRequest("POST", "/x"), context: paramsContext({ token }) };
    },
  },
  {
    name: "POST /api/analyze",
    expect: "200 200 200 200 200 200 200 401",
    call: () => ({ handler: h(analyzeRoute.POST), request: jsonRequest("POST", "/api/analyze", { chain: hullVibration, points: 20 }), context: undefined }),
  },
  { name: "GET /api/chains/:id/outputs/bom", expect: VIEW, call: (w) => ({ handler: h(bomRoute.GET), request: jsonRequest("GET", "/x?format=json"), context: idContext(completed(w)) }) },
  { name: "GET /api/chains/:id/outputs/bring-up", expect: VIEW, call: (w) => ({ handler: h(bringUpRoute.GET), request: jsonRequest("GET", "/x?f=10,1k"), context: idContext(completed(w)) }) },
  { name: "GET /api/chains/:id/outputs/plot-data", expect: VIEW, call: (w) => ({ handler: h(plotDataRoute.GET), request: jsonRequest("GET", "/x?table=noise"), context: idContext(completed(w)) }) },
  { name: "GET /api/chains/:id/outputs/firmware", expect: VIEW, call: (w) => ({ handler: h(firmwareRoute.GET), request: jsonRequest("GET", "/x?format=h"), context: idContext(completed(w)) }) },
  { name: "GET /api/chains/:id/export", expect: VIEW, call: (w) => ({ handler: h(chainExportRoute.GET), request: jsonRequest("GET", "/x"), context: idContext(w.chainId) }) },
  {
    name: "POST /api/chains/import (into the team)",
    expect: "201 201 403 404 201 201 404 401",
    call: (w) => ({ handler: h(chainImportRoute.POST), request: jsonRequest("POST", "/api/chains/import", { document: hullVibration, teamId: w.teamId }), context: undefined }),
  },
  {
    name: "GET /api/mailbox (stand-in switched off)",
    expect: "404 404 404 404 404 404 404 404",
    call: () => ({ handler: h(mailboxRoute.GET), request: jsonRequest("GET", "/api/mailbox"), context: undefined }),
  },
];

/** The route a row is for: its name up to the first note in parentheses. */
const routeOf = (row: RouteCase) => row.name.replace(/\s*\(.*$/, "").trim();

function personFor(w: TeamWorld, role: Role): User | null {
  return role === "signedOut" ? null : w[role];
}

let tmp: ReturnType<typeof useTempDatabase>;
beforeAll(() => {
  tmp = useTempDatabase();
});
afterAll(() => tmp.cleanup());

describe("authorisation matrix: every route × every position", () => {
  it("has a row for every route handler in app/, and no row for a route that is gone", () => {
    const found = appRoutes();
    const covered = new Set(ROUTES.map(routeOf));
    const missing = found.filter((r) => !covered.has(r.key) && !(r.key in NOT_IN_MATRIX));
    const message = missing
      .map((r) => `  ${r.key}   (export ${r.method} of ${r.file}): add { name: "${r.key}", expect: "<8 statuses: ${ROLES.join(" ")}>", call: … } to ROUTES`)
      .join("\n");
    expect(missing.map((r) => r.key), `routes without a row in tests/api/matrix-routes.test.ts:\n${message}`).toEqual([]);
    const known = new Set(found.map((r) => r.key));
    const stale = [...covered, ...Object.keys(NOT_IN_MATRIX)].filter((k) => !known.has(k));
    expect(stale, `rows naming a route that app/ no longer has (or a misspelt name; routes are named like "PATCH /api/chains/:id")`).toEqual([]);
    for (const r of ROUTES) expect(r.expect.split(" "), `${r.name}: one status per position (${ROLES.join(" ")})`).toHaveLength(ROLES.length);
  });

  it("calls, in each row, the very handler its name says", async () => {
    const w = teamWorld();
    const byKey = new Map(appRoutes().map((r) => [r.key, r]));
    for (const row of ROUTES) {
      const entry = byKey.get(routeOf(row))!;
      const mod = await importProjectModule(entry.file);
      expect(row.call(w, w.owner).handler, `${row.name} should call export ${entry.method} of ${entry.file}`).toBe(mod[entry.method]);
    }
  });

  for (const route of ROUTES) {
    const expected = route.expect.split(" ").map(Number);
    ROLES.forEach((role, i) => {
      it(`${route.name} as ${role} → ${expected[i]}`, async () => {
        const w = teamWorld();
        const me = personFor(w, role);
        signInAs(me);
        const { handler, request, context } = route.call(w, me);
        const res = await handler(request, context as never);
        const text = await res.text();
        expect(res.status, text).toBe(expected[i]);
        if (res.headers.get("content-type")?.includes("json")) expect(() => JSON.parse(text)).not.toThrow();
        // never another team's chain (the other team's admin sees theirs only), never the address of someone in nothing at all
        if (role !== "other") expect(text).not.toContain("Secret other chain");
        if (role === "other" && !route.tokenHolderReads) expect(text).not.toContain("Channel A");
        expect(text).not.toContain(w.stranger.email!);
        if (role !== "other") expect(text).not.toContain(w.other.email!);
        // the viewer (outside the team) never sees team members' addresses beyond the chain's members
        if (role === "viewer") expect(text).not.toContain(w.member.email!);
        if (res.status >= 400) {
          expect(text).not.toContain("Channel A");
          for (const p of [w.owner, w.editor, w.reviewer, w.viewer, w.member, w.admin]) expect(text).not.toContain(p.email!);
        }
      });
    });
  }
});
