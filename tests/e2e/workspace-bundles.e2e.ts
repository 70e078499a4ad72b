import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { DEMO_PEOPLE, signIn } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { openWorkspace, waitForFirstPlot, waitForPlot } from "./workspace-support";

const ctx = e2eContext();
/** A name Plotly's own code carries (an internal event); the workspace's chunk names it too, when it
 * listens for it, so a script counts as Plotly only when it is also over a megabyte (as in the budgets). */
const PLOTLY_MARK = "plotly_relayout";

/** Every JavaScript file the page loads from now on, with whether it carries Plotly. */
function watchScripts(page: Page): { url: string; plotly: boolean }[] {
  const seen: { url: string; plotly: boolean }[] = [];
  page.on("response", async (res) => {
    const type = res.headers()["content-type"] ?? "";
    if (!type.includes("javascript")) return;
    const body = await res.text().catch(() => "");
    seen.push({ url: res.url(), plotly: body.includes(PLOTLY_MARK) && body.length > 1_000_000 });
  });
  return seen;
}

describe.skipIf(ctx.skip !== null)("the plotting library loads only in the workspace (production build)", () => {
  const sessions = useBrowser();

  it("is in no script of the landing, sign-in, chain list or new-chain pages, and is fetched when a chain opens", async () => {
    const { context, page } = await sessions.open();
    const scripts = watchScripts(page);
    await page.goto("/");
    await page.goto("/sign-in");
    await signIn(page, DEMO_PEOPLE.engineerA.email);
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

  it("draws a chain's first plot as SVG without it, and Plotly, loaded when the plot is pointed at, draws the same line", async () => {
    const { context, page } = await sessions.open();
    const scripts = watchScripts(page);
    await signIn(page, DEMO_PEOPLE.engineerA.email);
    // opened with the pointer off the plot and no input since: only the SVG drawing
    const href = (await page.getByRole("link", { name: "Hull vibration channel, aft bay", exact: true }).getAttribute("href"))!;
    await page.mouse.move(1, 1);
    const before = scripts.length;
    await page.goto(href);
    await waitForFirstPlot(page);
    await expect(page.getByTestId("plot-area").getAttribute("data-drawn")).resolves.toBe("svg");
    await screenshot(page, "workspace-plot-svg");
    // the emphasised magnitude line on screen: its vertices in page pixels
    const onScreen = (selector: string) =>
      page.evaluate((sel) => {
        const path = document.querySelector<SVGPathElement>(sel);
        const m = path?.getScreenCTM();
        if (!path || !m) return null;
        return [...(path.getAttribute("d") ?? "").matchAll(/[ML](-?[\d.]+),(-?[\d.]+)/g)].map((p) => [m.a * +p[1] + m.c * +p[2] + m.e, m.b * +p[1] + m.d * +p[2] + m.f]);
      }, selector);
    const ours = (await onScreen('[data-testid="plot-svg"] path.curve[stroke="#1e6d6a"]'))!;
    expect(ours.length).toBeGreaterThan(100);
    expect(scripts.slice(before).filter((s) => s.plotly)).toEqual([]);

    await waitForPlot(page); // points at the plot
    await expect.poll(() => page.getByTestId("plot-area").getAttribute("data-drawn")).toBe("plotly");
    expect(scripts.slice(before).some((s) => s.plotly)).toBe(true);
    await expect(page.locator('[data-testid="plot-svg"] svg').count()).resolves.toBe(0);
    const theirs = (await page.evaluate(() => {
      for (const g of document.querySelectorAll('[data-testid="plot-area"] .scatterlayer g.trace')) {
        const trace = (g as Element & { __data__?: { trace?: { yaxis?: string; line?: { width?: number } } }[] }).__data__?.[0]?.trace;
        if (trace?.yaxis !== "y" || (trace.line?.width ?? 0) <= 2) continue;
        const path = g.querySelector<SVGPathElement>("path.js-line")!;
        const m = path.getScreenCTM()!;
        return [...(path.getAttribute("d") ?? "").matchAll(/[ML](-?[\d.]+),(-?[\d.]+)/g)].map((p) => [m.a * +p[1] + m.c * +p[2] + m.e, m.b * +p[1] + m.d * +p[2] + m.f]);
      }
      return null;
    }))!;
    expect(theirs.length).toBeGreaterThan(10); // Plotly draws a smooth curve with few vertices
    // Plotly keeps a subset of the points (it drops those a straight line covers): nearly every one of its
    // vertices lies on one of the SVG's, within a pixel, so the SVG placed the axes where Plotly does
    const near = theirs.filter(([x, y]) => ours.some(([u, v]) => Math.hypot(u - x, v - y) < 1)).length;
    expect(near / theirs.length).toBeGreaterThan(0.9);
    await context.close();
  });
});
