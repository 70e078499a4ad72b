import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { ChainList } from "@/components/workspace/chain-list";
import { listChainsForUser } from "@/db/queries/chains";
import { effectiveChainRole } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Chains" };

export default async function ChainsPage() {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in?callbackUrl=/chains");
  const rows = listChainsForUser(user.id).map((c) => ({
    id: c.id,
    name: c.name,
    teamName: c.teamName,
    role: effectiveChainRole(c.teamRole, c.chainRole),
    reviewState: c.reviewState,
    worstStatus: c.worstStatus,
    updatedAt: c.updatedAt.toISOString(),
  }));
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">Chains</h1>
        <p className="mt-1 text-sm text-graphite-500">Every chain your teams hold and every chain shared with you.</p>
      </div>
      <ChainList chains={rows} />
    </div>
  );
}
