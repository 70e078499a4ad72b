import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { ImportForm } from "@/components/outputs/import-form";
import { listUserTeams } from "@/db/queries/teams";
import { teamRights } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Import a chain" };

/** /chains/import: bring a chain file in as a new chain, after a check that writes nothing. */
export default async function ImportPage() {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in?callbackUrl=/chains/import");
  const teams = listUserTeams(user.id)
    .filter((t) => teamRights(user.id, t.id).has("team:create-chain"))
    .map((t) => ({ id: t.id, name: t.name }));
  return (
    <div className="flex flex-col gap-4">
      <p className="text-sm">
        <Link href="/chains">← Chains</Link>
      </p>
      <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">Import a chain file</h1>
      <p className="max-w-3xl text-sm text-graphite-700">
        A chain exported from Chainwright (a <code>chainwright.chain/1</code> JSON file). It is checked first; nothing is written until you import,
        and a document with any problem is not written at all.
      </p>
      {teams.length === 0 ? <p>You are in no team where you may create chains.</p> : <ImportForm teams={teams} />}
    </div>
  );
}
