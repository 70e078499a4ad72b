import { describe, expect, it, vi } from "vitest";
import { idContext, jsonRequest, sessionModule, signInAs } from "./session-mock";
import { clearMail, mailModule, sentMail } from "./mail-mock";

vi.mock("@/lib/auth/session", () => sessionModule);
vi.mock("@/lib/mail/transport", () => mailModule);

import { DELETE as deleteChain, PUT as save } from "@/app/api/chains/[id]/route";
import { GET as getReviews, POST as requestReview } from "@/app/api/chains/[id]/reviews/route";
import { POST as decide } from "@/app/api/chains/[id]/reviews/decision/route";
import { getChainRow } from "@/db/queries/chains";
import { listRevisions } from "@/db/queries/history";
import { saveUserSettings } from "@/db/queries/settings";
import { getDb } from "@/db/connection";
import { auditLog } from "@/db/schema";
import { draftDocument, makeChain, makeTeam, makeUser, share } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest(clearMail);

function world() {
  const engineer = makeUser("engineer");
  const reviewer = makeUser("reviewer");
  const second = makeUser("second");
  const admin = makeUser("admin");
  const teamId = makeTeam("Keel", [
    [engineer, "engineer"],
    [reviewer, "reviewer"],
    [second, "reviewer"],
    [admin, "admin"],
  ]);
  const chainId = makeChain(teamId, engineer, "Channel A");
  share(chainId, reviewer, "reviewer");
  share(chainId, second, "reviewer");
  return { engineer, reviewer, second, admin, teamId, chainId };
}

const version = (id: string) => getChainRow(id)!.version;

async function edit(chainId: string, notes: string, summary?: string) {
  return save(jsonRequest("PUT", `/api/chains/${chainId}`, { baseVersion: version(chainId), document: { ...draftDocument("Channel A"), notes }, summary }), idContext(chainId));
}

