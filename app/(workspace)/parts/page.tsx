import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { PartsLibrary } from "@/components/parts/parts-library";
import { SectionNav } from "@/components/team/section-nav";
import { listParts } from "@/db/queries/parts";
import { listUserTeams } from "@/db/queries/teams";
import { teamRights } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";
import { CSV_MAX_BYTES, CSV_MAX_ROWS } from "@/lib/parts-csv";

export const metadata: Metadata = { title: "Op-amp library" };

type Props = { searchParams: Promise<{ team?: string }> };

export default async function PartsPage({ searchParams }: Props) {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in?callbackUrl=/parts");
  const teams = listUserTeams(user.id);
  const { team } = await searchParams;
  const current = teams.find((t) => t.id === team) ?? teams.find((t) => !t.personal) ?? teams[0];
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">Op-amp library</h1>
        <p className="mt-1 text-sm text-graphite-500">
          Models the team shares. A chain keeps its own copy of each model it uses, so changing a model here never changes a reviewed chain.
        </p>
      </div>
      <SectionNav current="/parts" />
      {teams.length > 1 && (
        <nav aria-label="Team" className="flex gap-2 text-sm">
          {teams.map((t) => (
            <Link key={t.id} href={`/parts?team=${t.id}`} aria-current={t.id === current?.id ? "page" : undefined} className={t.id === current?.id ? "font-medium text-graphite-950" : ""}>
              {t.name}
            </Link>
          ))}
        </nav>
      )}
      {current ? (
        <PartsLibrary
          teamId={current.id}
          parts={listParts(current.id).map((p) => ({ ...p, updatedAt: p.updatedAt.toISOString() }))}
          canEdit={teamRights(user.id, current.id).has("team:edit-parts")}
          limits={{ bytes: CSV_MAX_BYTES, rows: CSV_MAX_ROWS }}
        />
      ) : (
        <p className="text-sm text-graphite-500">You are in no team yet.</p>
      )}
    </div>
  );
}
