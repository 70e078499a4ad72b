import "server-only";
import { recordAudit } from "@/db/queries/audit";
import { acceptInvitation, type AcceptOutcome } from "@/db/queries/invitations";

export const ACCEPT_REFUSALS: Record<Exclude<AcceptOutcome, { ok: true }>["reason"], { status: 403 | 404 | 409 | 410; message: string }> = {
  unknown: { status: 404, message: "This invitation link is not valid." },
  used: { status: 409, message: "This invitation has already been used. Each link works once." },
  expired: { status: 410, message: "This invitation has expired. Ask whoever invited you to send a new one." },
  "wrong-address": { status: 403, message: "This invitation was sent to another e-mail address. Sign in with that address to accept it." },
};

/** Accept an invitation for a signed-in user, with its audit line; where to go next on success. */
export function acceptFor(token: string, user: { id: string; email: string | null }): { ok: true; to: string } | { ok: false; status: number; message: string } {
  const outcome = acceptInvitation(token, user);
  if (!outcome.ok) return { ok: false, ...ACCEPT_REFUSALS[outcome.reason] };
  const inv = outcome.invitation;
  recordAudit({
    actorId: user.id,
    action: "invitation.accept",
    targetType: inv.chainId ? "chain" : "team",
    targetId: inv.chainId ?? inv.teamId,
    teamId: inv.teamId,
    details: { invitation: inv.id, role: outcome.granted },
  });
  return { ok: true, to: inv.chainId ? `/chains/${inv.chainId}` : `/teams/${inv.teamId}` };
}
