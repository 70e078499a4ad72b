import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { ChainLibrary } from "@/components/library/chain-library";
import { SectionNav } from "@/components/team/section-nav";
import { buttonClass } from "@/components/ui/button";
import { libraryFacets, searchLibrary } from "@/db/queries/library";
import { listUserTeams } from "@/db/queries/teams";
import { chainListState } from "@/lib/api/chain-view";
import { libraryQueryFromAddress } from "@/lib/api/library-query";
import { teamRights } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Chains" };

const PAGE_SIZE = 25;

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function ChainsPage({ searchParams }: Props) {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in?callbackUrl=/chains");
  const result = searchLibrary(user.id, libraryQueryFromAddress(await searchParams, PAGE_SIZE));
  const anyChains = result.total > 0 || searchLibrary(user.id, { pageSize: 1 }).total > 0 || searchLibrary(user.id, { pageSize: 1, archived: true }).total > 0;
  const rows = result.rows.map((c) => ({
    id: c.id,
    name: c.name,
    teamId: c.teamId,
    teamName: c.teamName,
    owners: c.owners,
    ...chainListState(c),
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
          <div className="flex items-center gap-2">
            <Link href="/chains/import" className={buttonClass("secondary")}>
              Import a chain file
            </Link>
            <Link href="/chains/new" className={buttonClass("primary")}>
              New chain
            </Link>
          </div>
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
