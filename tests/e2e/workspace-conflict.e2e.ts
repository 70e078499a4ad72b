import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD, DEMO_PEOPLE, signInWithPassword } from "./support/auth";
import { launchBrowser, newSession, screenshot } from "./support/browser";
import { e2eContext } from "./support/context";
import { openWorkspace, selectCard, serverChain, typeInto, waitForSaveState } from "./workspace-support";

const ctx = e2eContext();
const CHAIN = "Turbidity photodiode channel";

describe.skipIf(ctx.skip !== null)("two people saving the same chain (production build)", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  async function person(email: string): Promise<{ page: Page; close: () => Promise<void>; id: string }> {
    const { context, page } = await newSession(browser);
    await signInWithPassword(page, email, DEMO_PASSWORD);
    await page.waitForURL(/\/chains$/);
    const id = await openWorkspace(page, CHAIN);
    return { page, close: () => context.close(), id };
  }

  it("answers a stale save with the conflict choice, never a silent overwrite: load theirs, or keep mine as a copy", async () => {
    const tobias = await person(DEMO_PEOPLE.engineerA.email);
    const ines = await person(DEMO_PEOPLE.engineerB.email);
    const id = tobias.id;
    const start = (await serverChain(tobias.page, id)).version;

    // Tobias changes the gain and saves first.
    await selectCard(tobias.page, "inv");
    await typeInto(tobias.page, "f-r2", "22k");
    await waitForSaveState(tobias.page, "saved");
    expect((await serverChain(tobias.page, id)).version).toBe(start + 1);

    // Ines, still on the version she opened, changes r1: her save is refused.
    await selectCard(ines.page, "inv");
    await typeInto(ines.page, "f-r1", "4k7");
    await waitForSaveState(ines.page, "conflict");
    await ines.page.getByTestId("conflict").waitFor();
    await expect(ines.page.getByTestId("conflict").textContent()).resolves.toContain(`version ${start + 1}`);
    await screenshot(ines.page, "workspace-conflict");
    let server = await serverChain(tobias.page, id);
    expect(server.version).toBe(start + 1);
    expect(server.document.nodes.find((n) => n.id === "inv")!.params).toMatchObject({ r1: 10e3, r2: 22e3 });

    // She loads his version, and her next edit saves on top of it.
    await ines.page.getByRole("button", { name: "Load their version" }).click();
    await waitForSaveState(ines.page, "saved");
    await selectCard(ines.page, "inv");
    await expect(ines.page.locator("#f-r2").inputValue()).resolves.toBe("22k");
    await typeInto(ines.page, "f-r1", "4k7");
    await waitForSaveState(ines.page, "saved");
    server = await serverChain(tobias.page, id);
    expect(server.version).toBe(start + 2);
    expect(server.document.nodes.find((n) => n.id === "inv")!.params).toMatchObject({ r1: 4.7e3, r2: 22e3 });

    // Now Tobias is behind. His edit conflicts; he keeps his as a copy, and her chain is untouched.
    await selectCard(tobias.page, "inv");
    await typeInto(tobias.page, "f-r2", "47k");
    await waitForSaveState(tobias.page, "conflict");
    await tobias.page.getByRole("button", { name: "Keep mine as a copy" }).click();
    await tobias.page.waitForURL((u) => /\/chains\/[0-9a-f-]{36}$/.test(u.pathname) && !u.pathname.endsWith(id));
    await tobias.page.getByTestId("workspace").waitFor();
    const copyId = new URL(tobias.page.url()).pathname.split("/").pop()!;
    const copy = await serverChain(tobias.page, copyId);
    expect(copy.name).toBe(`${CHAIN} (my copy)`);
    expect(copy.document.nodes.find((n) => n.id === "inv")!.params).toMatchObject({ r1: 10e3, r2: 47e3 });
    await waitForSaveState(tobias.page, "saved");
    const original = await serverChain(tobias.page, id);
    expect(original.version).toBe(start + 2);
    expect(original.document.nodes.find((n) => n.id === "inv")!.params).toMatchObject({ r1: 4.7e3, r2: 22e3 });

    await tobias.close();
    await ines.close();
  });
});
