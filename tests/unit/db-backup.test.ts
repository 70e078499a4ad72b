import Database from "better-sqlite3";
import { existsSync } from "node:fs";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { backupDatabase, backupFileName } from "@/db/backup";
import { getDb } from "@/db/connection";
import { saveChainWithHistory } from "@/db/queries/history";
import { makeChain, makeTeam, makeUser } from "../support/fixtures";
import { useTempDatabase } from "../support/temp-db";

let tmp: ReturnType<typeof useTempDatabase>;
beforeEach(() => {
  tmp = useTempDatabase();
});
afterEach(() => tmp.cleanup());

describe("backupDatabase", () => {
  it("names the file by its UTC time", () => {
    expect(backupFileName(new Date("2026-12-03T19:01:02.345Z"))).toBe("chainwright-20261203T190102Z.db");
  });

  it("copies the live database, open connection and WAL included, into a file that opens on its own with the data", async () => {
    const user = makeUser("backup");
    const chainId = makeChain(makeTeam("Backup team", [[user, "admin"]]), user, "Kept chain");
    // a second version written through the server's own connection, still in the WAL when the backup runs
    const saved = saveChainWithHistory({ id: chainId, baseVersion: 1, name: "Kept chain", document: { format: "chainwright.chain/1", name: "Kept chain", notes: "second version", nodes: [], edges: [] }, userId: user.id, summary: "second", worstStatus: null });
    expect(saved.ok).toBe(true);
    expect(existsSync(`${tmp.file}-wal`)).toBe(true);

    const r = await backupDatabase(tmp.file, path.join(tmp.dir, "backups"), new Date("2026-12-03T19:01:02Z"));
    expect(r.file).toBe(path.join(tmp.dir, "backups", "chainwright-20261203T190102Z.db"));
    expect(r.integrity).toBe("ok");
    expect(r.counts).toEqual({ chains: 1, revisions: 2, users: 1 });

    // the server's connection is still open and usable after the backup
    expect(getDb().$client.prepare("SELECT count(*) AS n FROM chains").get()).toEqual({ n: 1 });
    const copy = new Database(r.file, { readonly: true });
    const row = copy.prepare("SELECT name, version, document FROM chains WHERE id = ?").get(chainId) as { name: string; version: number; document: string };
    copy.close();
    expect(row.name).toBe("Kept chain");
    expect(row.version).toBe(2);
    expect(JSON.parse(row.document).notes).toBe("second version");
  });

  it("refuses a source that does not exist instead of backing up an empty file", async () => {
    await expect(backupDatabase(path.join(tmp.dir, "missing.db"), path.join(tmp.dir, "backups"))).rejects.toThrow();
  });
});
