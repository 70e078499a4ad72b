import { z } from "zod";
import { recordAudit } from "@/db/queries/audit";
import { insertPart, isNameTaken, listParts } from "@/db/queries/parts";
import { ApiError, ValidationError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody, validate } from "@/lib/api/validate";
import { requireTeam, requireUser } from "@/lib/auth/guard";
import { libraryPartSchema, partJson } from "@/lib/review/parts";

const teamQuery = z.object({ teamId: z.string().min(1, "which team's library (teamId)").max(64) });

/** GET /api/parts?teamId=…: a team's op-amp models (team members). */
export const GET = apiRoute(async (request: Request) => {
  const parsed = validate(teamQuery, { teamId: new URL(request.url).searchParams.get("teamId") ?? "" });
  if (!parsed.ok) throw new ValidationError(parsed.errors);
  await requireTeam("team:view", parsed.data.teamId);
  return Response.json({ parts: listParts(parsed.data.teamId).map(partJson) });
});

const createSchema = libraryPartSchema.extend({ teamId: z.string().min(1).max(64) });

/** POST /api/parts `{ teamId, name, notes?, model }`: add a model (team admins and engineers). */
export const POST = apiRoute(async (request: Request) => {
  await requireUser(); // signed out is 401 whatever the body
  const body = await parseBody(request, createSchema);
  const { user } = await requireTeam("team:edit-parts", body.teamId);
  try {
    const part = insertPart(body.teamId, body, user.id);
    recordAudit({ actorId: user.id, action: "part.create", targetType: "part", targetId: part.id, teamId: body.teamId, details: { name: part.name } });
    return Response.json({ part: partJson(part) }, { status: 201 });
  } catch (err) {
    if (isNameTaken(err)) throw new ApiError(409, `The library already has a model named “${body.name}”.`, { errors: [{ path: "name", message: "already in the library" }] });
    throw err;
  }
});
