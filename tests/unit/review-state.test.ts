import { describe, expect, it } from "vitest";
import { stateFromDecisions } from "@/db/queries/reviews";
import { canReview, mayDeleteComment, assertChainDelete, AccessError, chainActionsFor } from "@/lib/auth/permissions";
import type { ChainRow } from "@/db/schema";

describe("stateFromDecisions", () => {
  const row = (decision: "pending" | "approved" | "changes-requested", decidedRevisionId: string | null = null) => ({ decision, decidedRevisionId });
  it("is draft with no open request and in review while anyone is still to decide", () => {
    expect(stateFromDecisions([], "r2")).toBe("draft");
    expect(stateFromDecisions([row("pending")], "r2")).toBe("in-review");
    expect(stateFromDecisions([row("approved", "r2"), row("pending")], "r2")).toBe("in-review");
  });
  it("lets any request for changes win", () => {
    expect(stateFromDecisions([row("approved", "r2"), row("changes-requested", "r2")], "r2")).toBe("changes-requested");
  });
  it("is approved only when every reviewer approved the current revision", () => {
    expect(stateFromDecisions([row("approved", "r2"), row("approved", "r2")], "r2")).toBe("approved");
    expect(stateFromDecisions([row("approved", "r1"), row("approved", "r2")], "r2")).toBe("in-review");
  });
});

describe("permission rules that look at state", () => {
  const chain = (reviewState: ChainRow["reviewState"]) => ({ reviewState }) as ChainRow;
  const rights = (teamRole: "admin" | "engineer" | "reviewer" | null, chainRole: "owner" | "editor" | "reviewer" | "viewer" | null, state: ChainRow["reviewState"]) => ({
    chain: chain(state),
    teamRole,
    chainRole,
    actions: chainActionsFor(teamRole, chainRole),
  });

  it("lets an owner share delete an approved chain, and no one else", () => {
    expect(() => assertChainDelete(rights(null, "owner", "approved"))).not.toThrow();
    expect(() => assertChainDelete(rights("admin", null, "approved"))).toThrow(AccessError);
    expect(() => assertChainDelete(rights("admin", null, "draft"))).not.toThrow();
    expect(() => assertChainDelete(rights("engineer", "editor", "draft"))).toThrow(/does not allow "delete"/);
  });

  it("lets the author or an owner delete a comment", () => {
    expect(mayDeleteComment("a", "a", { actions: chainActionsFor(null, "viewer") })).toBe(true);
    expect(mayDeleteComment("a", "b", { actions: chainActionsFor(null, "editor") })).toBe(false);
    expect(mayDeleteComment("a", "b", { actions: chainActionsFor(null, "owner") })).toBe(true);
  });

  it("knows who can be asked for a review", () => {
    expect(canReview(null, "reviewer")).toBe(true);
    expect(canReview("reviewer", null)).toBe(false); // a team reviewer needs a reviewer share of the chain
    expect(canReview("engineer", "editor")).toBe(false);
    expect(canReview("admin", null)).toBe(true);
  });
});
