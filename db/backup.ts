import "server-only";
import Database from "better-sqlite3";
import { mkdirSync, statSync } from "node:fs";
import path from "node:path";

/** `chainwright-20261203T190102Z.db`: sortable, one per second, no characters a file system refuses. */
export function backupFileName(now: Date): string {
  return `chainwright-${now.toISOString().replace(/[-:]/g, "").replace(/\.\d{3}Z$/, "Z")}.db`;
}

export interface BackupResult {
  file: string;
  bytes: number;
  integrity: string;
  counts: { chains: number; revisions: number; users: number };
}

/**
 * Copy a live database with SQLite's online backup API (better-sqlite3's `backup`), which copies pages
 * in steps while the server goes on reading and writing, and restarts a step a writer changed, so the
 * copy is one consistent moment of the file (WAL contents included). The copy is then opened on its
 * own and checked (`PRAGMA integrity_check`) with a count of its main tables.
 */
export async function backupDatabase(source: string, destDir: string, now = new Date()): Promise<BackupResult> {
  mkdirSync(destDir, { recursive: true });
  const file = path.join(destDir, backupFileName(now));
  const db = new Database(source, { fileMustExist: true });
  try {
    db.pragma("busy_timeout = 5000");
    await db.backup(file);
  } finally {
    db.close();
  }
  const copy = new Database(file, { readonly: true, fileMustExist: true });
  try {
    const integrity = (copy.pragma("integrity_check") as { integrity_check: string }[]).map((r) => r.integrity_check).join("; ");
    const count = (table: string) => (copy.prepare(`SELECT count(*) AS n FROM ${table}`).get() as { n: number }).n;
    const size = statSync(file).size;
    return { file, bytes: size, integrity, counts: { chains: count("chains"), revisions: count("revisions"), users: count("users") } };
  } finally {
    copy.close();
  }
}
