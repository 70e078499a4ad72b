import "server-only";
import { and, asc, count, eq, ne } from "drizzle-orm";
import { getDb } from "../connection";
import { chainMembers, teamMembers, users, type ChainRole } from "../schema";

export interface ChainMemberEntry {
  userId: string;
  name: string | null;
  email: string | null;
  role: ChainRole;
  since: Date;
}

/** Everyone holding a share of a chain, owners first. */
export function listChainMembers(chainId: string): ChainMemberEntry[] {
  const order: Record<ChainRole, number> = { owner: 0, editor: 1, reviewer: 2, viewer: 3 };
  return getDb()
    .select({ userId: users.id, name: users.name, email: users.email, role: chainMembers.role, since: chainMembers.createdAt })
    .from(chainMembers)
    .innerJoin(users, eq(users.id, chainMembers.userId))
    .where(eq(chainMembers.chainId, chainId))
    .orderBy(asc(users.name))
    .all()
    .sort((a, b) => order[a.role] - order[b.role]);
}

export function getChainShare(chainId: string, userId: string): ChainRole | null {
  const row = getDb()
    .select({ role: chainMembers.role })
    .from(chainMembers)
    .where(and(eq(chainMembers.chainId, chainId), eq(chainMembers.userId, userId)))
    .get();
  return row?.role ?? null;
}

/** Give a user a share of a chain, or change the one they hold. */
export function putChainShare(chainId: string, userId: string, role: ChainRole, grantedBy: string): void {
  getDb()
    .insert(chainMembers)
    .values({ chainId, userId, role, grantedBy })
    .onConflictDoUpdate({ target: [chainMembers.chainId, chainMembers.userId], set: { role, grantedBy } })
    .run();
}

export type ShareChange = { ok: true; previous: ChainRole | null } | { ok: false; reason: "missing" | "last-owner" };

/**
 * Change or remove a share, refusing to leave the chain without an owner share: the check and the
 * write happen in one transaction, so two owners removing each other at once cannot both succeed.
 */
export function changeChainShare(chainId: string, userId: string, role: ChainRole | null, grantedBy: string): ShareChange {
  const db = getDb();
  return db.transaction((tx) => {
    const current = tx
      .select({ role: chainMembers.role })
      .from(chainMembers)
      .where(and(eq(chainMembers.chainId, chainId), eq(chainMembers.userId, userId)))
      .get();
    if (!current) return { ok: false, reason: "missing" };
    if (current.role === "owner" && role !== "owner") {
      const [{ n }] = tx
        .select({ n: count() })
        .from(chainMembers)
        .where(and(eq(chainMembers.chainId, chainId), eq(chainMembers.role, "owner"), ne(chainMembers.userId, userId)))
        .all();
      if (n === 0) return { ok: false, reason: "last-owner" };
    }
    const where = and(eq(chainMembers.chainId, chainId), eq(chainMembers.userId, userId));
    if (role === null) tx.delete(chainMembers).where(where).run();
    else tx.update(chainMembers).set({ role, grantedBy }).where(where).run();
    return { ok: true, previous: current.role };
  });
}

export interface TeamPerson {
  userId: string;
  name: string | null;
  email: string | null;
  teamRole: string;
}

/** Members of a team (for choosing whom to share with or ask for a review). */
export function listTeamPeople(teamId: string): TeamPerson[] {
  return getDb()
    .select({ userId: users.id, name: users.name, email: users.email, teamRole: teamMembers.role })
    .from(teamMembers)
    .innerJoin(users, eq(users.id, teamMembers.userId))
    .where(eq(teamMembers.teamId, teamId))
    .orderBy(asc(users.name))
    .all();
}
