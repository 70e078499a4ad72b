/** Review states in words and shapes (never colour alone): our own marks, one per state. */
export const REVIEW_LOOK: Record<string, { word: string; shape: string; tone: string }> = {
  draft: { word: "Draft", shape: "◇", tone: "text-graphite-500" },
  "in-review": { word: "In review", shape: "◐", tone: "text-accent-700" },
  "changes-requested": { word: "Changes requested", shape: "▲", tone: "text-status-tight" },
  approved: { word: "Approved", shape: "◆", tone: "text-status-ok" },
};

export const ROLE_WORDS: Record<string, string> = {
  owner: "Owner",
  editor: "Editor",
  reviewer: "Reviewer",
  viewer: "Viewer",
  admin: "Admin",
  engineer: "Engineer",
};

export const DECISION_WORDS: Record<string, string> = {
  pending: "waiting",
  approved: "approved",
  "changes-requested": "requested changes",
};

export function shortTime(iso: string): string {
  return iso.slice(0, 16).replace("T", " ");
}
