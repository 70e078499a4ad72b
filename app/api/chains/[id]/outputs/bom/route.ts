import { apiRoute } from "@/lib/api/handler";
import { download, fileStem, outputsOf, readChoice } from "@/lib/api/outputs";
import { requireChain } from "@/lib/auth/guard";
import { bomCsv, bomGroupsCsv, buildBom } from "@/lib/handoff";

type Context = { params: Promise<{ id: string }> };

/**
 * GET /api/chains/:id/outputs/bom?format=csv|json&layout=lines|grouped: the bill of materials of the
 * chain as saved (it must be complete; 409 lists what is missing).
 */
export const GET = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { chain: row } = await requireChain("export", id);
  const q = new URL(request.url).searchParams;
  const format = readChoice(q.get("format"), "format", ["csv", "json"] as const, "csv");
  const layout = readChoice(q.get("layout"), "layout", ["lines", "grouped"] as const, "lines");
  const { chain, revision } = outputsOf(row);
  const bom = buildBom(chain);
  if (format === "json") return Response.json({ chain: chain.name, revision, bom });
  const csv = layout === "grouped" ? bomGroupsCsv(bom) : bomCsv(bom);
  return download(csv, "text/csv", `${fileStem(chain.name)}-bom${layout === "grouped" ? "-grouped" : ""}.csv`);
});
