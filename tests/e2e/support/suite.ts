import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll } from "vitest";
import { signIn } from "./auth";
import { launchBrowser, newSession } from "./browser";

export interface Session {
  context: BrowserContext;
  page: Page;
}

export interface BrowserSessions {
  /** the file's Chromium, for the rare test that needs it itself */
  readonly browser: Browser;
  /** a fresh profile (no cookies) at 1280×800, watched for policy violations and uncaught errors */
  open(): Promise<Session>;
  /** a fresh profile signed in by password (the demo password unless given), on the chain list */
  signedIn(email: string, password?: string): Promise<Session>;
}

/**
 * One Chromium for the tests of the describe block this is called in: launched before them, closed after
 * them, whether they passed or not. Call it at the top of the block, beside the tests.
 */
export function useBrowser(): BrowserSessions {
  let browser: Browser | undefined;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });
  const launched = (): Browser => {
    if (!browser) throw new Error("useBrowser(): the browser is launched in beforeAll; use it inside a test");
    return browser;
  };
  return {
    get browser() {
      return launched();
    },
    open: () => newSession(launched()),
    async signedIn(email, password) {
      const session = await newSession(launched());
      await signIn(session.page, email, password);
      return session;
    },
  };
}
