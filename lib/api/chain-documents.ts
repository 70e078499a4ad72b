import "server-only";
import { listUserTeams } from "@/db/queries/teams";
import { assertTeam, teamRights } from "@/lib/auth/permissions";
import { validateDraft } from "@/lib/chain/schema";
import { CHAIN_FORMAT } from "@/lib/chain/types";
import { ApiError, ValidationError, type FieldError } from "./errors";

/** The smallest draft a new chain starts from when no document is given. */
export function starterDraft(name: string): Record<string, unknown> {
  return { format: CHAIN_FORMAT, name, notes: "", nodes: [], edges: [] };
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

/**
 * Check a chain document at draft level (what the workspace may save mid-sketch). The chain's
 * name lives in the document; a separate `name` in the request wins and is written into it.
 * Errors come back with paths under `document.` so a client can find the field.
 */
export function checkDraftDocument(document: unknown, name: string | undefined): { draft: unknown; name: string } {
  let doc = document;
  if (name !== undefined && isRecord(doc)) doc = { ...doc, name };
  const result = validateDraft(doc);
  if (!result.ok) {
    const errors: FieldError[] = result.errors.map((e) => ({ path: e.path ? `document.${e.path}` : "document", message: e.message }));
    throw new ValidationError(errors);
  }
  const draft = result.draft as unknown;
  const draftName = isRecord(draft) && typeof draft.name === "string" ? draft.name : name;
  if (!draftName) throw new ValidationError([{ path: "name", message: "a chain needs a name (1–200 characters)" }]);
  return { draft, name: draftName };
}

/**
 * The team a new chain goes into: the one named, if the caller may create chains there (else the
 * permission module's refusal), or the caller's first team where they may.
 */
export function teamForNewChain(userId: string, teamId: string | undefined): string {
  if (teamId) {
    assertTeam(userId, "team:create-chain", teamId);
    return teamId;
  }
  const first = listUserTeams(userId).find((t) => teamRights(userId, t.id).has("team:create-chain"))?.id;
  if (!first) throw new ApiError(403, "You are in no team where you may create chains.");
  return first;
}
