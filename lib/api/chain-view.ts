import "server-only";
import type { ChainRole, ChainRow, TeamRole } from "@/db/schema";
import { CHAIN_ACTIONS, chainActionsFor, effectiveChainRole, type ChainRights } from "@/lib/auth/permissions";

/** What the chain routes answer about a chain: its row, and the caller's role and allowed actions. */
export function chainView(chain: ChainRow, rights: Pick<ChainRights, "teamRole" | "chainRole" | "actions">, withDocument: boolean) {
  return {
    id: chain.id,
    teamId: chain.teamId,
    name: chain.name,
    version: chain.version,
    reviewState: chain.reviewState,
    worstStatus: chain.worstStatus,
    createdAt: chain.createdAt.toISOString(),
    updatedAt: chain.updatedAt.toISOString(),
    role: effectiveChainRole(rights.teamRole, rights.chainRole),
    actions: CHAIN_ACTIONS.filter((a) => rights.actions.has(a)),
    ...(withDocument ? { document: JSON.parse(chain.document) as unknown } : {}),
  };
}

/**
 * The part of a chain-list entry every list shows alike (the library page and GET /api/chains):
 * the caller's role and actions, the review state, the worst headroom and the last save.
 */
export function chainListState(c: { teamRole: TeamRole | null; chainRole: ChainRole | null; reviewState: ChainRow["reviewState"]; worstStatus: ChainRow["worstStatus"]; version: number; updatedAt: Date }) {
  return {
    role: effectiveChainRole(c.teamRole, c.chainRole),
    actions: [...chainActionsFor(c.teamRole, c.chainRole)],
    reviewState: c.reviewState,
    worstStatus: c.worstStatus,
    version: c.version,
    updatedAt: c.updatedAt.toISOString(),
  };
}
