import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { insertParts, listParts } from "@/db/queries/parts";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireTeam, requireUser } from "@/lib/auth/guard";
import { CSV_MAX_BYTES, readPartsCsv } from "@/lib/parts-csv";

const schema = z.object({
  teamId: z.string().min(1).max(64),
  csv: z.string().min(1, "the CSV is empty"),
  /** false (the default): only preview; true: store the rows without errors */
  commit: z.boolean().default(false),
});

/**
 * POST /api/parts/import `{ teamId, csv, commit? }`: read a CSV of op-amp models. Without `commit` it
 * only answers the preview (every row with its model or its errors). With `commit: true` the CSV is
 * read again here (the preview a browser shows is never trusted) and the rows without errors are
 * stored together; rows with errors are left out and listed.
 */
export const POST = apiRoute(async (request: Request) => {
  await requireUser(); // signed out is 401 whatever the body
  // JSON quoting can nearly double a CSV's size; allow for it before the CSV's own limit applies.
  const body = await parseBody(request, schema, CSV_MAX_BYTES * 2 + 1024);
  const { user } = await requireTeam("team:edit-parts", body.teamId);
  const preview = readPartsCsv(body.csv, new Set(listParts(body.teamId).map((p) => p.name)));
  if (preview.fileErrors.length) throw new ApiError(400, preview.fileErrors.join("; "), { errors: preview.fileErrors.map((message) => ({ path: "csv", message })) });
  if (!body.commit) return Response.json({ preview });
  const good = preview.rows.filter((r) => r.model !== null);
  if (!good.length) throw new ApiError(400, "No row of the CSV can be stored.", { errors: [{ path: "csv", message: "every row has errors" }], preview });
  const stored = insertParts(body.teamId, good.map((r) => ({ name: r.name, notes: r.notes, model: r.model! })), user.id);
  recordAudit({ actorId: user.id, action: "part.import", targetType: "team", targetId: body.teamId, teamId: body.teamId, details: { stored, skipped: preview.invalid } });
  return Response.json({ preview, stored, skipped: preview.invalid }, { status: 201 });
});
