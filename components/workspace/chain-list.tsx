import type { ChainRole, ReviewState, WorstStatus } from "@/lib/domain";
import { StatusMark } from "@/components/ui/status-mark";

export interface ChainListRow {
  id: string;
  name: string;
  teamName: string;
  role: ChainRole | null;
  reviewState: ReviewState;
  worstStatus: WorstStatus | null;
  /** ISO date-time */
  updatedAt: string;
}

const REVIEW_WORDS: Record<ReviewState, string> = {
  draft: "Draft",
  "in-review": "In review",
  "changes-requested": "Changes requested",
  approved: "Approved",
};

const ROLE_WORDS: Record<ChainRole, string> = { owner: "Owner", editor: "Editor", reviewer: "Reviewer", viewer: "Viewer" };

function formatDate(iso: string): string {
  return iso.slice(0, 16).replace("T", " ");
}

/** The chains a user can see, as a plain table. `null` draws the empty frame while loading. */
export function ChainList({ chains }: { chains: ChainListRow[] | null }) {
  if (chains && chains.length === 0) {
    return (
      <div className="rounded-card border border-dashed border-paper-rule bg-paper-raised p-8 text-center text-graphite-700">
        No chains yet. Chains your team creates, or that someone shares with you, appear here.
      </div>
    );
  }
  return (
    <div className="overflow-x-auto rounded-card border border-paper-rule bg-paper-raised shadow-card">
      <table className="w-full text-left text-sm" data-testid={chains ? "chain-list" : "chain-list-loading"}>
        <caption className="sr-only">Chains you can open</caption>
        <thead className="border-b border-paper-rule bg-paper-sunk/60 text-xs uppercase tracking-wide text-graphite-500">
          <tr>
            <th scope="col" className="px-4 py-2.5 font-medium">Name</th>
            <th scope="col" className="px-4 py-2.5 font-medium">Team</th>
            <th scope="col" className="px-4 py-2.5 font-medium">Your role</th>
            <th scope="col" className="px-4 py-2.5 font-medium">Review</th>
            <th scope="col" className="px-4 py-2.5 font-medium">Headroom</th>
            <th scope="col" className="px-4 py-2.5 font-medium">Last saved (UTC)</th>
          </tr>
        </thead>
        <tbody>
          {(chains ?? []).map((c) => (
            <tr key={c.id} className="border-b border-paper-rule last:border-b-0">
              <th scope="row" className="px-4 py-3 font-medium text-graphite-950">{c.name}</th>
              <td className="px-4 py-3 text-graphite-700">{c.teamName}</td>
              <td className="px-4 py-3 text-graphite-700">{c.role ? ROLE_WORDS[c.role] : "—"}</td>
              <td className="px-4 py-3 text-graphite-700">{REVIEW_WORDS[c.reviewState]}</td>
              <td className="px-4 py-3">
                <StatusMark status={c.worstStatus} />
              </td>
              <td className="num px-4 py-3 text-graphite-500">{formatDate(c.updatedAt)}</td>
            </tr>
          ))}
          {chains === null ? (
            <tr>
              <td colSpan={6} className="px-4 py-6 text-center text-graphite-400">…</td>
            </tr>
          ) : null}
        </tbody>
      </table>
    </div>
  );
}
