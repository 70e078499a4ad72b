import { z } from "zod";
import { addComment } from "@/db/queries/comments";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";
import { commentRecipients, threadsView } from "@/lib/review/comments";
import { commentMail } from "@/lib/review/mails";
import { appOrigin, notifyUsers } from "@/lib/review/notify";

type Context = { params: Promise<{ id: string }> };

/** GET /api/chains/:id/comments: every thread, each pinned to a stage (nodeId) or to the chain (null). */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { user, actions } = await requireChain("view", id);
  return Response.json({ threads: threadsView(id), me: { id: user.id, canComment: actions.has("comment"), canModerate: actions.has("share") } });
});

const commentSchema = z.object({
  body: z.string().trim().min(1, "write something").max(5000, "at most 5000 characters"),
  nodeId: z
    .string()
    .regex(/^[A-Za-z0-9_-]{1,32}$/, "a stage id (1–32 letters, digits, _ or -)")
    .nullable()
    .default(null),
  parentId: z.string().min(1).max(64).nullable().default(null),
});

function stageIds(document: string): Set<string> {
  try {
    const doc = JSON.parse(document) as { nodes?: Array<{ id?: unknown }> };
    return new Set((doc.nodes ?? []).map((n) => n.id).filter((x): x is string => typeof x === "string"));
  } catch {
    return new Set();
  }
}

/**
 * POST /api/chains/:id/comments `{ body, nodeId?, parentId? }`: start a thread on a stage or on the
 * chain, or reply to a thread. The people concerned get a mail unless they turned comment mails off.
 */
export const POST = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { user, chain } = await requireChain("comment", id);
  const body = await parseBody(request, commentSchema);
  if (!body.parentId && body.nodeId && !stageIds(chain.document).has(body.nodeId)) {
    throw new ApiError(400, "That stage is not in the chain.", { errors: [{ path: "nodeId", message: "no stage with this id in the chain" }] });
  }
  const added = addComment({ chainId: id, authorId: user.id, body: body.body, nodeId: body.nodeId, parentId: body.parentId });
  if (!added.ok) throw new ApiError(404, "The thread you replied to is not on this chain.");
  const isReply = added.root.id !== added.comment.id;
  const url = `${appOrigin(request)}/chains/${id}${added.root.nodeId ? `?stage=${encodeURIComponent(added.root.nodeId)}` : ""}#thread-${added.root.id}`;
  await notifyUsers(commentRecipients(id, added.root.id, isReply, user.id), "comments", () =>
    commentMail({ author: user.name ?? "A colleague", chain: chain.name, stage: added.root.nodeId, body: body.body, reply: isReply, url }),
  );
  return Response.json({ comment: { id: added.comment.id, threadId: added.root.id }, threads: threadsView(id) }, { status: 201 });
});
