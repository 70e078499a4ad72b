import "server-only";
import Database from "better-sqlite3";
import { drizzle, type BetterSQLite3Database } from "drizzle-orm/better-sqlite3";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { mkdirSync } from "node:fs";
import path from "node:path";
import { env } from "@/lib/env";
import * as schema from "./schema";

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

/** Where the generated SQL migrations live (resolved from the working directory, as `next start` runs there). */
export const MIGRATIONS_DIR = path.join(process.cwd(), "drizzle");

/**
 * Open a SQLite file with the settings every connection needs: WAL so readers do not block the
 * writer, foreign keys enforced (SQLite leaves them off by default), and a busy timeout so two
 * processes (dev server and seed script) wait for each other instead of failing at once.
 */
export function openDatabase(file: string): Db {
  mkdirSync(path.dirname(file), { recursive: true });
  const client = new Database(file);
  client.pragma("journal_mode = WAL");
  client.pragma("foreign_keys = ON");
  client.pragma("busy_timeout = 5000");
  client.pragma("synchronous = NORMAL");
  return drizzle({ client, schema }) as Db;
}

/** Apply every migration in drizzle/ that the file has not seen yet. */
export function migrateDatabase(db: Db, migrationsFolder = MIGRATIONS_DIR): void {
  migrate(db, { migrationsFolder });
}

const globalForDb = globalThis as unknown as { __chainwrightDb?: { file: string; db: Db } };

/**
 * The process-wide connection for DATABASE_PATH, migrated on first use. Kept on globalThis so
 * hot reloads in development do not open a new handle each time.
 */
export function getDb(): Db {
  const file = env().databasePath;
  const held = globalForDb.__chainwrightDb;
  if (held && held.file === file) return held.db;
  if (held) held.db.$client.close();
  const db = openDatabase(file);
  migrateDatabase(db);
  globalForDb.__chainwrightDb = { file, db };
  return db;
}

/** Close the process-wide connection (tests and scripts). */
export function closeDb(): void {
  const held = globalForDb.__chainwrightDb;
  if (held) {
    held.db.$client.close();
    globalForDb.__chainwrightDb = undefined;
  }
}
