import { recordAudit } from "@/db/queries/audit";
import { revokeInvitation } from "@/db/queries/invitations";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { requireTeam } from "@/lib/auth/guard";

type Context = { params: Promise<{ id: string; invitationId: string }> };

/** DELETE /api/teams/:id/invitations/:invitationId: withdraw an open team invitation (admins). */
export const DELETE = apiRoute<Context>(async (_request, { params }) => {
  const { id, invitationId } = await params;
  const { user } = await requireTeam("team:manage", id);
  if (!revokeInvitation(invitationId, { teamId: id })) throw new ApiError(404, "No such open invitation in this team.");
  recordAudit({ actorId: user.id, action: "invitation.revoke", targetType: "team", targetId: id, teamId: id, details: { invitation: invitationId } });
  return Response.json({ revoked: true });
});
