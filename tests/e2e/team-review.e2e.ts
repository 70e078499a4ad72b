/**
 * Two people carry a chain from draft to approved: the engineer shares it by e-mail invitation, the
 * invitee signs up through the link from the mailbox, comments on a stage and requests changes, the
 * engineer fixes the stage, and the reviewer approves. Mail lands in the local mailbox at every step.
 */
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { firstLink } from "../../lib/mail/mailbox";
import { DEMO_PEOPLE, mailFor, waitForLink } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { card, selectCard, serverChain, typeInto, waitForSaveState } from "./workspace-support";

const ctx = e2eContext();

async function copyOfDemoChain(page: Page, name: string): Promise<string> {
  const list = await (await page.request.get("/api/chains")).json();
  const hull = list.chains.find((c: { name: string }) => c.name === "Hull vibration channel, aft bay");
  const res = await page.request.post(`/api/chains/${hull.id}/duplicate`, { data: { name } });
  expect(res.status()).toBe(201);
  return (await res.json()).chain.id;
}

async function openTab(page: Page, name: "Review" | "Share" | "People" | RegExp) {
  await page.getByTestId("team-tools").getByRole("button", { name }).click();
}

async function waitForMail(email: string, subject: RegExp, timeoutMs = 15_000) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const hit = (await mailFor(email)).find((m) => subject.test(m.subject));
    if (hit) return hit;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`no mail matching ${subject} reached ${email}`);
}

