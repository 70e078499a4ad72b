import { listUserTeams } from "@/db/queries/teams";
import { apiRoute } from "@/lib/api/handler";
import { requireUser } from "@/lib/auth/guard";
import { TEAM_ACTIONS, teamActionsFor } from "@/lib/auth/permissions";

/** GET /api/teams: the caller's teams, with their role and what it allows. */
export const GET = apiRoute(async () => {
  const user = await requireUser();
  const teams = listUserTeams(user.id).map((t) => {
    const allowed = teamActionsFor(t.role);
    return { ...t, actions: TEAM_ACTIONS.filter((a) => allowed.has(a)) };
  });
  return Response.json({ teams });
});
