import { env } from "@/lib/env";
import { jsonError } from "@/lib/api/errors";
import { messagesFor, readMessages } from "@/lib/mail/mailbox";
import { mailStandinEnabled } from "@/lib/mail/standin";

export const dynamic = "force-dynamic";

/** GET /api/mailbox[?to=address]: the stand-in's messages as JSON (404 unless MAIL_STANDIN=1). */
export async function GET(request: Request): Promise<Response> {
  if (!mailStandinEnabled()) return jsonError(404, "Not found.");
  const to = new URL(request.url).searchParams.get("to");
  const file = env().mailboxPath;
  return Response.json({ messages: to ? messagesFor(file, to) : readMessages(file) });
}
