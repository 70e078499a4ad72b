import { mkdirSync } from "node:fs";
import path from "node:path";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import { CHROMIUM_FLAGS, CHROMIUM_PATH } from "./chromium";
import { e2eContext } from "./context";

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_FLAGS });
}

/** A fresh browser profile (no cookies) at the size the product is designed for. */
export async function newSession(browser: Browser): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ baseURL: e2eContext().baseUrl, viewport: { width: 1280, height: 800 } });
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
