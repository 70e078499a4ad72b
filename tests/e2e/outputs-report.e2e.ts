import { inflateSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { DEMO_PEOPLE } from "./support/auth";
import { screenshot } from "./support/browser";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { openWorkspace, waitForSaveState } from "./workspace-support";

const ctx = e2eContext();

/** Pages of a PDF Chromium wrote: its page objects (`/Type /Page`, not `/Pages`), and the first one's size. */
function pdfPages(pdf: Buffer): { count: number; firstBox: number[] | null } {
  const text = pdf.toString("latin1");
  const count = (text.match(/\/Type\s*\/Page(?![a-z])/g) ?? []).length;
  const box = /\/MediaBox\s*\[\s*([\d.\s-]+)\]/.exec(text);
  return { count, firstBox: box ? box[1].trim().split(/\s+/).map(Number) : null };
}

/**
 * The outline (bookmark) titles of a PDF Chromium wrote with `tagged` and `outline`: one per heading of the
 * printed page. They sit in the file's streams (deflated) as UTF-16 hex strings with a byte-order mark
 * or as plain literals, which is enough to prove a heading reached the printed document.
 */
function pdfOutlineTitles(pdf: Buffer): string[] {
  const parts = [pdf.toString("latin1")];
  const raw = parts[0];
  for (const m of raw.matchAll(/stream\r?\n/g)) {
    const start = m.index + m[0].length;
    const end = raw.indexOf("endstream", start);
    if (end < 0) continue;
    try {
      parts.push(inflateSync(pdf.subarray(start, end)).toString("latin1"));
    } catch {
      // not deflated (images, fonts): nothing to read
    }
  }
  const titles: string[] = [];
  for (const text of parts) {
    for (const m of text.matchAll(/\/Title\s*(<([0-9A-Fa-f\s]+)>|\(((?:\\.|[^\\)])*)\))/g)) {
      if (m[2] !== undefined) {
        const hex = m[2].replace(/\s+/g, "");
        const bytes = Buffer.from(hex, "hex");
        titles.push(bytes[0] === 0xfe && bytes[1] === 0xff ? bytes.subarray(2).swap16().toString("utf16le") : bytes.toString("latin1"));
      } else titles.push(m[3].replace(/\\(.)/g, "$1"));
    }
  }
  return titles;
}

