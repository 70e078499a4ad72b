import { z } from "zod";
import { deleteComment, getComment, setThreadResolved } from "@/db/queries/comments";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";
import { AccessError, mayDeleteComment } from "@/lib/auth/permissions";
import { threadsView } from "@/lib/review/comments";

type Context = { params: Promise<{ id: string; commentId: string }> };

const patchSchema = z.object({ resolved: z.boolean("true to resolve the thread, false to reopen it") });

/** PATCH /api/chains/:id/comments/:commentId `{ resolved }`: resolve or reopen a thread (anyone who may comment). */
export const PATCH = apiRoute<Context>(async (request, { params }) => {
  const { id, commentId } = await params;
  const { user } = await requireChain("comment", id);
  const { resolved } = await parseBody(request, patchSchema);
  const comment = getComment(id, commentId);
  if (!comment) throw new ApiError(404, "No such comment on this chain.");
  if (comment.parentId) throw new ApiError(400, "Resolve the thread through its first comment.", { errors: [{ path: "commentId", message: "a reply, not a thread" }] });
  setThreadResolved(id, commentId, user.id, resolved);
  return Response.json({ threads: threadsView(id) });
});

/** DELETE /api/chains/:id/comments/:commentId: its author (or an owner) deletes a comment; a first comment takes its thread. */
export const DELETE = apiRoute<Context>(async (_request, { params }) => {
  const { id, commentId } = await params;
  const { user, ...rights } = await requireChain("view", id);
  const comment = getComment(id, commentId);
  if (!comment) throw new ApiError(404, "No such comment on this chain.");
  if (!mayDeleteComment(user.id, comment.authorId, rights)) throw new AccessError(403, "Only its author or the chain's owners may delete a comment.");
  deleteComment(id, commentId);
  return Response.json({ threads: threadsView(id) });
});
