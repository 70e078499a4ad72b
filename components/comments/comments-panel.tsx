"use client";
/**
 * Threads on one chain: each pinned to a stage or to the chain as a whole. A new thread is pinned to
 * the stage selected on the canvas (or to the chain when none is); replies stay in their thread;
 * threads can be resolved and reopened. Clicking a stage pin selects that stage on the canvas.
 */
import { useState } from "react";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { fetchJson, problemText } from "@/lib/api/client/fetch-json";
import { chainApiBase, teamKeys, useThreads, type ThreadData } from "@/components/review/queries";
import { shortTime } from "@/components/review/review-words";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";

export function CommentsPanel({ chainId, focusStage }: { chainId: string; focusStage: string | null }) {
  const threads = useThreads(chainId);
  const selected = useEditor((s) => (s.selected.length === 1 ? s.selected[0] : null));
  const stageIds = useEditor((s) => s.doc.nodes.map((n) => n.id).join(" "));
  const [showResolved, setShowResolved] = useState(false);
  const pin = focusStage ?? selected;
  if (threads.isPending) return <p className="p-3 text-sm text-graphite-500">Loading comments…</p>;
  if (threads.isError) return <p className="p-3 text-sm text-status-clip">■ {problemText(threads.error)}</p>;
  const { me } = threads.data;
  const all = threads.data.threads;
  const visible = all.filter((t) => showResolved || !t.resolvedAt).filter((t) => !pin || t.nodeId === pin);
  const resolvedCount = all.filter((t) => t.resolvedAt && (!pin || t.nodeId === pin)).length;
  return (
    <div className="flex flex-col gap-3 p-3 text-sm" data-testid="comments-panel">
      {me.canComment ? (
        <NewThread chainId={chainId} pin={pin && stageIds.split(" ").includes(pin) ? pin : null} />
      ) : (
        <p className="rounded-card border border-paper-rule bg-paper-sunk/50 p-2 text-[12.5px] text-graphite-700" data-testid="comments-read-only">
          Your role lets you read comments, not write them.
        </p>
      )}
      <div className="flex items-center justify-between text-[12.5px] text-graphite-500">
        <span>{pin ? `Threads on ${pin}` : "All threads"}</span>
        {resolvedCount > 0 && (
          <label className="flex items-center gap-1">
            <input type="checkbox" checked={showResolved} onChange={(e) => setShowResolved(e.target.checked)} /> show {resolvedCount} resolved
          </label>
        )}
      </div>
      {visible.length === 0 ? (
        <p className="text-[12.5px] text-graphite-500">No open threads here.</p>
      ) : (
        <ul className="flex flex-col gap-2.5">
          {visible.map((t) => (
            <li key={t.id}>
              <Thread chainId={chainId} thread={t} meId={me.id} canComment={me.canComment} canModerate={me.canModerate} />
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

function useCommentMutation<T>(chainId: string, fn: (v: T) => Promise<unknown>, onOk?: () => void) {
  const qc = useQueryClient();
  const [problem, setProblem] = useState<string | null>(null);
  const m = useMutation({
    mutationFn: fn,
    onSuccess: () => {
      setProblem(null);
      onOk?.();
      void qc.invalidateQueries({ queryKey: teamKeys.threads(chainId) });
    },
    onError: (e) => setProblem(problemText(e)),
  });
  return { m, problem };
}

function NewThread({ chainId, pin }: { chainId: string; pin: string | null }) {
  const [body, setBody] = useState("");
  const { m, problem } = useCommentMutation(chainId, () => fetchJson(`${chainApiBase(chainId)}/comments`, { method: "POST", body: { body, nodeId: pin } }), () => setBody(""));
  return (
    <form
      className="flex flex-col gap-1.5"
      onSubmit={(e) => {
        e.preventDefault();
        if (body.trim()) m.mutate(undefined);
      }}
    >
      <label htmlFor="new-comment" className="text-[12.5px] font-medium text-graphite-700">
        New comment {pin ? <>on stage <span className="num">{pin}</span></> : "on the whole chain"}
      </label>
      <textarea id="new-comment" value={body} onChange={(e) => setBody(e.target.value)} rows={3} maxLength={5000} className="rounded-card border border-paper-rule bg-paper-raised p-1.5 text-sm" />
      <div>
        <Button type="submit" disabled={m.isPending || !body.trim()}>
          Comment
        </Button>
      </div>
      {problem && <Notice tone="problem">{problem}</Notice>}
    </form>
  );
}

function Thread({ chainId, thread, meId, canComment, canModerate }: { chainId: string; thread: ThreadData; meId: string; canComment: boolean; canModerate: boolean }) {
  const actions = useEditorActions();
  const [reply, setReply] = useState("");
  const base = chainApiBase(chainId);
  const send = useCommentMutation(chainId, () => fetchJson(`${base}/comments`, { method: "POST", body: { body: reply, parentId: thread.id } }), () => setReply(""));
  const resolve = useCommentMutation(chainId, (resolved: boolean) => fetchJson(`${base}/comments/${thread.id}`, { method: "PATCH", body: { resolved } }));
  const remove = useCommentMutation(chainId, (id: string) => fetchJson(`${base}/comments/${id}`, { method: "DELETE" }));
  const problem = send.problem ?? resolve.problem ?? remove.problem;
  return (
    <article id={`thread-${thread.id}`} className={`rounded-card border p-2.5 ${thread.resolvedAt ? "border-paper-rule bg-paper-sunk/40" : "border-paper-rule bg-paper-raised"}`} data-testid="thread">
      <div className="mb-1 flex items-center justify-between text-[12px] text-graphite-500">
        {thread.nodeId ? (
          <button type="button" className="num rounded px-1 text-accent-700 hover:bg-accent-50" onClick={() => actions.select([thread.nodeId!])}>
            ✎ {thread.nodeId}
          </button>
        ) : (
          <span>whole chain</span>
        )}
        {thread.resolvedAt && <span>● resolved by {thread.resolvedBy?.name ?? "someone"}</span>}
      </div>
      <ol className="flex flex-col gap-1.5">
        {thread.comments.map((c) => (
          <li key={c.id}>
            <p className="text-[12px] text-graphite-500">
              <span className="font-medium text-graphite-900">{c.author?.name ?? "Former member"}</span> · <span className="num">{shortTime(c.createdAt)}</span>
              {(c.author?.id === meId || canModerate) && (
                <button type="button" className="ml-2 text-[11.5px] text-graphite-400 hover:text-status-clip" onClick={() => remove.m.mutate(c.id)} aria-label="Delete this comment">
                  delete
                </button>
              )}
            </p>
            <p className="whitespace-pre-wrap text-graphite-900" data-testid="comment-body">
              {c.body}
            </p>
          </li>
        ))}
      </ol>
      {canComment && (
        <div className="mt-2 flex flex-col gap-1.5">
          <label className="sr-only" htmlFor={`reply-${thread.id}`}>
            Reply
          </label>
          <textarea id={`reply-${thread.id}`} placeholder="Reply…" value={reply} onChange={(e) => setReply(e.target.value)} rows={1} maxLength={5000} className="rounded-card border border-paper-rule bg-paper-raised p-1.5 text-sm" />
          <div className="flex gap-2">
            <Button variant="secondary" onClick={() => send.m.mutate(undefined)} disabled={!reply.trim() || send.m.isPending}>
              Reply
            </Button>
            <Button variant="quiet" onClick={() => resolve.m.mutate(!thread.resolvedAt)}>
              {thread.resolvedAt ? "Reopen" : "Resolve"}
            </Button>
          </div>
        </div>
      )}
      {problem && <Notice tone="problem" className="mt-2">{problem}</Notice>}
    </article>
  );
}
