import "server-only";
import { recordAudit } from "@/db/queries/audit";
import { getChainRow, insertChain } from "@/db/queries/chains";
import { moveChain, setArchived } from "@/db/queries/library";
import { listUserTeams } from "@/db/queries/teams";
import type { ChainRow } from "@/db/schema";
import { ApiError } from "@/lib/api/errors";
import { AccessError, assertTeam, teamRights, type ChainRights } from "@/lib/auth/permissions";
import { keyResults } from "@/lib/history/key-results";

function requireOwnerRights(rights: ChainRights, what: string): void {
  if (!rights.actions.has("delete")) throw new AccessError(403, `Only the chain's owners may ${what}.`);
}

/** Move a chain to another team: owners only, into a team where they may create chains. */
export function moveChainTo(userId: string, rights: ChainRights, teamId: string): ChainRow {
  requireOwnerRights(rights, "move it to another team");
  assertTeam(userId, "team:create-chain", teamId);
  const moved = moveChain(rights.chain.id, teamId);
  if (!moved) throw new ApiError(404, "No such chain.");
  recordAudit({ actorId: userId, action: "chain.move", targetType: "chain", targetId: moved.id, teamId, details: { from: rights.chain.teamId, to: teamId } });
  return moved;
}

/** Archive (hide from the library) or bring back: owners only; nothing is lost either way. */
export function archiveChain(userId: string, rights: ChainRights, archived: boolean): ChainRow {
  requireOwnerRights(rights, archived ? "archive it" : "bring it back from the archive");
  const row = setArchived(rights.chain.id, archived);
  if (!row) throw new ApiError(404, "No such chain.");
  recordAudit({ actorId: userId, action: archived ? "chain.archive" : "chain.unarchive", targetType: "chain", targetId: row.id, teamId: row.teamId });
  return row;
}

/**
 * Copy a chain the user may see into a team where they may create chains (the chain's own team when
 * allowed, else their first such team). The copy starts its own history, review state and shares:
 * its creator owns it, nothing of the original's review carries over.
 */
export function duplicateChain(userId: string, rights: ChainRights, teamId: string | undefined, name: string | undefined): ChainRow {
  let target = teamId;
  if (target) assertTeam(userId, "team:create-chain", target);
  else if (teamRights(userId, rights.chain.teamId).has("team:create-chain")) target = rights.chain.teamId;
  else target = listUserTeams(userId).find((t) => teamRights(userId, t.id).has("team:create-chain"))?.id;
  if (!target) throw new ApiError(403, "You are in no team where you may create chains.");
  const source = getChainRow(rights.chain.id)!;
  const copyName = (name ?? `Copy of ${source.name}`).slice(0, 200);
  const document = { ...(JSON.parse(source.document) as Record<string, unknown>), name: copyName };
  const row = insertChain({
    teamId: target,
    name: copyName,
    document,
    userId,
    worstStatus: keyResults(document).worstStatus,
    summary: `Copied from “${source.name}” (version ${source.version})`,
  });
  recordAudit({ actorId: userId, action: "chain.duplicate", targetType: "chain", targetId: row.id, teamId: target, details: { from: source.id } });
  return row;
}
