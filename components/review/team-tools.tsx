"use client";
/**
 * The team side of the chain workspace, mounted under its command bar: the review state, and buttons
 * that open a side panel for review, comments and sharing, plus the link to the history. It also puts
 * the comment marks on the stage cards. It reads the chain id and version from the editor store and
 * refreshes the review state after each save, so an edit that sends an approved chain back to draft is
 * said at once.
 */
import { useEffect, useLayoutEffect, useRef, useState } from "react";
import Link from "next/link";
import dynamic from "next/dynamic";
import { useQueryClient } from "@tanstack/react-query";
import { CommentMarkers } from "@/components/comments/comment-markers";
import { cx } from "@/components/ui/cx";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import { ReviewBadge } from "./review-badge";
import { teamKeys, useReviews, useThreads } from "./queries";

// The side panels load when one is opened; none is open when a chain opens (unless a mail's link asks for one).
const ReviewPanel = dynamic(() => import("./review-panel").then((m) => m.ReviewPanel), { ssr: false });
const CommentsPanel = dynamic(() => import("@/components/comments/comments-panel").then((m) => m.CommentsPanel), { ssr: false });
const SharePanel = dynamic(() => import("@/components/sharing/share-panel").then((m) => m.SharePanel), { ssr: false });

type Tab = "review" | "comments" | "share";

export function TeamTools() {
  const chainId = useEditor((s) => s.chainId);
  if (!chainId) return null;
  return <TeamToolsFor chainId={chainId} />;
}

function TeamToolsFor({ chainId }: { chainId: string }) {
  const [tab, setTab] = useState<Tab | null>(null);
  const [focusStage, setFocusStage] = useState<string | null>(null);
  const reviews = useReviews(chainId);
  const threads = useThreads(chainId);
  const version = useEditor((s) => s.version);
  const actions = useEditorActions();
  const qc = useQueryClient();
  const seen = useRef(version);
  // The side panel opens under this strip (not over its buttons): measure where the strip ends.
  const strip = useRef<HTMLDivElement>(null);
  const [top, setTop] = useState(96);
  useLayoutEffect(() => {
    if (!tab || !strip.current) return;
    const measure = () => setTop(Math.round(strip.current!.getBoundingClientRect().bottom + window.scrollY));
    measure();
    window.addEventListener("resize", measure);
    return () => window.removeEventListener("resize", measure);
  }, [tab]);
  useEffect(() => {
    if (seen.current === version) return;
    seen.current = version;
    void qc.invalidateQueries({ queryKey: teamKeys.reviews(chainId) });
  }, [version, chainId, qc]);

  // A comment mail links to /chains/ID?stage=NODE#thread-…: open that stage's threads on arrival.
  useEffect(() => {
    const stage = new URL(window.location.href).searchParams.get("stage");
    if (!stage) return;
    actions.select([stage]);
    setFocusStage(stage);
    setTab("comments");
  }, [actions]);

  const state = reviews.data?.reviewState ?? "draft";
  const lastClosed = reviews.data?.rounds.find((r) => !r.open);
  const backToDraft = state === "draft" && lastClosed?.closedReason === "edited-after-approval";
  const open = (reviews.data?.me.actions ?? []) as string[];
  const openThreads = (threads.data?.threads ?? []).filter((t) => !t.resolvedAt).length;

  const toggle = (t: Tab) => {
    setFocusStage(null);
    setTab(tab === t ? null : t);
  };
  const button = (t: Tab, label: string) => (
    <button
      type="button"
      aria-expanded={tab === t}
      aria-controls="team-drawer"
      onClick={() => toggle(t)}
      className={cx("rounded-card px-2 py-0.5 text-[12.5px]", tab === t ? "bg-accent-50 font-medium text-accent-800" : "text-graphite-900 hover:bg-paper-sunk")}
    >
      {label}
    </button>
  );
  return (
    <>
      <div ref={strip} className="flex items-center gap-2 border-b border-paper-rule bg-paper-raised px-3 py-1 text-[12.5px]" data-testid="team-tools">
        <span className="text-graphite-500">Review:</span>
        <ReviewBadge state={state} className="font-medium text-graphite-950" />
        {backToDraft && (
          <span className="text-status-tight" data-testid="back-to-draft">
            ▲ edited after approval: back to draft
          </span>
        )}
        <span className="ml-auto flex items-center gap-1">
          {button("review", "Review")}
          {button("comments", `Comments${openThreads ? ` (${openThreads})` : ""}`)}
          {button("share", open.includes("share") ? "Share" : "People")}
          <Link href={`/chains/${chainId}/history`} className="rounded-card px-2 py-0.5 text-[12.5px] text-graphite-900 no-underline hover:bg-paper-sunk">
            History
          </Link>
        </span>
      </div>
      {tab && (
        <aside
          id="team-drawer"
          aria-label={tab === "review" ? "Review" : tab === "comments" ? "Comments" : "Sharing"}
          style={{ top }}
          className="fixed bottom-0 right-0 z-30 flex w-[360px] flex-col border-l border-paper-rule bg-paper-raised shadow-card"
        >
          <div className="flex items-center justify-between border-b border-paper-rule px-3 py-1.5">
            <h2 className="text-[13px] font-semibold text-graphite-950">{tab === "review" ? "Review" : tab === "comments" ? "Comments" : "Sharing"}</h2>
            <button type="button" onClick={() => setTab(null)} className="rounded px-1.5 text-[12.5px] text-graphite-500 hover:bg-paper-sunk" aria-label="Close the panel">
              Close
            </button>
          </div>
          <div className="min-h-0 flex-1 overflow-y-auto">
            {tab === "review" && <ReviewPanel chainId={chainId} />}
            {tab === "comments" && <CommentsPanel chainId={chainId} focusStage={focusStage} />}
            {tab === "share" && <SharePanel chainId={chainId} canShare={open.includes("share")} />}
          </div>
        </aside>
      )}
      <CommentMarkers
        threads={threads.data?.threads ?? []}
        onOpen={(nodeId) => {
          actions.select([nodeId]);
          setFocusStage(nodeId);
          setTab("comments");
        }}
      />
    </>
  );
}
