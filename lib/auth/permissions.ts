import "server-only";
import { getChainAccess } from "@/db/queries/chains";
import { getTeamRole } from "@/db/queries/teams";
import type { ChainRole, ChainRow, TeamRole } from "@/db/schema";

/**
 * THE permission module. Every route handler, server action and page that touches a chain or
 * a team asks here. Roles are read from the database on every call, never from the session
 * token, so a removed share or membership takes effect on the next request.
 */

/** What can be done to one chain. */
export const CHAIN_ACTIONS = [
  "view", // read the chain, its analysis, revisions and comments
  "export", // download JSON, CSV and reports
  "comment", // write comments
  "review", // approve or request changes
  "edit", // change the document, restore revisions, request reviews
  "share", // grant and revoke per-chain roles
  "delete", // delete or archive the chain
] as const;
export type ChainAction = (typeof CHAIN_ACTIONS)[number];

/** What can be done in one team. */
export const TEAM_ACTIONS = [
  "team:view", // see the team, its members and its part library
  "team:create-chain",
  "team:edit-parts", // add and change op-amp models in the team library
  "team:manage", // invite, remove and re-role members, rename the team
] as const;
export type TeamAction = (typeof TEAM_ACTIONS)[number];

const VIEWER: readonly ChainAction[] = ["view", "export"];
const REVIEWER: readonly ChainAction[] = [...VIEWER, "comment", "review"];
const EDITOR: readonly ChainAction[] = [...VIEWER, "comment", "edit"];
const OWNER: readonly ChainAction[] = CHAIN_ACTIONS;

/** Rights a per-chain share gives: viewer ⊂ editor ⊂ owner, viewer ⊂ reviewer. */
const BY_CHAIN_ROLE: Record<ChainRole, readonly ChainAction[]> = {
  owner: OWNER,
  editor: EDITOR,
  reviewer: REVIEWER,
  viewer: VIEWER,
};

/**
 * Rights a team role gives on every chain of that team. An admin holds owner rights; an
 * engineer reads every team chain (and owns the ones they create, through an owner share made
 * at creation); a team reviewer reads and comments, and reviews only when given a reviewer
 * share for that chain.
 */
const BY_TEAM_ROLE: Record<TeamRole, readonly ChainAction[]> = {
  admin: OWNER,
  engineer: VIEWER,
  reviewer: [...VIEWER, "comment"],
};

const TEAM_RIGHTS: Record<TeamRole, readonly TeamAction[]> = {
  admin: TEAM_ACTIONS,
  engineer: ["team:view", "team:create-chain", "team:edit-parts"],
  reviewer: ["team:view"],
};

/** The union of what a team role and a chain share allow (either may be absent). */
export function chainActionsFor(teamRole: TeamRole | null, chainRole: ChainRole | null): Set<ChainAction> {
  const actions = new Set<ChainAction>();
  if (teamRole) for (const a of BY_TEAM_ROLE[teamRole]) actions.add(a);
  if (chainRole) for (const a of BY_CHAIN_ROLE[chainRole]) actions.add(a);
  return actions;
}

export function teamActionsFor(teamRole: TeamRole | null): Set<TeamAction> {
  return new Set(teamRole ? TEAM_RIGHTS[teamRole] : []);
}

/**
 * One word for lists: the strongest position the user holds on a chain. Display only; the
 * decision is always made on the action set.
 */
export function effectiveChainRole(teamRole: TeamRole | null, chainRole: ChainRole | null): ChainRole | null {
  const actions = chainActionsFor(teamRole, chainRole);
  if (actions.has("share")) return "owner";
  if (actions.has("edit")) return "editor";
  if (actions.has("review") || actions.has("comment")) return "reviewer";
  if (actions.has("view")) return "viewer";
  return null;
}

export interface ChainRights {
  chain: ChainRow;
  teamRole: TeamRole | null;
  chainRole: ChainRole | null;
  actions: Set<ChainAction>;
}

/** What `userId` may do to `chainId`, read fresh from the database; null if the chain does not exist. */
export function chainRights(userId: string, chainId: string): ChainRights | null {
  const access = getChainAccess(userId, chainId);
  if (!access) return null;
  return { ...access, actions: chainActionsFor(access.teamRole, access.chainRole) };
}

export function teamRights(userId: string, teamId: string): Set<TeamAction> {
  return teamActionsFor(getTeamRole(userId, teamId));
}

export type Resource = { type: "chain"; id: string } | { type: "team"; id: string };

/** The single yes/no question: may this user do this to this chain or team? */
export function can(userId: string | null | undefined, action: ChainAction | TeamAction, resource: Resource): boolean {
  if (!userId) return false;
  if (resource.type === "chain") {
    const rights = chainRights(userId, resource.id);
    return rights !== null && rights.actions.has(action as ChainAction);
  }
  return teamRights(userId, resource.id).has(action as TeamAction);
}

/**
 * Why a request was refused, in the terms a route turns into a status code:
 * no user → 401; the chain is missing or not visible to the user → 404 (so that ids of
 * chains one cannot see do not leak); visible but the action is not allowed → 403.
 */
export class AccessError extends Error {
  constructor(
    public readonly status: 401 | 403 | 404,
    message: string,
  ) {
    super(message);
    this.name = "AccessError";
  }
}

/** Rights on a chain or an AccessError. The check every chain route and action goes through. */
export function assertChain(userId: string | null | undefined, action: ChainAction, chainId: string): ChainRights {
  if (!userId) throw new AccessError(401, "Sign in first.");
  const rights = chainRights(userId, chainId);
  if (!rights || !rights.actions.has("view")) throw new AccessError(404, "No such chain.");
  if (!rights.actions.has(action)) throw new AccessError(403, `Your role on this chain does not allow "${action}".`);
  return rights;
}

/** Team rights or an AccessError (404 when not a member, 403 when the role falls short). */
export function assertTeam(userId: string | null | undefined, action: TeamAction, teamId: string): Set<TeamAction> {
  if (!userId) throw new AccessError(401, "Sign in first.");
  const rights = teamRights(userId, teamId);
  if (!rights.has("team:view")) throw new AccessError(404, "No such team.");
  if (!rights.has(action)) throw new AccessError(403, `Your role in this team does not allow "${action}".`);
  return rights;
}

// ---------------------------------------------------------------------------
// Rules that look at the chain's state as well as the role (issue 5)

/**
 * Deleting a chain needs "delete"; deleting an approved chain needs more: an owner share of that
 * chain. Team admins hold owner rights on every team chain, but an approved design is its owner's to
 * withdraw, not something an admin clears away in passing.
 */
export function assertChainDelete(rights: ChainRights): void {
  if (!rights.actions.has("delete")) throw new AccessError(403, `Your role on this chain does not allow "delete".`);
  if (rights.chain.reviewState === "approved" && rights.chainRole !== "owner") {
    throw new AccessError(403, "This chain is approved: only its owner may delete it.");
  }
}

/** A comment may be deleted by its author, or by whoever may share the chain (its owners). */
export function mayDeleteComment(userId: string, authorId: string | null, rights: Pick<ChainRights, "actions">): boolean {
  return authorId === userId || rights.actions.has("share");
}

/** Whether a user (by their roles) could act as a reviewer of a chain: who may be asked for a review. */
export function canReview(teamRole: TeamRole | null, chainRole: ChainRole | null): boolean {
  return chainActionsFor(teamRole, chainRole).has("review");
}
