import type { ReactNode } from "react";
import { cx } from "./cx";

export type NoticeTone = "info" | "problem" | "caution";

const TONES: Record<NoticeTone, { box: string; mark: string; markTone: string; word: string }> = {
  info: { box: "border-accent-300 bg-accent-50", mark: "○", markTone: "text-accent-700", word: "Note" },
  problem: { box: "border-status-clip/40 bg-[#f6e9e6]", mark: "■", markTone: "text-status-clip", word: "Problem" },
  caution: { box: "border-status-tight/40 bg-[#f5eddf]", mark: "▲", markTone: "text-status-tight", word: "Caution" },
};

/** A boxed message that says what kind it is in words and a shape, not by colour alone. */
export function Notice({ tone = "info", title, children, className }: { tone?: NoticeTone; title?: string; children: ReactNode; className?: string }) {
  const t = TONES[tone];
  return (
    <div role={tone === "problem" ? "alert" : "status"} data-tone={tone} className={cx("rounded-card border px-3.5 py-3 text-sm text-graphite-900", t.box, className)}>
      <p className="font-medium">
        <span aria-hidden="true" className={cx("mr-1.5", t.markTone)}>
          {t.mark}
        </span>
        {title ?? t.word}
      </p>
      <div className="mt-1 text-graphite-700">{children}</div>
    </div>
  );
}
