import { findInvitationByToken } from "@/db/queries/invitations";
import { jsonError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";

type Context = { params: Promise<{ token: string }> };

/**
 * GET /api/invitations/:token: what an invitation link is for (whoever holds the link may ask; it was
 * mailed to them). Only its state, target name, role and the address it is bound to; 404 for a token
 * that opens nothing. No session is needed: the token itself is the credential, so there is no
 * permission check beyond finding it.
 */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { token } = await params;
  const view = findInvitationByToken(token);
  if (!view) return jsonError(404, "This invitation link is not valid.");
  const inv = view.invitation;
  return Response.json({
    invitation: {
      state: view.state,
      email: inv.email,
      role: inv.role,
      kind: inv.chainId ? "chain" : "team",
      name: view.state === "open" ? (inv.chainId ? view.chainName : view.teamName) : null,
      invitedBy: view.state === "open" ? view.invitedByName : null,
      expiresAt: inv.expiresAt.toISOString(),
    },
  });
});
