import { z } from "zod";
import { ValidationError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { validate } from "@/lib/api/validate";
import { requireChain } from "@/lib/auth/guard";
import { compareRevisions } from "@/lib/history/compare";

type Context = { params: Promise<{ id: string }> };

const query = z.object({ from: z.string().min(1, "the older revision's id").max(64), to: z.string().min(1, "the newer revision's id").max(64) });

/** GET /api/chains/:id/revisions/compare?from=…&to=…: a readable diff of two revisions and of their key results. */
export const GET = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  await requireChain("view", id);
  const url = new URL(request.url);
  const parsed = validate(query, { from: url.searchParams.get("from") ?? "", to: url.searchParams.get("to") ?? "" });
  if (!parsed.ok) throw new ValidationError(parsed.errors);
  return Response.json(compareRevisions(id, parsed.data.from, parsed.data.to));
});
