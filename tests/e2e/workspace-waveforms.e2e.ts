import { describe, expect, it } from "vitest";
import { DEMO_PEOPLE } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { openWorkspace, waitForPlot } from "./workspace-support";

const ctx = e2eContext();

describe.skipIf(ctx.skip !== null)("the Waveforms tab (production build)", () => {
  const sessions = useBrowser();

  it("runs a step that clips, draws the stacked plots and lists the clip; reads a recording and names a bad line", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerA.email);
    await openWorkspace(page, "Hull vibration channel, aft bay");
    await waitForPlot(page);
    await page.getByRole("tab", { name: "Waveforms" }).click();
    const panel = page.getByTestId("waveform-panel");
    // the hull accelerometer is a charge source: the step is in coulombs (−1.5 nC lifts the inverting
    // charge amplifier's output by 1.5 V, which the ×2 stage takes past its upper swing)
    await panel.getByLabel("Amplitude (C)").fill("-1.5e-9");
    await panel.getByTestId("waveform-run").click();
    await page.getByTestId("waveform-summary").waitFor({ timeout: 20_000 });
    // one stacked row per trace: the sensor's charge, charge amplifier, gain, anti-alias
    await page.waitForFunction(() => document.querySelectorAll('[data-testid="waveform-plot"] .gl-container, [data-testid="waveform-plot"] .main-svg').length > 0, null, { timeout: 20_000 });
    const rows = await page.locator('[data-testid="waveform-plot"] .main-svg .yaxislayer-above').count();
    expect(rows).toBeGreaterThanOrEqual(1);
    const table = page.getByTestId("waveform-clip-table");
    await expect(table.locator("tbody tr").count()).resolves.toBeGreaterThan(0);
    await expect(table.innerText()).resolves.toMatch(/gain.*upper swing/s);
    await screenshot(page, "workspace-waveforms-step");

    await panel.getByLabel("Drive").selectOption("recording");
    await panel.getByLabel("Recording CSV").setInputFiles({ name: "bad.csv", mimeType: "text/csv", buffer: Buffer.from("time,voltage\n0,0\n0.001,\n0.002,1\n") });
    await expect(page.getByTestId("recording-problems").innerText()).resolves.toMatch(/line 3, voltage: missing value/);
    await panel.getByLabel("Recording CSV").setInputFiles("public/examples/keelwater-hull-knock-burst.csv");
    await expect(page.getByTestId("recording-preview").innerText()).resolves.toMatch(/4,000 rows, 20000 S\/s/);
    await panel.getByTestId("waveform-run").click();
    await page.waitForFunction(() => /4,000 samples/.test(document.querySelector('[data-testid="waveform-summary"]')?.textContent ?? ""), null, { timeout: 20_000 });
    await expect(page.getByTestId("waveform-clip-table").innerText()).resolves.toMatch(/swing/);
    await screenshot(page, "workspace-waveforms-recording");
    await context.close();
  });
});
