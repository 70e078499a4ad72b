import { mkdtempSync, rmSync } from "node:fs";
import { afterEach, beforeEach } from "vitest";
import { tmpdir } from "node:os";
import path from "node:path";
import { closeDb, getDb } from "@/db/connection";
import { resetEnvCache } from "@/lib/env";

/**
 * Point the app's database at a fresh SQLite file in a temp folder (migrated on first use).
 * Call in beforeEach/beforeAll; the returned cleanup closes the connection and removes the folder.
 */
export function useTempDatabase(): { dir: string; file: string; cleanup: () => void } {
  closeDb();
  const dir = mkdtempSync(path.join(tmpdir(), "chainwright-test-"));
  const file = path.join(dir, "test.db");
  process.env.DATABASE_PATH = file;
  resetEnvCache();
  getDb();
  return {
    dir,
    file,
    cleanup() {
      closeDb();
      rmSync(dir, { recursive: true, force: true });
      resetEnvCache();
    },
  };
}

/**
 * Give every test of the file (or of the describe block it is called in) its own fresh database,
 * removed again after the test. `setUp` runs once the database is ready, e.g. to clear recorded mail
 * or sign someone in.
 */
export function freshDatabasePerTest(setUp?: () => void): void {
  let tmp: ReturnType<typeof useTempDatabase> | undefined;
  beforeEach(() => {
    tmp = useTempDatabase();
    setUp?.();
  });
  afterEach(() => {
    tmp?.cleanup();
    tmp = undefined;
  });
}
