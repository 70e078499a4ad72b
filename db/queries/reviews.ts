import "server-only";
import { and, asc, desc, eq, inArray, isNull } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { getDb } from "../connection";
import { chains, reviews, revisions, users, type ReviewDecision, type ReviewState } from "../schema";

/**
 * Review state follows from the open request's rows: any "changes requested" wins; "approved" needs
 * every chosen reviewer to have approved the chain's current revision (an approval of an older
 * revision no longer counts once the chain changed); otherwise the chain is in review.
 */
export function stateFromDecisions(rows: Array<{ decision: ReviewDecision; decidedRevisionId: string | null }>, currentRevisionId: string): ReviewState {
  if (rows.length === 0) return "draft";
  if (rows.some((r) => r.decision === "changes-requested")) return "changes-requested";
  if (rows.every((r) => r.decision === "approved" && r.decidedRevisionId === currentRevisionId)) return "approved";
  return "in-review";
}

export interface RequestReviewInput {
  chainId: string;
  requestedBy: string;
  reviewerIds: string[];
  note: string;
  now?: Date;
}

/**
 * Open a review request: an open earlier request is closed as superseded, the chain's current
 * revision is pinned (it will never fold with later saves) and named by the request, and the chain
 * goes to "in review".
 */
export function requestReview(input: RequestReviewInput): { round: string; revisionId: string; revisionNumber: number } {
  const db = getDb();
  const now = input.now ?? new Date();
  return db.transaction((tx) => {
    const current = tx.select().from(revisions).where(eq(revisions.chainId, input.chainId)).orderBy(desc(revisions.number)).limit(1).get();
    if (!current) throw new Error("a chain without revisions cannot be reviewed");
    tx.update(reviews)
      .set({ closedAt: now, closedReason: "superseded" })
      .where(and(eq(reviews.chainId, input.chainId), isNull(reviews.closedAt)))
      .run();
    tx.update(revisions).set({ pinned: true }).where(eq(revisions.id, current.id)).run();
    const round = crypto.randomUUID();
    for (const reviewerId of input.reviewerIds) {
      tx.insert(reviews)
        .values({ chainId: input.chainId, revisionId: current.id, requestedBy: input.requestedBy, reviewerId, note: input.note, round, createdAt: now })
        .run();
    }
    tx.update(chains).set({ reviewState: "in-review" }).where(eq(chains.id, input.chainId)).run();
    return { round, revisionId: current.id, revisionNumber: current.number };
  });
}

export type DecideOutcome =
  | { ok: true; state: ReviewState; revisionId: string; revisionNumber: number; requestedBy: string | null }
  | { ok: false; reason: "not-requested" | "conflict" | "own-revision"; currentVersion?: number };

/**
 * Record a reviewer's decision on the open request. The reviewer names the chain version they looked
 * at; if the chain changed since, nothing is recorded (409), so nobody approves what they have not
 * seen. Nobody approves a revision they authored. An approval pins the revision it names.
 */
export function decideReview(
  chainId: string,
  reviewerId: string,
  decision: Exclude<ReviewDecision, "pending">,
  note: string,
  seenVersion: number,
  now = new Date(),
): DecideOutcome {
  const db = getDb();
  return db.transaction((tx) => {
    const open = tx.select().from(reviews).where(and(eq(reviews.chainId, chainId), isNull(reviews.closedAt))).all();
    const mine = open.find((r) => r.reviewerId === reviewerId);
    if (!mine) return { ok: false, reason: "not-requested" };
    const chain = tx.select({ version: chains.version }).from(chains).where(eq(chains.id, chainId)).get();
    if (!chain || chain.version !== seenVersion) return { ok: false, reason: "conflict", currentVersion: chain?.version };
    const current = tx.select().from(revisions).where(eq(revisions.chainId, chainId)).orderBy(desc(revisions.number)).limit(1).get()!;
    if (decision === "approved" && current.authorId === reviewerId) return { ok: false, reason: "own-revision" };
    tx.update(reviews).set({ decision, note, decidedAt: now, decidedRevisionId: current.id }).where(eq(reviews.id, mine.id)).run();
    if (decision === "approved") tx.update(revisions).set({ pinned: true }).where(eq(revisions.id, current.id)).run();
    const rows = open.map((r) => (r.id === mine.id ? { ...r, decision, decidedRevisionId: current.id } : r));
    const state = stateFromDecisions(rows, current.id);
    tx.update(chains).set({ reviewState: state }).where(eq(chains.id, chainId)).run();
    return { ok: true, state, revisionId: current.id, revisionNumber: current.number, requestedBy: mine.requestedBy };
  });
}

