import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { requireUser } from "@/lib/auth/guard";
import { acceptFor } from "@/lib/review/accept";

type Context = { params: Promise<{ token: string }> };

/**
 * POST /api/invitations/:token/accept: the signed-in user takes the invitation (once; before it
 * expires; only with the address it was sent to). Answers where to go: the chain or the team.
 */
export const POST = apiRoute<Context>(async (_request, { params }) => {
  const { token } = await params;
  const user = await requireUser();
  const result = acceptFor(token, user);
  if (!result.ok) throw new ApiError(result.status, result.message);
  return Response.json({ accepted: true, location: result.to });
});
