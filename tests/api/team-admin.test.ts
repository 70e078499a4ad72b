import { describe, expect, it, vi } from "vitest";
import { idContext, jsonRequest, paramsContext, sessionModule, signInAs } from "./session-mock";
import { clearMail, lastLinkTo, mailModule, sentMail } from "./mail-mock";

vi.mock("@/lib/auth/session", () => sessionModule);
vi.mock("@/lib/mail/transport", () => mailModule);

import { GET as getTeam } from "@/app/api/teams/[id]/route";
import { DELETE as removeMember, PATCH as changeRole } from "@/app/api/teams/[id]/members/[userId]/route";
import { POST as invite } from "@/app/api/teams/[id]/invitations/route";
import { POST as accept } from "@/app/api/invitations/[token]/accept/route";
import { getTeamRole } from "@/db/queries/teams";
import { getDb } from "@/db/connection";
import { auditLog } from "@/db/schema";
import { makeTeam, makeUser } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest(clearMail);

describe("team administration", () => {
  it("changes roles and removes members, keeping at least one admin, with audit lines", async () => {
    const admin = makeUser("admin");
    const eng = makeUser("eng");
    const teamId = makeTeam("Keel", [
      [admin, "admin"],
      [eng, "engineer"],
    ]);
    signInAs(admin);
    expect((await changeRole(jsonRequest("PATCH", "/x", { role: "engineer" }), paramsContext({ id: teamId, userId: admin.id }))).status).toBe(409);
    expect((await changeRole(jsonRequest("PATCH", "/x", { role: "reviewer" }), paramsContext({ id: teamId, userId: eng.id }))).status).toBe(200);
    expect(getTeamRole(eng.id, teamId)).toBe("reviewer");
    expect((await changeRole(jsonRequest("PATCH", "/x", { role: "boss" }), paramsContext({ id: teamId, userId: eng.id }))).status).toBe(400);
    expect((await removeMember(jsonRequest("DELETE", "/x"), paramsContext({ id: teamId, userId: eng.id }))).status).toBe(200);
    expect(getTeamRole(eng.id, teamId)).toBeNull();
    expect((await removeMember(jsonRequest("DELETE", "/x"), paramsContext({ id: teamId, userId: eng.id }))).status).toBe(404);
    const actions = getDb().select().from(auditLog).all().map((a) => a.action);
    expect(actions).toEqual(["team.role", "team.remove"]);
  });

  it("invites someone to the team by e-mail; the invitee joins with the invited role", async () => {
    const admin = makeUser("admin");
    const newcomer = makeUser("newcomer");
    const teamId = makeTeam("Keel", [[admin, "admin"]]);
    signInAs(admin);
    expect((await invite(jsonRequest("POST", "/x", { email: newcomer.email, role: "engineer" }), idContext(teamId))).status).toBe(201);
    expect(sentMail[0].subject).toBe(`${admin.name} invited you to Keel on Chainwright`);
    const token = lastLinkTo(newcomer.email!)!.split("/").pop()!;
    signInAs(newcomer);
    const res = await accept(jsonRequest("POST", "/x"), paramsContext({ token }));
    expect((await res.json()).location).toBe(`/teams/${teamId}`);
    expect(getTeamRole(newcomer.id, teamId)).toBe("engineer");
    const team = await (await getTeam(jsonRequest("GET", "/x"), idContext(teamId))).json();
    expect(team.members.map((m: { email: string }) => m.email).sort()).toEqual([admin.email, newcomer.email].sort());
  });
});
