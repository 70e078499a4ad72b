/**
 * The Noise budget and Spread tabs in a real browser (production build, strict content security policy): a run streams in
 * through the worker and ends with the envelope, the histograms and the worst-case table drawn; a second,
 * long run is cancelled part way. No timing is asserted.
 */
import { describe, expect, it } from "vitest";
import { DEMO_PEOPLE, signIn } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { openWorkspace, waitForPlot } from "./workspace-support";

const ctx = e2eContext();

describe.skipIf(ctx.skip !== null)("tolerance spread in the workspace", () => {
  const sessions = useBrowser();

  it("runs a spread to the end, then cancels a long one", async () => {
    const { context, page } = await sessions.open();
    await page.goto("/sign-in");
    await signIn(page, DEMO_PEOPLE.engineerA.email);
    await openWorkspace(page, "Hull vibration channel, aft bay");
    await waitForPlot(page);
    // the noise budget, from the full analysis
    await page.getByRole("tab", { name: "Noise budget" }).click();
    await expect.poll(() => page.getByTestId("noise-contributions").locator("tbody tr").count(), { timeout: 60_000 }).toBeGreaterThan(2);
    expect((await page.getByTestId("noise-density").locator('[data-line="total"]').getAttribute("d"))?.length ?? 0).toBeGreaterThan(20);
    expect(await page.getByTestId("noise-alias").locator("[data-span]").count()).toBeGreaterThan(0);
    expect(await page.getByTestId("noise-snr").textContent()).toMatch(/dB/);
    await screenshot(page, "noise-budget");

    await page.getByRole("tab", { name: "Spread" }).click();

    await page.getByTestId("spread-trials").fill("300");
    await page.getByTestId("spread-seed").fill("7");
    await page.getByTestId("spread-run").click();
    await expect.poll(() => page.getByTestId("spread-status").getAttribute("data-phase"), { timeout: 120_000 }).toBe("done");
    await expect.poll(() => page.getByTestId("spread-status").textContent()).toMatch(/300 builds/);
    // the envelope: both bands and the nominal line have path data
    for (const sel of ['[data-band="min to max"]', '[data-band="5 to 95 %"]', '[data-line="nominal"]']) {
      const d = await page.getByTestId("spread-envelope").locator(sel).getAttribute("d");
      expect(d?.length ?? 0, sel).toBeGreaterThan(20);
    }
    expect(await page.getByTestId("spread-histograms").locator("[data-bar]").count()).toBeGreaterThan(10);
    expect(await page.getByTestId("spread-worst-case").locator("tbody tr").count()).toBeGreaterThan(0);
    expect(await page.getByTestId("spread-sensitivity").locator("tbody tr").count()).toBeGreaterThan(0);
    await expect.poll(() => page.getByTestId("spread-clip-share").textContent()).toMatch(/of 300 builds clip/);
    await screenshot(page, "spread-done");

    await page.getByTestId("spread-trials").fill("100000");
    await page.getByTestId("spread-run").click();
    await expect.poll(() => page.getByTestId("spread-status").textContent(), { timeout: 60_000 }).toMatch(/[1-9]\d* of 100000 builds/);
    await page.getByTestId("spread-cancel").click();
    await expect.poll(() => page.getByTestId("spread-status").getAttribute("data-phase"), { timeout: 30_000 }).toBe("cancelled");
    expect(await page.getByTestId("spread-status").textContent()).toMatch(/cancelled after \d+ builds/);
    await context.close();
  });
});
