import { getDb } from "@/db/connection";
import { insertChain } from "@/db/queries/chains";
import { chainMembers, teamMembers, teams, users, type ChainRole, type TeamRole, type User } from "@/db/schema";

let counter = 0;

/** A verified user with a unique address (no password unless one is given as a hash). */
export function makeUser(label = "user", passwordHash: string | null = null): User {
  counter += 1;
  return getDb()
    .insert(users)
    .values({ name: `${label} ${counter}`, email: `${label}.${counter}@test.example`, emailVerified: new Date(), passwordHash })
    .returning()
    .get();
}

export function makeTeam(name = "Team", members: Array<[User, TeamRole]> = []): string {
  const team = getDb().insert(teams).values({ name }).returning({ id: teams.id }).get();
  for (const [user, role] of members) getDb().insert(teamMembers).values({ teamId: team.id, userId: user.id, role }).run();
  return team.id;
}

/** A draft chain document small enough for route tests. */
export function draftDocument(name = "Test chain"): Record<string, unknown> {
  return { format: "chainwright.chain/1", name, nodes: [], edges: [] };
}

export function makeChain(teamId: string, creator: User, name = "Test chain"): string {
  return insertChain({ teamId, name, document: draftDocument(name), userId: creator.id }).id;
}

export function share(chainId: string, user: User, role: ChainRole): void {
  getDb().insert(chainMembers).values({ chainId, userId: user.id, role }).run();
}
