import "server-only";
import Database from "better-sqlite3";
import { copyFileSync, existsSync, mkdirSync, statSync } from "node:fs";
import path from "node:path";
import { diskFilePath, filesFolder } from "@/lib/storage/file-store";

/** `chainwright-20261203T190102Z.db`: sortable, one per second, no characters a file system refuses. */
export function backupFileName(now: Date): string {
  return `chainwright-${now.toISOString().replace(/[-:]/g, "").replace(/\.\d{3}Z$/, "Z")}.db`;
}

export interface BackupResult {
  file: string;
  bytes: number;
  integrity: string;
  counts: { chains: number; revisions: number; users: number };
  /** attached files (measured sweeps, waveforms) copied beside the database copy */
  files: { folder: string; copied: number; bytes: number; missing: string[] };
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
  // The copy keeps the source's WAL mode in its header; one self-contained file is what a backup should be.
  const rw = new Database(file, { fileMustExist: true });
  try {
    rw.pragma("journal_mode = DELETE");
  } finally {
    rw.close();
  }
  const copy = new Database(file, { readonly: true, fileMustExist: true });
  try {
    const integrity = (copy.pragma("integrity_check") as { integrity_check: string }[]).map((r) => r.integrity_check).join("; ");
    const count = (table: string) => (copy.prepare(`SELECT count(*) AS n FROM ${table}`).get() as { n: number }).n;
    const keys = (copy.prepare("SELECT storage_key AS k FROM chain_files ORDER BY storage_key").all() as { k: string }[]).map((r) => r.k);
    const files = backupFiles(keys, filesFolder(source), `${file.replace(/\.db$/, "")}-files`);
    const size = statSync(file).size;
    return { file, bytes: size, integrity, counts: { chains: count("chains"), revisions: count("revisions"), users: count("users") }, files };
  } finally {
    copy.close();
  }
}

/**
 * Copies the bytes of every file the database copy lists into `dest`, laid out as the disk store lays
 * them out (so restoring is copying the folder back as `files/`). Only the listed keys are copied: a
 * file written after the database copy was taken has no row in it and would be an orphan. A listed
 * key whose bytes are not on disk is reported, not skipped in silence.
 */
export function backupFiles(keys: string[], sourceRoot: string, dest: string): BackupResult["files"] {
  let copied = 0;
  let bytes = 0;
  const missing: string[] = [];
  for (const key of keys) {
    const from = diskFilePath(sourceRoot, key);
    if (!existsSync(from)) {
      missing.push(key);
      continue;
    }
    const to = diskFilePath(dest, key);
    mkdirSync(path.dirname(to), { recursive: true });
    copyFileSync(from, to);
    copied += 1;
    bytes += statSync(to).size;
  }
  return { folder: dest, copied, bytes, missing };
}
