import "server-only";
import { and, count, eq, ne } from "drizzle-orm";
import { getDb } from "../connection";
import { teamMembers, teams, type Team, type TeamRole } from "../schema";

export function getTeam(id: string): Team | undefined {
  return getDb().select().from(teams).where(eq(teams.id, id)).get();
}

export function renameTeam(id: string, name: string): void {
  getDb().update(teams).set({ name }).where(eq(teams.id, id)).run();
}

export type TeamRoleChange = { ok: true; previous: TeamRole } | { ok: false; reason: "missing" | "last-admin" };

/**
 * Change a member's team role or (role null) remove them, never leaving the team without an admin.
 * Check and write share one transaction.
 */
export function changeTeamMember(teamId: string, userId: string, role: TeamRole | null): TeamRoleChange {
  const db = getDb();
  return db.transaction((tx) => {
    const where = and(eq(teamMembers.teamId, teamId), eq(teamMembers.userId, userId));
    const current = tx.select({ role: teamMembers.role }).from(teamMembers).where(where).get();
    if (!current) return { ok: false, reason: "missing" };
    if (current.role === "admin" && role !== "admin") {
      const [{ n }] = tx
        .select({ n: count() })
        .from(teamMembers)
        .where(and(eq(teamMembers.teamId, teamId), eq(teamMembers.role, "admin"), ne(teamMembers.userId, userId)))
        .all();
      if (n === 0) return { ok: false, reason: "last-admin" };
    }
    if (role === null) tx.delete(teamMembers).where(where).run();
    else tx.update(teamMembers).set({ role }).where(where).run();
    return { ok: true, previous: current.role };
  });
}
