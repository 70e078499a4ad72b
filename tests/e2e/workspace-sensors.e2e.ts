/**
 * A sensor source in the workspace: a photodiode placed from the shelf, its junction capacitance typed in,
 * a transimpedance amplifier after it with no feedback capacitor. The loop check fires (phase margin,
 * peaking, the suggested cf), one click sets cf to the suggestion and the warning goes; marking the sensor
 * as connected to a person brings up the safety caution. The chain is made here, on its own.
 */
import { describe, expect, it } from "vitest";
import { DEMO_PEOPLE } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { card, selectCard, serverChain, typeInto, waitForSaveState } from "./workspace-support";

const ctx = e2eContext();

/** A generic op-amp class for the test (invented figures): 1 MHz gain-bandwidth, single pole. */
const PART = { label: "Generic CMOS, 1 MHz", gbw: 1e6, aol: 1e6, slewRate: 5e5, swingLow: 0.05, swingHigh: 0.05 };

describe.skipIf(ctx.skip !== null)("a sensor source in the workspace (production build)", () => {
  const sessions = useBrowser();

  it("photodiode into a TIA: the loop check fires without cf, names the fix, clears once it is applied; a body-connected sensor shows the caution", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerB.email);
    const name = `Photodiode trial ${Date.now()}`;
    const created = await page.request.post("/api/chains", {
      data: { name, document: { format: "chainwright.chain/1", name, parts: { p1: PART }, nodes: [], edges: [] } },
    });
    expect(created.status()).toBe(201);
    const id = (await created.json()).chain.id as string;
    await page.goto(`/chains/${id}`);
    await page.getByTestId("workspace").waitFor();

    // the photodiode from the shelf, with a large junction capacitance
    await page.getByTestId("shelf").getByRole("button", { name: /Photodiode/ }).click();
    await card(page, "src").waitFor();
    await selectCard(page, "src");
    await typeInto(page, "f-capacitance", "220p");
    // the TIA is placed after the selected source and joined to it
    await page.getByTestId("shelf").getByRole("button", { name: /Transimpedance/ }).click();
    await card(page, "u1").waitFor();
    await expect.poll(() => page.locator(".react-flow__edge").count()).toBe(1);
    await selectCard(page, "u1");
    await typeInto(page, "f-rails-low", "-5");
    await typeInto(page, "f-rails-high", "5");
    await page.locator("#f-part").selectOption("p1");
    await typeInto(page, "f-cf", "0");

    // noise-gain construction: 220 pF at the summing node against 100 kΩ and 1 MHz leaves a few degrees
    const margin = page.getByTestId("fig-phase-margin");
    await expect.poll(async () => parseFloat((await margin.textContent()) ?? "NaN"), { timeout: 15_000 }).toBeLessThan(45);
    expect(parseFloat((await page.getByTestId("fig-peaking").textContent()) ?? "NaN")).toBeGreaterThan(6);
    // √(Cin/(2π·rf·GBW)) = √(220 pF/(2π·100 kΩ·1 MHz)) = 18.7 pF (the common rule), rounded up to E12: 22 pF
    await expect(page.getByTestId("fig-suggested-cf").textContent()).resolves.toMatch(/^22(\.0)? pF$/);
    await page.getByRole("tab", { name: /Findings/ }).click();
    const finding = page.locator('[data-testid="findings"] [data-code="tia-stability"]');
    await expect.poll(() => finding.count()).toBe(1);
    await expect(finding.textContent()).resolves.toMatch(/phase margin \d+(\.\d)?°.*feedback capacitor of about 18\.7 pF/);
    await screenshot(page, "workspace-tia-unstable");

    await page.getByTestId("use-suggested-cf").click();
    await expect.poll(() => page.locator("#f-cf").inputValue()).toBe("22p");
    await expect.poll(() => finding.count(), { timeout: 15_000 }).toBe(0);
    await expect.poll(async () => parseFloat((await margin.textContent()) ?? "NaN")).toBeGreaterThan(45);
    await expect(page.getByTestId("use-suggested-cf").count()).resolves.toBe(0);
    // with cf at the rule's value it is no longer offered as a change, only as the least cf for the margin
    await expect.poll(() => page.getByTestId("loop-figures").textContent()).toMatch(/Least cf for about 45°\s*22(\.0)? pF/);
    await waitForSaveState(page, "saved");
    const saved = await serverChain(page, id);
    expect(saved.document.nodes.find((n) => n.id === "u1")!.params.cf).toBeCloseTo(22e-12, 18);

    // the TIA's gain is a transimpedance and its corner 1/(2π·rf·cf) = 1/(2π·100 kΩ·22 pF) = 72.3 kHz; the
    // cascade from a current is in dB re 1 V/A, and the noise referred to the input is a current
    const rf = saved.document.nodes.find((n) => n.id === "u1")!.params.rf as number;
    await expect.poll(() => page.getByTestId("fig-gain").textContent()).toMatch(new RegExp(`^−${(rf / 1e3).toFixed(1)} kV/A \\(${(20 * Math.log10(rf)).toFixed(1)} dB re 1 V/A\\)$`));
    await expect.poll(() => card(page, "u1").textContent()).toMatch(new RegExp(`kV/A · fc ${(1 / (2 * Math.PI * rf * 22e-12) / 1e3).toPrecision(3)} kHz`));
    await page.getByRole("tab", { name: "Response" }).click();
    await expect.poll(() => page.getByTestId("response-plot").locator("text").allTextContents(), { timeout: 15_000 }).toContain("dB re 1 V/A");
    await page.getByRole("tab", { name: "Noise budget" }).click();
    await expect.poll(() => page.getByTestId("noise-input-referred").textContent(), { timeout: 15_000 }).toMatch(/^[\d.]+ [fpnµ]A rms$/);

    // a sensor on a person: the caution on the page and on the card
    await expect(page.getByTestId("safety-caution").count()).resolves.toBe(0);
    await selectCard(page, "src");
    await page.locator("#f-safety").selectOption("body-connected");
    await page.getByTestId("safety-caution").waitFor();
    await expect(page.getByTestId("safety-caution").textContent()).resolves.toMatch(/does not check isolation/);
    await expect(card(page, "src").getByTestId("card-safety").count()).resolves.toBe(1);
    await waitForSaveState(page, "saved");
    expect((await serverChain(page, id)).document.nodes.find((n) => n.id === "src")!.params.safety).toBe("body-connected");
    await screenshot(page, "workspace-sensor-caution");

    expect((await page.request.delete(`/api/chains/${id}`)).status()).toBe(200);
    await context.close();
  });
});
