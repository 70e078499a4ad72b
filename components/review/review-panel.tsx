"use client";
/**
 * Review of one chain: its state, the open request with each reviewer's decision, asking for a review
 * (editors), and deciding (the chosen reviewers): approve the revision on screen or request changes.
 */
import { useState } from "react";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { Notice } from "@/components/ui/notice";
import { Button } from "@/components/ui/button";
import { fetchJson, problemText } from "@/lib/api/client/fetch-json";
import { useEditor } from "@/lib/store/editor-context";
import { ReviewBadge } from "./review-badge";
import { chainApiBase, teamKeys, useMembers, useReviews, type RoundView } from "./queries";
import { DECISION_WORDS, shortTime } from "./review-words";

const CLOSED_WORDS: Record<string, string> = {
  superseded: "replaced by a newer request",
  withdrawn: "withdrawn",
  "edited-after-approval": "closed: the chain was edited after approval, so it went back to draft",
};

export function ReviewPanel({ chainId }: { chainId: string }) {
  const reviews = useReviews(chainId);
  const version = useEditor((s) => s.version);
  const qc = useQueryClient();
  const [note, setNote] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const refresh = () => {
    void qc.invalidateQueries({ queryKey: teamKeys.reviews(chainId) });
  };
  const decide = useMutation({
    mutationFn: (decision: "approved" | "changes-requested") => fetchJson(`${chainApiBase(chainId)}/reviews/decision`, { method: "POST", body: { decision, note, version } }),
    onSuccess: () => {
      setNote("");
      setProblem(null);
      refresh();
    },
    onError: (e) => setProblem(problemText(e)),
  });
  if (reviews.isPending) return <p className="p-3 text-sm text-graphite-500">Loading the review…</p>;
  if (reviews.isError) return <p className="p-3 text-sm text-status-clip">■ {problemText(reviews.error)}</p>;
  const data = reviews.data;
  const open = data.rounds.find((r) => r.open);
  const mine = open?.reviewers.find((r) => r.reviewer.id === data.me.id);
  const canEdit = data.me.actions.includes("edit");
  const lastClosed = data.rounds.find((r) => !r.open);
  return (
    <div className="flex flex-col gap-4 p-3 text-sm" data-testid="review-panel">
      <p className="flex items-center gap-2">
        <span className="text-graphite-500">State:</span>
        <ReviewBadge state={data.reviewState} className="font-medium" />
      </p>
      {data.reviewState === "draft" && lastClosed?.closedReason === "edited-after-approval" && (
        <Notice tone="caution" title="Back to draft">
          This chain was approved, then edited, so it is a draft again. The approval stays in the history with the revision it named.
        </Notice>
      )}
      {open && <RoundCard round={open} />}
      {mine && (
        <section className="flex flex-col gap-2 rounded-card border border-accent-300 bg-accent-50 p-2.5" aria-label="Your decision">
          <p className="font-medium text-graphite-950">You were asked to review revision {open!.requestedRevision.number}.</p>
          <p className="text-[12.5px] text-graphite-700">Your decision applies to the chain as it is on screen now (version {version}).</p>
          <label className="flex flex-col gap-1 text-[12.5px]">
            Note (optional)
            <textarea value={note} onChange={(e) => setNote(e.target.value)} rows={2} maxLength={2000} className="rounded-card border border-paper-rule bg-paper-raised p-1.5 text-sm" />
          </label>
          <div className="flex gap-2">
            <Button onClick={() => decide.mutate("approved")} disabled={decide.isPending}>
              Approve
            </Button>
            <Button variant="secondary" onClick={() => decide.mutate("changes-requested")} disabled={decide.isPending}>
              Request changes
            </Button>
          </div>
        </section>
      )}
      {problem && <Notice tone="problem">{problem}</Notice>}
      {canEdit && <RequestForm chainId={chainId} me={data.me.id} onDone={refresh} reopen={!!open} />}
      {data.rounds.filter((r) => !r.open).length > 0 && (
        <section>
          <h3 className="mb-1 text-[12px] font-semibold uppercase tracking-wide text-graphite-500">Earlier requests</h3>
          <ul className="flex flex-col gap-2">
            {data.rounds
              .filter((r) => !r.open)
              .map((r) => (
                <li key={r.round}>
                  <RoundCard round={r} />
                </li>
              ))}
          </ul>
        </section>
      )}
    </div>
  );
}

