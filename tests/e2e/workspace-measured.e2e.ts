import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { DIFFERENCE_COLUMNS } from "@/lib/waveform-csv";
import { DEMO_PEOPLE } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { openWorkspace, waitForPlot } from "./workspace-support";

const ctx = e2eContext();
const EXAMPLE = "public/examples/keelwater-hull-vibration-measured.csv";

/** Names and y axes of the traces Plotly has drawn in the response plot. */
const drawnTraces = (page: import("playwright-core").Page) =>
  page.evaluate(() => {
    const gd = document.querySelector('[data-testid="plot-area"]') as HTMLElement & { _fullData?: { name: string; yaxis: string; y: (number | null)[] }[] };
    return (gd._fullData ?? []).map((t) => ({ name: t.name, yaxis: t.yaxis, points: t.y.filter((v) => v !== null).length }));
  });

describe.skipIf(ctx.skip !== null)("measured responses on the response plot (production build)", () => {
  const sessions = useBrowser();

  it("uploads the example sweep, overlays it with the difference plotted, downloads the difference and deletes it", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerA.email);
    await openWorkspace(page, "Hull vibration channel, aft bay");
    await waitForPlot(page);
    const controls = page.getByTestId("measured-controls");
    await controls.locator("summary").click();
    await expect(controls.getByRole("link", { name: /bench sweep/ }).getAttribute("href")).resolves.toBe("/examples/keelwater-hull-vibration-measured.csv");

    // a bad file is refused before upload, with its line named
    const input = controls.getByLabel("Measured response CSV");
    await input.setInputFiles({ name: "falling.csv", mimeType: "text/csv", buffer: Buffer.from("frequency,magnitude,phase\n100,0,0\n10,0,0\n") });
    await expect(page.getByTestId("measured-problems").innerText()).resolves.toMatch(/line 3, frequency: .*must increase/);

    await input.setInputFiles(EXAMPLE);
    const summary = page.getByTestId("measured-summary");
    await summary.waitFor({ timeout: 20_000 });
    await expect(summary.innerText()).resolves.toMatch(/Δ rms 0\.\d\d dB, largest −0\.\d\d dB at .*phase rms \d\.\d°/);
    await expect(controls.getByLabel(/Node .* was measured at/).inputValue()).resolves.toBe("adc");
    // measured magnitude and phase on the two panels, the differences in dB and degrees on the third (the
    // measured phase has a gap wherever it wraps past ±180°)
    const overlaid = async () => (await drawnTraces(page)).filter((t) => t.name.startsWith("keelwater-hull-vibration-measured.csv at adc"));
    await expect.poll(async () => (await overlaid()).map((t) => t.yaxis), { timeout: 20_000 }).toEqual(["y", "y2", "y3", "y4"]);
    const points = (await overlaid()).map((t) => t.points);
    expect([points[0], points[2], points[3]]).toEqual([44, 44, 44]);
    expect(points[1]).toBeGreaterThanOrEqual(40);
    // the difference panel is drawn: its own axis with a line on it
    await expect(page.locator('[data-testid="plot-area"] .main-svg .yaxislayer-above .y3tick').count()).resolves.toBeGreaterThan(0);
    // folded away, the list gives the plot its height back and the headline keeps the figures
    await controls.locator("summary").click();
    await expect(page.getByTestId("measured-headline").innerText()).resolves.toMatch(/at adc: Δ rms 0\.\d\d dB, largest −0\.\d\d dB; phase largest/);
    await screenshot(page, "workspace-measured-overlay");
    await controls.locator("summary").click();

    const [download] = await Promise.all([page.waitForEvent("download"), controls.getByRole("button", { name: "Difference CSV" }).click()]);
    expect(download.suggestedFilename()).toBe("keelwater-hull-vibration-measured-difference-adc.csv");
    const lines = readFileSync((await download.path())!, "utf8").trim().split("\n");
    expect(lines[0]).toBe(DIFFERENCE_COLUMNS.join(","));
    expect(lines).toHaveLength(45);
    const [fHz, measuredDb, , computedDb, , diffDb] = lines[1].split(",").map(Number);
    expect(fHz).toBe(1);
    expect(diffDb).toBeCloseTo(measuredDb - computedDb, 9);

    // read at the gain stage instead, the anti-alias roll-off shows up as a large difference
    await controls.getByLabel(/Node .* was measured at/).selectOption("gain");
    await expect.poll(() => summary.innerText()).toMatch(/largest −(\d\d|[4-9])\.\d\d dB at/);

    await controls.getByRole("button", { name: "delete" }).click();
    await expect.poll(() => page.getByTestId("measured-file").count()).toBe(0);
    await expect.poll(async () => (await drawnTraces(page)).filter((t) => t.name.includes("measured")).length).toBe(0);
    await context.close();
  });
});
