import "server-only";
import { takeRateToken } from "@/db/queries/rate-limit";
import { createInvitation, revokeInvitation, type InvitationTarget } from "@/db/queries/invitations";
import { normalizeEmail } from "@/db/queries/users";
import { ApiError } from "@/lib/api/errors";
import { sendMail } from "@/lib/mail/transport";
import { invitationMail } from "./mails";
import { appOrigin } from "./notify";

/** Invitations one person may send per hour, and invitations one address may receive per hour. */
export const INVITES_PER_SENDER_PER_HOUR = 20;
export const INVITES_PER_ADDRESS_PER_HOUR = 5;
const HOUR = 60 * 60 * 1000;

/**
 * Record an invitation and mail its link. Both rate limits are taken first (a refused request leaves
 * no invitation); a mail that cannot be sent withdraws the invitation again, so no live link exists
 * that nobody received.
 */
export async function sendInvitation(input: {
  request: Request;
  email: string;
  target: InvitationTarget;
  what: { kind: "chain" | "team"; name: string };
  inviter: { id: string; name: string | null; email: string | null };
}) {
  const email = normalizeEmail(input.email);
  for (const [key, limit] of [
    [`invite-by:${input.inviter.id}`, INVITES_PER_SENDER_PER_HOUR],
    [`invite-to:${email}`, INVITES_PER_ADDRESS_PER_HOUR],
  ] as const) {
    const decision = takeRateToken(key, limit, HOUR);
    if (!decision.allowed) {
      throw new ApiError(429, "Too many invitations in the last hour; try again later.", { retryAfterSeconds: Math.ceil(decision.retryAfterMs / 1000) });
    }
  }
  const { invitation, token } = createInvitation(email, input.target, input.inviter.id);
  const url = `${appOrigin(input.request)}/invitation/${token}`;
  const scope = input.target.chainId ? { chainId: input.target.chainId } : { teamId: input.target.teamId };
  try {
    await sendMail({
      to: email,
      ...invitationMail({ inviter: input.inviter.name ?? input.inviter.email ?? "A colleague", what: input.what, role: input.target.role, url, email, expiresAt: invitation.expiresAt }),
    });
  } catch (err) {
    revokeInvitation(invitation.id, scope);
    console.error("[invite] mail not sent:", err instanceof Error ? err.message : err);
    throw new ApiError(502, "The invitation mail could not be sent, so no invitation was made. Try again in a moment.");
  }
  return invitation;
}
