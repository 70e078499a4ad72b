import { getRevision } from "@/db/queries/history";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { requireChain } from "@/lib/auth/guard";

type Context = { params: Promise<{ id: string; revisionId: string }> };

/** GET /api/chains/:id/revisions/:revisionId: one revision with its document. */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id, revisionId } = await params;
  await requireChain("view", id);
  const r = getRevision(id, revisionId);
  if (!r) throw new ApiError(404, "No such revision of this chain.");
  return Response.json({
    revision: { id: r.id, number: r.number, summary: r.summary, pinned: r.pinned, authorId: r.authorId, createdAt: r.createdAt.toISOString(), document: JSON.parse(r.document) as unknown },
  });
});
