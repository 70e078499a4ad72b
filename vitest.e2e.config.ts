import { defineConfig } from "vitest/config";
import base from "./vitest.config";

/**
 * Browser tests: one production build and one server per run (tests/e2e/support/global-setup.ts),
 * files one after another against it. Kept apart from vitest.config.ts (whose aliases it reuses)
 * so `vitest run` there stays quick; `npm test` runs both.
 */
export default defineConfig({
  resolve: base.resolve,
  test: {
    include: ["tests/e2e/**/*.e2e.ts"],
    globalSetup: ["tests/e2e/support/global-setup.ts"],
    environment: "node",
    pool: "forks",
    fileParallelism: false,
    maxWorkers: 1,
    testTimeout: 90_000,
    hookTimeout: 120_000,
    // expect.poll waits for a state (a card's status, a save, a review state); vitest's default of 1 s is
    // shorter than a server round trip or an analysis takes on a loaded machine
    expect: { poll: { timeout: 15_000 } },
  },
});