/** Close the open request without a decision (the requester withdraws it); the chain returns to draft. */
export function withdrawReview(chainId: string, now = new Date()): boolean {
  const db = getDb();
  return db.transaction((tx) => {
    const n = tx
      .update(reviews)
      .set({ closedAt: now, closedReason: "withdrawn" })
      .where(and(eq(reviews.chainId, chainId), isNull(reviews.closedAt)))
      .run().changes;
    if (n > 0) tx.update(chains).set({ reviewState: "draft" }).where(eq(chains.id, chainId)).run();
    return n > 0;
  });
}

export interface ReviewEntry {
  id: string;
  round: string | null;
  reviewer: { id: string; name: string | null };
  requestedBy: { id: string; name: string | null } | null;
  decision: ReviewDecision;
  note: string;
  createdAt: Date;
  decidedAt: Date | null;
  closedAt: Date | null;
  closedReason: string | null;
  requestedRevision: { id: string; number: number };
  decidedRevision: { id: string; number: number } | null;
}

/** Every review row of a chain, newest request first. */
export function listReviews(chainId: string): ReviewEntry[] {
  const reviewer = alias(users, "reviewer");
  const requester = alias(users, "requester");
  const asked = alias(revisions, "asked");
  const decided = alias(revisions, "decided");
  return getDb()
    .select({
      r: reviews,
      reviewerName: reviewer.name,
      requesterName: requester.name,
      askedNumber: asked.number,
      decidedNumber: decided.number,
    })
    .from(reviews)
    .innerJoin(reviewer, eq(reviewer.id, reviews.reviewerId))
    .leftJoin(requester, eq(requester.id, reviews.requestedBy))
    .innerJoin(asked, eq(asked.id, reviews.revisionId))
    .leftJoin(decided, eq(decided.id, reviews.decidedRevisionId))
    .where(eq(reviews.chainId, chainId))
    .orderBy(desc(reviews.createdAt), asc(reviewer.name))
    .all()
    .map(({ r, reviewerName, requesterName, askedNumber, decidedNumber }) => ({
      id: r.id,
      round: r.round,
      reviewer: { id: r.reviewerId, name: reviewerName },
      requestedBy: r.requestedBy ? { id: r.requestedBy, name: requesterName } : null,
      decision: r.decision,
      note: r.note,
      createdAt: r.createdAt,
      decidedAt: r.decidedAt,
      closedAt: r.closedAt,
      closedReason: r.closedReason,
      requestedRevision: { id: r.revisionId, number: askedNumber },
      decidedRevision: r.decidedRevisionId && decidedNumber !== null ? { id: r.decidedRevisionId, number: decidedNumber } : null,
    }));
}

/** The reviewers of the open request (for notifying them). */
export function openReviewerIds(chainId: string): string[] {
  return getDb()
    .select({ id: reviews.reviewerId })
    .from(reviews)
    .where(and(eq(reviews.chainId, chainId), isNull(reviews.closedAt)))
    .all()
    .map((r) => r.id);
}

export function usersByIds(ids: string[]): Array<{ id: string; name: string | null; email: string | null }> {
  if (!ids.length) return [];
  return getDb().select({ id: users.id, name: users.name, email: users.email }).from(users).where(inArray(users.id, ids)).all();
}
