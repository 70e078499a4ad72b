import { findInvitationByToken } from "@/db/queries/invitations";
import { jsonError } from "@/lib/api/errors";

type Context = { params: Promise<{ token: string }> };

/**
 * GET /api/invitations/:token: what an invitation link is for (whoever holds the link may ask; it was
 * mailed to them). Only its state, target name, role and the address it is bound to; 404 for a token
 * that opens nothing.
 */
export async function GET(_request: Request, { params }: Context): Promise<Response> {
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
}
