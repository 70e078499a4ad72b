import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { chainView } from "@/lib/api/chain-view";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";
import { assertChain, assertChainDelete } from "@/lib/auth/permissions";
import { archiveChain, moveChainTo } from "@/lib/review/library";
import { deleteChainWithFiles } from "@/lib/storage/chain-files";
import { saveVersion } from "@/lib/history/save";

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
 * someone saved since `baseVersion`, nothing is written and 409 names the current version. The save
 * is kept as a revision (autosaves by one author within minutes fold into one, lib/history); an
 * approved chain goes back to draft and `notice` says so.
 */
export const PUT = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { user, chain, ...rights } = await requireChain("edit", id);
  const body = await parseBody(request, saveSchema);
  const saved = saveVersion({ chainId: id, teamId: chain.teamId, baseVersion: body.baseVersion, document: body.document, name: body.name, userId: user.id, summary: body.summary });
  return Response.json({
    chain: chainView(saved.chain, rights, false),
    revision: { id: saved.revision.id, number: saved.revision.number, summary: saved.revision.summary, folded: saved.folded },
    notice: saved.notice,
  });
});

/**
 * DELETE /api/chains/:id: owners (and team admins) only; an approved chain only by an owner share. Its
 * attached files go with it, bytes included.
 */
export const DELETE = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { user, ...rights } = await requireChain("view", id);
  assertChainDelete(rights);
  const chain = rights.chain;
  await deleteChainWithFiles(id);
  recordAudit({ actorId: user.id, action: "chain.delete", targetType: "chain", targetId: id, teamId: chain.teamId, details: { name: chain.name } });
  return Response.json({ deleted: true, id });
});

const patchSchema = z
  .object({
    baseVersion: z.int("the version the change started from (an integer)").min(1).optional(),
    name: z.string().trim().min(1, "1–200 characters").max(200, "1–200 characters").optional(),
    archived: z.boolean().optional(),
    teamId: z.string().min(1).max(64).optional(),
  })
  .refine((b) => b.name !== undefined || b.archived !== undefined || b.teamId !== undefined, { message: "name, archived or teamId is required" })
  .refine((b) => b.name === undefined || b.baseVersion !== undefined, { path: ["baseVersion"], message: "a rename names the version it started from" });

/**
 * PATCH /api/chains/:id `{ name?, baseVersion?, archived?, teamId? }`: rename (an edit, kept as a
 * revision), archive or bring back (owners), move to another team (owners, who may also create
 * chains in the team it goes to).
 */
export const PATCH = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { user, ...rights } = await requireChain("view", id);
  const body = await parseBody(request, patchSchema);
  let chain = rights.chain;
  if (body.name !== undefined && body.name !== chain.name) {
    assertChain(user.id, "edit", id);
    const document = { ...(JSON.parse(chain.document) as Record<string, unknown>), name: body.name };
    chain = saveVersion({ chainId: id, teamId: chain.teamId, baseVersion: body.baseVersion!, document, name: body.name, userId: user.id, summary: `Renamed to “${body.name}”`, action: "chain.rename" }).chain;
  }
  if (body.teamId !== undefined && body.teamId !== chain.teamId) {
    chain = moveChainTo(user.id, rights, body.teamId);
  }
  if (body.archived !== undefined && body.archived !== (chain.archivedAt !== null)) {
    chain = archiveChain(user.id, rights, body.archived);
  }
  return Response.json({ chain: chainView(chain, rights, false) });
});
