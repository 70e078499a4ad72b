import "server-only";
import { listChainMembers } from "@/db/queries/sharing";
import { listComments, threadAuthorIds, type CommentEntry } from "@/db/queries/comments";
import { openReviewerIds } from "@/db/queries/reviews";
import { chainRights } from "@/lib/auth/permissions";

const iso = (d: Date | null) => (d ? d.toISOString() : null);

export interface ThreadView {
  id: string;
  nodeId: string | null;
  resolvedAt: string | null;
  resolvedBy: { id: string; name: string | null } | null;
  comments: Array<{ id: string; body: string; author: { id: string; name: string | null } | null; createdAt: string }>;
}

/** Comments grouped into threads (first comment, then replies in order), threads oldest first. */
export function threadsOf(entries: CommentEntry[]): ThreadView[] {
  const threads = new Map<string, ThreadView>();
  const item = (c: CommentEntry) => ({ id: c.id, body: c.body, author: c.author, createdAt: c.createdAt.toISOString() });
  for (const c of entries) {
    if (c.parentId === null) threads.set(c.id, { id: c.id, nodeId: c.nodeId, resolvedAt: iso(c.resolvedAt), resolvedBy: c.resolvedBy, comments: [item(c)] });
  }
  for (const c of entries) if (c.parentId !== null) threads.get(c.parentId)?.comments.push(item(c));
  return [...threads.values()];
}

export function threadsView(chainId: string): ThreadView[] {
  return threadsOf(listComments(chainId));
}

/**
 * Who hears of a new comment: for a reply, everyone who wrote in the thread; for a new thread, the
 * chain's owners and editors and the reviewers of an open request. Never the writer, and only people
 * who can still see the chain.
 */
export function commentRecipients(chainId: string, rootId: string, isReply: boolean, authorId: string): string[] {
  const ids = isReply
    ? threadAuthorIds(rootId)
    : [...listChainMembers(chainId).filter((m) => m.role === "owner" || m.role === "editor").map((m) => m.userId), ...openReviewerIds(chainId)];
  return [...new Set(ids)].filter((id) => id !== authorId && chainRights(id, chainId)?.actions.has("view"));
}
