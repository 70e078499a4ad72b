import type { Metadata } from "next";
import Link from "next/link";
import { HistoryView } from "@/components/history/history-view";
import { ReviewBadge } from "@/components/review/review-badge";
import { listRevisions } from "@/db/queries/history";
import { pageChain } from "@/lib/auth/guard";

export const metadata: Metadata = { title: "History" };

type Props = { params: Promise<{ id: string }> };

export default async function HistoryPage({ params }: Props) {
  const { id } = await params;
  const rights = await pageChain("view", id, `/chains/${id}/history`);
  const revisions = listRevisions(id).map((r) => ({ ...r, createdAt: r.createdAt.toISOString(), updatedAt: r.updatedAt?.toISOString() ?? null }));
  return (
    <div className="flex flex-col gap-5">
      <div className="flex items-start justify-between gap-4">
        <div>
          <p className="text-sm">
            <Link href={`/chains/${id}`}>← Back to the chain</Link>
          </p>
          <h1 className="mt-1 text-2xl font-semibold tracking-tight text-graphite-950">History of {rights.chain.name}</h1>
          <p className="mt-1 flex items-center gap-2 text-sm text-graphite-500">
            Version <span className="num">{rights.chain.version}</span> · <ReviewBadge state={rights.chain.reviewState} /> · autosaves by one person within five minutes are kept as one revision
          </p>
        </div>
      </div>
      <HistoryView chainId={id} version={rights.chain.version} revisions={revisions} canRestore={rights.actions.has("edit")} />
    </div>
  );
}
