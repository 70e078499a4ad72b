import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { chainListRows, DEMO_PEOPLE, mailFor, requestSignInLink, signIn, signInWithPassword, signOut, uniqueEmail, waitForLink } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";

const ctx = e2eContext();

/** The form's own problem notice (Next's route announcer also has role=alert). */
const problem = (page: Page) => page.locator('[role="alert"][data-tone="problem"]');

describe.skipIf(ctx.skip !== null)("signing in and the workspace list (production build)", () => {
  const sessions = useBrowser();

  it("shows the landing page to everyone, with what the product does", async () => {
    const { context, page } = await sessions.open();
    const res = await page.goto("/");
    expect(res?.status()).toBe(200);
    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toMatch(/op-amp stages between a sensor and its ADC/);
    await screenshot(page, "landing");
    await context.close();
  });

  it("sends a signed-out visitor from the workspace to sign-in, and the API answers 401", async () => {
    const { context, page } = await sessions.open();
    await page.goto("/chains");
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    expect(new URL(page.url()).searchParams.get("callbackUrl")).toBe("/chains");
    const api = await page.request.get("/api/chains");
    expect(api.status()).toBe(401);
    await screenshot(page, "sign-in");
    await context.close();
  });

  it("signs a demo engineer in by password and lists the team's chains", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerA.email);
    // Other browser-test files share this server and may have added chains: check the seeded ones are there.
    const rows = await chainListRows(page);
    const text = rows.join("\n");
    expect(text).toContain("Hull vibration channel, aft bay");
    expect(text).toContain("Ballast tank pressure bridge");
    expect(text).toContain("Turbidity photodiode channel");
    expect(text).toContain("Hits a rail"); // the ballast chain clips at DC
    await expect(page.getByTestId("signed-in-as").textContent()).resolves.toContain(DEMO_PEOPLE.engineerA.email);
    // numbers are set in the shipped Geist Mono (next/font/local), not a system fallback
    const loaded = await page.evaluate(async () => {
      await document.fonts.ready;
      return [...document.fonts].filter((f) => f.status === "loaded").map((f) => f.family.replace(/"/g, ""));
    });
    expect(loaded).toEqual(expect.arrayContaining(["geistMono", "geistSans"]));
    await screenshot(page, "workspace-chains-engineer");
    await signOut(page);
    await page.goto("/chains");
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await context.close();
  });

  it("refuses a wrong password and an unknown address with the same words", async () => {
    const { context, page } = await sessions.open();
    await signInWithPassword(page, DEMO_PEOPLE.reviewer.email, "not-the-password");
    const wrong = problem(page);
    await wrong.waitFor();
    const wrongText = await wrong.textContent();
    await screenshot(page, "sign-in-wrong-password");
    await signInWithPassword(page, "nobody-here@keelwater.example", "not-the-password");
    const unknown = problem(page);
    await unknown.waitFor();
    expect(await unknown.textContent()).toBe(wrongText);
    expect(wrongText).toMatch(/do not match an account/);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await context.close();
  });

  it("shows the outsider only the chain shared with them, as viewer", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.outsider.email);
    const rows = await chainListRows(page);
    const row = rows.find((r) => r.includes("Hull vibration channel, aft bay")) ?? "";
    expect(rows.join("\n")).not.toMatch(/Ballast tank pressure bridge|Turbidity photodiode channel/);
    expect(row).toContain("Hull vibration channel, aft bay");
    expect(row).toContain("Viewer");
    await context.close();
  });

  it("signs the reviewer in through the mailbox link, once only", async () => {
    const { context, page } = await sessions.open();
    const email = DEMO_PEOPLE.reviewer.email;
    const before = (await mailFor(email)).length;
    await requestSignInLink(page, email);
    await screenshot(page, "check-your-mail");
    const link = await waitForLink(email, before);
    expect(link.startsWith(`${ctx.baseUrl}/api/auth/callback/nodemailer?`)).toBe(true);

    // the mailbox page shows the same message, with the link clickable
    await page.goto("/mailbox");
    await expect(page.getByTestId("mail").first().textContent()).resolves.toContain(email);
    await screenshot(page, "mailbox");

    await page.goto(link);
    await page.waitForURL(/\/chains$/);
    const rows = await chainListRows(page);
    for (const name of ["Hull vibration channel, aft bay", "Ballast tank pressure bridge", "Turbidity photodiode channel"]) {
      expect(rows.find((r) => r.includes(name))).toContain("Reviewer");
    }

    // a used link no longer works, and says so plainly
    const { context: other, page: second } = await sessions.open();
    await second.goto(link);
    await second.waitForURL(/\/auth-error/);
    await expect(second.getByRole("heading", { level: 1 }).textContent()).resolves.toBe("This sign-in link no longer works");
    await screenshot(second, "link-used");
    await other.close();
    await context.close();
  });

  it("signs up a new user through the e-mail link, gives them a workspace, and their password works after", async () => {
    const { context, page } = await sessions.open();
    const email = uniqueEmail("newcomer");
    const password = "a-long-enough-password";
    await page.goto("/sign-up");
    await page.getByLabel("Name").fill("Nadia Newcomer");
    await page.getByLabel("E-mail", { exact: true }).fill(email);
    await page.getByLabel("Password", { exact: true }).fill(password);
    await screenshot(page, "sign-up");
    await page.getByRole("button", { name: "Create account" }).click();
    await page.waitForURL(/\/check-your-mail/);

    // before the link is followed, the password does not sign in
    const { context: early, page: earlyPage } = await sessions.open();
    await signInWithPassword(earlyPage, email, password);
    await problem(earlyPage).waitFor();
    await early.close();

    const link = await waitForLink(email);
    await page.goto(link);
    await page.waitForURL(/\/chains$/);
    await expect(page.getByTestId("signed-in-as").textContent()).resolves.toContain("Nadia Newcomer");
    await expect(page.getByText("No chains yet.").count()).resolves.toBe(1);
    await screenshot(page, "workspace-new-user");

    // the personal team lets them create a chain through the API with their session
    const created = await page.request.post("/api/chains", { data: { name: "First sketch" } });
    expect(created.status()).toBe(201);
    await page.reload();
    expect(await chainListRows(page)).toEqual([expect.stringContaining("First sketch")]);

    await signOut(page);
    await signIn(page, email, password);
    await context.close();
  });

  it("refuses malformed and oversized requests to the API without a server error", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerB.email);
    const bad = await page.request.post("/api/chains", { headers: { "content-type": "application/json" }, data: "{oops" });
    expect(bad.status()).toBe(400);
    const big = await page.request.post("/api/analyze", { data: { chain: { notes: "x".repeat(1_100_000) } } });
    expect(big.status()).toBe(413);
    await context.close();
  });
});
