import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { changeChainShare, listChainMembers } from "@/db/queries/sharing";
import { CHAIN_ROLES } from "@/lib/domain";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";

type Context = { params: Promise<{ id: string; userId: string }> };

const roleSchema = z.object({ role: z.enum(CHAIN_ROLES, "one of owner, editor, reviewer, viewer") });

function refuse(reason: "missing" | "last-owner"): never {
  if (reason === "missing") throw new ApiError(404, "That person has no share of this chain.");
  throw new ApiError(409, "A chain keeps at least one owner: make someone else owner first.");
}

/** PATCH /api/chains/:id/members/:userId `{ role }`: change a share's role (owners). */
export const PATCH = apiRoute<Context>(async (request, { params }) => {
  const { id, userId } = await params;
  const { user, chain } = await requireChain("share", id);
  const { role } = await parseBody(request, roleSchema);
  const change = changeChainShare(id, userId, role, user.id);
  if (!change.ok) refuse(change.reason);
  recordAudit({ actorId: user.id, action: "share.role", targetType: "chain", targetId: id, teamId: chain.teamId, details: { userId, from: change.previous, to: role } });
  return Response.json({ members: listChainMembers(id) });
});

/** DELETE /api/chains/:id/members/:userId: remove a share (owners). */
export const DELETE = apiRoute<Context>(async (_request, { params }) => {
  const { id, userId } = await params;
  const { user, chain } = await requireChain("share", id);
  const change = changeChainShare(id, userId, null, user.id);
  if (!change.ok) refuse(change.reason);
  recordAudit({ actorId: user.id, action: "share.remove", targetType: "chain", targetId: id, teamId: chain.teamId, details: { userId, role: change.previous } });
  return Response.json({ members: listChainMembers(id) });
});
