import { existsSync } from "node:fs";
import path from "node:path";
import type { TestProject } from "vitest/node";
import type { E2EContext } from "./context";
import { CHROMIUM_PATH } from "./chromium";
import { startE2EServer } from "./server";

const ARTIFACTS = path.resolve(__dirname, "../../../artifacts");

/**
 * Once per browser-test run: find Chromium, build and start the app, hand the address to the
 * test files. Without Chromium the tests skip with a loud notice, except under CI, where a
 * missing browser is a failure (CI must really run them).
 */
export default async function setup(project: TestProject): Promise<(() => Promise<void>) | void> {
  const blank: E2EContext = { skip: null, baseUrl: "", chromiumPath: CHROMIUM_PATH, mailboxPath: "", artifactsDir: ARTIFACTS, serverSecrets: [] };
  if (!existsSync(CHROMIUM_PATH)) {
    if (process.env.CI) {
      throw new Error(`CI is set but ${CHROMIUM_PATH} is missing: install Debian's chromium (.ci/run does) so the browser tests run.`);
    }
    const reason = `browser tests SKIPPED: ${CHROMIUM_PATH} not found (apt-get install chromium to run them)`;
    console.warn(`\n${"!".repeat(reason.length + 4)}\n! ${reason} !\n${"!".repeat(reason.length + 4)}\n`);
    project.provide("e2e", { ...blank, skip: reason });
    return;
  }
  const started = Date.now();
  const server = await startE2EServer(ARTIFACTS);
  console.log(`[e2e] app built and started at ${server.baseUrl} in ${Math.round((Date.now() - started) / 1000)} s`);
  project.provide("e2e", { ...blank, baseUrl: server.baseUrl, mailboxPath: server.mailboxPath, serverSecrets: server.serverSecrets });
  return () => server.stop();
}
