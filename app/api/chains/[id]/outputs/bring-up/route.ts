import { apiRoute } from "@/lib/api/handler";
import { download, fileStem, outputsOf, readChoice, readTestFrequencies } from "@/lib/api/outputs";
import { requireChain } from "@/lib/auth/guard";
import { bringUpCsv, buildBringUpSheet, withSpread } from "@/lib/handoff";

type Context = { params: Promise<{ id: string }> };

/**
 * GET /api/chains/:id/outputs/bring-up?f=2,63,2k&format=csv|json: expected DC and AC at every test
 * point, at the test frequencies given (hertz, engineering notation; the source band's edges and middle
 * when none are given), with the spread of each over BRING_UP_TRIALS (200) builds within the part tolerances
 * (seeded, so the same chain gives the same file).
 */
export const GET = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { chain: row } = await requireChain("export", id);
  const q = new URL(request.url).searchParams;
  const format = readChoice(q.get("format"), "format", ["csv", "json"] as const, "csv");
  const { chain, result, revision } = outputsOf(row);
  const sheet = withSpread(chain, buildBringUpSheet(chain, result, readTestFrequencies(q.get("f"), chain)));
  if (format === "json") return Response.json({ chain: chain.name, revision, sheet });
  return download(bringUpCsv(sheet), "text/csv", `${fileStem(chain.name)}-bring-up.csv`);
});