describe.skipIf(ctx.skip !== null)("hand-offs: outputs page, printed design report, chain import (production build)", () => {
  const sessions = useBrowser();

  it("prints the design report to PDF on A4 and Letter with its plots as images and every section", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.reviewer.email);
    const id = await openWorkspace(page, "Hull vibration channel, aft bay");
    await page.getByTestId("outputs-link").click();
    await page.waitForURL(new RegExp(`/chains/${id}/outputs$`));
    await page.getByTestId("outputs-page").waitFor();
    await screenshot(page, "outputs-page");
    await expect(page.getByTestId("bring-up-table").locator("tbody tr").count()).resolves.toBe(4);
    await expect(page.getByTestId("scaling-header").textContent()).resolves.toMatch(/#define CW_ADC_SOURCE_COULOMBS_PER_CODE/);
    // the sheet's spread from tolerances: a range per test point and the builds and seed said
    await expect(page.getByTestId("spread-dc").count()).resolves.toBe(await page.getByTestId("bring-up-table").locator("tbody tr").count());
    await expect(page.getByTestId("bring-up-spread-note").textContent()).resolves.toMatch(/^Spread from tolerances: 200 builds \(seed 1\)/);

    await page.goto(`/chains/${id}/report`);
    await page.locator('[data-plots="ready"]').waitFor({ timeout: 30_000 });
    const images = page.getByTestId("design-report").locator("figure img");
    await expect(images.count()).resolves.toBe(1);
    const src = await images.first().getAttribute("src");
    expect(src?.startsWith("data:image/png;base64,")).toBe(true);
    const text = (await page.getByTestId("design-report").textContent()) ?? "";
    for (const needle of ["Design report", "Hull vibration channel, aft bay", "Purpose and notes", "Headroom", "Noise budget", "Warnings", "Bill of materials", "Bring-up", "Converter scaling", "Review record", "Revision", "Spread from tolerances"]) {
      expect(text, needle).toContain(needle);
    }
    await expect(page.getByTestId("report-cards").locator("li").count()).resolves.toBe(5);
    // the spread summary, run when the report was built, says how and shows a row per stage figure
    const spreadText = (await page.getByTestId("report-spread").textContent()) ?? "";
    expect(spreadText).toMatch(/Run when this report was built: 200 builds \(seed 1\)/);
    expect(spreadText).toMatch(/No build clips anywhere|of the builds clip somewhere/);
    await expect(page.getByTestId("report-spread-stages").locator("tbody tr").count()).resolves.toBeGreaterThan(0);
    await expect(page.getByTestId("report-spread-top").locator("tbody tr").count()).resolves.toBeGreaterThan(0);
    await screenshot(page, "design-report");

    // under print media the spread section is not one of the screen-only parts
    await page.emulateMedia({ media: "print" });
    await expect(page.getByTestId("report-spread").isVisible()).resolves.toBe(true);
    await page.emulateMedia({ media: null });
    const a4Pdf = await page.pdf({ preferCSSPageSize: true, printBackground: true, tagged: true, outline: true });
    expect(pdfOutlineTitles(a4Pdf)).toEqual(expect.arrayContaining(["Spread from tolerances", "Bring-up", "Headroom"]));
    const a4 = pdfPages(a4Pdf);
    expect(a4.count).toBeGreaterThanOrEqual(2);
    expect(a4.count).toBeLessThanOrEqual(8);
    // A4 is 595.28 × 841.89 points
    expect(Math.round(a4.firstBox![2])).toBe(595);
    expect(Math.round(a4.firstBox![3])).toBe(842);

    await page.goto(`/chains/${id}/report?paper=letter`);
    await page.locator('[data-plots="ready"]').waitFor({ timeout: 30_000 });
    const letter = pdfPages(await page.pdf({ preferCSSPageSize: true, printBackground: true }));
    expect(letter.count).toBeGreaterThanOrEqual(2);
    expect(letter.firstBox!.slice(2).map(Math.round)).toEqual([612, 792]);
    await context.close();
  });

  it("imports a chain file: names every problem first, writes nothing until asked, then opens the new chain", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerB.email);
    const id = await openWorkspace(page, "Turbidity photodiode channel");
    const exported = await page.request.get(`/api/chains/${id}/export`);
    expect(exported.status()).toBe(200);
    const doc = (await exported.json()) as { name: string; nodes: { params: Record<string, unknown> }[] };

    await page.goto("/chains");
    await page.getByRole("link", { name: "Import a chain file" }).click();
    await page.waitForURL(/\/chains\/import$/);
    const broken = structuredClone(doc);
    broken.nodes[1].params.rf = -10; // the TIA's feedback resistor
    await page.locator("#import-text").fill(JSON.stringify(broken));
    await page.getByRole("button", { name: /^Check/ }).click();
    const errors = page.getByTestId("import-errors");
    await errors.waitFor();
    await expect(errors.textContent()).resolves.toContain("document.nodes[1].params.rf");
    await expect(page.getByRole("button", { name: "Import as a new chain" }).isDisabled()).resolves.toBe(true);

    const copy = { ...doc, name: `Imported turbidity ${Date.now()}` };
    await page.locator("#import-text").fill(JSON.stringify(copy));
    await page.getByRole("button", { name: /^Check/ }).click();
    await page.getByTestId("import-preview").waitFor();
    await expect(page.getByTestId("import-preview").textContent()).resolves.toContain("Complete");
    await page.getByRole("button", { name: "Import as a new chain" }).click();
    await page.waitForURL(/\/chains\/[0-9a-f-]{36}$/);
    await page.getByTestId("workspace").waitFor();
    await expect(page.getByTestId("chain-name").textContent()).resolves.toBe(copy.name);
    await screenshot(page, "imported-chain");
    await context.close();
  });

  it("the read-only link opens the chain with every edit off, even for someone who may edit it", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.admin.email);
    const id = await openWorkspace(page, "Hull vibration channel, aft bay");
    await page.goto(`/chains/${id}/view`);
    await page.getByTestId("workspace").waitFor();
    await waitForSaveState(page, "read-only");
    await expect(page.getByRole("button", { name: "Undo" }).count()).resolves.toBe(0);
    await context.close();
  });
});
