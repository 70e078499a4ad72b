import { env } from "@/lib/env";
import { jsonError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { messagesFor, readMessages } from "@/lib/mail/mailbox";
import { mailStandinEnabled } from "@/lib/mail/standin";

export const dynamic = "force-dynamic";

/**
 * GET /api/mailbox[?to=address]: the stand-in's messages as JSON (404 unless MAIL_STANDIN=1). No
 * sign-in: it is the inbox of a local trial, which is how a trial user reads their sign-in link; the
 * server warns at start when it is switched on in production.
 */
export const GET = apiRoute(async (request: Request) => {
  if (!mailStandinEnabled()) return jsonError(404, "Not found.");
  const to = new URL(request.url).searchParams.get("to");
  const file = env().mailboxPath;
  return Response.json({ messages: to ? messagesFor(file, to) : readMessages(file) });
});
