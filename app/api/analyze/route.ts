import { runAnalysis } from "@/lib/chain/analyze-request";
import { apiRoute } from "@/lib/api/handler";
import { ValidationError } from "@/lib/api/errors";
import { readJsonBody } from "@/lib/api/validate";
import { requireUser } from "@/lib/auth/guard";

/** Requests over this size are refused with 413 before parsing (a large chain is ~100 kB). */
export const ANALYZE_BODY_LIMIT = 1024 * 1024;

/**
 * POST /api/analyze, body `{ chain, freqs?, points? }`: the analysis of a complete chain, the
 * same object the command line prints. 400 lists `{ path, message }` for each problem.
 */
export const POST = apiRoute(async (request: Request) => {
  await requireUser();
  const body = await readJsonBody(request, ANALYZE_BODY_LIMIT);
  const outcome = runAnalysis(body);
  if (!outcome.ok) throw new ValidationError(outcome.errors);
  return Response.json(outcome.result);
});
