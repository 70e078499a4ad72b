import { cx } from "./cx";

export type Status = "ok" | "tight" | "clip";

/** Each status has its own shape and word; the colour only repeats what they already say. */
const LOOK: Record<Status, { word: string; shape: string; tone: string }> = {
  ok: { word: "Within rails", shape: "●", tone: "text-status-ok" },
  tight: { word: "Little margin", shape: "▲", tone: "text-status-tight" },
  clip: { word: "Hits a rail", shape: "■", tone: "text-status-clip" },
};

export function StatusMark({ status, className }: { status: Status | null; className?: string }) {
  if (!status) {
    return <span className={cx("text-sm text-graphite-400", className)}>○ Not analysed</span>;
  }
  const look = LOOK[status];
  return (
    <span className={cx("inline-flex items-center gap-1.5 text-sm", className)}>
      <span aria-hidden="true" className={look.tone}>
        {look.shape}
      </span>
      <span>{look.word}</span>
    </span>
  );
}
