import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { decideReview } from "@/db/queries/reviews";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";
import { reviewDecisionMail } from "@/lib/review/mails";
import { appOrigin, notifyUsers } from "@/lib/review/notify";
import { reviewsView } from "@/lib/review/reviews";

type Context = { params: Promise<{ id: string }> };

const decisionSchema = z.object({
  decision: z.enum(["approved", "changes-requested"], "approved or changes-requested"),
  note: z.string().trim().max(2000, "at most 2000 characters").default(""),
  version: z.int("the chain version you reviewed (an integer)").min(1),
});

/**
 * POST /api/chains/:id/reviews/decision `{ decision, note?, version }`: a chosen reviewer approves the
 * current revision or requests changes. 409 when the chain changed after `version` (look again), 403
 * for approving a revision one wrote oneself or when not asked to review.
 */
export const POST = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { user, chain } = await requireChain("review", id);
  const body = await parseBody(request, decisionSchema);
  const outcome = decideReview(id, user.id, body.decision, body.note, body.version);
  if (!outcome.ok) {
    if (outcome.reason === "not-requested") throw new ApiError(403, "You were not asked to review this chain (or the request was closed).");
    if (outcome.reason === "own-revision") throw new ApiError(403, "You wrote the current revision, so you cannot approve it: ask another reviewer.");
    throw new ApiError(409, "The chain changed after the version you reviewed. Look at the new version before deciding.", { currentVersion: outcome.currentVersion });
  }
  recordAudit({
    actorId: user.id,
    action: body.decision === "approved" ? "review.approve" : "review.request-changes",
    targetType: "chain",
    targetId: id,
    teamId: chain.teamId,
    details: { revision: outcome.revisionId, state: outcome.state },
  });
  if (outcome.requestedBy) {
    const url = `${appOrigin(request)}/chains/${id}`;
    await notifyUsers([outcome.requestedBy], "reviews", () =>
      reviewDecisionMail({ reviewer: user.name ?? user.email ?? "A reviewer", chain: chain.name, decision: body.decision, revision: outcome.revisionNumber, note: body.note, url }),
    );
  }
  return Response.json({ reviewState: outcome.state, revision: { id: outcome.revisionId, number: outcome.revisionNumber }, rounds: reviewsView(id) });
});
