import "server-only";
import { recordAudit } from "@/db/queries/audit";
import { saveChainWithHistory } from "@/db/queries/history";
import { checkDraftDocument } from "@/lib/api/chain-documents";
import { ApiError } from "@/lib/api/errors";
import { keyResults } from "./key-results";

export const BACK_TO_DRAFT_NOTICE =
  "This chain was approved. Your change moved it back to draft: the approval stays in the history with the revision it named. Ask for a review again when the change is ready.";

/**
 * Every path that writes a new version of a chain (save, rename, restore) comes through here: draft
 * checks, the worst headroom status for the library, the version-checked write with its revision,
 * and the audit line. A stale base version is a 409 naming the current one.
 */
export function saveVersion(input: { chainId: string; teamId: string; baseVersion: number; document: unknown; name?: string; userId: string; summary?: string; action?: string }) {
  const { draft, name } = checkDraftDocument(input.document, input.name);
  const worstStatus = keyResults(draft).worstStatus;
  const outcome = saveChainWithHistory({
    id: input.chainId,
    baseVersion: input.baseVersion,
    name,
    document: draft,
    userId: input.userId,
    summary: input.summary,
    worstStatus,
  });
  if (!outcome.ok) {
    if (outcome.reason === "missing") throw new ApiError(404, "No such chain.");
    throw new ApiError(409, "Someone saved this chain after the version you started from. Reload it and apply your change again.", {
      currentVersion: outcome.currentVersion,
      baseVersion: input.baseVersion,
    });
  }
  recordAudit({
    actorId: input.userId,
    action: input.action ?? "chain.save",
    targetType: "chain",
    targetId: input.chainId,
    teamId: input.teamId,
    details: { version: outcome.chain.version, revision: outcome.revision.id, folded: outcome.folded, ...(outcome.backToDraft ? { reviewState: "approved→draft" } : {}) },
  });
  return { ...outcome, notice: outcome.backToDraft ? BACK_TO_DRAFT_NOTICE : null };
}
