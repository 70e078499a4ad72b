import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { insertChain, listChainsForUser } from "@/db/queries/chains";
import { checkDraftDocument, starterDraft, teamForNewChain } from "@/lib/api/chain-documents";
import { chainListState, chainView } from "@/lib/api/chain-view";
import { ValidationError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody, validate } from "@/lib/api/validate";
import { searchLibrary } from "@/db/queries/library";
import { libraryApiQuery } from "@/lib/api/library-query";
import { requireUser } from "@/lib/auth/guard";
import { chainActionsFor } from "@/lib/auth/permissions";

/**
 * GET /api/chains: every chain the caller may see, newest change first. With any of `q`, `teamId`,
 * `ownerId`, `reviewState`, `worstStatus`, `archived`, `sort`, `dir`, `page`, `pageSize` it answers
 * one page of the library, searched, filtered and sorted by the database, with `total`.
 */
export const GET = apiRoute(async (request: Request) => {
  const user = await requireUser();
  const url = new URL(request.url);
  if ([...url.searchParams.keys()].length > 0) {
    const parsed = validate(libraryApiQuery, Object.fromEntries(url.searchParams));
    if (!parsed.ok) throw new ValidationError(parsed.errors);
    const p = parsed.data;
    const page = searchLibrary(user.id, { ...p, archived: p.archived === "1" });
    return Response.json({
      chains: page.rows.map((c) => ({
        id: c.id,
        name: c.name,
        team: { id: c.teamId, name: c.teamName },
        owners: c.owners,
        ...chainListState(c),
        archived: c.archivedAt !== null,
      })),
      total: page.total,
      page: page.page,
      pageSize: page.pageSize,
    });
  }
  const chains = listChainsForUser(user.id).map((c) => ({
    id: c.id,
    name: c.name,
    team: { id: c.teamId, name: c.teamName },
    ...chainListState(c),
  }));
  return Response.json({ chains });
});

const createSchema = z.object({
  name: z.string().trim().min(1, "1–200 characters").max(200, "1–200 characters").optional(),
  teamId: z.string().min(1).max(64).optional(),
  document: z.unknown().optional(),
});

/**
 * POST /api/chains `{ name?, teamId?, document? }`: create a chain (draft-level checks) in the
 * given team, or in the caller's first team where they may create chains. The creator owns it.
 */
export const POST = apiRoute(async (request: Request) => {
  const user = await requireUser();
  const body = await parseBody(request, createSchema);
  const teamId = teamForNewChain(user.id, body.teamId);
  const document = body.document === undefined ? starterDraft(body.name ?? "Untitled chain") : body.document;
  const { draft, name } = checkDraftDocument(document, body.name);
  const chain = insertChain({ teamId, name, document: draft, userId: user.id });
  recordAudit({ actorId: user.id, action: "chain.create", targetType: "chain", targetId: chain.id, teamId });
  const rights = { teamRole: null, chainRole: "owner" as const, actions: chainActionsFor(null, "owner") };
  return Response.json({ chain: chainView(chain, rights, true) }, { status: 201, headers: { Location: `/api/chains/${chain.id}` } });
});
