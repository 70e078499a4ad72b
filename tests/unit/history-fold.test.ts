import { describe, expect, it } from "vitest";
import { FOLD_WINDOW_MS, shouldFold } from "@/lib/history/fold";

const t0 = new Date("2026-03-01T10:00:00Z");
const at = (ms: number) => new Date(t0.getTime() + ms);
const last = { number: 4, authorId: "ann", pinned: false, createdAt: t0, updatedAt: null };

describe("shouldFold", () => {
  it("folds an autosave by the same author within the window", () => {
    expect(shouldFold(last, { authorId: "ann", at: at(60_000) })).toBe(true);
    expect(shouldFold(last, { authorId: "ann", at: at(FOLD_WINDOW_MS) })).toBe(true);
  });

  it("measures the window from the last save folded in, not from the revision's start", () => {
    const folded = { ...last, updatedAt: at(4 * 60_000) };
    expect(shouldFold(folded, { authorId: "ann", at: at(8 * 60_000) })).toBe(true);
    expect(shouldFold(last, { authorId: "ann", at: at(8 * 60_000) })).toBe(false);
  });

  it("starts a new revision for another author, after the window, or with a summary of its own", () => {
    expect(shouldFold(last, { authorId: "ben", at: at(1000) })).toBe(false);
    expect(shouldFold(last, { authorId: "ann", at: at(FOLD_WINDOW_MS + 1) })).toBe(false);
    expect(shouldFold(last, { authorId: "ann", at: at(1000), summary: "Restored revision 2" })).toBe(false);
    expect(shouldFold(last, { authorId: "ann", at: at(1000), summary: "   " })).toBe(true);
  });

  it("never folds into a pinned revision, the first revision, or with no revision at all", () => {
    expect(shouldFold({ ...last, pinned: true }, { authorId: "ann", at: at(1000) })).toBe(false);
    expect(shouldFold({ ...last, number: 1 }, { authorId: "ann", at: at(1000) })).toBe(false);
    expect(shouldFold(null, { authorId: "ann", at: at(1000) })).toBe(false);
    expect(shouldFold({ ...last, authorId: null }, { authorId: "ann", at: at(1000) })).toBe(false);
  });

  it("does not fold a save stamped before the revision (clock skew)", () => {
    expect(shouldFold(last, { authorId: "ann", at: at(-1000) })).toBe(false);
  });
});