describe("review from request to approval", () => {
  it("mails each chosen reviewer, and approval needs every reviewer on the current revision", async () => {
    const w = world();
    signInAs(w.engineer);
    expect((await edit(w.chainId, "first draft", "Ready")).status).toBe(200);
    const asked = await requestReview(jsonRequest("POST", "/x", { reviewerIds: [w.reviewer.id, w.second.id], note: "Please check the gain" }), idContext(w.chainId));
    expect(asked.status).toBe(201);
    expect((await asked.json()).reviewState).toBe("in-review");
    expect(sentMail.map((m) => m.to).sort()).toEqual([w.reviewer.email, w.second.email].sort());
    expect(sentMail[0].subject).toBe("Review requested: Channel A");
    expect(sentMail[0].text).toContain("Please check the gain");
    expect(listRevisions(w.chainId)[0].pinned).toBe(true);

    signInAs(w.reviewer);
    const first = await decide(jsonRequest("POST", "/x", { decision: "approved", version: version(w.chainId) }), idContext(w.chainId));
    expect(first.status).toBe(200);
    expect((await first.json()).reviewState).toBe("in-review");
    signInAs(w.second);
    const both = await decide(jsonRequest("POST", "/x", { decision: "approved", version: version(w.chainId), note: "Fine" }), idContext(w.chainId));
    expect((await both.json()).reviewState).toBe("approved");
    expect(getChainRow(w.chainId)!.reviewState).toBe("approved");
    // the requester hears of each decision
    expect(sentMail.filter((m) => m.to === w.engineer.email).map((m) => m.subject)).toEqual(["Approved: Channel A", "Approved: Channel A"]);
    const actions = getDb().select().from(auditLog).all().map((a) => a.action);
    expect(actions).toEqual(expect.arrayContaining(["review.request", "review.approve"]));
  });

  it("refuses a decision on a version the reviewer has not seen (409) and one by someone not asked (403)", async () => {
    const w = world();
    signInAs(w.engineer);
    await requestReview(jsonRequest("POST", "/x", { reviewerIds: [w.reviewer.id] }), idContext(w.chainId));
    const seen = version(w.chainId);
    await edit(w.chainId, "changed meanwhile");
    signInAs(w.reviewer);
    const stale = await decide(jsonRequest("POST", "/x", { decision: "approved", version: seen }), idContext(w.chainId));
    expect(stale.status).toBe(409);
    expect((await stale.json()).currentVersion).toBe(seen + 1);
    signInAs(w.second);
    expect((await decide(jsonRequest("POST", "/x", { decision: "approved", version: version(w.chainId) }), idContext(w.chainId))).status).toBe(403);
  });

  it("never lets anyone approve a revision they wrote", async () => {
    const w = world();
    signInAs(w.admin); // an admin may edit and review
    await edit(w.chainId, "admin's own change");
    signInAs(w.engineer);
    await requestReview(jsonRequest("POST", "/x", { reviewerIds: [w.admin.id] }), idContext(w.chainId));
    signInAs(w.admin);
    const res = await decide(jsonRequest("POST", "/x", { decision: "approved", version: version(w.chainId) }), idContext(w.chainId));
    expect(res.status).toBe(403);
    expect((await res.json()).error).toMatch(/you wrote the current revision/i);
    expect(getChainRow(w.chainId)!.reviewState).toBe("in-review");
  });

  it("refuses to ask the requester or someone who cannot review, naming the field", async () => {
    const w = world();
    const bystander = makeUser("bystander");
    signInAs(w.engineer);
    const res = await requestReview(jsonRequest("POST", "/x", { reviewerIds: [w.engineer.id, bystander.id] }), idContext(w.chainId));
    expect(res.status).toBe(400);
    expect((await res.json()).errors.map((e: { path: string }) => e.path)).toEqual(["reviewerIds[0]", "reviewerIds[1]"]);
  });

  it("goes back to draft on an edit after approval, says so, and keeps the approval in the history", async () => {
    const w = world();
    signInAs(w.engineer);
    await edit(w.chainId, "v2", "Ready");
    await requestReview(jsonRequest("POST", "/x", { reviewerIds: [w.reviewer.id] }), idContext(w.chainId));
    signInAs(w.reviewer);
    await decide(jsonRequest("POST", "/x", { decision: "changes-requested", note: "Corner too low", version: version(w.chainId) }), idContext(w.chainId));
    expect(getChainRow(w.chainId)!.reviewState).toBe("changes-requested");
    signInAs(w.engineer);
    await edit(w.chainId, "v3 fixed", "Raised the corner");
    expect(getChainRow(w.chainId)!.reviewState).toBe("changes-requested");
    signInAs(w.reviewer);
    const ok = await decide(jsonRequest("POST", "/x", { decision: "approved", version: version(w.chainId) }), idContext(w.chainId));
    const approved = await ok.json();
    expect(approved.reviewState).toBe("approved");
    const approvedRevision = approved.revision.id;

    signInAs(w.engineer);
    const after = await edit(w.chainId, "v4 after approval");
    const body = await after.json();
    expect(body.notice).toMatch(/back to draft/);
    expect(getChainRow(w.chainId)!.reviewState).toBe("draft");
    const rounds = (await (await getReviews(jsonRequest("GET", "/x"), idContext(w.chainId))).json()).rounds;
    expect(rounds[0]).toMatchObject({ open: false, closedReason: "edited-after-approval" });
    expect(rounds[0].reviewers[0]).toMatchObject({ decision: "approved", decidedRevision: { id: approvedRevision } });
    // the approved revision is pinned, so the later autosave did not fold into it
    const revs = listRevisions(w.chainId);
    expect(revs.find((r) => r.id === approvedRevision)).toMatchObject({ pinned: true, summary: "Raised the corner" });
    expect(revs[0].id).not.toBe(approvedRevision);
  });

  it("lets only an owner share delete an approved chain", async () => {
    const w = world();
    signInAs(w.engineer);
    await edit(w.chainId, "v2");
    await requestReview(jsonRequest("POST", "/x", { reviewerIds: [w.reviewer.id] }), idContext(w.chainId));
    signInAs(w.reviewer);
    await decide(jsonRequest("POST", "/x", { decision: "approved", version: version(w.chainId) }), idContext(w.chainId));
    signInAs(w.admin);
    const byAdmin = await deleteChain(jsonRequest("DELETE", "/x"), idContext(w.chainId));
    expect(byAdmin.status).toBe(403);
    expect((await byAdmin.json()).error).toMatch(/only its owner/);
    signInAs(w.engineer);
    expect((await deleteChain(jsonRequest("DELETE", "/x"), idContext(w.chainId))).status).toBe(200);
    expect(getChainRow(w.chainId)).toBeUndefined();
  });

  it("sends no review mail to someone who turned review mails off", async () => {
    const w = world();
    saveUserSettings(w.reviewer.id, { notifyOnComments: true, notifyOnReviews: false });
    signInAs(w.engineer);
    const res = await requestReview(jsonRequest("POST", "/x", { reviewerIds: [w.reviewer.id, w.second.id] }), idContext(w.chainId));
    expect((await res.json()).mailed).toBe(1);
    expect(sentMail.map((m) => m.to)).toEqual([w.second.email]);
  });
});
