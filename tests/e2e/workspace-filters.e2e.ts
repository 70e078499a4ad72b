import { describe, expect, it } from "vitest";
import { DEMO_PEOPLE } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { card, createBlankChain, pressOnCanvas, selectCard, typeInto, waitForPlot, waitForSaveState, waitForStatus, serverChain } from "./workspace-support";

const ctx = e2eContext();

/** The path data of every drawn response line, to see the plot change. */
const plotLines = (page: import("playwright-core").Page) =>
  page.evaluate(() =>
    [...document.querySelectorAll('[data-testid="plot-area"][data-ready="1"] .scatterlayer path.js-line')].map((p) => p.getAttribute("d") ?? "").join("|"),
  );

describe.skipIf(ctx.skip !== null)("filter sections in the workspace (production build)", () => {
  const sessions = useBrowser();

  it("adds a Sallen-Key high-pass from the shelf, gives it gain, and the figures and the plot follow", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerB.email);
    const id = await createBlankChain(page, "High-pass sketch");
    await pressOnCanvas(page, "1");
    await card(page, "src").waitFor();
    await page.getByTestId("shelf").getByRole("button", { name: /Sallen-Key high-pass/ }).click();
    await card(page, "u1").waitFor();
    await selectCard(page, "u1");
    await typeInto(page, "f-rails-low", "-5");
    await typeInto(page, "f-rails-high", "5");
    await waitForStatus(page, "u1", "ok");
    await waitForPlot(page);
    // starting values: equal 10 nF capacitors, r1 = 11 kΩ, r2 = 22 kΩ, unity gain: Q = √(r2/r1)/2 = 0.707
    await expect.poll(() => page.getByTestId("fig-f0q").textContent()).toMatch(/· 0\.707$/);
    // a high-pass passes no DC
    await expect(page.getByTestId("fig-gain").textContent()).resolves.toMatch(/−∞ dB/);
    const before = await plotLines(page);

    // gain 1 + 2.2k/10k = 1.22: Q = √(r1r2c1c2)/(r1(c1 + c2) + r2c2(1 − K)) = 0.907
    await typeInto(page, "f-rf", "2.2k");
    await typeInto(page, "f-rg", "10k");
    await expect.poll(() => page.getByTestId("fig-f0q").textContent()).toMatch(/· 0\.907$/);
    await expect.poll(() => plotLines(page)).not.toBe(before);
    await screenshot(page, "workspace-filters-highpass");
    await waitForSaveState(page, "saved");
    const saved = await serverChain(page, id);
    expect(saved.document.nodes[1].params).toMatchObject({ rf: 2.2e3, rg: 10e3, r1: 11e3, r2: 22e3 });
    await context.close();
  });
});
