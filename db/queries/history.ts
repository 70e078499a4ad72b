import "server-only";
import { and, desc, eq, isNull, lt, sql } from "drizzle-orm";
import { diffChains, shouldFold, summarizeDiff } from "@/lib/history";
import { getDb } from "../connection";
import { updateAtVersion, type SaveChainInput, type StaleSave } from "./chains";
import { chains, reviews, revisions, users, type ChainRow, type ReviewState, type Revision, type WorstStatus } from "../schema";

export interface HistorySaveInput extends SaveChainInput {
  /** a summary the saver wrote (explicit saves, restores); autosaves leave it out */
  summary?: string;
  worstStatus: WorstStatus | null;
  now?: Date;
}

export type HistorySaveOutcome =
  | { ok: true; chain: ChainRow; revision: Revision; folded: boolean; reviewStateBefore: ReviewState; backToDraft: boolean }
  | StaleSave;

/**
 * Save a new version of a chain and keep its history, all in one transaction:
 * - the version test sits in the UPDATE's WHERE clause, so of two saves from one base only the first
 *   lands and the second is told the current version;
 * - the save becomes a revision, or folds into the last one when lib/history's rule says so (same
 *   author, within minutes, not pinned, no summary of its own); the summary says what changed since
 *   the revision before;
 * - an approved chain goes back to draft, and its review request is closed with that reason.
 */
export function saveChainWithHistory(input: HistorySaveInput): HistorySaveOutcome {
  const db = getDb();
  const now = input.now ?? new Date();
  const documentText = JSON.stringify(input.document);
  return db.transaction((tx) => {
    const before = tx.select({ reviewState: chains.reviewState }).from(chains).where(eq(chains.id, input.id)).get();
    if (!before) return { ok: false, reason: "missing" };
    const backToDraft = before.reviewState === "approved";
    const saved = updateAtVersion(tx, input.id, input.baseVersion, {
      name: input.name,
      document: documentText,
      updatedAt: now,
      updatedBy: input.userId,
      worstStatus: input.worstStatus,
      ...(backToDraft ? { reviewState: "draft" as const } : {}),
    });
    if (!saved.ok) return saved;
    const updated = saved.chain;
    const last = tx.select().from(revisions).where(eq(revisions.chainId, input.id)).orderBy(desc(revisions.number)).limit(1).get();
    const fold = shouldFold(last, { authorId: input.userId, summary: input.summary, at: now });
    let revision: Revision;
    if (fold && last) {
      const prior = tx
        .select({ document: revisions.document })
        .from(revisions)
        .where(and(eq(revisions.chainId, input.id), lt(revisions.number, last.number)))
        .orderBy(desc(revisions.number))
        .limit(1)
        .get();
      const summary = summarizeDiff(diffChains(prior ? JSON.parse(prior.document) : {}, input.document));
      revision = tx
        .update(revisions)
        .set({ number: updated.version, document: documentText, updatedAt: now, saves: sql`${revisions.saves} + 1`, summary })
        .where(eq(revisions.id, last.id))
        .returning()
        .get()!;
    } else {
      const summary = input.summary?.trim() || summarizeDiff(diffChains(last ? JSON.parse(last.document) : {}, input.document));
      revision = tx
        .insert(revisions)
        .values({ chainId: input.id, number: updated.version, document: documentText, authorId: input.userId, summary, createdAt: now })
        .returning()
        .get();
    }
    if (backToDraft) {
      tx.update(reviews)
        .set({ closedAt: now, closedReason: "edited-after-approval" })
        .where(and(eq(reviews.chainId, input.id), isNull(reviews.closedAt)))
        .run();
    }
    return { ok: true, chain: updated, revision, folded: fold, reviewStateBefore: before.reviewState, backToDraft };
  });
}

export interface RevisionListEntry {
  id: string;
  number: number;
  summary: string;
  pinned: boolean;
  saves: number;
  createdAt: Date;
  updatedAt: Date | null;
  author: { id: string; name: string | null } | null;
}

/** A chain's revisions, newest first, without their documents. */
export function listRevisions(chainId: string): RevisionListEntry[] {
  return getDb()
    .select({
      id: revisions.id,
      number: revisions.number,
      summary: revisions.summary,
      pinned: revisions.pinned,
      saves: revisions.saves,
      createdAt: revisions.createdAt,
      updatedAt: revisions.updatedAt,
      authorId: revisions.authorId,
      authorName: users.name,
    })
    .from(revisions)
    .leftJoin(users, eq(users.id, revisions.authorId))
    .where(eq(revisions.chainId, chainId))
    .orderBy(desc(revisions.number))
    .all()
    .map(({ authorId, authorName, ...r }) => ({ ...r, author: authorId ? { id: authorId, name: authorName } : null }));
}

/** One revision of one chain (both ids must match, so a revision id never opens another chain's history). */
export function getRevision(chainId: string, revisionId: string): Revision | undefined {
  return getDb()
    .select()
    .from(revisions)
    .where(and(eq(revisions.chainId, chainId), eq(revisions.id, revisionId)))
    .get();
}

/** The revision that records the chain's current version. */
export function currentRevision(chainId: string): Revision | undefined {
  return getDb().select().from(revisions).where(eq(revisions.chainId, chainId)).orderBy(desc(revisions.number)).limit(1).get();
}
