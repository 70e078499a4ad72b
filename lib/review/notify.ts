import "server-only";
import { getUserSettings } from "@/db/queries/settings";
import { usersByIds } from "@/db/queries/reviews";
import { env } from "@/lib/env";
import { sendMail } from "@/lib/mail/transport";
import type { MailContent } from "./mails";

/**
 * Where links in mails point: AUTH_URL when the deployment names its address, else the address the
 * request came in by (the local stand-in and the browser tests).
 */
export function appOrigin(request: Request): string {
  const configured = env().authUrl;
  if (configured) return new URL(configured).origin;
  return new URL(request.url).origin;
}

export type NotificationKind = "comments" | "reviews";

/**
 * Mail each user who has not turned this kind of mail off. A notification that cannot be sent is
 * logged, never a failed request: the comment or decision it tells of has been stored already.
 * Returns the ids mailed.
 */
export async function notifyUsers(userIds: string[], kind: NotificationKind, mail: (user: { id: string; name: string | null }) => MailContent): Promise<string[]> {
  const sent: string[] = [];
  for (const user of usersByIds([...new Set(userIds)])) {
    if (!user.email) continue;
    const settings = getUserSettings(user.id);
    if (kind === "comments" && !settings.notifyOnComments) continue;
    if (kind === "reviews" && !settings.notifyOnReviews) continue;
    try {
      await sendMail({ to: user.email, ...mail(user) });
      sent.push(user.id);
    } catch (err) {
      console.error(`[notify] ${kind} mail to user ${user.id} not sent:`, err instanceof Error ? err.message : err);
    }
  }
  return sent;
}
