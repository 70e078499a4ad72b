import { z } from "zod";
import { listParts } from "@/db/queries/parts";
import { getTeam } from "@/db/queries/team-admin";
import { ValidationError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { validate } from "@/lib/api/validate";
import { requireTeam } from "@/lib/auth/guard";
import { writePartsCsv } from "@/lib/parts-csv";

const query = z.object({ teamId: z.string().min(1, "which team's library (teamId)").max(64) });

/** GET /api/parts/export?teamId=…: the team's library as CSV, in the columns the import reads. */
export const GET = apiRoute(async (request: Request) => {
  const parsed = validate(query, { teamId: new URL(request.url).searchParams.get("teamId") ?? "" });
  if (!parsed.ok) throw new ValidationError(parsed.errors);
  await requireTeam("team:view", parsed.data.teamId);
  const team = getTeam(parsed.data.teamId)!;
  const file = `${team.name.replace(/[^A-Za-z0-9]+/g, "-").replace(/^-|-$/g, "").toLowerCase() || "team"}-op-amp-models.csv`;
  return new Response(writePartsCsv(listParts(parsed.data.teamId)), {
    headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="${file}"` },
  });
});
