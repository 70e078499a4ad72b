import { apiRoute } from "@/lib/api/handler";
import { download, fileStem, outputsOf, readChoice } from "@/lib/api/outputs";
import { requireChain } from "@/lib/auth/guard";
import { PLOT_TABLES, plotCsv } from "@/lib/handoff";

type Context = { params: Promise<{ id: string }> };

/** GET /api/chains/:id/outputs/plot-data?table=response|noise: the data behind a plot, as CSV. */
export const GET = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { chain: row } = await requireChain("export", id);
  const table = readChoice(new URL(request.url).searchParams.get("table"), "table", PLOT_TABLES, "response");
  const { chain, result } = outputsOf(row);
  return download(plotCsv(chain, result, table), "text/csv", `${fileStem(chain.name)}-${table}.csv`);
});
