import { describe, expect, it } from "vitest";
import { getDb } from "@/db/connection";
import { chainMembers, teamMembers, type ChainRole, type TeamRole } from "@/db/schema";
import { and, eq } from "drizzle-orm";
import {
  AccessError,
  assertChain,
  assertTeam,
  can,
  CHAIN_ACTIONS,
  chainActionsFor,
  chainRights,
  effectiveChainRole,
  teamActionsFor,
  type ChainAction,
} from "@/lib/auth/permissions";
import { makeChain, makeTeam, makeUser, share } from "../support/fixtures";
import { freshDatabasePerTest } from "../support/temp-db";

// The whole matrix written out by hand from the role rules in issue 2:
// V view, X export, C comment, R review, E edit, S share, D delete.
const CODE: Record<string, ChainAction> = { V: "view", X: "export", C: "comment", R: "review", E: "edit", S: "share", D: "delete" };
const MATRIX: Array<[TeamRole | null, ChainRole | null, string]> = [
  [null, null, ""],
  [null, "owner", "VXCRESD"],
  [null, "editor", "VXCE"],
  [null, "reviewer", "VXCR"],
  [null, "viewer", "VX"],
  ["admin", null, "VXCRESD"],
  ["admin", "owner", "VXCRESD"],
  ["admin", "editor", "VXCRESD"],
  ["admin", "reviewer", "VXCRESD"],
  ["admin", "viewer", "VXCRESD"],
  ["engineer", null, "VX"],
  ["engineer", "owner", "VXCRESD"],
  ["engineer", "editor", "VXCE"],
  ["engineer", "reviewer", "VXCR"],
  ["engineer", "viewer", "VX"],
  ["reviewer", null, "VXC"],
  ["reviewer", "owner", "VXCRESD"],
  ["reviewer", "editor", "VXCE"],
  ["reviewer", "reviewer", "VXCR"],
  ["reviewer", "viewer", "VXC"],
];

function decode(codes: string): ChainAction[] {
  return [...codes].map((c) => CODE[c]).sort();
}

describe("chainActionsFor", () => {
  it.each(MATRIX)("team role %s with chain share %s allows %s", (teamRole, chainRole, codes) => {
    expect([...chainActionsFor(teamRole, chainRole)].sort()).toEqual(decode(codes));
  });

  it("orders the chain roles viewer ⊂ editor ⊂ owner and viewer ⊂ reviewer", () => {
    const of = (r: ChainRole) => chainActionsFor(null, r);
    const subset = (a: Set<ChainAction>, b: Set<ChainAction>) => [...a].every((x) => b.has(x)) && b.size > a.size;
    expect(subset(of("viewer"), of("editor"))).toBe(true);
    expect(subset(of("editor"), of("owner"))).toBe(true);
    expect(subset(of("viewer"), of("reviewer"))).toBe(true);
    expect(of("owner")).toEqual(new Set(CHAIN_ACTIONS));
    // editor and reviewer are side by side: neither holds the other's distinguishing right
    expect(of("editor").has("review")).toBe(false);
    expect(of("reviewer").has("edit")).toBe(false);
  });
});

describe("teamActionsFor", () => {
  it.each([
    ["admin", ["team:create-chain", "team:edit-parts", "team:manage", "team:view"]],
    ["engineer", ["team:create-chain", "team:edit-parts", "team:view"]],
    ["reviewer", ["team:view"]],
    [null, []],
  ] as const)("team role %s", (role, expected) => {
    expect([...teamActionsFor(role)].sort()).toEqual([...expected]);
  });
});

describe("effectiveChainRole", () => {
  it("names the strongest position held", () => {
    expect(effectiveChainRole("admin", null)).toBe("owner");
    expect(effectiveChainRole("engineer", "editor")).toBe("editor");
    expect(effectiveChainRole("reviewer", null)).toBe("reviewer");
    expect(effectiveChainRole("engineer", null)).toBe("viewer");
    expect(effectiveChainRole(null, null)).toBeNull();
  });
});

