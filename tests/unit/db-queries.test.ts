import { describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/connection";
import { getChainRow, insertChain, listChainsForUser, saveChainVersion } from "@/db/queries/chains";
import { takeRateToken } from "@/db/queries/rate-limit";
import { listUserTeams } from "@/db/queries/teams";
import {
  applyPendingSignup,
  ensurePersonalTeam,
  findUserByEmail,
  PENDING_SIGNUP_MAX_AGE_MS,
  savePendingSignup,
} from "@/db/queries/users";
import { chainMembers, chains, revisions, users } from "@/db/schema";
import { draftDocument, makeChain, makeTeam, makeUser, share } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

freshDatabasePerTest();

describe("openDatabase settings", () => {
  it("uses WAL, enforces foreign keys and waits on a busy database", () => {
    const client = getDb().$client;
    expect(client.pragma("journal_mode", { simple: true })).toBe("wal");
    expect(client.pragma("foreign_keys", { simple: true })).toBe(1);
    expect(client.pragma("busy_timeout", { simple: true })).toBe(5000);
  });

  it("maps camelCase fields to snake_case columns", () => {
    const cols = getDb().$client.prepare("select name from pragma_table_info('chains')").all() as { name: string }[];
    expect(cols.map((c) => c.name)).toEqual(expect.arrayContaining(["team_id", "review_state", "worst_status", "archived_at", "created_by"]));
  });

  it("refuses a chain whose team does not exist (foreign keys are on)", () => {
    const user = makeUser();
    expect(() => insertChain({ teamId: "missing-team", name: "x", document: {}, userId: user.id })).toThrow(/FOREIGN KEY/);
    expect(getDb().select().from(chains).all()).toHaveLength(0); // nothing half-written
  });
});

describe("insertChain", () => {
  it("makes the creator owner and records revision 1, with a random id", () => {
    const u = makeUser();
    const team = makeTeam("T", [[u, "engineer"]]);
    const row = insertChain({ teamId: team, name: "Channel", document: draftDocument("Channel"), userId: u.id });
    expect(row.id).toMatch(/^[0-9a-f-]{36}$/);
    expect(row.version).toBe(1);
    const member = getDb().select().from(chainMembers).where(eq(chainMembers.chainId, row.id)).get();
    expect(member).toMatchObject({ userId: u.id, role: "owner" });
    const revs = getDb().select().from(revisions).where(eq(revisions.chainId, row.id)).all();
    expect(revs.map((r) => r.number)).toEqual([1]);
  });
});

describe("saveChainVersion", () => {
  it("saves from the current version and adds a revision", () => {
    const u = makeUser();
    const id = makeChain(makeTeam("T", [[u, "engineer"]]), u);
    const out = saveChainVersion({ id, baseVersion: 1, name: "Renamed", document: draftDocument("Renamed"), userId: u.id });
    expect(out.ok).toBe(true);
    expect(getChainRow(id)).toMatchObject({ version: 2, name: "Renamed" });
    expect(getDb().select().from(revisions).where(eq(revisions.chainId, id)).all()).toHaveLength(2);
  });

  it("refuses a save from a stale version and names the current one, changing nothing", () => {
    const u = makeUser();
    const id = makeChain(makeTeam("T", [[u, "engineer"]]), u);
    const a = saveChainVersion({ id, baseVersion: 1, name: "A", document: draftDocument("A"), userId: u.id });
    const b = saveChainVersion({ id, baseVersion: 1, name: "B", document: draftDocument("B"), userId: u.id });
    expect(a.ok).toBe(true);
    expect(b).toEqual({ ok: false, reason: "conflict", currentVersion: 2 });
    expect(getChainRow(id)?.name).toBe("A");
    expect(getDb().select().from(revisions).where(eq(revisions.chainId, id)).all()).toHaveLength(2);
  });

  it("says when the chain is gone", () => {
    const u = makeUser();
    expect(saveChainVersion({ id: "nope", baseVersion: 1, name: "x", document: {}, userId: u.id })).toEqual({ ok: false, reason: "missing" });
  });
});

describe("listChainsForUser", () => {
  it("lists team chains and direct shares, not other teams' chains or archived ones", () => {
    const a = makeUser("a");
    const b = makeUser("b");
    const teamA = makeTeam("A", [[a, "engineer"]]);
    const teamB = makeTeam("B", [[b, "engineer"]]);
    const mine = makeChain(teamA, a, "mine");
    const theirs = makeChain(teamB, b, "theirs");
    const sharedWithA = makeChain(teamB, b, "shared");
    share(sharedWithA, a, "viewer");
    const archived = makeChain(teamA, a, "old");
    getDb().update(chains).set({ archivedAt: new Date() }).where(eq(chains.id, archived)).run();
    const seen = listChainsForUser(a.id);
    expect(seen.map((c) => c.id).sort()).toEqual([mine, sharedWithA].sort());
    expect(seen.find((c) => c.id === sharedWithA)).toMatchObject({ teamName: "B", teamRole: null, chainRole: "viewer" });
    expect(seen.some((c) => c.id === theirs)).toBe(false);
  });
});

describe("takeRateToken", () => {
  it("allows `limit` events per window per key, then refuses with the wait", () => {
    const t0 = 1_000_000;
    for (let i = 0; i < 3; i++) expect(takeRateToken("k", 3, 60_000, t0 + i * 1000).allowed).toBe(true);
    const refused = takeRateToken("k", 3, 60_000, t0 + 5000);
    expect(refused.allowed).toBe(false);
    expect(refused.retryAfterMs).toBe(55_000); // the first event leaves the window at t0 + 60 s
    expect(takeRateToken("other", 3, 60_000, t0 + 5000).allowed).toBe(true);
    expect(takeRateToken("k", 3, 60_000, t0 + 60_001).allowed).toBe(true);
  });
});

describe("pending sign-ups and personal teams", () => {
  it("moves a waiting password onto the user who proved the address, once", () => {
    const u = makeUser("new");
    savePendingSignup(u.email!.toUpperCase(), "New Person", "$2b$11$hash");
    expect(applyPendingSignup(u.id, u.email!)).toBe(true);
    expect(findUserByEmail(u.email!)).toMatchObject({ name: "New Person", passwordHash: "$2b$11$hash" });
    expect(applyPendingSignup(u.id, u.email!)).toBe(false);
  });

  it("ignores a sign-up older than its link", () => {
    const u = makeUser("late");
    savePendingSignup(u.email!, "Late", "$2b$11$hash");
    const later = new Date(Date.now() + PENDING_SIGNUP_MAX_AGE_MS + 60_000);
    expect(applyPendingSignup(u.id, u.email!, later)).toBe(false);
    expect(getDb().select().from(users).where(eq(users.id, u.id)).get()?.passwordHash).toBeNull();
  });

  it("gives a user without a team a personal team as its admin, and only once", () => {
    const u = makeUser("solo");
    const teamId = ensurePersonalTeam(u.id);
    expect(teamId).not.toBeNull();
    expect(ensurePersonalTeam(u.id)).toBeNull();
    expect(listUserTeams(u.id)).toEqual([expect.objectContaining({ id: teamId, personal: true, role: "admin" })]);
  });

  it("leaves a team member without a personal team", () => {
    const u = makeUser("member");
    makeTeam("Real", [[u, "reviewer"]]);
    expect(ensurePersonalTeam(u.id)).toBeNull();
    expect(listUserTeams(u.id)).toHaveLength(1);
  });
});
