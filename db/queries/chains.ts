import "server-only";
import { and, desc, eq, isNull, or, sql } from "drizzle-orm";
import type { SQLiteUpdateSetSource } from "drizzle-orm/sqlite-core";
import { getDb, type Db } from "../connection";
import {
  chainFiles,
  chainMembers,
  chains,
  revisions,
  teamMembers,
  teams,
  type ChainRole,
  type ChainRow,
  type ReviewState,
  type TeamRole,
  type WorstStatus,
} from "../schema";

export function getChainRow(id: string): ChainRow | undefined {
  return getDb().select().from(chains).where(eq(chains.id, id)).get();
}

export interface ChainAccessRow {
  chain: ChainRow;
  teamRole: TeamRole | null;
  chainRole: ChainRole | null;
}

/**
 * A chain with the two roles that decide what `userId` may do with it: their role in the
 * chain's team and their own share of the chain. Undefined when the chain does not exist.
 */
export function getChainAccess(userId: string, chainId: string): ChainAccessRow | undefined {
  const row = getDb()
    .select({ chain: chains, teamRole: teamMembers.role, chainRole: chainMembers.role })
    .from(chains)
    .leftJoin(teamMembers, and(eq(teamMembers.teamId, chains.teamId), eq(teamMembers.userId, userId)))
    .leftJoin(chainMembers, and(eq(chainMembers.chainId, chains.id), eq(chainMembers.userId, userId)))
    .where(eq(chains.id, chainId))
    .get();
  return row ?? undefined;
}

export interface ChainListEntry {
  id: string;
  name: string;
  teamId: string;
  teamName: string;
  reviewState: ReviewState;
  worstStatus: WorstStatus | null;
  version: number;
  updatedAt: Date;
  teamRole: TeamRole | null;
  chainRole: ChainRole | null;
}

/**
 * Every chain a user can see: those of their teams and those shared with them directly.
 * Archived chains are left out. Newest change first.
 */
export function listChainsForUser(userId: string): ChainListEntry[] {
  return getDb()
    .select({
      id: chains.id,
      name: chains.name,
      teamId: chains.teamId,
      teamName: teams.name,
      reviewState: chains.reviewState,
      worstStatus: chains.worstStatus,
      version: chains.version,
      updatedAt: chains.updatedAt,
      teamRole: teamMembers.role,
      chainRole: chainMembers.role,
    })
    .from(chains)
    .innerJoin(teams, eq(teams.id, chains.teamId))
    .leftJoin(teamMembers, and(eq(teamMembers.teamId, chains.teamId), eq(teamMembers.userId, userId)))
    .leftJoin(chainMembers, and(eq(chainMembers.chainId, chains.id), eq(chainMembers.userId, userId)))
    .where(and(isNull(chains.archivedAt), or(sql`${teamMembers.userId} is not null`, sql`${chainMembers.userId} is not null`)))
    .orderBy(desc(chains.updatedAt), chains.name)
    .all();
}

export interface NewChainInput {
  teamId: string;
  name: string;
  /** the chain document (already validated) */
  document: unknown;
  userId: string;
  worstStatus?: WorstStatus | null;
  summary?: string;
}

/**
 * Create a chain, make its creator its owner, and record revision 1, all or nothing.
 */
export function insertChain(input: NewChainInput): ChainRow {
  const db = getDb();
  const documentText = JSON.stringify(input.document);
  return db.transaction((tx) => {
    const row = tx
      .insert(chains)
      .values({
        teamId: input.teamId,
        name: input.name,
        document: documentText,
        version: 1,
        worstStatus: input.worstStatus ?? null,
        createdBy: input.userId,
        updatedBy: input.userId,
      })
      .returning()
      .get();
    tx.insert(chainMembers).values({ chainId: row.id, userId: input.userId, role: "owner", grantedBy: input.userId }).run();
    tx.insert(revisions)
      .values({ chainId: row.id, number: 1, document: documentText, authorId: input.userId, summary: input.summary ?? "Created" })
      .run();
    return row;
  });
}

export interface SaveChainInput {
  id: string;
  baseVersion: number;
  name: string;
  document: unknown;
  userId: string;
  summary?: string;
}

/** Why a save did not land: someone saved since the base version (with the current one), or the chain is gone. */
export type StaleSave = { ok: false; reason: "conflict"; currentVersion: number } | { ok: false; reason: "missing" };

export type SaveChainOutcome = { ok: true; chain: ChainRow } | StaleSave;

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/**
 * The version test every save shares: write `set` and bump the version only where the row still has
 * `baseVersion`. The test sits in the UPDATE's WHERE clause, so of two saves racing from one base
 * only the first changes a row; the second is told the current version (or that the chain is gone).
 */
export function updateAtVersion(tx: Tx, id: string, baseVersion: number, set: SQLiteUpdateSetSource<typeof chains>): { ok: true; chain: ChainRow } | StaleSave {
  const updated = tx
    .update(chains)
    .set({ ...set, version: sql`${chains.version} + 1` })
    .where(and(eq(chains.id, id), eq(chains.version, baseVersion)))
    .returning()
    .get();
  if (updated) return { ok: true, chain: updated };
  const current = tx.select({ version: chains.version }).from(chains).where(eq(chains.id, id)).get();
  return current ? { ok: false, reason: "conflict", currentVersion: current.version } : { ok: false, reason: "missing" };
}

/**
 * Save a new version of a chain if, and only if, nobody saved since `baseVersion` (see
 * updateAtVersion), recording it as a revision of its own.
 */
export function saveChainVersion(input: SaveChainInput): SaveChainOutcome {
  const db = getDb();
  const documentText = JSON.stringify(input.document);
  return db.transaction((tx) => {
    const saved = updateAtVersion(tx, input.id, input.baseVersion, {
      name: input.name,
      document: documentText,
      updatedAt: new Date(),
      updatedBy: input.userId,
      // a saved change invalidates the last analysis summary until it is recomputed
      worstStatus: null,
    });
    if (!saved.ok) return saved;
    const updated = saved.chain;
    tx.insert(revisions)
      .values({
        chainId: updated.id,
        number: updated.version,
        document: documentText,
        authorId: input.userId,
        summary: input.summary ?? "",
      })
      .run();
    return { ok: true, chain: updated };
  });
}

/**
 * Delete a chain and (by cascade) its shares, revisions, comments, reviews and file rows. Returns the
 * storage keys of the files it had (read in the same transaction, so none can slip in between), for the
 * caller to remove their bytes; null when there was no such chain.
 */
export function deleteChainRow(id: string): { storageKeys: string[] } | null {
  return getDb().transaction((tx) => {
    const storageKeys = tx.select({ key: chainFiles.storageKey }).from(chainFiles).where(eq(chainFiles.chainId, id)).all().map((r) => r.key);
    const gone = tx.delete(chains).where(eq(chains.id, id)).run().changes > 0;
    return gone ? { storageKeys } : null;
  });
}
