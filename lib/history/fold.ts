/**
 * When a save becomes a revision of its own and when it folds into the last one. Autosave writes a
 * few seconds after every edit; a history of each keystroke would bury the changes people care about.
 * Consecutive saves by one author within a few minutes are one revision, unless that revision is
 * pinned (a review request or an approval names it: it must stay exactly what was reviewed) or the
 * new save carries a summary of its own (an explicit save or a restore says what it is).
 */

/** How long after the last save into a revision another save by the same author still folds into it. */
export const FOLD_WINDOW_MS = 5 * 60 * 1000;

export interface LastRevision {
  /** revision 1 records the chain as created and is never folded into */
  number: number;
  authorId: string | null;
  pinned: boolean;
  createdAt: Date;
  /** time of the last save folded into it, null when none was */
  updatedAt: Date | null;
}

export interface IncomingSave {
  authorId: string;
  /** a summary the saver wrote; autosaves have none */
  summary?: string | null;
  at: Date;
}

export function shouldFold(last: LastRevision | null | undefined, save: IncomingSave, windowMs = FOLD_WINDOW_MS): boolean {
  if (!last) return false;
  if (last.pinned || last.number <= 1) return false;
  if (save.summary && save.summary.trim()) return false;
  if (!last.authorId || last.authorId !== save.authorId) return false;
  const lastAt = (last.updatedAt ?? last.createdAt).getTime();
  const gap = save.at.getTime() - lastAt;
  return gap >= 0 && gap <= windowMs;
}
