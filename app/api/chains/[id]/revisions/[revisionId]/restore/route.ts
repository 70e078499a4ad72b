import { z } from "zod";
import { getRevision } from "@/db/queries/history";
import { chainView } from "@/lib/api/chain-view";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";
import { saveVersion } from "@/lib/history/save";

type Context = { params: Promise<{ id: string; revisionId: string }> };

const schema = z.object({ baseVersion: z.int("the version you are looking at (an integer)").min(1) });

/**
 * POST /api/chains/:id/revisions/:revisionId/restore `{ baseVersion }`: make an old revision's
 * document the chain's newest version, as a new revision (nothing in the history is removed).
 */
export const POST = apiRoute<Context>(async (request, { params }) => {
  const { id, revisionId } = await params;
  const { user, chain, ...rights } = await requireChain("edit", id);
  const { baseVersion } = await parseBody(request, schema);
  const old = getRevision(id, revisionId);
  if (!old) throw new ApiError(404, "No such revision of this chain.");
  const document = JSON.parse(old.document) as Record<string, unknown>;
  const saved = saveVersion({
    chainId: id,
    teamId: chain.teamId,
    baseVersion,
    document,
    name: typeof document.name === "string" ? document.name : chain.name,
    userId: user.id,
    summary: `Restored revision ${old.number}`,
    action: "chain.restore",
  });
  return Response.json(
    { chain: chainView(saved.chain, rights, true), revision: { id: saved.revision.id, number: saved.revision.number, summary: saved.revision.summary }, notice: saved.notice },
    { status: 201 },
  );
});
