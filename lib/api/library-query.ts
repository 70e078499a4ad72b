import "server-only";
import { z } from "zod";
import { LIBRARY_SORTS, defaultLibraryDir, type LibraryQuery } from "@/db/queries/library";
import { REVIEW_STATES, WORST_STATUSES } from "@/lib/domain";

/**
 * What each filter of the chains library may hold. The library page reads these from its address
 * and GET /api/chains from its query string; both take them from here so a new review state or sort
 * key reaches both at once.
 */
const FIELDS = {
  q: z.string().max(200),
  teamId: z.string().max(64),
  ownerId: z.string().max(64),
  reviewState: z.enum(REVIEW_STATES),
  worstStatus: z.enum([...WORST_STATUSES, "none"]),
  sort: z.enum(LIBRARY_SORTS),
  dir: z.enum(["asc", "desc"]),
  page: z.coerce.number().int().min(1).max(10_000),
};

/** GET /api/chains: the fields by their own names, strictly, so a bad value is a 400 naming it. */
export const libraryApiQuery = z.object({
  q: FIELDS.q.optional(),
  teamId: FIELDS.teamId.optional(),
  ownerId: FIELDS.ownerId.optional(),
  reviewState: FIELDS.reviewState.optional(),
  worstStatus: FIELDS.worstStatus.optional(),
  archived: z.enum(["0", "1"]).optional(),
  sort: FIELDS.sort.optional(),
  dir: FIELDS.dir.optional(),
  page: FIELDS.page.optional(),
  pageSize: z.coerce.number().int().min(1).max(100).optional(),
});

/** A value the address cannot give is dropped, as if it were not there. */
const lenient = <S extends z.ZodType>(schema: S) => schema.optional().catch(undefined);

/** The library page's address: short names (?team=…&review=…). */
const addressQuery = z.object({
  q: lenient(FIELDS.q),
  team: lenient(FIELDS.teamId),
  owner: lenient(FIELDS.ownerId),
  review: lenient(FIELDS.reviewState),
  status: lenient(FIELDS.worstStatus),
  archived: lenient(z.literal("1")),
  sort: lenient(FIELDS.sort),
  dir: lenient(FIELDS.dir),
  page: lenient(FIELDS.page),
});

export { defaultLibraryDir };

/**
 * The library page's query from its address. Anything unreadable in it is ignored, never an error
 * page; a repeated parameter counts by its first value.
 */
export function libraryQueryFromAddress(searchParams: Record<string, string | string[] | undefined>, pageSize: number): LibraryQuery {
  const raw = Object.fromEntries(Object.entries(searchParams).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const q = addressQuery.parse(raw);
  return {
    q: q.q,
    teamId: q.team,
    ownerId: q.owner,
    reviewState: q.review,
    worstStatus: q.status,
    archived: q.archived === "1",
    sort: q.sort,
    dir: q.dir ?? defaultLibraryDir(q.sort),
    page: q.page,
    pageSize,
  };
}
