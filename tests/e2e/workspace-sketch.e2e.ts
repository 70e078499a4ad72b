import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { DEMO_PEOPLE, signIn } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { findTemplate } from "../../lib/templates";
import { card, createBlankChain, createFromExample, dragConnect, pressOnCanvas, selectCard, serverChain, typeInto, waitForPlot, waitForSaveState, waitForStatus } from "./workspace-support";

const ctx = e2eContext();

describe.skipIf(ctx.skip !== null)("sketching a chain in the workspace (production build)", () => {
  const sessions = useBrowser();

  it("builds the demo chain from a blank sheet, finds the stage that clips at DC, fixes it, and finds it unchanged after a reload", async () => {
    const { context, page } = await sessions.open();
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await signIn(page, DEMO_PEOPLE.engineerB.email);
    const id = await createBlankChain(page, "Shaft torque channel");
    await expect(page.getByTestId("chain-name").textContent()).resolves.toBe("Shaft torque channel");

    // Source by its key, the lossy integrator from the shelf (placed after the selected source and
    // connected), the RC low-pass on its own, then a connection drawn with the mouse, then the ADC by key.
    await pressOnCanvas(page, "1");
    await card(page, "src").waitFor();
    await page.getByTestId("shelf").getByRole("button", { name: /Lossy integrator/ }).click();
    await card(page, "u1").waitFor();
    await pressOnCanvas(page, "Escape");
    await page.getByTestId("shelf").getByRole("button", { name: /RC low-pass/ }).click();
    await card(page, "rc1").waitFor();
    await pressOnCanvas(page, "f");
    await page.waitForTimeout(400);
    await dragConnect(page, "u1", "rc1");
    await expect.poll(() => page.locator(".react-flow__edge").count()).toBe(2);
    await selectCard(page, "rc1");
    await pressOnCanvas(page, "0");
    await card(page, "adc1").waitFor();
    await expect.poll(() => page.locator(".react-flow__edge").count()).toBe(3);

    // Values, typed in engineering notation.
    await selectCard(page, "src");
    await typeInto(page, "f-dc", "0.5");
    await typeInto(page, "f-amplitude", "50m");
    await typeInto(page, "f-fLow", "1");
    await typeInto(page, "f-fHigh", "200");
    await selectCard(page, "u1");
    await typeInto(page, "f-r1", "10k");
    await typeInto(page, "f-r2", "1M");
    await typeInto(page, "f-c2", "1n");
    await expect(page.getByTestId("f-r2-parsed").textContent()).resolves.toContain("1.000 MΩ");
    await typeInto(page, "f-rails-low", "-5");
    await typeInto(page, "f-rails-high", "5");
    await selectCard(page, "rc1");
    await typeInto(page, "f-r", "1k");
    await typeInto(page, "f-c", "100n");
    await selectCard(page, "adc1");
    await typeInto(page, "f-bits", "16");
    await typeInto(page, "f-sampleRate", "2k");
    await typeInto(page, "f-vinLow", "-4.096");
    await typeInto(page, "f-vinHigh", "4.096");

    // The plot appears, and the integrator is flagged: gain −100 on 0.5 V of source DC wants −50 V.
    await waitForPlot(page);
    await waitForStatus(page, "u1", "clip");
    // …and so is the converter it drives, whose input is driven far past its range
    await waitForStatus(page, "adc1", "clip");
    await expect(page.getByTestId("headline").textContent()).resolves.toBe("■ 1 stage hits a rail · 1 converter over range");
    await page.getByRole("tab", { name: /Findings/ }).click();
    const clip = page.locator('[data-testid="findings"] [data-code="rail-clip"][data-node="u1"]');
    await expect(clip.textContent()).resolves.toMatch(/source's DC/);
    await selectCard(page, "u1");
    await screenshot(page, "workspace-sketch-clipping");

    // A finding selects its node.
    await pressOnCanvas(page, "Escape");
    await clip.click();
    await expect.poll(() => page.getByTestId("inspector").getAttribute("data-node-id")).toBe("u1");

    // Fix: r2 = 10k gives a DC gain of −1, so −0.5 V at DC.
    await typeInto(page, "f-r2", "10k");
    await waitForStatus(page, "u1", "ok");
    await waitForStatus(page, "adc1", "ok");
    await expect.poll(() => page.locator('[data-testid="findings"] [data-code="rail-clip"]').count()).toBe(0);
    await expect(page.getByTestId("headline").textContent()).resolves.toBe("");
    await expect(page.getByTestId("fig-dc").textContent()).resolves.toBe("-500 mV … -500 mV");
    await page.getByRole("tab", { name: "Response" }).click();
    await screenshot(page, "workspace-sketch-fixed");

    // The readout follows the cursor over the plot, and the plotted curves export as CSV.
    const plotBox = (await page.getByTestId("plot-area").boundingBox())!;
    await page.mouse.move(plotBox.x + plotBox.width * 0.5, plotBox.y + plotBox.height * 0.25);
    await expect.poll(() => page.getByTestId("plot-readout").textContent()).toMatch(/Hz: u1 .*dB .*°/);
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: "Export CSV" }).click()]);
    const csv = readFileSync(await download.path(), "utf8");
    const lines = csv.trim().split(/\r?\n/);
    expect(lines[0]).toBe("frequency_Hz,u1 from source magnitude_dB,u1 from source phase_deg");
    expect(lines).toHaveLength(1 + 600); // the default 600 plot points

    await waitForSaveState(page, "saved");
    const before = await serverChain(page, id);
    expect(before.document.nodes.map((n) => n.id)).toEqual(["src", "u1", "rc1", "adc1"]);
    expect(before.document.edges).toEqual([
      { from: "src", to: "u1" },
      { from: "u1", to: "rc1" },
      { from: "rc1", to: "adc1" },
    ]);
    expect(before.document.nodes[1].params).toMatchObject({ r1: 10e3, r2: 10e3, c2: 1e-9 });

    await page.reload();
    await page.getByTestId("workspace").waitFor();
    await waitForPlot(page);
    await waitForStatus(page, "u1", "ok");
    await selectCard(page, "u1");
    await expect(page.locator("#f-r2").inputValue()).resolves.toBe("10k");
    await expect(page.locator("#f-rails-low").inputValue()).resolves.toBe("-5");
    await expect.poll(() => page.locator(".react-flow__edge").count()).toBe(3);
    const after = await serverChain(page, id);
    expect(after.document).toEqual(before.document);
    expect(after.version).toBe(before.version);
    await screenshot(page, "workspace-sketch-reloaded");
    expect(errors).toEqual([]);
    await context.close();
  });

  it("undoes and redoes, duplicates and deletes by keyboard, and keeps a half-drawn chain analysable", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerB.email);
    await createBlankChain(page, "Keyboard sketch");
    await pressOnCanvas(page, "1");
    await pressOnCanvas(page, "2"); // non-inverting gain after the source
    await card(page, "u1").waitFor();
    // the card shows the analysis's word once it is back (the card itself comes first)
    await expect.poll(() => card(page, "u1").textContent()).toMatch(/needs rails/);
    await selectCard(page, "u1");
    await typeInto(page, "f-rails-low", "-12");
    await typeInto(page, "f-rails-high", "12");
    await waitForStatus(page, "u1", "ok");
    await pressOnCanvas(page, "Control+d");
    await card(page, "u2").waitFor();
    // the copy keeps the rails typed on the original
    await selectCard(page, "u2");
    await expect(page.locator("#f-rails-high").inputValue()).resolves.toBe("12");
    await pressOnCanvas(page, "Delete");
    await expect.poll(() => card(page, "u2").count()).toBe(0);
    await pressOnCanvas(page, "Control+z");
    await expect.poll(() => card(page, "u2").count()).toBe(1);
    await pressOnCanvas(page, "Control+Shift+z");
    await expect.poll(() => card(page, "u2").count()).toBe(0);
    // With no converter yet, the plot follows the path to the last stage.
    await waitForPlot(page);

    // A stage dragged from the shelf lands where it is dropped.
    await page.getByTestId("shelf").getByRole("button", { name: /RC high-pass/ }).dragTo(page.locator(".react-flow__pane"), { targetPosition: { x: 300, y: 260 } });
    await card(page, "rc1").waitFor();

    // A source marked as connected to a person brings up the caution.
    await selectCard(page, "src");
    await page.locator("#f-safety").selectOption("body-connected");
    await page.getByTestId("safety-caution").waitFor();
    await expect(page.getByTestId("safety-caution").textContent()).resolves.toMatch(/does not check isolation, creepage, leakage/);
    await expect(card(page, "src").getByTestId("card-safety").textContent()).resolves.toMatch(/on a person/);
    await screenshot(page, "workspace-caution");

    // Copy the gain stage here and paste it into another chain.
    await selectCard(page, "u1");
    await pressOnCanvas(page, "Control+c");
    await waitForSaveState(page, "saved");
    await createBlankChain(page, "Paste target");
    await pressOnCanvas(page, "Control+v");
    await card(page, "u1").waitFor();
    await selectCard(page, "u1");
    await expect(page.locator("#f-rails-low").inputValue()).resolves.toBe("-12");
    await context.close();
  });

  it("starts a chain from an example and shows it analysed", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerA.email);
    await createFromExample(page, "Turbidity photodiode, two channels");
    for (const id of ["u1", "u2", "adc1", "adc2"]) await waitForStatus(page, id, "ok");
    // two converters: the plot offers both paths
    await expect(page.getByLabel("Path to plot").locator("option").allTextContents()).resolves.toEqual(["adc1", "adc2"]);
    await screenshot(page, "workspace-template");
    await context.close();
  });

  it("redraws an edited curve at once, where Plotly itself then draws it", async () => {
    const { context, page } = await sessions.open();
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    await signIn(page, DEMO_PEOPLE.engineerA.email);
    await createFromExample(page, "Turbidity photodiode, two channels");
    await selectCard(page, "u2"); // the plot follows the anti-alias stage
    await page.waitForTimeout(800); // the selection's full redraw has settled

    // In the page: change c2, take the emphasised magnitude line as first drawn for that edit, then
    // again after Plotly has caught up with it.
    const result = await page.evaluate(async () => {
      const line = () => {
        for (const g of document.querySelectorAll('[data-testid="plot-area"] .scatterlayer g.trace')) {
          const trace = (g as Element & { __data__?: { trace?: { yaxis?: string; line?: { width?: number } } }[] }).__data__?.[0]?.trace;
          if (trace?.yaxis === "y" && (trace.line?.width ?? 0) > 2) return [...g.querySelectorAll("path.js-line")].map((p) => p.getAttribute("d") ?? "").join("");
        }
        return null;
      };
      const before = line();
      const count = () => performance.getEntriesByType("mark").filter((m) => m.name.startsWith("cw:plot:")).length;
      const marks = count();
      const input = document.querySelector<HTMLInputElement>("#f-c2")!;
      Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, "value")!.set!.call(input, "3.9n");
      input.dispatchEvent(new Event("input", { bubbles: true }));
      const t0 = performance.now();
      while (count() === marks) {
        if (performance.now() - t0 > 5000) throw new Error("no redraw after the edit");
        await new Promise((r) => setTimeout(r, 1));
      }
      const direct = line();
      await new Promise((r) => setTimeout(r, 1000));
      return { before, direct, plotly: line() };
    });
    expect(result.before).not.toBeNull();
    expect(result.direct).not.toBe(result.before);
    expect(result.plotly).not.toBe(result.direct); // Plotly redrew it (it writes its own path text)
    const points = (d: string) => [...d.matchAll(/[ML](-?[\d.]+),(-?[\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])]);
    const ours = points(result.direct!);
    const theirs = points(result.plotly!);
    expect(ours.length).toBeGreaterThan(100);
    expect(theirs.length).toBeGreaterThan(20);
    // Plotly keeps a subset of the points (it drops those a straight line covers) and may add points
    // where the line leaves the plot area: nearly every one of its vertices is one of ours, within a
    // fraction of a pixel.
    const near = theirs.filter(([x, y]) => ours.some(([u, v]) => Math.hypot(u - x, v - y) < 0.6)).length;
    expect(near / theirs.length).toBeGreaterThan(0.9);
    expect(errors).toEqual([]);
    await context.close();
  });

  it("keeps both panels when an edit moves only the magnitude curve", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerA.email);
    // the bridge example with ideal op-amps in its in-amp: a gain change moves its magnitude and leaves
    // its phase (0°) exactly as it was
    const doc = findTemplate("ballast-bridge")!.make();
    for (const n of doc.nodes) if (n.id === "u1") delete (n as { part?: string }).part;
    const res = await page.request.post("/api/chains", { data: { name: `Ideal first stage ${Date.now()}`, document: doc } });
    expect(res.status()).toBe(201);
    await page.goto(`/chains/${(await res.json()).chain.id}`);
    await waitForPlot(page);
    await selectCard(page, "u1");
    await page.waitForTimeout(800);
    const lines = () =>
      page.evaluate(() =>
        [...document.querySelectorAll('[data-testid="plot-area"] .scatterlayer g.trace')].map((g) => ({
          axis: (g as Element & { __data__?: { trace?: { yaxis?: string } }[] }).__data__?.[0]?.trace?.yaxis,
          d: [...g.querySelectorAll("path.js-line")].map((p) => p.getAttribute("d") ?? "").join(""),
        })),
      );
    const before = await lines();
    expect(before.map((l) => l.axis)).toEqual(["y", "y2"]);
    await page.evaluate(() => {
      const input = document.querySelector<HTMLInputElement>("#f-rg")!;
      Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, "value")!.set!.call(input, "378"); // 374 → 378 Ω: gain 135 → 133, same dB range
      input.dispatchEvent(new Event("input", { bubbles: true }));
    });
    await page.waitForTimeout(1000); // past the moment Plotly catches up
    const after = await lines();
    expect(after.map((l) => l.axis)).toEqual(["y", "y2"]);
    expect(after[0].d).not.toBe(before[0].d);
    expect(after[1].d).toBe(before[1].d);
    await context.close();
  });
});
