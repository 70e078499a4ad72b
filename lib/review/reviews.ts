import "server-only";
import { listReviews, type ReviewEntry } from "@/db/queries/reviews";

const iso = (d: Date | null) => (d ? d.toISOString() : null);

/** Review rows as JSON, grouped by request (newest first), with the open request marked. */
export function reviewsView(chainId: string) {
  const rows = listReviews(chainId);
  const rounds = new Map<string, ReviewEntry[]>();
  for (const r of rows) {
    const key = r.round ?? r.id;
    rounds.set(key, [...(rounds.get(key) ?? []), r]);
  }
  return [...rounds.entries()].map(([round, entries]) => {
    const first = entries[0];
    return {
      round,
      open: first.closedAt === null,
      requestedBy: first.requestedBy,
      requestedAt: first.createdAt.toISOString(),
      requestedRevision: first.requestedRevision,
      note: entries.find((e) => e.decision === "pending")?.note ?? first.note,
      closedAt: iso(first.closedAt),
      closedReason: first.closedReason,
      reviewers: entries.map((e) => ({
        id: e.id,
        reviewer: e.reviewer,
        decision: e.decision,
        note: e.decision === "pending" ? "" : e.note,
        decidedAt: iso(e.decidedAt),
        decidedRevision: e.decidedRevision,
      })),
    };
  });
}
