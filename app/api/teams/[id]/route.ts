import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { listTeamPeople } from "@/db/queries/sharing";
import { getTeam, renameTeam } from "@/db/queries/team-admin";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireTeam } from "@/lib/auth/guard";
import { TEAM_ACTIONS } from "@/lib/auth/permissions";

type Context = { params: Promise<{ id: string }> };

/** GET /api/teams/:id: the team and its members (members only; others get 404). */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { actions } = await requireTeam("team:view", id);
  const team = getTeam(id)!;
  return Response.json({
    team: { id: team.id, name: team.name, personal: team.personal },
    actions: TEAM_ACTIONS.filter((a) => actions.has(a)),
    members: listTeamPeople(id),
  });
});

const renameSchema = z.object({ name: z.string().trim().min(1, "1–100 characters").max(100, "1–100 characters") });

/** PATCH /api/teams/:id `{ name }`: rename the team (admins). */
export const PATCH = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { user } = await requireTeam("team:manage", id);
  const { name } = await parseBody(request, renameSchema);
  renameTeam(id, name);
  recordAudit({ actorId: user.id, action: "team.rename", targetType: "team", targetId: id, teamId: id, details: { name } });
  const team = getTeam(id)!;
  return Response.json({ team: { id: team.id, name: team.name, personal: team.personal } });
});
