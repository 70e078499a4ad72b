import { describe, expect, it, vi } from "vitest";
import { idContext, jsonRequest, paramsContext, sessionModule, signInAs } from "./session-mock";
import { clearMail, lastLinkTo, mailModule, sentMail } from "./mail-mock";

vi.mock("@/lib/auth/session", () => sessionModule);
vi.mock("@/lib/mail/transport", () => mailModule);

import { GET as listMembers, POST as addMember } from "@/app/api/chains/[id]/members/route";
import { DELETE as removeMember, PATCH as changeMember } from "@/app/api/chains/[id]/members/[userId]/route";
import { POST as invite } from "@/app/api/chains/[id]/invitations/route";
import { GET as readInvitation } from "@/app/api/invitations/[token]/route";
import { POST as accept } from "@/app/api/invitations/[token]/accept/route";
import { GET as getChain } from "@/app/api/chains/[id]/route";
import { getDb } from "@/db/connection";
import { acceptInvitation, createInvitation, hashToken, INVITATION_TTL_MS } from "@/db/queries/invitations";
import { INVITES_PER_ADDRESS_PER_HOUR } from "@/lib/review/invite";
import { auditLog, invitations } from "@/db/schema";
import { makeChain, makeTeam, makeUser, share } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest(clearMail);

function world() {
  const owner = makeUser("owner");
  const colleague = makeUser("colleague");
  const teamId = makeTeam("Keel", [
    [owner, "engineer"],
    [colleague, "engineer"],
  ]);
  const chainId = makeChain(teamId, owner, "Channel A");
  return { owner, colleague, teamId, chainId };
}

describe("invitations to a chain", () => {
  it("mails a link whose token is not stored, and the invitee gets the role once", async () => {
    const w = world();
    const guest = makeUser("guest");
    signInAs(w.owner);
    const res = await invite(jsonRequest("POST", "/x", { email: guest.email!.toUpperCase(), role: "reviewer" }), idContext(w.chainId));
    expect(res.status).toBe(201);
    expect(sentMail).toHaveLength(1);
    expect(sentMail[0].to).toBe(guest.email);
    const link = lastLinkTo(guest.email!)!;
    expect(link).toMatch(/^http:\/\/localhost\/invitation\/[A-Za-z0-9_-]{43}$/);
    const token = link.split("/").pop()!;
    const stored = getDb().select().from(invitations).all();
    expect(stored).toHaveLength(1);
    expect(stored[0].tokenHash).toBe(hashToken(token));
    expect(JSON.stringify(stored)).not.toContain(token);

    const info = await (await readInvitation(jsonRequest("GET", "/x"), paramsContext({ token }))).json();
    expect(info.invitation).toMatchObject({ state: "open", role: "reviewer", kind: "chain", name: "Channel A" });

    signInAs(guest);
    const ok = await accept(jsonRequest("POST", "/x"), paramsContext({ token }));
    expect(ok.status).toBe(200);
    expect((await ok.json()).location).toBe(`/chains/${w.chainId}`);
    const chain = await (await getChain(jsonRequest("GET", "/x"), idContext(w.chainId))).json();
    expect(chain.chain.role).toBe("reviewer");
    const again = await accept(jsonRequest("POST", "/x"), paramsContext({ token }));
    expect(again.status).toBe(409);
    const after = await (await readInvitation(jsonRequest("GET", "/x"), paramsContext({ token }))).json();
    expect(after.invitation).toMatchObject({ state: "used", name: null });
    const actions = getDb().select().from(auditLog).all().map((a) => a.action);
    expect(actions).toEqual(expect.arrayContaining(["invitation.send", "invitation.accept"]));
  });

  it("is bound to the address it was sent to", async () => {
    const w = world();
    const { token } = createInvitation("someone.else@test.example", { chainId: w.chainId, teamId: w.teamId, role: "editor" }, w.owner.id);
    signInAs(w.colleague);
    const res = await accept(jsonRequest("POST", "/x"), paramsContext({ token }));
    expect(res.status).toBe(403);
    expect((await res.json()).error).toMatch(/another e-mail address/);
  });

  it("expires, and an unknown token opens nothing", async () => {
    const w = world();
    const guest = makeUser("guest");
    const sent = new Date(Date.now() - INVITATION_TTL_MS - 1000);
    const { token } = createInvitation(guest.email!, { chainId: w.chainId, teamId: w.teamId, role: "viewer" }, w.owner.id, sent);
    signInAs(guest);
    expect((await accept(jsonRequest("POST", "/x"), paramsContext({ token }))).status).toBe(410);
    expect((await accept(jsonRequest("POST", "/x"), paramsContext({ token: "not-a-token" }))).status).toBe(404);
    expect((await readInvitation(jsonRequest("GET", "/x"), paramsContext({ token: "not-a-token" }))).status).toBe(404);
  });

  it("cannot be used twice even by two requests at once", () => {
    const w = world();
    const guest = makeUser("guest");
    const { token } = createInvitation(guest.email!, { chainId: w.chainId, teamId: w.teamId, role: "viewer" }, w.owner.id);
    const results = [acceptInvitation(token, guest), acceptInvitation(token, guest)];
    expect(results.map((r) => r.ok)).toEqual([true, false]);
  });

  it("keeps a stronger share the invitee already holds", () => {
    const w = world();
    const { token } = createInvitation(w.owner.email!, { chainId: w.chainId, teamId: w.teamId, role: "viewer" }, w.colleague.id);
    const r = acceptInvitation(token, w.owner);
    expect(r).toMatchObject({ ok: true, granted: "owner" });
  });

  it("limits how many invitations one address receives in an hour (429)", async () => {
    const w = world();
    signInAs(w.owner);
    for (let i = 0; i < INVITES_PER_ADDRESS_PER_HOUR; i++) {
      expect((await invite(jsonRequest("POST", "/x", { email: "popular@test.example", role: "viewer" }), idContext(w.chainId))).status).toBe(201);
    }
    const refused = await invite(jsonRequest("POST", "/x", { email: "popular@test.example", role: "viewer" }), idContext(w.chainId));
    expect(refused.status).toBe(429);
    expect((await refused.json()).retryAfterSeconds).toBeGreaterThan(0);
    expect(sentMail).toHaveLength(INVITES_PER_ADDRESS_PER_HOUR);
  });

  it("makes no invitation when the mail cannot be sent", async () => {
    const w = world();
    signInAs(w.owner);
    mailModule.sendMail.mockRejectedValueOnce(new Error("smtp down"));
    const res = await invite(jsonRequest("POST", "/x", { email: "later@test.example", role: "viewer" }), idContext(w.chainId));
    expect(res.status).toBe(502);
    expect(getDb().select().from(invitations).all()).toEqual([]);
  });

  it("answers 400 naming the field for a bad address or role", async () => {
    const w = world();
    signInAs(w.owner);
    const res = await invite(jsonRequest("POST", "/x", { email: "nope", role: "boss" }), idContext(w.chainId));
    expect(res.status).toBe(400);
    expect((await res.json()).errors.map((e: { path: string }) => e.path).sort()).toEqual(["email", "role"]);
  });
});

