/**
 * Helpers for the workspace browser tests: opening and creating chains, typing into the inspector,
 * reading card status and the save state. Built on the shared harness in tests/e2e/support.
 */
import type { Page } from "playwright-core";
import { expect } from "vitest";

export const card = (page: Page, id: string) => page.getByTestId(`card-${id}`);

export async function openWorkspace(page: Page, chainName: string): Promise<string> {
  await page.goto("/chains");
  await page.getByRole("link", { name: chainName, exact: true }).click();
  await page.waitForURL(/\/chains\/[0-9a-f-]{36}$/);
  await page.getByTestId("workspace").waitFor();
  return new URL(page.url()).pathname.split("/").pop()!;
}

/** New chain from the blank sheet; ends in its workspace. Returns the chain id. */
export async function createBlankChain(page: Page, name: string): Promise<string> {
  await page.goto("/chains");
  await page.getByRole("link", { name: "New chain" }).click();
  await page.waitForURL(/\/chains\/new$/);
  await page.getByRole("radio", { name: "Blank sheet" }).check();
  await page.getByLabel("Name").fill(name);
  await page.getByRole("button", { name: "Create and open" }).click();
  await page.waitForURL(/\/chains\/[0-9a-f-]{36}$/);
  await page.getByTestId("workspace").waitFor();
  return new URL(page.url()).pathname.split("/").pop()!;
}

/** New chain from one of the examples, by its title, once signed in; ends with its plot drawn. */
export async function createFromExample(page: Page, title: string): Promise<string> {
  await page.waitForURL(/\/chains$/);
  await page.getByRole("link", { name: "New chain" }).click();
  await page.getByRole("radio", { name: title }).check();
  await page.getByRole("button", { name: "Create and open" }).click();
  await page.waitForURL(/\/chains\/[0-9a-f-]{36}$/);
  await waitForPlot(page);
  return new URL(page.url()).pathname.split("/").pop()!;
}

/** Select a node by clicking its card's title line (not a handle). */
export async function selectCard(page: Page, id: string): Promise<void> {
  await card(page, id).locator("div.truncate").first().click();
  await expect.poll(() => page.getByTestId("inspector").getAttribute("data-node-id")).toBe(id);
}

/** Type into an inspector field the way a person does: clear it, then type the text. */
export async function typeInto(page: Page, fieldId: string, text: string): Promise<void> {
  const input = page.locator(`#${fieldId}`);
  await input.fill("");
  await input.pressSequentially(text, { delay: 10 });
}

export async function waitForStatus(page: Page, id: string, status: string, timeout = 10_000): Promise<void> {
  await expect.poll(() => card(page, id).getAttribute("data-status"), { timeout }).toBe(status);
}

export async function waitForSaveState(page: Page, state: string, timeout = 15_000): Promise<void> {
  await expect.poll(() => page.getByTestId("save-state").getAttribute("data-state"), { timeout }).toBe(state);
}

/**
 * Plotly has drawn at least one line (a flat line has no height, so this checks its path data; Plotly
 * draws a straight line with two points only). The workspace draws its figures as plain SVG and loads
 * Plotly when the pointer reaches the plot, so this points at the plot's toolbar first, as someone
 * wanting the readout would, when the plot is on screen.
 */
export async function waitForPlot(page: Page): Promise<void> {
  const plot = page.getByTestId("response-plot");
  let step = 0;
  const drawn = () =>
    page.evaluate(() =>
      [...document.querySelectorAll('[data-testid="plot-area"][data-ready="1"] .scatterlayer path.js-line')].some((p) => /^M[^L]+L/.test(p.getAttribute("d") ?? "")),
    );
  await expect
    .poll(
      async () => {
        if (await drawn()) return true;
        // a page still opening may not listen for the pointer yet: move over the plot again on every try
        // (a new position each time, so the page sees a pointer move), until Plotly has drawn
        if (await plot.isVisible()) {
          step = (step + 1) % 4;
          await plot.hover({ position: { x: 4 + step, y: 4 + step } }).catch(() => undefined);
        }
        return drawn();
      },
      { timeout: 30_000 },
    )
    .toBe(true);
}

/** The first figure is on screen, drawn either as SVG (before Plotly has loaded) or by Plotly. */
export async function waitForFirstPlot(page: Page): Promise<void> {
  await expect.poll(() => page.getByTestId("plot-area").getAttribute("data-drawn"), { timeout: 30_000 }).toMatch(/^(svg|plotly)$/);
}

/** Drag from the right handle of one card to the left handle of another, as a person connects them. */
export async function dragConnect(page: Page, from: string, to: string): Promise<void> {
  const a = await card(page, from).locator(".react-flow__handle-right").boundingBox();
  const b = await card(page, to).locator(".react-flow__handle-left").boundingBox();
  if (!a || !b) throw new Error("handles not visible");
  await page.mouse.move(a.x + a.width / 2, a.y + a.height / 2);
  await page.mouse.down();
  await page.mouse.move((a.x + b.x) / 2, (a.y + b.y) / 2 + 20, { steps: 8 });
  await page.mouse.move(b.x + b.width / 2, b.y + b.height / 2, { steps: 8 });
  await page.mouse.up();
}

/** The chain as the server holds it. */
export async function serverChain(page: Page, id: string): Promise<{ version: number; name: string; document: { nodes: { id: string; params: Record<string, unknown> }[]; edges: { from: string; to: string }[] } }> {
  const res = await page.request.get(`/api/chains/${id}`);
  expect(res.status()).toBe(200);
  return (await res.json()).chain;
}

/** Press a key with the focus on the page itself (not in a field), as the canvas commands expect. */
export async function pressOnCanvas(page: Page, key: string): Promise<void> {
  await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
  await page.keyboard.press(key);
}
