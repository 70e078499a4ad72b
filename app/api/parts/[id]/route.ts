import { recordAudit } from "@/db/queries/audit";
import { deletePart, findPart, isNameTaken, updatePart } from "@/db/queries/parts";
import { ApiError } from "@/lib/api/errors";
import { apiRoute } from "@/lib/api/handler";
import { parseBody } from "@/lib/api/validate";
import { requireTeam, requireUser } from "@/lib/auth/guard";
import { AccessError, teamRights } from "@/lib/auth/permissions";
import { libraryPartSchema, partJson } from "@/lib/review/parts";

type Context = { params: Promise<{ id: string }> };

/** The part, if the caller is in its team; a part of another team is "not found", like a missing one. */
async function partFor(id: string) {
  const user = await requireUser();
  const part = findPart(id);
  if (!part || !teamRights(user.id, part.teamId).has("team:view")) throw new AccessError(404, "No such model.");
  return { user, part };
}

/** GET /api/parts/:id: one model (team members). */
export const GET = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { part } = await partFor(id);
  return Response.json({ part: partJson(part) });
});

/** PUT /api/parts/:id `{ name, notes?, model }`: change a model (admins, engineers). Chains keep their own copies. */
export const PUT = apiRoute<Context>(async (request, { params }) => {
  const { id } = await params;
  const { part } = await partFor(id);
  const { user } = await requireTeam("team:edit-parts", part.teamId);
  const body = await parseBody(request, libraryPartSchema);
  try {
    const updated = updatePart(part.teamId, id, body);
    if (!updated) throw new ApiError(404, "No such model.");
    recordAudit({ actorId: user.id, action: "part.update", targetType: "part", targetId: id, teamId: part.teamId, details: { name: updated.name } });
    return Response.json({ part: partJson(updated) });
  } catch (err) {
    if (isNameTaken(err)) throw new ApiError(409, `The library already has a model named “${body.name}”.`, { errors: [{ path: "name", message: "already in the library" }] });
    throw err;
  }
});

/** DELETE /api/parts/:id: remove a model from the library (admins, engineers); chains that copied it keep their copy. */
export const DELETE = apiRoute<Context>(async (_request, { params }) => {
  const { id } = await params;
  const { part } = await partFor(id);
  const { user } = await requireTeam("team:edit-parts", part.teamId);
  deletePart(part.teamId, id);
  recordAudit({ actorId: user.id, action: "part.delete", targetType: "part", targetId: id, teamId: part.teamId, details: { name: part.name } });
  return Response.json({ deleted: true });
});
