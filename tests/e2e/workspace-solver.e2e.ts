/**
 * From targets to parts in the browser: solve a stage from targets, apply the best set, undo it; the gain
 * plan tab on the clipping bridge demo; a low-pass of order 4 inserted after a stage. Each test works on its
 * own copy of a demo chain.
 */
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { DEMO_PEOPLE } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { card, selectCard, waitForSaveState, waitForStatus } from "./workspace-support";

const ctx = e2eContext();

async function copyOf(page: Page, demo: string): Promise<string> {
  const list = await (await page.request.get("/api/chains")).json();
  const src = list.chains.find((c: { name: string }) => c.name === demo);
  const copy = await (await page.request.post(`/api/chains/${src.id}/duplicate`, { data: { name: `Solver trial ${Date.now()}` } })).json();
  const id: string = copy.chain.id;
  await page.goto(`/chains/${id}`);
  await page.getByTestId("workspace").waitFor();
  return id;
}

describe.skipIf(ctx.skip !== null)("solver in the workspace (production build)", () => {
  const sessions = useBrowser();

  it("solves a Sallen-Key stage for 1 kHz Butterworth, applies the best set, and undoes it", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerB.email);
    await copyOf(page, "Hull vibration channel, aft bay");
    await selectCard(page, "aa");
    const c1Before = await page.locator("#f-c1").inputValue();
    await page.getByTestId("solve-open").click();
    const panel = page.getByTestId("solve-panel");
    await panel.locator('input[name="solve-f0"]').fill("1k");
    await panel.locator('input[name="solve-q"]').fill("0.7071");
    await panel.getByTestId("solve-run").click();
    await panel.getByTestId("solve-set").first().waitFor();
    await expect(panel.getByTestId("solve-set").first().textContent()).resolves.toMatch(/f0 (1\.00\d kHz|99\d\.\d Hz) \([+-]\d\.\d\d %\).*Q 0\.7\d* \([+-]\d\.\d\d %\)/);
    await screenshot(page, "solver-results");
    await panel.getByTestId("solve-apply").first().click();
    await panel.getByTestId("solve-applied").waitFor();
    await expect.poll(() => page.locator("#f-c1").inputValue()).not.toBe(c1Before);
    await panel.getByTestId("solve-undo").click();
    await expect.poll(() => page.locator("#f-c1").inputValue()).toBe(c1Before);
    // a target that cannot be met says which constraint stops it
    await panel.locator('input[name="solve-q"]').fill("40");
    await panel.locator('input[name="solve-maxCapacitance"]').fill("10n");
    await panel.getByTestId("solve-run").click();
    await expect(panel.textContent()).resolves.toMatch(/Targets not met.*c1\/c2 ≥ 4Q²/);
    await context.close();
  });

  it("plans the gain of the clipping bridge demo and applies the plan in one step", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerB.email);
    await copyOf(page, "Ballast tank pressure bridge");
    await waitForStatus(page, "gain", "clip");
    await page.getByRole("tab", { name: "Gain plan" }).click();
    await page.getByTestId("plan-run").click();
    const summary = page.getByTestId("plan-summary");
    await summary.waitFor();
    await expect(summary.textContent()).resolves.toMatch(/Clipping[^→]*gain[^→]*→ none/);
    await screenshot(page, "solver-gain-plan");
    await page.getByTestId("plan-apply").click();
    await expect.poll(() => card(page, "gain").getAttribute("data-status"), { timeout: 10_000 }).not.toBe("clip");
    await page.getByTestId("plan-undo").click();
    await waitForStatus(page, "gain", "clip");
    await context.close();
  });

  it("inserts a fourth-order Butterworth low-pass after a stage", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerB.email);
    await copyOf(page, "Hull vibration channel, aft bay");
    await selectCard(page, "gain");
    await page.getByTestId("filter-open").click();
    const wiz = page.getByTestId("filter-wizard");
    await wiz.getByTestId("filter-design").click();
    await expect(wiz.getByTestId("filter-sections").textContent()).resolves.toMatch(/1\. Sallen-Key: f0 1\.000 kHz, Q 0\.541.*2\. Sallen-Key: f0 1\.000 kHz, Q 1\.307/);
    await wiz.getByTestId("filter-insert").click();
    await page.getByTestId("card-u1").waitFor();
    await page.getByTestId("card-u2").waitFor();
    await waitForSaveState(page, "saved");
    await wiz.getByTestId("filter-undo").click();
    await expect.poll(() => page.getByTestId("card-u2").count()).toBe(0);
    await context.close();
  });
});