describe("chainRights / can / assertChain against the database", () => {
  freshDatabasePerTest();

  function world() {
    const admin = makeUser("admin");
    const engineer = makeUser("engineer");
    const other = makeUser("engineer2");
    const reviewer = makeUser("reviewer");
    const outsider = makeUser("outsider");
    const teamId = makeTeam("Team", [
      [admin, "admin"],
      [engineer, "engineer"],
      [other, "engineer"],
      [reviewer, "reviewer"],
    ]);
    const chainId = makeChain(teamId, engineer);
    return { admin, engineer, other, reviewer, outsider, teamId, chainId };
  }

  it("gives the creator owner rights and the team its role's rights", () => {
    const w = world();
    expect(can(w.engineer.id, "delete", { type: "chain", id: w.chainId })).toBe(true);
    expect(can(w.admin.id, "share", { type: "chain", id: w.chainId })).toBe(true);
    expect(can(w.other.id, "view", { type: "chain", id: w.chainId })).toBe(true);
    expect(can(w.other.id, "edit", { type: "chain", id: w.chainId })).toBe(false);
    expect(can(w.reviewer.id, "comment", { type: "chain", id: w.chainId })).toBe(true);
    expect(can(w.reviewer.id, "review", { type: "chain", id: w.chainId })).toBe(false);
    expect(can(w.outsider.id, "view", { type: "chain", id: w.chainId })).toBe(false);
    expect(can(null, "view", { type: "chain", id: w.chainId })).toBe(false);
  });

  it("answers 401 without a user, 404 for an invisible or missing chain, 403 for a missing right", () => {
    const w = world();
    const status = (fn: () => unknown) => {
      try {
        fn();
        return 200;
      } catch (e) {
        expect(e).toBeInstanceOf(AccessError);
        return (e as AccessError).status;
      }
    };
    expect(status(() => assertChain(null, "view", w.chainId))).toBe(401);
    expect(status(() => assertChain(w.outsider.id, "view", w.chainId))).toBe(404);
    expect(status(() => assertChain(w.engineer.id, "view", "no-such-chain"))).toBe(404);
    expect(status(() => assertChain(w.other.id, "edit", w.chainId))).toBe(403);
    expect(status(() => assertChain(w.engineer.id, "edit", w.chainId))).toBe(200);
    expect(status(() => assertTeam(w.outsider.id, "team:view", w.teamId))).toBe(404);
    expect(status(() => assertTeam(w.reviewer.id, "team:create-chain", w.teamId))).toBe(403);
    expect(status(() => assertTeam(w.engineer.id, "team:create-chain", w.teamId))).toBe(200);
  });

  it("lets a share reach outside the team, and takes a removed share away on the next check", () => {
    const w = world();
    share(w.chainId, w.outsider, "editor");
    expect(chainRights(w.outsider.id, w.chainId)?.actions.has("edit")).toBe(true);
    getDb()
      .delete(chainMembers)
      .where(and(eq(chainMembers.chainId, w.chainId), eq(chainMembers.userId, w.outsider.id)))
      .run();
    expect(chainRights(w.outsider.id, w.chainId)?.actions.size).toBe(0);
    expect(can(w.outsider.id, "view", { type: "chain", id: w.chainId })).toBe(false);
  });

  it("reads team roles fresh: a demoted admin loses owner rights at once", () => {
    const w = world();
    expect(can(w.admin.id, "delete", { type: "chain", id: w.chainId })).toBe(true);
    getDb()
      .update(teamMembers)
      .set({ role: "reviewer" })
      .where(and(eq(teamMembers.teamId, w.teamId), eq(teamMembers.userId, w.admin.id)))
      .run();
    expect(can(w.admin.id, "delete", { type: "chain", id: w.chainId })).toBe(false);
    expect(can(w.admin.id, "comment", { type: "chain", id: w.chainId })).toBe(true);
    expect(can(w.admin.id, "team:manage", { type: "team", id: w.teamId })).toBe(false);
  });

  it("gives no rights in another team's chains", () => {
    const w = world();
    const stranger = makeUser("stranger");
    const otherTeam = makeTeam("Other", [[stranger, "admin"]]);
    const theirs = makeChain(otherTeam, stranger);
    expect(can(w.admin.id, "view", { type: "chain", id: theirs })).toBe(false);
    expect(can(stranger.id, "view", { type: "chain", id: w.chainId })).toBe(false);
  });
});
