import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { listTeamPeople } from "@/db/queries/sharing";
import { changeTeamMember } from "@/db/queries/team-admin";
import { TEAM_ROLES } from "@/lib/domain";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireTeam } from "@/lib/auth/guard";

type Context = { params: Promise<{ id: string; userId: string }> };

const roleSchema = z.object({ role: z.enum(TEAM_ROLES, "one of admin, engineer, reviewer") });

function refuse(reason: "missing" | "last-admin"): never {
  if (reason === "missing") throw new ApiError(404, "That person is not a member of this team.");
  throw new ApiError(409, "A team keeps at least one admin: make someone else admin first.");
}

/** PATCH /api/teams/:id/members/:userId `{ role }`: change a member's team role (admins). */
export const PATCH = apiRoute<Context>(async (request, { params }) => {
  const { id, userId } = await params;
  const { user } = await requireTeam("team:manage", id);
  const { role } = await parseBody(request, roleSchema);
  const change = changeTeamMember(id, userId, role);
  if (!change.ok) refuse(change.reason);
  recordAudit({ actorId: user.id, action: "team.role", targetType: "team", targetId: id, teamId: id, details: { userId, from: change.previous, to: role } });
  return Response.json({ members: listTeamPeople(id) });
});

/** DELETE /api/teams/:id/members/:userId: remove a member (admins). Their own chain shares stay. */
export const DELETE = apiRoute<Context>(async (_request, { params }) => {
  const { id, userId } = await params;
  const { user } = await requireTeam("team:manage", id);
  const change = changeTeamMember(id, userId, null);
  if (!change.ok) refuse(change.reason);
  recordAudit({ actorId: user.id, action: "team.remove", targetType: "team", targetId: id, teamId: id, details: { userId, role: change.previous } });
  return Response.json({ members: listTeamPeople(id) });
});
