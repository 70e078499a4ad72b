import Database from "better-sqlite3";
import { existsSync, readFileSync, rmSync } from "node:fs";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { backupDatabase, backupFileName } from "@/db/backup";
import { getDb } from "@/db/connection";
import { insertChainFile } from "@/db/queries/chain-files";
import { saveChainWithHistory } from "@/db/queries/history";
import { DiskFileStore, filesFolder } from "@/lib/storage/file-store";
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

  it("leaves one self-contained file (rollback journal, no -wal beside it) and copies the attached files it lists", async () => {
    const user = makeUser("files");
    const chainId = makeChain(makeTeam("Files team", [[user, "admin"]]), user, "Chain with files");
    const store = new DiskFileStore(filesFolder(tmp.file));
    const attach = async (key: string, text: string) => {
      await store.put(key, new TextEncoder().encode(text));
      insertChainFile({ id: key.slice(9), chainId, kind: "response", name: `${key}.csv`, storageKey: key, size: text.length, sha256: "0".repeat(64), rows: 1, sampleRate: null });
    };
    await attach("response-aaaaaaaa", "frequency_hz,magnitude_db\n100,1\n");
    await attach("response-bbbbbbbb", "frequency_hz,magnitude_db\n200,2\n");
    // bytes on disk with no row (an upload that never committed) are not part of the backup
    await store.put("response-cccccccc", new TextEncoder().encode("orphan"));

    const r = await backupDatabase(tmp.file, path.join(tmp.dir, "backups"), new Date("2026-12-03T19:01:03Z"));
    expect(r.integrity).toBe("ok");
    const copy = new Database(r.file, { readonly: true });
    expect(copy.pragma("journal_mode", { simple: true })).toBe("delete");
    copy.close();
    expect(existsSync(`${r.file}-wal`)).toBe(false);

    expect(r.files.folder).toBe(path.join(tmp.dir, "backups", "chainwright-20261203T190103Z-files"));
    expect(r.files.copied).toBe(2);
    expect(r.files.missing).toEqual([]);
    const restored = new DiskFileStore(r.files.folder);
    expect((await restored.get("response-bbbbbbbb"))?.toString()).toBe("frequency_hz,magnitude_db\n200,2\n");
    expect(await restored.get("response-cccccccc")).toBeNull();
    expect(readFileSync(path.join(r.files.folder, "re", "response-aaaaaaaa"), "utf8")).toContain("100,1");
  });

  it("reports a listed file whose bytes are gone instead of passing over it", async () => {
    const user = makeUser("gone");
    const chainId = makeChain(makeTeam("Gone team", [[user, "admin"]]), user, "Chain with a lost file");
    const store = new DiskFileStore(filesFolder(tmp.file));
    await store.put("response-dddddddd", new TextEncoder().encode("x"));
    insertChainFile({ id: "dddddddd", chainId, kind: "response", name: "lost.csv", storageKey: "response-dddddddd", size: 1, sha256: "0".repeat(64), rows: 1, sampleRate: null });
    rmSync(path.join(filesFolder(tmp.file), "re", "response-dddddddd"));

    const r = await backupDatabase(tmp.file, path.join(tmp.dir, "backups"));
    expect(r.files.copied).toBe(0);
    expect(r.files.missing).toEqual(["response-dddddddd"]);
  });

  it("refuses a source that does not exist instead of backing up an empty file", async () => {
    await expect(backupDatabase(path.join(tmp.dir, "missing.db"), path.join(tmp.dir, "backups"))).rejects.toThrow();
  });
});
