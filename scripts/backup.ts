/**
 * `npm run backup [-- --out DIR]`: an online backup of DATABASE_PATH (default ./data/chainwright.db)
 * into DIR (default the database's folder + /backups) as chainwright-<UTC time>.db, safe while the
 * server runs, with the attached files the copy lists in chainwright-<UTC time>-files/. Prints the
 * file, its size, its integrity check, row counts and files copied; exits 1 if the copy is not intact
 * or a listed file is missing on disk. Restoring is described in DEVELOPERS.md ("Backup and restore").
 */
import path from "node:path";
import { backupDatabase } from "../db/backup";
import { env } from "../lib/env";

async function main(): Promise<number> {
  const i = process.argv.indexOf("--out");
  const source = env().databasePath;
  const out = i >= 0 ? path.resolve(process.argv[i + 1]) : path.join(path.dirname(source), "backups");
  const r = await backupDatabase(source, out);
  console.log(`[backup] ${source} → ${r.file} (${(r.bytes / 1024).toFixed(0)} kB): integrity ${r.integrity}; ${r.counts.chains} chains, ${r.counts.revisions} revisions, ${r.counts.users} users`);
  console.log(`[backup] attached files → ${r.files.folder}: ${r.files.copied} copied (${(r.files.bytes / 1024).toFixed(0)} kB)${r.files.missing.length ? `; MISSING on disk: ${r.files.missing.join(", ")}` : ""}`);
  return r.integrity === "ok" && r.files.missing.length === 0 ? 0 : 1;
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(`[backup] failed: ${(err as Error).message}`);
    process.exit(1);
  },
);
