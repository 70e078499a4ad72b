import { inject } from "vitest";

/** What the global setup hands every browser test file. */
export interface E2EContext {
  /** why the browser tests are skipped, or null when they run */
  skip: string | null;
  baseUrl: string;
  chromiumPath: string;
  mailboxPath: string;
  artifactsDir: string;
  /** the server's AUTH_SECRET and database path (tests/e2e/build-budgets.e2e.ts looks for them in what browsers get) */
  serverSecrets: string[];
}

declare module "vitest" {
  export interface ProvidedContext {
    e2e: E2EContext;
  }
}

export function e2eContext(): E2EContext {
  return inject("e2e");
}
