import { recordAudit } from "@/db/queries/audit";
import { revokeInvitation } from "@/db/queries/invitations";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { requireChain } from "@/lib/auth/guard";

type Context = { params: Promise<{ id: string; invitationId: string }> };

/** DELETE /api/chains/:id/invitations/:invitationId: withdraw an unused invitation (owners). */
export const DELETE = apiRoute<Context>(async (_request, { params }) => {
  const { id, invitationId } = await params;
  const { user, chain } = await requireChain("share", id);
  if (!revokeInvitation(invitationId, { chainId: id })) throw new ApiError(404, "No such open invitation on this chain.");
  recordAudit({ actorId: user.id, action: "invitation.revoke", targetType: "chain", targetId: id, teamId: chain.teamId, details: { invitation: invitationId } });
  return Response.json({ revoked: true });
});
