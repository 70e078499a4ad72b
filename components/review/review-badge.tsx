import { cx } from "@/components/ui/cx";
import { REVIEW_LOOK } from "./review-words";

/** A chain's review state as a word with its own shape. */
export function ReviewBadge({ state, className }: { state: string; className?: string }) {
  const look = REVIEW_LOOK[state] ?? REVIEW_LOOK.draft;
  return (
    <span className={cx("inline-flex items-center gap-1 whitespace-nowrap", className)} data-testid="review-state" data-state={state}>
      <span aria-hidden="true" className={look.tone}>
        {look.shape}
      </span>
      {look.word}
    </span>
  );
}
