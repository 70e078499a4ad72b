import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { getTeamRole } from "@/db/queries/teams";
import { listChainMembers, listTeamPeople, putChainShare } from "@/db/queries/sharing";
import { CHAIN_ROLES } from "@/lib/domain";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";
import { canReview } from "@/lib/auth/permissions";
import { getChainShare } from "@/db/queries/sharing";

type Context = { params: Promise<{ id: string }> };

/**
 * GET /api/chains/:id/members: the chain's shares (name, address, role). Those who may share also get
 * the chain's team members as candidates (to add directly) and who could review. Addresses of people
 * outside the chain and its team are never listed.
 */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { chain, actions, teamRole } = await requireChain("view", id);
  const members = listChainMembers(id).map((m) => ({ ...m, since: m.since.toISOString() }));
  const body: Record<string, unknown> = { members };
  // Team members' addresses go only to those who share the chain from inside its team.
  if (actions.has("share") && teamRole) {
    const shared = new Set(members.map((m) => m.userId));
    body.candidates = listTeamPeople(chain.teamId).filter((p) => !shared.has(p.userId));
  }
  if (actions.has("edit")) {
    // Who could be asked for a review: anyone whose roles give "review" on this chain.
    const people = new Map<string, { userId: string; name: string | null }>();
    for (const m of members) people.set(m.userId, { userId: m.userId, name: m.name });
    for (const p of listTeamPeople(chain.teamId)) people.set(p.userId, { userId: p.userId, name: p.name });
    body.reviewers = [...people.values()].filter((p) => canReview(getTeamRole(p.userId, chain.teamId), getChainShare(id, p.userId)));
  }
  return Response.json(body);
});

const addSchema = z.object({
  userId: z.string().min(1).max(64),
  role: z.enum(CHAIN_ROLES, "one of owner, editor, reviewer, viewer"),
});

/**
 * POST /api/chains/:id/members `{ userId, role }`: share directly with a member of the chain's team.
 * Anyone else is invited by e-mail (POST …/invitations), so this route cannot be used to find out
 * which addresses have accounts.
 */
export const POST = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { user, chain } = await requireChain("share", id);
  const body = await parseBody(request, addSchema);
  if (!getTeamRole(body.userId, chain.teamId)) {
    throw new ApiError(400, "Only members of the chain's team can be added directly; invite anyone else by e-mail.", {
      errors: [{ path: "userId", message: "not a member of this chain's team" }],
    });
  }
  if (getChainShare(id, body.userId)) throw new ApiError(409, "That person already has a share of this chain; change their role instead.");
  putChainShare(id, body.userId, body.role, user.id);
  recordAudit({ actorId: user.id, action: "share.add", targetType: "chain", targetId: id, teamId: chain.teamId, details: { userId: body.userId, role: body.role } });
  return Response.json({ members: listChainMembers(id) }, { status: 201 });
});
