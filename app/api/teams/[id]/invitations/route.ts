import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { listPendingInvitations } from "@/db/queries/invitations";
import { getTeam } from "@/db/queries/team-admin";
import { TEAM_ROLES } from "@/lib/domain";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireTeam } from "@/lib/auth/guard";
import { sendInvitation } from "@/lib/review/invite";

type Context = { params: Promise<{ id: string }> };

function pending(teamId: string) {
  return listPendingInvitations({ teamId }).map((i) => ({ ...i, createdAt: i.createdAt.toISOString(), expiresAt: i.expiresAt.toISOString() }));
}

/** GET /api/teams/:id/invitations: open team invitations (admins). */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  await requireTeam("team:manage", id);
  return Response.json({ invitations: pending(id) });
});

const inviteSchema = z.object({
  email: z.email("an e-mail address like name@example.com").max(320),
  role: z.enum(TEAM_ROLES, "one of admin, engineer, reviewer"),
});

/** POST /api/teams/:id/invitations `{ email, role }`: invite someone to the team by e-mail (admins; rate-limited). */
export const POST = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { user } = await requireTeam("team:manage", id);
  const body = await parseBody(request, inviteSchema);
  const team = getTeam(id)!;
  const invitation = await sendInvitation({ request, email: body.email, target: { chainId: null, teamId: id, role: body.role }, what: { kind: "team", name: team.name }, inviter: user });
  recordAudit({ actorId: user.id, action: "invitation.send", targetType: "team", targetId: id, teamId: id, details: { invitation: invitation.id, email: invitation.email, role: body.role } });
  return Response.json({ invitation: { id: invitation.id, email: invitation.email, role: invitation.role, expiresAt: invitation.expiresAt.toISOString() }, invitations: pending(id) }, { status: 201 });
});
