import "server-only";
import { and, asc, eq, isNull } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { getDb } from "../connection";
import { comments, users, type Comment } from "../schema";

export interface CommentEntry {
  id: string;
  nodeId: string | null;
  parentId: string | null;
  body: string;
  author: { id: string; name: string | null } | null;
  createdAt: Date;
  resolvedAt: Date | null;
  resolvedBy: { id: string; name: string | null } | null;
}

/** Every comment of a chain, oldest first (threads are put together by the caller from parentId). */
export function listComments(chainId: string): CommentEntry[] {
  const resolver = alias(users, "resolver");
  return getDb()
    .select({ c: comments, authorName: users.name, resolverName: resolver.name })
    .from(comments)
    .leftJoin(users, eq(users.id, comments.authorId))
    .leftJoin(resolver, eq(resolver.id, comments.resolvedBy))
    .where(eq(comments.chainId, chainId))
    .orderBy(asc(comments.createdAt), asc(comments.id))
    .all()
    .map(({ c, authorName, resolverName }) => ({
      id: c.id,
      nodeId: c.nodeId,
      parentId: c.parentId,
      body: c.body,
      author: c.authorId ? { id: c.authorId, name: authorName } : null,
      createdAt: c.createdAt,
      resolvedAt: c.resolvedAt,
      resolvedBy: c.resolvedBy ? { id: c.resolvedBy, name: resolverName } : null,
    }));
}

export function getComment(chainId: string, id: string): Comment | undefined {
  return getDb()
    .select()
    .from(comments)
    .where(and(eq(comments.chainId, chainId), eq(comments.id, id)))
    .get();
}

export type AddCommentOutcome = { ok: true; comment: Comment; root: Comment } | { ok: false; reason: "no-parent" };

/**
 * Start a thread (pinned to a stage, or to the chain when nodeId is null) or reply to one. Replies
 * always hang on the thread's first comment and share its pin, so a thread is one level deep.
 */
export function addComment(input: { chainId: string; authorId: string; body: string; nodeId: string | null; parentId: string | null; now?: Date }): AddCommentOutcome {
  const db = getDb();
  return db.transaction((tx) => {
    let root: Comment | undefined;
    if (input.parentId) {
      const parent = tx.select().from(comments).where(and(eq(comments.chainId, input.chainId), eq(comments.id, input.parentId))).get();
      if (!parent) return { ok: false, reason: "no-parent" };
      root = parent.parentId ? tx.select().from(comments).where(eq(comments.id, parent.parentId)).get() : parent;
      if (!root) return { ok: false, reason: "no-parent" };
      // a reply to a resolved thread reopens it: someone has more to say
      if (root.resolvedAt) tx.update(comments).set({ resolvedAt: null, resolvedBy: null }).where(eq(comments.id, root.id)).run();
    }
    const comment = tx
      .insert(comments)
      .values({
        chainId: input.chainId,
        authorId: input.authorId,
        body: input.body,
        nodeId: root ? root.nodeId : input.nodeId,
        parentId: root?.id ?? null,
        createdAt: input.now ?? new Date(),
      })
      .returning()
      .get();
    return { ok: true, comment, root: root ?? comment };
  });
}

/** Resolve or reopen a thread (its first comment). */
export function setThreadResolved(chainId: string, rootId: string, userId: string, resolved: boolean, now = new Date()): boolean {
  return (
    getDb()
      .update(comments)
      .set(resolved ? { resolvedAt: now, resolvedBy: userId } : { resolvedAt: null, resolvedBy: null })
      .where(and(eq(comments.chainId, chainId), eq(comments.id, rootId), isNull(comments.parentId)))
      .run().changes > 0
  );
}

/** Delete a comment (a thread's first comment takes its replies with it, by cascade). */
export function deleteComment(chainId: string, id: string): boolean {
  return getDb().delete(comments).where(and(eq(comments.chainId, chainId), eq(comments.id, id))).run().changes > 0;
}

/** Everyone who wrote in a thread. */
export function threadAuthorIds(rootId: string): string[] {
  const rows = getDb()
    .select({ a: comments.authorId, id: comments.id, parentId: comments.parentId })
    .from(comments)
    .where(eq(comments.parentId, rootId))
    .all();
  const root = getDb().select({ a: comments.authorId }).from(comments).where(eq(comments.id, rootId)).get();
  return [...new Set([root?.a, ...rows.map((r) => r.a)].filter((x): x is string => !!x))];
}
