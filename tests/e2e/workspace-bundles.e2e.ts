import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD, DEMO_PEOPLE, signInWithPassword } from "./support/auth";
import { launchBrowser, newSession } from "./support/browser";
import { e2eContext } from "./support/context";
import { openWorkspace, waitForPlot } from "./workspace-support";

const ctx = e2eContext();
/** A name only Plotly's own code carries (an internal event), not ours. */
const PLOTLY_MARK = "plotly_relayout";

/** Every JavaScript file the page loads from now on, with whether it carries Plotly. */
function watchScripts(page: Page): { url: string; plotly: boolean }[] {
  const seen: { url: string; plotly: boolean }[] = [];
  page.on("response", async (res) => {
    const type = res.headers()["content-type"] ?? "";
    if (!type.includes("javascript")) return;
    const body = await res.text().catch(() => "");
    seen.push({ url: res.url(), plotly: body.includes(PLOTLY_MARK) });
  });
  return seen;
}

describe.skipIf(ctx.skip !== null)("the plotting library loads only in the workspace (production build)", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("is in no script of the landing, sign-in, chain list or new-chain pages, and is fetched when a chain opens", async () => {
    const { context, page } = await newSession(browser);
    const scripts = watchScripts(page);
    await page.goto("/");
    await page.goto("/sign-in");
    await signInWithPassword(page, DEMO_PEOPLE.engineerA.email, DEMO_PASSWORD);
    await page.waitForURL(/\/chains$/);
    await page.goto("/chains/new");
    await page.getByRole("button", { name: "Create and open" }).waitFor();
    await page.waitForLoadState("networkidle");
    expect(scripts.length).toBeGreaterThan(3);
    expect(scripts.filter((s) => s.plotly).map((s) => s.url)).toEqual([]);

    const before = scripts.length;
    await openWorkspace(page, "Hull vibration channel, aft bay");
    await waitForPlot(page);
    await page.waitForLoadState("networkidle");
    expect(scripts.slice(before).some((s) => s.plotly)).toBe(true);
    await context.close();
  });
});
