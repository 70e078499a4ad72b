/**
 * The rest of working together in the browser: a viewer who can read but neither edit nor comment,
 * restoring an old revision from the history, and importing op-amp models from a CSV with bad rows
 * through the preview.
 */
import { describe, expect, it } from "vitest";
import { DEMO_PEOPLE } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { openWorkspace, selectCard, serverChain, typeInto, waitForSaveState } from "./workspace-support";

const ctx = e2eContext();

describe.skipIf(ctx.skip !== null)("viewer, history and the op-amp library (production build)", () => {
  const sessions = useBrowser();

  it("lets a viewer read comments and the review but neither comment, decide nor share", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.outsider.email);
    const id = await openWorkspace(page, "Hull vibration channel, aft bay");
    const tools = page.getByTestId("team-tools");
    await expect(tools.getByRole("button", { name: "Share" }).count()).resolves.toBe(0);
    await tools.getByRole("button", { name: /^Comments/ }).click();
    await page.getByTestId("comments-read-only").waitFor();
    await expect(page.locator("#new-comment").count()).resolves.toBe(0);
    await tools.getByRole("button", { name: "Review" }).click();
    await page.getByTestId("review-panel").waitFor();
    await expect(page.getByRole("button", { name: "Approve" }).count()).resolves.toBe(0);
    await expect(page.getByRole("button", { name: "Request review" }).count()).resolves.toBe(0);
    await tools.getByRole("button", { name: "People" }).click();
    await page.getByTestId("members").waitFor();
    await expect(page.getByRole("button", { name: "Send invitation" }).count()).resolves.toBe(0);
    await screenshot(page, "team-viewer");
    // the API says the same
    expect((await page.request.post(`/api/chains/${id}/comments`, { data: { body: "let me in" } })).status()).toBe(403);
    expect((await page.request.post(`/api/chains/${id}/invitations`, { data: { email: "x@e2e.example", role: "owner" } })).status()).toBe(403);
    // the library offers them no command on the chain itself, only a copy into their own workspace
    await page.goto("/chains");
    const row = page.getByTestId("library-row").filter({ hasText: "Hull vibration channel, aft bay" });
    await expect(row.getByRole("button").allTextContents()).resolves.toEqual(["Duplicate"]);
    await context.close();
  });

  it("restores an old revision as a new one, after showing the difference", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerB.email);
    const list = await (await page.request.get("/api/chains")).json();
    const hull = list.chains.find((c: { name: string }) => c.name === "Hull vibration channel, aft bay");
    const name = `Restore trial ${Date.now()}`;
    const copy = await (await page.request.post(`/api/chains/${hull.id}/duplicate`, { data: { name } })).json();
    const id: string = copy.chain.id;
    const original = await serverChain(page, id);
    await page.goto(`/chains/${id}`);
    await page.getByTestId("workspace").waitFor();
    await selectCard(page, "aa");
    await typeInto(page, "f-c2", "10n");
    await waitForSaveState(page, "saved");
    const edited = await serverChain(page, id);
    expect(edited.document.nodes.find((n) => n.id === "aa")!.params.c2).toBeCloseTo(10e-9, 15);

    await page.goto(`/chains/${id}/history`);
    await expect(page.getByTestId("revision-row").count()).resolves.toBe(2);
    const comparison = page.getByTestId("comparison");
    await comparison.getByTestId("stage-diff").waitFor();
    await expect(comparison.textContent()).resolves.toMatch(/4\.70 nF\s*→\s*10\.0 nF/);
    await expect(page.getByTestId("key-results").textContent()).resolves.toMatch(/corner of aa/);
    await screenshot(page, "team-history-diff");
    page.once("dialog", (d) => void d.accept());
    await page.getByRole("button", { name: "Restore revision 1" }).click();
    await expect.poll(() => page.getByTestId("revision-row").count()).toBe(3);
    await expect(page.getByTestId("revision-row").first().textContent()).resolves.toContain("Restored revision 1");
    const restored = await serverChain(page, id);
    // autosave may have saved more than once while typing (those saves fold into one revision); the restore is one more
    expect(restored.version).toBe(edited.version + 1);
    expect(restored.document.nodes).toEqual(original.document.nodes);
    // leave the demo team's chain list as the other browser tests expect it
    expect((await page.request.delete(`/api/chains/${id}`)).status()).toBe(200);
    await context.close();
  });

  it("imports op-amp models from a CSV with bad rows through the preview", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerA.email);
    await page.goto("/parts");
    const before = await page.getByTestId("part-row").count();
    const stamp = Date.now();
    const csv = [
      "name,gbw,aol,slewRate,vos,ib,en,swingLow,swingHigh",
      `Audio bipolar ${stamp},10M,1M,7M,0.5m,200n,4n,1.2,1.2`,
      `Micropower CMOS ${stamp},50k,100k,20k,1m,1p,60n,0.01,0.01`,
      `Broken gain ${stamp},lots,1M,,,,,,`,
      `,1M,,,,,,,`,
      `Negative offset ${stamp},1M,,,-1m,,,,`,
    ].join("\n");
    await page.getByTestId("csv-file").setInputFiles({ name: "models.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
    const preview = page.getByTestId("csv-preview");
    await preview.waitFor();
    await expect(preview.textContent()).resolves.toMatch(/2\s*rows ready,\s*3\s*with errors/);
    await expect(page.locator('[data-testid="csv-row"][data-ok="false"]').count()).resolves.toBe(3);
    await expect(preview.textContent()).resolves.toContain("gbw:");
    await expect(preview.textContent()).resolves.toContain("a model needs a name");
    await screenshot(page, "team-csv-preview");
    // nothing is stored before the preview is confirmed
    await expect(page.getByTestId("part-row").count()).resolves.toBe(before);
    await page.getByRole("button", { name: "Import 2 models" }).click();
    await page.getByTestId("csv-stored").waitFor();
    await expect(page.getByTestId("csv-stored").textContent()).resolves.toContain("2 models stored; 3 rows with errors left out");
    await expect.poll(() => page.getByTestId("part-row").count()).toBe(before + 2);
    await expect(page.getByTestId("parts-table").textContent()).resolves.toContain(`Audio bipolar ${stamp}`);
    await expect(page.getByTestId("parts-table").textContent()).resolves.toContain("10.0 MHz");
    const href = await page.getByRole("link", { name: "Download CSV" }).getAttribute("href");
    const download = await page.request.get(href!);
    expect(download.status()).toBe(200);
    expect(download.headers()["content-type"]).toContain("text/csv");
    const text = await download.text();
    expect(text.split("\n")[0]).toMatch(/^name,label,gbw,aol/);
    expect(text).toContain(`Audio bipolar ${stamp}`);
    await screenshot(page, "team-parts");
    await context.close();
  });
});
