import { describe, expect, it } from "vitest";
import { DEMO_PEOPLE } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { card, openWorkspace, pressOnCanvas, selectCard, serverChain, waitForPlot } from "./workspace-support";

const ctx = e2eContext();

describe.skipIf(ctx.skip !== null)("who may edit in the workspace (production build)", () => {
  const sessions = useBrowser();

  it("gives a viewer a read-only canvas: nothing to add, nothing to type, keys do nothing, and the API refuses a save", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.outsider.email);
    const id = await openWorkspace(page, "Hull vibration channel, aft bay");
    await waitForPlot(page);
    await expect(page.getByTestId("save-state").getAttribute("data-state")).resolves.toBe("read-only");
    await expect(page.getByText("you are a viewer: viewing only")).toBeTruthy();
    const shelf = page.getByTestId("shelf").getByRole("button");
    for (const b of await shelf.all()) expect(await b.isDisabled()).toBe(true);
    await expect(page.getByRole("button", { name: "Undo" }).count()).resolves.toBe(0);

    const before = await serverChain(page, id);
    const first = before.document.nodes[1].id;
    await selectCard(page, first);
    // the values are there to read, in fields that do not take input
    const inputs = page.getByTestId("inspector").locator("input");
    expect(await inputs.count()).toBeGreaterThan(2);
    for (const i of await inputs.all()) expect(await i.isDisabled()).toBe(true);
    await pressOnCanvas(page, "Delete");
    await pressOnCanvas(page, "Control+d");
    await pressOnCanvas(page, "3");
    await expect(card(page, first).count()).resolves.toBe(1);
    await expect(page.locator(".react-flow__node").count()).resolves.toBe(before.document.nodes.length);
    // cards cannot be dragged away (a drag pans the view instead; the card's place in the chain stays)
    const place = () => page.locator(`.react-flow__node[data-id="${first}"]`).evaluate((el) => (el as HTMLElement).style.transform);
    const at = await place();
    const box = (await card(page, first).boundingBox())!;
    await page.mouse.move(box.x + 40, box.y + 10);
    await page.mouse.down();
    await page.mouse.move(box.x + 140, box.y + 110, { steps: 5 });
    await page.mouse.up();
    await expect(place()).resolves.toBe(at);
    await screenshot(page, "workspace-viewer");

    const put = await page.request.put(`/api/chains/${id}`, { data: { baseVersion: before.version, document: before.document } });
    expect(put.status()).toBe(403);
    const after = await serverChain(page, id);
    expect(after.version).toBe(before.version);
    await context.close();
  });

  it("gives a reviewer the same read-only canvas with every figure", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.reviewer.email);
    await openWorkspace(page, "Ballast tank pressure bridge");
    await waitForPlot(page);
    await expect(page.getByTestId("save-state").getAttribute("data-state")).resolves.toBe("read-only");
    // the seeded ballast chain clips at DC; a reviewer sees it on the card and in the findings
    await expect.poll(() => page.locator('[data-status="clip"][data-testid^="card-"]').count()).toBeGreaterThan(0);
    await page.getByRole("tab", { name: /Findings/ }).click();
    await expect.poll(() => page.locator('[data-testid="findings"] [data-code="rail-clip"]').count()).toBeGreaterThan(0);
    await page.getByRole("tab", { name: "Headroom" }).click();
    await page.getByTestId("headroom-table").waitFor();
    await screenshot(page, "workspace-reviewer-headroom");
    await context.close();
  });
});
