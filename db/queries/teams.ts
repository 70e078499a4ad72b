import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "../connection";
import { teamMembers, teams, type TeamRole } from "../schema";

export interface UserTeam {
  id: string;
  name: string;
  personal: boolean;
  role: TeamRole;
}

/** The teams a user belongs to, with their role in each, oldest membership first. */
export function listUserTeams(userId: string): UserTeam[] {
  return getDb()
    .select({ id: teams.id, name: teams.name, personal: teams.personal, role: teamMembers.role })
    .from(teamMembers)
    .innerJoin(teams, eq(teams.id, teamMembers.teamId))
    .where(eq(teamMembers.userId, userId))
    .orderBy(asc(teamMembers.createdAt), asc(teams.name))
    .all();
}

/** The user's role in a team, or null when they are not a member. */
export function getTeamRole(userId: string, teamId: string): TeamRole | null {
  const row = getDb()
    .select({ role: teamMembers.role })
    .from(teamMembers)
    .where(and(eq(teamMembers.userId, userId), eq(teamMembers.teamId, teamId)))
    .get();
  return row?.role ?? null;
}
