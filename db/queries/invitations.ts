import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, asc, eq, gt, isNull } from "drizzle-orm";
import { getDb } from "../connection";
import { chainMembers, chains, invitations, teamMembers, teams, users, type ChainRole, type Invitation, type TeamRole } from "../schema";
import { normalizeEmail } from "./users";

/** How long an invitation link works. */
export const INVITATION_TTL_MS = 7 * 24 * 60 * 60 * 1000;

/** Only this hash of a link's token is stored: a copy of the database opens no invitation. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

export type InvitationTarget = { chainId: string; teamId: string; role: ChainRole } | { chainId: null; teamId: string; role: TeamRole };

/** Record an invitation and return the secret token for its link (256 random bits). */
export function createInvitation(
  email: string,
  target: InvitationTarget,
  invitedBy: string,
  now = new Date(),
): { invitation: Invitation; token: string } {
  const token = randomBytes(32).toString("base64url");
  const invitation = getDb()
    .insert(invitations)
    .values({
      tokenHash: hashToken(token),
      email: normalizeEmail(email),
      teamId: target.teamId,
      chainId: target.chainId,
      role: target.role,
      invitedBy,
      createdAt: now,
      expiresAt: new Date(now.getTime() + INVITATION_TTL_MS),
    })
    .returning()
    .get();
  return { invitation, token };
}

export interface PendingInvitation {
  id: string;
  email: string;
  role: string;
  createdAt: Date;
  expiresAt: Date;
  invitedByName: string | null;
}

/** Invitations of a chain (or, with chainId null, of a team) that can still be used. */
export function listPendingInvitations(scope: { chainId: string } | { teamId: string }, now = new Date()): PendingInvitation[] {
  const where =
    "chainId" in scope
      ? eq(invitations.chainId, scope.chainId)
      : and(eq(invitations.teamId, scope.teamId), isNull(invitations.chainId));
  return getDb()
    .select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      createdAt: invitations.createdAt,
      expiresAt: invitations.expiresAt,
      invitedByName: users.name,
    })
    .from(invitations)
    .leftJoin(users, eq(users.id, invitations.invitedBy))
    .where(and(where, isNull(invitations.usedAt), gt(invitations.expiresAt, now)))
    .orderBy(asc(invitations.createdAt))
    .all();
}

/** Withdraw an unused invitation of the given chain or team. */
export function revokeInvitation(id: string, scope: { chainId: string } | { teamId: string }): boolean {
  const where =
    "chainId" in scope
      ? and(eq(invitations.id, id), eq(invitations.chainId, scope.chainId))
      : and(eq(invitations.id, id), eq(invitations.teamId, scope.teamId), isNull(invitations.chainId));
  return getDb().delete(invitations).where(and(where, isNull(invitations.usedAt))).run().changes > 0;
}

export interface InvitationView {
  invitation: Invitation;
  chainName: string | null;
  teamName: string | null;
  invitedByName: string | null;
  state: "open" | "used" | "expired";
}

/** The invitation a link's token opens, with what it is for; undefined for an unknown token. */
export function findInvitationByToken(token: string, now = new Date()): InvitationView | undefined {
  if (!token || token.length > 200) return undefined;
  const row = getDb()
    .select({ invitation: invitations, chainName: chains.name, teamName: teams.name, invitedByName: users.name })
    .from(invitations)
    .leftJoin(chains, eq(chains.id, invitations.chainId))
    .leftJoin(teams, eq(teams.id, invitations.teamId))
    .leftJoin(users, eq(users.id, invitations.invitedBy))
    .where(eq(invitations.tokenHash, hashToken(token)))
    .get();
  if (!row) return undefined;
  const state = row.invitation.usedAt ? "used" : row.invitation.expiresAt.getTime() <= now.getTime() ? "expired" : "open";
  return { ...row, state };
}

export type AcceptOutcome =
  | { ok: true; invitation: Invitation; granted: string }
  | { ok: false; reason: "unknown" | "used" | "expired" | "wrong-address" };

const CHAIN_RANK: Record<ChainRole, number> = { viewer: 0, reviewer: 1, editor: 2, owner: 3 };

/**
 * Use an invitation: only once (the used mark is set by an UPDATE that also requires it unset), only
 * before it expires, and only by the account whose address it was sent to. A share already held is
 * kept when it is stronger than the invited one; a team member keeps their team role.
 */
export function acceptInvitation(token: string, user: { id: string; email: string | null }, now = new Date()): AcceptOutcome {
  const db = getDb();
  return db.transaction((tx) => {
    const inv = tx.select().from(invitations).where(eq(invitations.tokenHash, hashToken(token))).get();
    if (!inv) return { ok: false, reason: "unknown" };
    if (inv.usedAt) return { ok: false, reason: "used" };
    if (inv.expiresAt.getTime() <= now.getTime()) return { ok: false, reason: "expired" };
    if (!user.email || normalizeEmail(user.email) !== inv.email) return { ok: false, reason: "wrong-address" };
    const marked = tx
      .update(invitations)
      .set({ usedAt: now, usedBy: user.id })
      .where(and(eq(invitations.id, inv.id), isNull(invitations.usedAt)))
      .run();
    if (marked.changes !== 1) return { ok: false, reason: "used" };
    if (inv.chainId) {
      const role = inv.role as ChainRole;
      const held = tx
        .select({ role: chainMembers.role })
        .from(chainMembers)
        .where(and(eq(chainMembers.chainId, inv.chainId), eq(chainMembers.userId, user.id)))
        .get();
      const granted = held && CHAIN_RANK[held.role] >= CHAIN_RANK[role] ? held.role : role;
      tx.insert(chainMembers)
        .values({ chainId: inv.chainId, userId: user.id, role: granted, grantedBy: inv.invitedBy })
        .onConflictDoUpdate({ target: [chainMembers.chainId, chainMembers.userId], set: { role: granted } })
        .run();
      return { ok: true, invitation: inv, granted };
    }
    const teamId = inv.teamId!;
    const held = tx
      .select({ role: teamMembers.role })
      .from(teamMembers)
      .where(and(eq(teamMembers.teamId, teamId), eq(teamMembers.userId, user.id)))
      .get();
    if (!held) tx.insert(teamMembers).values({ teamId, userId: user.id, role: inv.role as TeamRole }).run();
    return { ok: true, invitation: inv, granted: held?.role ?? inv.role };
  });
}

/**
 * Create the account an invitation was sent to: the link proves the address (it was mailed there), so
 * the account is verified at once and its password set. Refused when the invitation is not open or
 * the address already has an account (its owner signs in instead).
 */
export function createInvitedUser(token: string, name: string, passwordHash: string, now = new Date()): { ok: true; userId: string; email: string } | { ok: false; reason: "not-open" | "exists" } {
  const db = getDb();
  return db.transaction((tx) => {
    const inv = tx.select().from(invitations).where(eq(invitations.tokenHash, hashToken(token))).get();
    if (!inv || inv.usedAt || inv.expiresAt.getTime() <= now.getTime()) return { ok: false, reason: "not-open" };
    const existing = tx.select({ id: users.id }).from(users).where(eq(users.email, inv.email)).get();
    if (existing) return { ok: false, reason: "exists" };
    const user = tx.insert(users).values({ name, email: inv.email, emailVerified: now, passwordHash }).returning({ id: users.id }).get();
    return { ok: true, userId: user.id, email: inv.email };
  });
}