describe.skipIf(ctx.skip !== null)("review by invitation, from draft to approved (production build)", () => {
  const sessions = useBrowser();

  it("shares by invitation, takes a comment and a request for changes, and ends approved", async () => {
    const stamp = Date.now();
    const chainName = `Review trial ${stamp}`;
    const reviewerEmail = `rhea.${stamp}@e2e.example`;
    const engineerEmail = DEMO_PEOPLE.engineerA.email;

    // The engineer makes a chain of their own and invites a reviewer who has no account yet.
    const eng = await sessions.signedIn(engineerEmail);
    const chainId = await copyOfDemoChain(eng.page, chainName);
    await eng.page.goto(`/chains/${chainId}`);
    await eng.page.getByTestId("workspace").waitFor();
    await expect.poll(() => eng.page.getByTestId("review-state").first().getAttribute("data-state")).toBe("draft");
    await openTab(eng.page, "Share");
    await eng.page.getByLabel("E-mail address").fill(reviewerEmail);
    await eng.page.locator("#invite-role").selectOption("reviewer");
    await eng.page.getByRole("button", { name: "Send invitation" }).click();
    await eng.page.getByTestId("share-done").waitFor();
    await expect.poll(() => eng.page.getByTestId("pending-invitations").textContent()).toContain(reviewerEmail);
    await screenshot(eng.page, "team-share-invited");

    // The reviewer follows the link from the mailbox page and signs up through it.
    const rev = await sessions.open();
    const link = await waitForLink(reviewerEmail);
    expect(link).toMatch(/\/invitation\/[A-Za-z0-9_-]{43}$/);
    await rev.page.goto("/mailbox");
    await rev.page.locator(`a[href="${link}"]`).first().click();
    await rev.page.waitForURL(/\/invitation\//);
    await expect(rev.page.getByTestId("invitation-what").textContent()).resolves.toContain(chainName);
    await rev.page.getByLabel("Name").fill("Rhea Reviewer");
    await rev.page.getByLabel("Password", { exact: true }).fill("a-long-enough-password");
    await screenshot(rev.page, "team-invitation-sign-up");
    await rev.page.getByRole("button", { name: "Create account and accept" }).click();
    await rev.page.waitForURL(new RegExp(`/chains/${chainId}$`));
    await rev.page.getByTestId("workspace").waitFor();
    // the link worked once: a second visit says so
    const other = await sessions.open();
    await other.page.goto(link);
    await expect(other.page.getByRole("heading", { level: 1 }).textContent()).resolves.toBe("This invitation has been used");
    await other.context.close();

    // The engineer asks the new reviewer for a review; the reviewer is mailed.
    await eng.page.reload();
    await eng.page.getByTestId("workspace").waitFor();
    await openTab(eng.page, "Review");
    await eng.page.getByRole("checkbox", { name: "Rhea Reviewer" }).check();
    await eng.page.getByLabel("Note to the reviewers").fill("Please check the gain stage.");
    await eng.page.getByRole("button", { name: "Request review" }).click();
    await expect.poll(() => eng.page.getByTestId("review-state").first().getAttribute("data-state")).toBe("in-review");
    const request = await waitForMail(reviewerEmail, /^Review requested/);
    expect(request.text).toContain("Please check the gain stage.");

    // The reviewer comments on the gain stage (a marker appears on its card) and requests changes.
    await rev.page.reload();
    await rev.page.getByTestId("workspace").waitFor();
    await selectCard(rev.page, "gain");
    await openTab(rev.page, /^Comments/);
    await rev.page.locator("#new-comment").fill("Gain of 2 leaves most of the ADC range unused; take 4.");
    await rev.page.getByRole("button", { name: "Comment", exact: true }).click();
    await rev.page.getByTestId("thread").first().waitFor();
    await rev.page.locator('[data-testid="comment-marker"][data-node="gain"]').waitFor();
    await openTab(rev.page, "Review");
    await rev.page.getByLabel("Note (optional)").fill("See my comment on the gain stage.");
    await rev.page.getByRole("button", { name: "Request changes" }).click();
    await expect.poll(() => rev.page.getByTestId("review-state").first().getAttribute("data-state")).toBe("changes-requested");
    await screenshot(rev.page, "team-changes-requested");
    const commentMail = await waitForMail(engineerEmail, new RegExp(`^New comment on gain · ${chainName}`));
    await waitForMail(engineerEmail, new RegExp(`^Changes requested: ${chainName}`));

    // The engineer follows the comment mail's link: the workspace opens on the gain stage's threads.
    const threadLink = firstLink(commentMail)!;
    expect(threadLink).toContain(`/chains/${chainId}?stage=gain#thread-`);
    await eng.page.goto(threadLink);
    await eng.page.getByTestId("workspace").waitFor();
    await expect.poll(() => eng.page.getByTestId("review-state").first().getAttribute("data-state")).toBe("changes-requested");
    await eng.page.getByTestId("comments-panel").getByText("Threads on gain").waitFor();
    await eng.page.getByRole("button", { name: "Close the panel" }).click();
    // the marker on the card opens the same threads
    await eng.page.locator('[data-testid="comment-marker"][data-node="gain"]').click();
    await expect(eng.page.getByTestId("comment-body").first().textContent()).resolves.toContain("take 4");
    await eng.page.locator('[id^="reply-"]').first().fill("Done: rf is 30k now, gain 4.");
    await eng.page.getByRole("button", { name: "Reply", exact: true }).click();
    await expect.poll(() => eng.page.getByTestId("comment-body").count()).toBe(2);
    await eng.page.getByRole("button", { name: "Close the panel" }).click();
    await selectCard(eng.page, "gain");
    await typeInto(eng.page, "f-rf", "30k");
    await waitForSaveState(eng.page, "saved");
    const fixed = await serverChain(eng.page, chainId);
    expect(fixed.document.nodes.find((n) => n.id === "gain")!.params.rf).toBe(30_000);
    await waitForMail(reviewerEmail, /^New reply on gain/);

    // The reviewer looks at the new version and approves it.
    await rev.page.reload();
    await rev.page.getByTestId("workspace").waitFor();
    await openTab(rev.page, "Review");
    await rev.page.getByRole("button", { name: "Approve" }).click();
    await expect.poll(() => rev.page.getByTestId("review-state").first().getAttribute("data-state")).toBe("approved");
    await screenshot(rev.page, "team-approved");
    const approved = await waitForMail(engineerEmail, new RegExp(`^Approved: ${chainName}`));
    expect(approved.text).toMatch(/approved revision \d+/);

    // The library shows the state; the history shows every change, the approved revision pinned.
    await eng.page.goto(`/chains?q=${encodeURIComponent(chainName)}`);
    const row = eng.page.getByTestId("library-row").filter({ hasText: chainName });
    await expect(row.textContent()).resolves.toContain("Approved");
    await eng.page.goto(`/chains/${chainId}/history`);
    const rows = eng.page.getByTestId("revision-row");
    expect(await rows.count()).toBeGreaterThanOrEqual(2);
    await expect(rows.first().textContent()).resolves.toContain("rf");
    await expect.poll(() => eng.page.getByTestId("comparison").textContent(), { timeout: 15_000 }).toMatch(/10\.0 kΩ\s*→\s*30\.0 kΩ/);
    await screenshot(eng.page, "team-history");

    // An edit after approval sends it back to draft and says so.
    await eng.page.goto(`/chains/${chainId}`);
    await eng.page.getByTestId("workspace").waitFor();
    await selectCard(eng.page, "gain");
    await typeInto(eng.page, "f-rf", "33k");
    await waitForSaveState(eng.page, "saved");
    await eng.page.getByTestId("back-to-draft").waitFor();
    await expect.poll(() => eng.page.getByTestId("review-state").first().getAttribute("data-state")).toBe("draft");
    await expect(card(eng.page, "gain").count()).resolves.toBe(1);
    // leave the demo team's chain list as the other browser tests expect it
    expect((await eng.page.request.delete(`/api/chains/${chainId}`)).status()).toBe(200);
    await rev.context.close();
    await eng.context.close();
  }, 240_000); // the whole review, a dozen server round trips and mails: more than the default on a loaded machine
});
