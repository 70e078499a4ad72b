import { z } from "zod";
import { chainView } from "@/lib/api/chain-view";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";
import { chainActionsFor } from "@/lib/auth/permissions";
import { duplicateChain } from "@/lib/review/library";

type Context = { params: Promise<{ id: string }> };

const schema = z.object({
  teamId: z.string().min(1).max(64).optional(),
  name: z.string().trim().min(1, "1–200 characters").max(200, "1–200 characters").optional(),
});

/** POST /api/chains/:id/duplicate `{ teamId?, name? }`: a copy the caller owns (anyone who may view may copy). */
export const POST = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { user, ...rights } = await requireChain("view", id);
  const body = await parseBody(request, schema);
  const row = duplicateChain(user.id, rights, body.teamId, body.name);
  const mine = { teamRole: null, chainRole: "owner" as const, actions: chainActionsFor(null, "owner") };
  return Response.json({ chain: chainView(row, mine, false) }, { status: 201, headers: { Location: `/api/chains/${row.id}` } });
});
