import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "../connection";
import { pendingSignups, teamMembers, teams, users, userSettings, type User } from "../schema";

/** E-mail addresses are compared in one canonical form everywhere (Auth.js lower-cases them too). */
export function normalizeEmail(email: string): string {
  return email.trim().toLowerCase();
}

export function findUserByEmail(email: string): User | undefined {
  return getDb().select().from(users).where(eq(users.email, normalizeEmail(email))).get();
}

export function getUserById(id: string): User | undefined {
  return getDb().select().from(users).where(eq(users.id, id)).get();
}

/** Keep (or replace) a password sign-up until its e-mail link is followed. */
export function savePendingSignup(email: string, name: string, passwordHash: string): void {
  const row = { email: normalizeEmail(email), name, passwordHash, createdAt: new Date() };
  getDb()
    .insert(pendingSignups)
    .values(row)
    .onConflictDoUpdate({ target: pendingSignups.email, set: { name, passwordHash, createdAt: row.createdAt } })
    .run();
}

/** How long a password sign-up waits for its link (the link itself lives 24 h too). */
export const PENDING_SIGNUP_MAX_AGE_MS = 24 * 60 * 60 * 1000;

/**
 * Move a waiting sign-up's name and password onto the user who just proved the address.
 * Returns true when a sign-up was applied.
 */
export function applyPendingSignup(userId: string, email: string, now = new Date()): boolean {
  const db = getDb();
  return db.transaction((tx) => {
    const pending = tx.select().from(pendingSignups).where(eq(pendingSignups.email, normalizeEmail(email))).get();
    if (!pending) return false;
    tx.delete(pendingSignups).where(eq(pendingSignups.email, pending.email)).run();
    if (now.getTime() - pending.createdAt.getTime() > PENDING_SIGNUP_MAX_AGE_MS) return false;
    tx.update(users).set({ name: pending.name, passwordHash: pending.passwordHash }).where(eq(users.id, userId)).run();
    return true;
  });
}

/**
 * Give a user with no team a personal team of their own (as its admin), so that every user
 * has somewhere to create chains. Returns the id of the team made, or null if they had one.
 */
export function ensurePersonalTeam(userId: string): string | null {
  const db = getDb();
  return db.transaction((tx) => {
    const member = tx.select({ teamId: teamMembers.teamId }).from(teamMembers).where(eq(teamMembers.userId, userId)).get();
    if (member) return null;
    const user = tx.select().from(users).where(eq(users.id, userId)).get();
    if (!user) return null;
    const label = user.name?.trim() || user.email?.split("@")[0] || "My";
    const team = tx
      .insert(teams)
      .values({ name: `${label}'s workspace`, personal: true, createdBy: userId })
      .returning({ id: teams.id })
      .get();
    tx.insert(teamMembers).values({ teamId: team.id, userId, role: "admin" }).run();
    tx.insert(userSettings).values({ userId }).onConflictDoNothing().run();
    return team.id;
  });
}
