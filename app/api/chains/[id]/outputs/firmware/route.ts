import { apiRoute } from "@/lib/api/handler";
import { download, fileStem, outputsOf, readChoice } from "@/lib/api/outputs";
import { requireChain } from "@/lib/auth/guard";
import { buildFirmwareScaling, scalingHeader, type FirmwareScaling } from "@/lib/handoff";

type Context = { params: Promise<{ id: string }> };

/**
 * GET /api/chains/:id/outputs/firmware?format=json|h: converter scaling constants for every converter
 * of the chain, as JSON (with the converters that cannot be scaled and why) or as a C header.
 */
export const GET = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { chain: row } = await requireChain("export", id);
  const format = readChoice(new URL(request.url).searchParams.get("format"), "format", ["json", "h"] as const, "json");
  const { chain, result, revision } = outputsOf(row);
  const all = buildFirmwareScaling(chain, result);
  if (format === "json") {
    return Response.json({
      chain: chain.name,
      revision,
      scalings: all.flatMap((r) => (r.ok ? [r.scaling] : [])),
      unscaled: all.flatMap((r) => (r.ok ? [] : [{ adcId: r.adcId, reason: r.reason }])),
    });
  }
  const ok: FirmwareScaling[] = all.flatMap((r) => (r.ok ? [r.scaling] : []));
  return download(scalingHeader(ok, revision), "text/x-c", `${fileStem(chain.name)}-scaling.h`);
});
