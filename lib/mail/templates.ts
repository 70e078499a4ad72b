/** Text and HTML of the mails Chainwright sends. Kept plain: many mail readers strip styles. */

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

export function signInLinkMail(url: string, host: string): { subject: string; text: string; html: string } {
  const subject = "Your Chainwright sign-in link";
  const text = [
    `Open this link to sign in to Chainwright at ${host}:`,
    "",
    url,
    "",
    "The link works once and for 24 hours. If you did not ask for it, ignore this mail: nothing happens until the link is opened.",
  ].join("\n");
  const html = `<!doctype html><html><body style="font-family: sans-serif; color: #23262b">
<p>Open this link to sign in to Chainwright at ${escapeHtml(host)}:</p>
<p><a href="${escapeHtml(url)}">Sign in to Chainwright</a></p>
<p style="color:#5b6068">The link works once and for 24 hours. If you did not ask for it, ignore this mail: nothing happens until the link is opened.</p>
</body></html>`;
  return { subject, text, html };
}
