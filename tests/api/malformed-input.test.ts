/**
 * Malformed input never makes a route answer 500: every handler under app/api (except Auth.js's own
 * and the development mailbox) is called with broken JSON, bodies of the wrong type, fields of the
 * wrong type, oversized and deeply nested values, and garbage in its path and query, as people who
 * hold every kind of right. Each answer must be a refusal or success with a JSON body, never a
 * server error.
 */
import { describe, expect, it, vi } from "vitest";
import { jsonRequest, paramsContext, sessionModule, signInAs } from "./session-mock";
import { mailModule } from "./mail-mock";

vi.mock("@/lib/auth/session", () => sessionModule);
vi.mock("@/lib/mail/transport", () => mailModule);

import * as analyzeRoute from "@/app/api/analyze/route";
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
import { teamWorld, type TeamWorld } from "../support/team-world";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest();

type Handler = (request: Request, context: never) => Promise<Response>;
type Params = (w: TeamWorld) => Record<string, string>;

/** Each route module with the real path parameters of the world, so checks get past "not found" to the body. */
const ROUTES: Array<{ path: string; module: Record<string, unknown>; params: Params }> = [
  { path: "/api/analyze", module: analyzeRoute, params: () => ({}) },
  { path: "/api/chains", module: chainsRoute, params: () => ({}) },
  { path: "/api/chains/:id", module: chainRoute, params: (w) => ({ id: w.chainId }) },
  { path: "/api/chains/:id/duplicate", module: duplicateRoute, params: (w) => ({ id: w.chainId }) },
  { path: "/api/chains/:id/members", module: membersRoute, params: (w) => ({ id: w.chainId }) },
  { path: "/api/chains/:id/members/:userId", module: memberRoute, params: (w) => ({ id: w.chainId, userId: w.editor.id }) },
  { path: "/api/chains/:id/invitations", module: chainInvitesRoute, params: (w) => ({ id: w.chainId }) },
  { path: "/api/chains/:id/invitations/:invitationId", module: chainInviteRoute, params: (w) => ({ id: w.chainId, invitationId: w.chainInvitationId }) },
  { path: "/api/chains/:id/reviews", module: reviewsRoute, params: (w) => ({ id: w.chainId }) },
  { path: "/api/chains/:id/reviews/decision", module: decisionRoute, params: (w) => ({ id: w.chainId }) },
  { path: "/api/chains/:id/comments", module: commentsRoute, params: (w) => ({ id: w.chainId }) },
  { path: "/api/chains/:id/comments/:commentId", module: commentRoute, params: (w) => ({ id: w.chainId, commentId: w.threadId }) },
  { path: "/api/chains/:id/revisions", module: revisionsRoute, params: (w) => ({ id: w.chainId }) },
  { path: "/api/chains/:id/revisions/:revisionId", module: revisionRoute, params: (w) => ({ id: w.chainId, revisionId: w.firstRevisionId }) },
  { path: "/api/chains/:id/revisions/compare", module: compareRoute, params: (w) => ({ id: w.chainId }) },
  { path: "/api/chains/:id/revisions/:revisionId/restore", module: restoreRoute, params: (w) => ({ id: w.chainId, revisionId: w.firstRevisionId }) },
  { path: "/api/teams", module: teamsRoute, params: () => ({}) },
  { path: "/api/teams/:id", module: teamRoute, params: (w) => ({ id: w.teamId }) },
  { path: "/api/teams/:id/members/:userId", module: teamMemberRoute, params: (w) => ({ id: w.teamId, userId: w.member.id }) },
  { path: "/api/teams/:id/invitations", module: teamInvitesRoute, params: (w) => ({ id: w.teamId }) },
  { path: "/api/teams/:id/invitations/:invitationId", module: teamInviteRoute, params: (w) => ({ id: w.teamId, invitationId: w.teamInvitationId }) },
  { path: "/api/parts", module: partsRoute, params: () => ({}) },
  { path: "/api/parts/:id", module: partRoute, params: (w) => ({ id: w.partId }) },
  { path: "/api/parts/import", module: importRoute, params: () => ({}) },
  { path: "/api/parts/export", module: exportRoute, params: () => ({}) },
  { path: "/api/invitations/:token", module: invitationRoute, params: () => ({ token: "not-a-token" }) },
  { path: "/api/invitations/:token/accept", module: acceptRoute, params: () => ({ token: "not-a-token" }) },
];

