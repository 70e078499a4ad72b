import "server-only";
import { and, asc, count, desc, eq, isNotNull, isNull, or, sql, type SQL } from "drizzle-orm";
import { getDb } from "../connection";
import {
  chainMembers,
  chains,
  teamMembers,
  teams,
  type ChainRole,
  type ChainRow,
  type ReviewState,
  type TeamRole,
  type WorstStatus,
} from "../schema";

export const LIBRARY_SORTS = ["name", "team", "reviewState", "worstStatus", "updatedAt"] as const;
export type LibrarySort = (typeof LIBRARY_SORTS)[number];

export interface LibraryQuery {
  q?: string;
  teamId?: string;
  ownerId?: string;
  reviewState?: ReviewState;
  /** "none" = not analysed yet */
  worstStatus?: WorstStatus | "none";
  archived?: boolean;
  sort?: LibrarySort;
  dir?: "asc" | "desc";
  page?: number;
  pageSize?: number;
}

export interface LibraryRow {
  id: string;
  name: string;
  teamId: string;
  teamName: string;
  owners: string | null;
  reviewState: ReviewState;
  worstStatus: WorstStatus | null;
  version: number;
  updatedAt: Date;
  archivedAt: Date | null;
  teamRole: TeamRole | null;
  chainRole: ChainRole | null;
}

export interface LibraryPage {
  rows: LibraryRow[];
  total: number;
  page: number;
  pageSize: number;
}

/** `%` and `_` typed by a user match themselves, not every character. */
function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

const ownersOf = sql<string | null>`(select group_concat(coalesce(ou.name, 'unnamed'), ', ') from chain_members oc join users ou on ou.id = oc.user_id where oc.chain_id = ${chains.id} and oc.role = 'owner')`;
const statusRank = sql<number>`case ${chains.worstStatus} when 'ok' then 1 when 'tight' then 2 when 'clip' then 3 else 0 end`;
const reviewRank = sql<number>`case ${chains.reviewState} when 'draft' then 0 when 'in-review' then 1 when 'changes-requested' then 2 else 3 end`;

function visibleTo(userId: string) {
  return { tm: and(eq(teamMembers.teamId, chains.teamId), eq(teamMembers.userId, userId)), cm: and(eq(chainMembers.chainId, chains.id), eq(chainMembers.userId, userId)) };
}

/**
 * The chains library: what the user may see (their teams' chains and chains shared with them),
 * searched, filtered, sorted and paged in SQL, so the table never loads more than one page.
 */

/**
 * Newest change first by default; any other column reads A→Z (or best→worst) until turned round.
 * Here rather than in the page so the API and the library page agree when no direction is given.
 */
export function defaultLibraryDir(sort: LibrarySort | undefined): "asc" | "desc" {
  return sort && sort !== "updatedAt" ? "asc" : "desc";
}

export function searchLibrary(userId: string, query: LibraryQuery): LibraryPage {
  const db = getDb();
  const join = visibleTo(userId);
  const conditions: SQL[] = [or(isNotNull(teamMembers.userId), isNotNull(chainMembers.userId))!];
  conditions.push(query.archived ? isNotNull(chains.archivedAt) : isNull(chains.archivedAt));
  if (query.q?.trim()) conditions.push(sql`${chains.name} like ${likePattern(query.q.trim())} escape '\\'`);
  if (query.teamId) conditions.push(eq(chains.teamId, query.teamId));
  if (query.reviewState) conditions.push(eq(chains.reviewState, query.reviewState));
  if (query.worstStatus === "none") conditions.push(isNull(chains.worstStatus));
  else if (query.worstStatus) conditions.push(eq(chains.worstStatus, query.worstStatus));
  if (query.ownerId) {
    conditions.push(sql`exists (select 1 from chain_members fo where fo.chain_id = ${chains.id} and fo.role = 'owner' and fo.user_id = ${query.ownerId})`);
  }
  const where = and(...conditions);
  const pageSize = Math.min(Math.max(query.pageSize ?? 25, 1), 100);
  const page = Math.max(query.page ?? 1, 1);
  const dir = (query.dir ?? defaultLibraryDir(query.sort)) === "asc" ? asc : desc;
  const sortKey = query.sort ?? "updatedAt";
  const order =
    sortKey === "name"
      ? [dir(sql`${chains.name} collate nocase`)]
      : sortKey === "team"
        ? [dir(sql`${teams.name} collate nocase`), asc(chains.name)]
        : sortKey === "reviewState"
          ? [dir(reviewRank), asc(chains.name)]
          : sortKey === "worstStatus"
            ? [dir(statusRank), asc(chains.name)]
            : [dir(chains.updatedAt), asc(chains.name)];
  const rows = db
    .select({
      id: chains.id,
      name: chains.name,
      teamId: chains.teamId,
      teamName: teams.name,
      owners: ownersOf,
      reviewState: chains.reviewState,
      worstStatus: chains.worstStatus,
      version: chains.version,
      updatedAt: chains.updatedAt,
      archivedAt: chains.archivedAt,
      teamRole: teamMembers.role,
      chainRole: chainMembers.role,
    })
    .from(chains)
    .innerJoin(teams, eq(teams.id, chains.teamId))
    .leftJoin(teamMembers, join.tm)
    .leftJoin(chainMembers, join.cm)
    .where(where)
    .orderBy(...order, asc(chains.id))
    .limit(pageSize)
    .offset((page - 1) * pageSize)
    .all();
  const [{ n }] = db
    .select({ n: count() })
    .from(chains)
    .innerJoin(teams, eq(teams.id, chains.teamId))
    .leftJoin(teamMembers, join.tm)
    .leftJoin(chainMembers, join.cm)
    .where(where)
    .all();
  return { rows, total: n, page, pageSize };
}

/** Teams and owners that appear among the chains a user may see (for the library's filter menus). */
export function libraryFacets(userId: string): { teams: Array<{ id: string; name: string }>; owners: Array<{ id: string; name: string }> } {
  const db = getDb();
  const join = visibleTo(userId);
  const visible = or(isNotNull(teamMembers.userId), isNotNull(chainMembers.userId));
  const teamRows = db
    .selectDistinct({ id: teams.id, name: teams.name })
    .from(chains)
    .innerJoin(teams, eq(teams.id, chains.teamId))
    .leftJoin(teamMembers, join.tm)
    .leftJoin(chainMembers, join.cm)
    .where(visible)
    .orderBy(asc(teams.name))
    .all();
  const owners = db.all<{ id: string; name: string | null }>(sql`
    select distinct u.id as id, u.name as name
    from chains c
    join chain_members os on os.chain_id = c.id and os.role = 'owner'
    join users u on u.id = os.user_id
    where exists (select 1 from team_members t where t.team_id = c.team_id and t.user_id = ${userId})
       or exists (select 1 from chain_members m where m.chain_id = c.id and m.user_id = ${userId})
    order by u.name`);
  return { teams: teamRows, owners: owners.map((o) => ({ id: o.id, name: o.name ?? "unnamed" })) };
}

export function moveChain(id: string, teamId: string): ChainRow | undefined {
  return getDb().update(chains).set({ teamId }).where(eq(chains.id, id)).returning().get();
}

export function setArchived(id: string, archived: boolean): ChainRow | undefined {
  return getDb()
    .update(chains)
    .set({ archivedAt: archived ? new Date() : null })
    .where(eq(chains.id, id))
    .returning()
    .get();
}