function RoundCard({ round }: { round: RoundView }) {
  return (
    <div className="rounded-card border border-paper-rule bg-paper-raised p-2.5 text-[12.5px]" data-testid={round.open ? "open-review" : "closed-review"}>
      <p className="text-graphite-700">
        {round.requestedBy?.name ?? "Someone"} asked for a review of revision {round.requestedRevision.number} on <span className="num">{shortTime(round.requestedAt)}</span>
        {round.closedReason ? ` — ${CLOSED_WORDS[round.closedReason] ?? round.closedReason}` : ""}.
      </p>
      {round.note && <p className="mt-1 italic text-graphite-700">“{round.note}”</p>}
      <ul className="mt-1.5 flex flex-col gap-1">
        {round.reviewers.map((r) => (
          <li key={r.id}>
            <span className="font-medium text-graphite-950">{r.reviewer.name ?? "Reviewer"}</span>: {DECISION_WORDS[r.decision] ?? r.decision}
            {r.decidedRevision ? ` (revision ${r.decidedRevision.number})` : ""}
            {r.note ? ` — “${r.note}”` : ""}
          </li>
        ))}
      </ul>
    </div>
  );
}

function RequestForm({ chainId, me, onDone, reopen }: { chainId: string; me: string; onDone: () => void; reopen: boolean }) {
  const members = useMembers(chainId);
  const [chosen, setChosen] = useState<string[]>([]);
  const [note, setNote] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const [sent, setSent] = useState<string | null>(null);
  const ask = useMutation({
    mutationFn: () => fetchJson<{ mailed: number; revision: { number: number } }>(`${chainApiBase(chainId)}/reviews`, { method: "POST", body: { reviewerIds: chosen, note } }),
    onSuccess: (r) => {
      setSent(`Review of revision ${r.revision.number} requested; ${r.mailed} ${r.mailed === 1 ? "mail" : "mails"} sent.`);
      setProblem(null);
      setChosen([]);
      setNote("");
      onDone();
    },
    onError: (e) => setProblem(problemText(e)),
  });
  const candidates = (members.data?.reviewers ?? []).filter((p) => p.userId !== me);
  return (
    <section className="flex flex-col gap-2 border-t border-paper-rule pt-3" aria-label="Ask for a review">
      <h3 className="text-[12px] font-semibold uppercase tracking-wide text-graphite-500">{reopen ? "Ask again (replaces the open request)" : "Ask for a review"}</h3>
      {candidates.length === 0 ? (
        <p className="text-[12.5px] text-graphite-500">Nobody can review this chain yet. Share it with someone as reviewer first.</p>
      ) : (
        <fieldset className="flex flex-col gap-1">
          <legend className="sr-only">Reviewers</legend>
          {candidates.map((p) => (
            <label key={p.userId} className="flex items-center gap-2">
              <input
                type="checkbox"
                checked={chosen.includes(p.userId)}
                onChange={(e) => setChosen(e.target.checked ? [...chosen, p.userId] : chosen.filter((x) => x !== p.userId))}
              />
              {p.name ?? "Unnamed"}
            </label>
          ))}
        </fieldset>
      )}
      <label className="flex flex-col gap-1 text-[12.5px]">
        Note to the reviewers
        <textarea value={note} onChange={(e) => setNote(e.target.value)} rows={2} maxLength={2000} className="rounded-card border border-paper-rule bg-paper-raised p-1.5 text-sm" />
      </label>
      <div>
        <Button onClick={() => ask.mutate()} disabled={ask.isPending || chosen.length === 0}>
          Request review
        </Button>
      </div>
      {sent && <p className="text-[12.5px] text-graphite-700" role="status">○ {sent}</p>}
      {problem && <Notice tone="problem">{problem}</Notice>}
    </section>
  );
}
