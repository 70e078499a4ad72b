import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { insertChain } from "@/db/queries/chains";
import { checkDraftDocument, teamForNewChain } from "@/lib/api/chain-documents";
import { chainView } from "@/lib/api/chain-view";
import { ValidationError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireUser } from "@/lib/auth/guard";
import { chainActionsFor } from "@/lib/auth/permissions";
import { validateChain } from "@/lib/chain/schema";
import { KIND_WORDS } from "@/lib/chain/params";
import type { DraftChain, NodeKind } from "@/lib/chain/types";

const importSchema = z.object({
  /** the chain document: parsed JSON, or the file's text */
  document: z.unknown().refine((d) => d !== undefined, "the chain document is required (the file's JSON)"),
  teamId: z.string().min(1).max(64).optional(),
  /** true: check and describe only, write nothing */
  preview: z.boolean().optional(),
});

/** The file's text read as JSON, or 400 naming `document`. */
function readDocument(doc: unknown): unknown {
  if (typeof doc !== "string") return doc;
  try {
    return JSON.parse(doc) as unknown;
  } catch (e) {
    throw new ValidationError([{ path: "document", message: `is not JSON (${e instanceof Error ? e.message.slice(0, 120) : "unreadable"})` }]);
  }
}

/** What the preview shows: name, counts per kind, and whether (and why not) it is complete. */
function describe(draft: DraftChain) {
  const kinds: Record<string, number> = {};
  for (const n of draft.nodes) kinds[n.kind] = (kinds[n.kind] ?? 0) + 1;
  const complete = validateChain(draft);
  return {
    name: draft.name,
    notes: draft.notes,
    nodes: draft.nodes.length,
    edges: draft.edges.length,
    parts: Object.keys(draft.parts).length,
    kinds: Object.entries(kinds).map(([kind, count]) => ({ kind, words: KIND_WORDS[kind as NodeKind] ?? kind, count })),
    complete: complete.ok,
    // a draft imports as it is; these say what it still needs before it can be analysed whole
    incomplete: complete.ok ? [] : complete.errors.map((e) => ({ path: e.path ? `document.${e.path}` : "document", message: e.message })),
  };
}

/**
 * POST /api/chains/import `{ document, teamId?, preview? }`: take a `chainwright.chain/1` file back in.
 * The document is checked at draft level; any problem refuses it whole with 400 and every field named
 * (`document.nodes[1].params.r1`). With `preview: true` nothing is written and the answer describes the
 * chain; otherwise it becomes a new chain (row, owner share and first revision in one transaction) in
 * the given team or the caller's first team where they may create chains.
 */
export const POST = apiRoute(async (request: Request) => {
  const user = await requireUser();
  const body = await parseBody(request, importSchema);
  const teamId = teamForNewChain(user.id, body.teamId);
  const { draft, name } = checkDraftDocument(readDocument(body.document), undefined);
  const preview = describe(draft as DraftChain);
  if (body.preview) return Response.json({ preview, teamId });
  const chain = insertChain({ teamId, name, document: draft, userId: user.id, summary: "Imported from a chain file" });
  recordAudit({ actorId: user.id, action: "chain.import", targetType: "chain", targetId: chain.id, teamId });
  const rights = { teamRole: null, chainRole: "owner" as const, actions: chainActionsFor(null, "owner") };
  return Response.json({ chain: chainView(chain, rights, false), preview }, { status: 201, headers: { Location: `/api/chains/${chain.id}` } });
});
