import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { getChainShare } from "@/db/queries/sharing";
import { requestReview, withdrawReview } from "@/db/queries/reviews";
import { getTeamRole } from "@/db/queries/teams";
import { getChainRow } from "@/db/queries/chains";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";
import { canReview } from "@/lib/auth/permissions";
import { reviewRequestMail } from "@/lib/review/mails";
import { appOrigin, notifyUsers } from "@/lib/review/notify";
import { reviewsView } from "@/lib/review/reviews";

type Context = { params: Promise<{ id: string }> };

/** GET /api/chains/:id/reviews: the review state and every request with each reviewer's decision. */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { chain, user, actions } = await requireChain("view", id);
  return Response.json({
    reviewState: chain.reviewState,
    version: chain.version,
    rounds: reviewsView(id),
    me: { id: user.id, actions: [...actions] },
  });
});

const requestSchema = z.object({
  reviewerIds: z.array(z.string().min(1).max(64)).min(1, "choose at least one reviewer").max(20, "at most 20 reviewers"),
  note: z.string().trim().max(2000, "at most 2000 characters").default(""),
});

/**
 * POST /api/chains/:id/reviews `{ reviewerIds, note? }`: ask chosen people to review the current
 * revision (editors and owners). Every reviewer must be able to review this chain and must not be
 * the one asking. Each gets a mail.
 */
export const POST = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { user, chain } = await requireChain("edit", id);
  const body = await parseBody(request, requestSchema);
  const ids = [...new Set(body.reviewerIds)];
  const errors = ids
    .map((rid, i) => {
      if (rid === user.id) return { path: `reviewerIds[${i}]`, message: "you cannot review your own request" };
      if (!canReview(getTeamRole(rid, chain.teamId), getChainShare(id, rid))) return { path: `reviewerIds[${i}]`, message: "this person cannot review this chain (give them the reviewer role first)" };
      return null;
    })
    .filter((e): e is { path: string; message: string } => e !== null);
  if (errors.length) throw new ApiError(400, "Some reviewers cannot review this chain.", { errors });
  const round = requestReview({ chainId: id, requestedBy: user.id, reviewerIds: ids, note: body.note });
  recordAudit({ actorId: user.id, action: "review.request", targetType: "chain", targetId: id, teamId: chain.teamId, details: { reviewers: ids, revision: round.revisionId } });
  const url = `${appOrigin(request)}/chains/${id}`;
  const mailed = await notifyUsers(ids, "reviews", () =>
    reviewRequestMail({ requester: user.name ?? user.email ?? "A colleague", chain: chain.name, revision: round.revisionNumber, note: body.note, url }),
  );
  return Response.json({ reviewState: getChainRow(id)!.reviewState, revision: { id: round.revisionId, number: round.revisionNumber }, mailed: mailed.length, rounds: reviewsView(id) }, { status: 201 });
});

/** DELETE /api/chains/:id/reviews: withdraw the open request (editors and owners); the chain returns to draft. */
export const DELETE = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { user, chain } = await requireChain("edit", id);
  if (!withdrawReview(id)) throw new ApiError(409, "There is no open review request to withdraw.");
  recordAudit({ actorId: user.id, action: "review.withdraw", targetType: "chain", targetId: id, teamId: chain.teamId });
  return Response.json({ reviewState: "draft", rounds: reviewsView(id) });
});