describe("shares", () => {
  it("adds a team member directly, changes and removes roles, and never leaves the chain without an owner", async () => {
    const w = world();
    signInAs(w.owner);
    expect((await addMember(jsonRequest("POST", "/x", { userId: w.colleague.id, role: "editor" }), idContext(w.chainId))).status).toBe(201);
    expect((await addMember(jsonRequest("POST", "/x", { userId: w.colleague.id, role: "viewer" }), idContext(w.chainId))).status).toBe(409);
    const outsider = makeUser("outsider");
    expect((await addMember(jsonRequest("POST", "/x", { userId: outsider.id, role: "viewer" }), idContext(w.chainId))).status).toBe(400);
    const lastOwner = await changeMember(jsonRequest("PATCH", "/x", { role: "viewer" }), paramsContext({ id: w.chainId, userId: w.owner.id }));
    expect(lastOwner.status).toBe(409);
    expect((await removeMember(jsonRequest("DELETE", "/x"), paramsContext({ id: w.chainId, userId: w.owner.id }))).status).toBe(409);
    expect((await changeMember(jsonRequest("PATCH", "/x", { role: "owner" }), paramsContext({ id: w.chainId, userId: w.colleague.id }))).status).toBe(200);
    expect((await changeMember(jsonRequest("PATCH", "/x", { role: "viewer" }), paramsContext({ id: w.chainId, userId: w.owner.id }))).status).toBe(200);
    signInAs(w.colleague);
    const list = await (await listMembers(jsonRequest("GET", "/x"), idContext(w.chainId))).json();
    expect(list.members.map((m: { role: string }) => m.role)).toEqual(["owner", "viewer"]);
    const actions = getDb().select().from(auditLog).all().map((a) => a.action);
    expect(actions).toEqual(expect.arrayContaining(["share.add", "share.role"]));
  });

  it("shows a guest outside the team the chain's members but no team candidates", async () => {
    const w = world();
    const guest = makeUser("guest");
    share(w.chainId, guest, "owner");
    signInAs(guest);
    const body = await (await listMembers(jsonRequest("GET", "/x"), idContext(w.chainId))).json();
    expect(body.candidates).toBeUndefined();
    expect(JSON.stringify(body)).not.toContain(w.colleague.email);
  });
});
