import { listRevisions } from "@/db/queries/history";
import { apiRoute } from "@/lib/api/handler";
import { requireChain } from "@/lib/auth/guard";

type Context = { params: Promise<{ id: string }> };

/** GET /api/chains/:id/revisions: every revision, newest first, with author, time, summary and pin. */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { chain } = await requireChain("view", id);
  const revisions = listRevisions(id).map((r) => ({
    ...r,
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt ? r.updatedAt.toISOString() : null,
  }));
  return Response.json({ version: chain.version, revisions });
});
