/**
 * The mails of working together: invitations, review requests and decisions, comments. Plain text
 * first (the mailbox shows it; many readers strip HTML), with a small HTML twin.
 */

export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

function compose(subject: string, lines: string[], link: { url: string; label: string }, footer: string): MailContent {
  const text = [...lines, "", link.url, "", footer].join("\n");
  const html = `<!doctype html><html><body style="font-family: sans-serif; color: #23262b">
${lines.filter(Boolean).map((l) => `<p>${escapeHtml(l)}</p>`).join("\n")}
<p><a href="${escapeHtml(link.url)}">${escapeHtml(link.label)}</a></p>
<p style="color:#5b6068">${escapeHtml(footer)}</p>
</body></html>`;
  return { subject, text, html };
}

const ROLE_WORDS: Record<string, string> = {
  owner: "an owner",
  editor: "an editor",
  reviewer: "a reviewer",
  viewer: "a viewer",
  admin: "an admin",
  engineer: "an engineer",
};

export function invitationMail(input: {
  inviter: string;
  what: { kind: "chain"; name: string } | { kind: "team"; name: string };
  role: string;
  url: string;
  email: string;
  expiresAt: Date;
}): MailContent {
  const target = input.what.kind === "chain" ? `the chain “${input.what.name}”` : `the team “${input.what.name}”`;
  const subject = input.what.kind === "chain" ? `${input.inviter} shared “${input.what.name}” with you on Chainwright` : `${input.inviter} invited you to ${input.what.name} on Chainwright`;
  return compose(
    subject,
    [
      `${input.inviter} invited you to ${target} as ${ROLE_WORDS[input.role] ?? input.role}.`,
      `Open the link below to accept. If you have no Chainwright account yet, you can create one there with this address (${input.email}).`,
    ],
    { url: input.url, label: "Open the invitation" },
    `The link works once, only for ${input.email}, until ${input.expiresAt.toISOString().slice(0, 16).replace("T", " ")} UTC. If you did not expect it, ignore this mail.`,
  );
}

export function reviewRequestMail(input: { requester: string; chain: string; revision: number; note: string; url: string }): MailContent {
  return compose(
    `Review requested: ${input.chain}`,
    [
      `${input.requester} asks you to review “${input.chain}” (revision ${input.revision}).`,
      input.note ? `Their note: ${input.note}` : "",
      "Open the chain, comment on any stage, and finish with “Approve” or “Request changes”.",
    ],
    { url: input.url, label: "Open the chain" },
    "You get this mail because you were chosen as a reviewer. Review mails can be turned off in your settings.",
  );
}

export function reviewDecisionMail(input: { reviewer: string; chain: string; decision: "approved" | "changes-requested"; revision: number; note: string; url: string }): MailContent {
  const verb = input.decision === "approved" ? `approved revision ${input.revision} of` : `requested changes to`;
  return compose(
    `${input.decision === "approved" ? "Approved" : "Changes requested"}: ${input.chain}`,
    [`${input.reviewer} ${verb} “${input.chain}”.`, input.note ? `Their note: ${input.note}` : ""],
    { url: input.url, label: "Open the chain" },
    "You get this mail because you asked for this review. Review mails can be turned off in your settings.",
  );
}

export function commentMail(input: { author: string; chain: string; stage: string | null; body: string; reply: boolean; url: string }): MailContent {
  const where = input.stage ? `on stage ${input.stage} of “${input.chain}”` : `on “${input.chain}”`;
  const excerpt = input.body.length > 600 ? `${input.body.slice(0, 599)}…` : input.body;
  return compose(
    `${input.reply ? "New reply" : "New comment"} ${input.stage ? `on ${input.stage}` : ""} · ${input.chain}`.replace(/\s+/g, " "),
    [`${input.author} ${input.reply ? "replied" : "commented"} ${where}:`, "", excerpt],
    { url: input.url, label: "Open the thread" },
    "You get this mail because you take part in this thread or this chain. Comment mails can be turned off in your settings.",
  );
}
