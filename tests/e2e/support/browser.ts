import { mkdirSync } from "node:fs";
import path from "node:path";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import { CHROMIUM_FLAGS, CHROMIUM_PATH } from "./chromium";
import { e2eContext } from "./context";

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_FLAGS });
}

/** Chromium's console wording when the content security policy blocks something. */
const CSP_MESSAGE = /Content Security Policy|Refused to (load|execute|apply|connect|create|frame|evaluate)/i;

/**
 * Fail the test at `context.close()` when any page of the context broke the content security policy
 * or threw an uncaught error: a blocked script or style shows up in the console, not as a failed
 * assertion, and would otherwise pass unnoticed.
 */
async function watchForBreakage(context: BrowserContext): Promise<void> {
  const problems: string[] = [];
  context.on("console", (msg) => {
    if (msg.type() === "error" && CSP_MESSAGE.test(msg.text())) problems.push(`CSP violation on ${msg.page()?.url() ?? "?"}: ${msg.text()}`);
  });
  context.on("weberror", (err) => problems.push(`uncaught error on ${err.page()?.url() ?? "?"}: ${err.error().message}`));
  // the page reports every violation itself too, including those the console wording above would miss
  await context.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (e) => {
      console.error(`Content Security Policy: ${e.violatedDirective} blocked ${e.blockedURI || "inline"} (${e.sourceFile}:${e.lineNumber})`);
    });
  });
  const close = context.close.bind(context);
  context.close = async (options) => {
    await close(options);
    if (problems.length) throw new Error(`the pages of this browser session reported:\n  ${[...new Set(problems)].join("\n  ")}`);
  };
}

/** A fresh browser profile (no cookies) at the size the product is designed for. */
export async function newSession(browser: Browser): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ baseURL: e2eContext().baseUrl, viewport: { width: 1280, height: 800 } });
  await watchForBreakage(context);
  const page = await context.newPage();
  return { context, page };
}

/** Save a full-page screenshot to artifacts/NAME.png and return its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  const dir = e2eContext().artifactsDir;
  mkdirSync(dir, { recursive: true });
  const file = path.join(dir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}
