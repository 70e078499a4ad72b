import "server-only";
import type { ChainRow } from "@/db/schema";
import { CHAIN_ACTIONS, effectiveChainRole, type ChainRights } from "@/lib/auth/permissions";

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
