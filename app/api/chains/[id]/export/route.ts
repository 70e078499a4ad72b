import { apiRoute } from "@/lib/api/handler";
import { download, fileStem } from "@/lib/api/outputs";
import { requireChain } from "@/lib/auth/guard";

type Context = { params: Promise<{ id: string }> };

/**
 * GET /api/chains/:id/export: the chain document exactly as saved (a draft too), as a
 * `chainwright.chain/1` JSON file that POST /api/chains/import takes back.
 */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { chain: row } = await requireChain("export", id);
  const text = `${JSON.stringify(JSON.parse(row.document), null, 2)}\n`;
  return download(text, "application/json", `${fileStem(row.name)}.chain.json`);
});
