import type { Page } from "playwright-core";
import { expect } from "vitest";
import { DEMO_PASSWORD } from "../../../db/seed-data/people";
import { firstLink, type StoredMessage } from "../../../lib/mail/mailbox";
import { e2eContext } from "./context";

/** Demo password of the seeded Keelwater Instruments accounts (db/seed-data/people.ts). */
export { DEMO_PASSWORD, DEMO_PEOPLE } from "../../../db/seed-data/people";

export async function signInWithPassword(page: Page, email: string, password: string): Promise<void> {
  await page.goto("/sign-in");
  await page.locator("#password-email").fill(email);
  await page.getByLabel("Password", { exact: true }).fill(password);
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
}

/** Sign in by password (the demo password unless given) and wait for the chain list the sign-in ends on. */
export async function signIn(page: Page, email: string, password: string = DEMO_PASSWORD): Promise<void> {
  await signInWithPassword(page, email, password);
  await page.waitForURL(/\/chains$/);
}

/** Ask for a sign-in link on the sign-in page; ends on the check-your-mail page. */
export async function requestSignInLink(page: Page, email: string): Promise<void> {
  await page.goto("/sign-in");
  await page.locator("#link-email").fill(email);
  await page.getByRole("button", { name: "Send me a sign-in link" }).click();
  await page.waitForURL(/\/check-your-mail/);
}

/** Messages to `email` from the stand-in's JSON mailbox (the same store /mailbox shows). */
export async function mailFor(email: string): Promise<StoredMessage[]> {
  const res = await fetch(`${e2eContext().baseUrl}/api/mailbox?to=${encodeURIComponent(email)}`);
  expect(res.status).toBe(200);
  return ((await res.json()) as { messages: StoredMessage[] }).messages;
}

/**
 * Wait for a mail to `email` beyond the `already` seen before, and return the link in it.
 * The stand-in stores the decoded text (quoted-printable undone by mailparser), so the link
 * is whole.
 */
export async function waitForLink(email: string, already = 0, timeoutMs = 15_000): Promise<string> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const messages = await mailFor(email);
    if (messages.length > already) {
      const link = firstLink(messages[0]);
      if (link) return link;
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`no mail with a link reached ${email} within ${timeoutMs} ms`);
}

export async function signOut(page: Page): Promise<void> {
  await page.getByRole("button", { name: "Sign out" }).click();
  await page.waitForURL((url) => url.pathname === "/");
}

/** The rows of the workspace chain list, once it has rendered (not its loading frame). */
export async function chainListRows(page: Page): Promise<string[]> {
  const list = page.getByTestId("chain-list");
  await list.waitFor();
  return list.locator("tbody tr").allTextContents();
}

/** An address no other test (or earlier run) uses, for sign-ups and invitations. */
export function uniqueEmail(label: string): string {
  return `${label}.${Date.now().toString(36)}.${Math.random().toString(36).slice(2, 8)}@e2e.example`;
}
