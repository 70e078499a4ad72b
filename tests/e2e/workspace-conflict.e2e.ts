import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { DEMO_PEOPLE } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { findTemplate } from "../../lib/templates";
import { selectCard, serverChain, typeInto, waitForPlot, waitForSaveState } from "./workspace-support";

const ctx = e2eContext();
const CHAIN = "Turbidity, conflict check";

describe.skipIf(ctx.skip !== null)("two people saving the same chain (production build)", () => {
  const sessions = useBrowser();

  /** Tobias makes a chain of his own from the turbidity example and shares it with Ines as an editor. */
  async function sharedChain(owner: Page): Promise<string> {
    const doc = { ...findTemplate("turbidity-two-channel")!.make(), name: CHAIN };
    // the seeded turbidity chain's ids, so the steps below read like the seeded one
    doc.nodes = doc.nodes.map((n) => (n.id === "u1" ? { ...n, id: "inv", params: { ...n.params, r1: 10e3, r2: 20e3 } } : n));
    doc.edges = doc.edges.map((e) => ({ from: e.from === "u1" ? "inv" : e.from, to: e.to === "u1" ? "inv" : e.to }));
    const created = await owner.request.post("/api/chains", { data: { name: CHAIN, document: doc } });
    expect(created.status()).toBe(201);
    const id = (await created.json()).chain.id as string;
    const members = await (await owner.request.get(`/api/chains/${id}/members`)).json();
    const ines = (members.candidates as { userId: string; email?: string; name?: string }[]).find((p) => p.email === DEMO_PEOPLE.engineerB.email);
    expect(ines).toBeDefined();
    const shared = await owner.request.post(`/api/chains/${id}/members`, { data: { userId: ines!.userId, role: "editor" } });
    expect(shared.status()).toBeLessThan(300);
    return id;
  }

  /**
   * Opens the chain and waits for its plot: loading the plotting library holds the page for a second or
   * more on a slow machine, and an autosave timer that fires in the middle of someone's typing would
   * split one edit into two saves.
   */
  async function open(page: Page, id: string) {
    await page.goto(`/chains/${id}`);
    await page.getByTestId("workspace").waitFor();
    await waitForPlot(page);
  }

  it("answers a stale save with the conflict choice, never a silent overwrite: load theirs, or keep mine as a copy", async () => {
    const tobias = await sessions.signedIn(DEMO_PEOPLE.engineerA.email);
    const ines = await sessions.signedIn(DEMO_PEOPLE.engineerB.email);
    const id = await sharedChain(tobias.page);
    await open(tobias.page, id);
    await open(ines.page, id);
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

    await tobias.context.close();
    await ines.context.close();
  });
});
