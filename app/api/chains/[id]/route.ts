import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { deleteChainRow, saveChainVersion } from "@/db/queries/chains";
import { checkDraftDocument } from "@/lib/api/chain-documents";
import { chainView } from "@/lib/api/chain-view";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";

type Context = { params: Promise<{ id: string }> };

/** GET /api/chains/:id: the chain with its document, the caller's role and allowed actions. */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { chain, ...rights } = await requireChain("view", id);
  return Response.json({ chain: chainView(chain, rights, true) });
});

const saveSchema = z.object({
  baseVersion: z.int("the version the edit started from (an integer)").min(1),
  document: z.unknown().refine((d) => d !== undefined, "the chain document is required"),
  name: z.string().trim().min(1, "1–200 characters").max(200, "1–200 characters").optional(),
  summary: z.string().max(500, "at most 500 characters").optional(),
});

/**
 * PUT /api/chains/:id `{ baseVersion, document, name?, summary? }`: save a new version. If
 * someone saved since `baseVersion`, nothing is written and 409 names the current version.
 */
export const PUT = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { user, chain, ...rights } = await requireChain("edit", id);
  const body = await parseBody(request, saveSchema);
  const { draft, name } = checkDraftDocument(body.document, body.name);
  const outcome = saveChainVersion({ id, baseVersion: body.baseVersion, name, document: draft, userId: user.id, summary: body.summary });
  if (!outcome.ok) {
    if (outcome.reason === "missing") throw new ApiError(404, "No such chain.");
    throw new ApiError(409, "Someone saved this chain after the version you started from. Reload it and apply your change again.", {
      currentVersion: outcome.currentVersion,
      baseVersion: body.baseVersion,
    });
  }
  recordAudit({
    actorId: user.id,
    action: "chain.save",
    targetType: "chain",
    targetId: id,
    teamId: chain.teamId,
    details: { version: outcome.chain.version },
  });
  return Response.json({ chain: chainView(outcome.chain, rights, false) });
});

/** DELETE /api/chains/:id: owners (and team admins) only. */
export const DELETE = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { user, chain } = await requireChain("delete", id);
  deleteChainRow(id);
  recordAudit({ actorId: user.id, action: "chain.delete", targetType: "chain", targetId: id, teamId: chain.teamId, details: { name: chain.name } });
  return Response.json({ deleted: true, id });
});