const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;
const WITH_BODY = new Set(["POST", "PUT", "PATCH"]);

function nested(depth: number): string {
  return "[".repeat(depth) + "]".repeat(depth);
}

/** A value of the wrong kind for every field name the routes read. */
const WRONG_TYPES = {
  name: {}, teamId: [], userId: 7, role: { admin: true }, email: 12, baseVersion: "one", document: "not a chain", summary: { x: 1 },
  archived: "maybe", body: 5, nodeId: [], parentId: 3, resolved: "yes", decision: 9, note: [], reviewerIds: "everyone",
  csv: 42, commit: "sure", model: [1, 2], notes: false, chain: "x", freqs: "many", points: -3, q: 1, revisionId: null,
};

/** Raw request bodies: broken, empty, the wrong JSON type, wrong field types, too large, too deep. */
const RAW_BODIES: string[] = [
  "{",
  "",
  "   ",
  "null",
  "[]",
  '"text"',
  "42",
  "true",
  "{}",
  JSON.stringify(WRONG_TYPES),
  JSON.stringify({ name: "x".repeat(300_000) }),
  `{"document":${nested(5000)},"chain":${nested(5000)},"model":${nested(5000)},"csv":${nested(5000)}}`,
  // deeper than any recursive walk could go on the default stack
  `{"document":${nested(50_000)},"chain":${nested(50_000)},"model":${nested(50_000)}}`,
  JSON.stringify({ baseVersion: 1e308, role: "owner", email: "a@b", teamId: "x".repeat(10_000), name: "\u0000\ud800" }),
];

const BAD_QUERIES = ["?teamId=", `?teamId=${"x".repeat(5000)}`, "?page=abc&pageSize=-1&sort=zzz&dir=up&reviewState=lost", "?q=%ZZ&from=%00&to=", "?from=1&to=2", "?archived=2&worstStatus=bad"];
const BAD_IDS = ["", "x".repeat(5000), "../../etc", "%00", "' OR 1=1 --", "名前"];

function garbageParams(real: Record<string, string>, id: string): Record<string, string> {
  return Object.fromEntries(Object.keys(real).map((k) => [k, id]));
}

async function expectNo500(label: string, handler: Handler, request: Request, params: Record<string, string>) {
  const res = await handler(request, paramsContext(params) as never);
  const text = await res.text();
  expect(res.status, `${label} → ${res.status} ${text.slice(0, 200)}`).toBeLessThan(500);
  if (res.status >= 400) expect(res.headers.get("content-type"), label).toContain("json");
}

describe("no route answers 500 to malformed input", () => {
  it("lists every route handler module it calls", () => {
    const handlers = ROUTES.flatMap((r) => METHODS.filter((m) => typeof r.module[m] === "function"));
    expect(handlers.length).toBeGreaterThanOrEqual(40);
  });

  for (const route of ROUTES) {
    for (const method of METHODS) {
      const handler = route.module[method] as Handler | undefined;
      if (typeof handler !== "function") continue;
      it(`${method} ${route.path}`, async () => {
        const w = teamWorld();
        const real = route.params(w);
        // the team admin, the chain's owner and its reviewer between them hold every right a route asks for
        for (const who of [w.admin, w.owner, w.reviewer]) {
          signInAs(who);
          if (WITH_BODY.has(method)) {
            for (const raw of RAW_BODIES) {
              await expectNo500(`${method} ${route.path} body ${raw.slice(0, 40)}`, handler, jsonRequest(method, route.path, undefined, raw), real);
            }
          } else {
            for (const query of BAD_QUERIES) {
              await expectNo500(`${method} ${route.path}${query}`, handler, jsonRequest(method, route.path + query), real);
            }
          }
          for (const id of BAD_IDS) {
            const body = WITH_BODY.has(method) ? "{}" : undefined;
            await expectNo500(`${method} ${route.path} with id ${id.slice(0, 20)}`, handler, jsonRequest(method, route.path, undefined, body), garbageParams(real, id));
          }
        }
      });
    }
  }
});
