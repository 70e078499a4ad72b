import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { z } from "zod";
import { ChainLibrary } from "@/components/library/chain-library";
import { SectionNav } from "@/components/team/section-nav";
import { buttonClass } from "@/components/ui/button";
import { LIBRARY_SORTS, libraryFacets, searchLibrary } from "@/db/queries/library";
import { listUserTeams } from "@/db/queries/teams";
import { REVIEW_STATES, WORST_STATUSES } from "@/db/schema";
import { chainActionsFor, effectiveChainRole, teamRights } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Chains" };

const PAGE_SIZE = 25;

/** The address is the library's query; anything unreadable in it is ignored, never an error page. */
const querySchema = z.object({
  q: z.string().max(200).optional().catch(undefined),
  team: z.string().max(64).optional().catch(undefined),
  owner: z.string().max(64).optional().catch(undefined),
  review: z.enum(REVIEW_STATES).optional().catch(undefined),
  status: z.enum([...WORST_STATUSES, "none"]).optional().catch(undefined),
  archived: z.literal("1").optional().catch(undefined),
  sort: z.enum(LIBRARY_SORTS).optional().catch(undefined),
  dir: z.enum(["asc", "desc"]).optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(10_000).optional().catch(undefined),
});

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function ChainsPage({ searchParams }: Props) {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in?callbackUrl=/chains");
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const q = querySchema.parse(raw);
  const result = searchLibrary(user.id, {
    q: q.q,
    teamId: q.team,
    ownerId: q.owner,
    reviewState: q.review,
    worstStatus: q.status,
    archived: q.archived === "1",
    sort: q.sort,
    dir: q.dir ?? (q.sort && q.sort !== "updatedAt" ? "asc" : "desc"),
    page: q.page,
    pageSize: PAGE_SIZE,
  });
  const anyChains = result.total > 0 || searchLibrary(user.id, { pageSize: 1 }).total > 0 || searchLibrary(user.id, { pageSize: 1, archived: true }).total > 0;
  const rows = result.rows.map((c) => ({
    id: c.id,
    name: c.name,
    teamId: c.teamId,
    teamName: c.teamName,
    owners: c.owners,
    role: effectiveChainRole(c.teamRole, c.chainRole),
    actions: [...chainActionsFor(c.teamRole, c.chainRole)],
    reviewState: c.reviewState,
    worstStatus: c.worstStatus,
    version: c.version,
    updatedAt: c.updatedAt.toISOString(),
    archived: c.archivedAt !== null,
  }));
  const creatableTeams = listUserTeams(user.id)
    .filter((t) => teamRights(user.id, t.id).has("team:create-chain"))
    .map((t) => ({ id: t.id, name: t.name }));
  return (
    <div className="flex flex-col gap-5">
      <div className="flex items-start justify-between gap-4">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">Chains</h1>
          <p className="mt-1 text-sm text-graphite-500">Every chain your teams hold and every chain shared with you.</p>
        </div>
        {creatableTeams.length > 0 && (
          <Link href="/chains/new" className={buttonClass("primary")}>
            New chain
          </Link>
        )}
      </div>
      <SectionNav current="/chains" />
      <ChainLibrary
        rows={rows}
        total={result.total}
        page={result.page}
        pageSize={result.pageSize}
        facets={libraryFacets(user.id)}
        creatableTeams={creatableTeams}
        anyChains={anyChains}
      />
    </div>
  );
}
