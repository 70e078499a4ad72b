import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { listPendingInvitations } from "@/db/queries/invitations";
import { CHAIN_ROLES } from "@/lib/domain";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";
import { sendInvitation } from "@/lib/review/invite";

type Context = { params: Promise<{ id: string }> };

function pending(chainId: string) {
  return listPendingInvitations({ chainId }).map((i) => ({ ...i, createdAt: i.createdAt.toISOString(), expiresAt: i.expiresAt.toISOString() }));
}

/** GET /api/chains/:id/invitations: invitations that can still be used (owners). */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  await requireChain("share", id);
  return Response.json({ invitations: pending(id) });
});

const inviteSchema = z.object({
  email: z.email("an e-mail address like name@example.com").max(320),
  role: z.enum(CHAIN_ROLES, "one of owner, editor, reviewer, viewer"),
});

/**
 * POST /api/chains/:id/invitations `{ email, role }`: mail a single-use link, bound to that address
 * and expiring in 7 days, that gives the role on this chain (and lets someone without an account
 * sign up). Rate-limited per sender and per address (429).
 */
export const POST = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { user, chain } = await requireChain("share", id);
  const body = await parseBody(request, inviteSchema);
  const invitation = await sendInvitation({
    request,
    email: body.email,
    target: { chainId: id, teamId: chain.teamId, role: body.role },
    what: { kind: "chain", name: chain.name },
    inviter: user,
  });
  recordAudit({ actorId: user.id, action: "invitation.send", targetType: "chain", targetId: id, teamId: chain.teamId, details: { invitation: invitation.id, email: invitation.email, role: body.role } });
  return Response.json({ invitation: { id: invitation.id, email: invitation.email, role: invitation.role, expiresAt: invitation.expiresAt.toISOString() }, invitations: pending(id) }, { status: 201 });
});
