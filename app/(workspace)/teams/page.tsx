import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { ROLE_WORDS } from "@/components/review/review-words";
import { SectionNav } from "@/components/team/section-nav";
import { listUserTeams } from "@/db/queries/teams";
import { getCurrentUser } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Teams" };

export default async function TeamsPage() {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in?callbackUrl=/teams");
  const teams = listUserTeams(user.id);
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">Teams</h1>
        <p className="mt-1 text-sm text-graphite-500">The teams you belong to. Admins manage members, roles and invitations.</p>
      </div>
      <SectionNav current="/teams" />
      <ul className="flex flex-col gap-2" data-testid="teams">
        {teams.map((t) => (
          <li key={t.id} className="flex items-center justify-between rounded-card border border-paper-rule bg-paper-raised px-4 py-3">
            <Link href={`/teams/${t.id}`} className="font-medium text-graphite-950">
              {t.name}
            </Link>
            <span className="text-sm text-graphite-500">
              {t.personal ? "personal · " : ""}
              {ROLE_WORDS[t.role]}
            </span>
          </li>
        ))}
      </ul>
    </div>
  );
}
