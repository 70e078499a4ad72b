import { describe, expect, it, vi } from "vitest";
import { idContext, jsonRequest, paramsContext, sessionModule, signInAs } from "./session-mock";
import { clearMail, mailModule, sentMail } from "./mail-mock";

vi.mock("@/lib/auth/session", () => sessionModule);
vi.mock("@/lib/mail/transport", () => mailModule);

import { GET as listThreads, POST as post } from "@/app/api/chains/[id]/comments/route";
import { DELETE as remove, PATCH as resolve } from "@/app/api/chains/[id]/comments/[commentId]/route";
import { saveUserSettings } from "@/db/queries/settings";
import { insertChain } from "@/db/queries/chains";
import { makeTeam, makeUser, share } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest(clearMail);

function world() {
  const owner = makeUser("owner");
  const reviewer = makeUser("reviewer");
  const editor = makeUser("editor");
  const teamId = makeTeam("Keel", [[owner, "engineer"]]);
  const doc = { format: "chainwright.chain/1", name: "Channel A", nodes: [{ id: "u1", kind: "inverting", params: { r1: 1000 } }], edges: [] };
  const chainId = insertChain({ teamId, name: "Channel A", document: doc, userId: owner.id }).id;
  share(chainId, reviewer, "reviewer");
  share(chainId, editor, "editor");
  return { owner, reviewer, editor, chainId };
}

describe("comment threads", () => {
  it("pins a thread to a stage, notifies owners and editors, and a reply notifies the thread", async () => {
    const w = world();
    signInAs(w.reviewer);
    const res = await post(jsonRequest("POST", "/x", { body: "R1 is small for this source", nodeId: "u1" }), idContext(w.chainId));
    expect(res.status).toBe(201);
    const { comment } = await res.json();
    expect(sentMail.map((m) => m.to).sort()).toEqual([w.owner.email, w.editor.email].sort());
    expect(sentMail[0].subject).toBe("New comment on u1 · Channel A");
    expect(sentMail[0].text).toContain("R1 is small for this source");
    expect(sentMail[0].text).toContain(`/chains/${w.chainId}?stage=u1#thread-${comment.threadId}`);

    clearMail();
    signInAs(w.owner);
    const reply = await post(jsonRequest("POST", "/x", { body: "Raised it", parentId: comment.id }), idContext(w.chainId));
    const body = await reply.json();
    expect(body.threads).toHaveLength(1);
    expect(body.threads[0]).toMatchObject({ nodeId: "u1", comments: [{ body: "R1 is small for this source" }, { body: "Raised it" }] });
    expect(sentMail.map((m) => m.to)).toEqual([w.reviewer.email]);
  });

  it("resolves and reopens a thread, and a reply to a resolved thread reopens it", async () => {
    const w = world();
    signInAs(w.reviewer);
    const { comment } = await (await post(jsonRequest("POST", "/x", { body: "Whole chain: check rails" }), idContext(w.chainId))).json();
    signInAs(w.editor);
    const resolved = await (await resolve(jsonRequest("PATCH", "/x", { resolved: true }), paramsContext({ id: w.chainId, commentId: comment.id }))).json();
    expect(resolved.threads[0]).toMatchObject({ nodeId: null, resolvedBy: { id: w.editor.id } });
    await post(jsonRequest("POST", "/x", { body: "Not yet", parentId: comment.id }), idContext(w.chainId));
    const threads = await (await listThreads(jsonRequest("GET", "/x"), idContext(w.chainId))).json();
    expect(threads.threads[0].resolvedAt).toBeNull();
    expect(threads.me).toEqual({ id: w.editor.id, canComment: true, canModerate: false });
  });

  it("refuses a pin to a stage that is not in the chain, an empty body and a reply to another chain's thread", async () => {
    const w = world();
    signInAs(w.reviewer);
    const bad = await post(jsonRequest("POST", "/x", { body: "x", nodeId: "nope" }), idContext(w.chainId));
    expect(bad.status).toBe(400);
    expect((await bad.json()).errors[0].path).toBe("nodeId");
    expect((await post(jsonRequest("POST", "/x", { body: "   " }), idContext(w.chainId))).status).toBe(400);
    expect((await post(jsonRequest("POST", "/x", { body: "x", parentId: "00000000-0000-0000-0000-000000000000" }), idContext(w.chainId))).status).toBe(404);
  });

  it("lets the author delete their comment but not someone else's", async () => {
    const w = world();
    signInAs(w.reviewer);
    const { comment } = await (await post(jsonRequest("POST", "/x", { body: "mine" }), idContext(w.chainId))).json();
    signInAs(w.editor);
    expect((await remove(jsonRequest("DELETE", "/x"), paramsContext({ id: w.chainId, commentId: comment.id }))).status).toBe(403);
    signInAs(w.reviewer);
    expect((await remove(jsonRequest("DELETE", "/x"), paramsContext({ id: w.chainId, commentId: comment.id }))).status).toBe(200);
  });

  it("sends no comment mail to someone who turned comment mails off", async () => {
    const w = world();
    saveUserSettings(w.editor.id, { notifyOnComments: false, notifyOnReviews: true });
    signInAs(w.reviewer);
    await post(jsonRequest("POST", "/x", { body: "hello" }), idContext(w.chainId));
    expect(sentMail.map((m) => m.to)).toEqual([w.owner.email]);
  });
});
