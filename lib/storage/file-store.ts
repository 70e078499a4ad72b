import "server-only";
import { mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from "node:fs";
import path from "node:path";
import { env } from "@/lib/env";

/**
 * Where attached files keep their bytes. The metadata (name, size, hash, owner chain) lives in SQLite
 * (`chain_files`); the store only maps an opaque key to bytes, so an object store (a bucket with
 * put/get/delete by key) can stand in for the disk without touching the callers.
 */
export interface FileStore {
  /** stores the bytes under the key, all or nothing (a reader never sees part of a file) */
  put(key: string, bytes: Uint8Array): Promise<void>;
  /** the bytes, or null when there is nothing under the key */
  get(key: string): Promise<Buffer | null>;
  /** removes the key; no error when it is already gone */
  delete(key: string): Promise<void>;
}

const KEY = /^[a-z0-9-]{8,80}$/;

function checkKey(key: string): void {
  if (!KEY.test(key)) throw new Error(`file store: malformed key ${JSON.stringify(key)}`);
}

/** Where the disk store keeps a key's bytes under `root`: `<root>/<first two characters>/<key>`. */
export function diskFilePath(root: string, key: string): string {
  checkKey(key);
  return path.join(root, key.slice(0, 2), key);
}

/** The folder of attached files for a database file: `files/` beside it. */
export function filesFolder(databasePath: string): string {
  return path.join(path.dirname(path.resolve(databasePath)), "files");
}

/**
 * Files under `<data folder>/files/` (the folder of DATABASE_PATH). A put writes a temporary file
 * beside the target and renames it into place, which is atomic on one file system.
 */
export class DiskFileStore implements FileStore {
  constructor(private readonly root: string) {}

  private file(key: string): string {
    return diskFilePath(this.root, key);
  }

  async put(key: string, bytes: Uint8Array): Promise<void> {
    const target = this.file(key);
    mkdirSync(path.dirname(target), { recursive: true });
    const tmp = `${target}.part-${process.pid}`;
    try {
      writeFileSync(tmp, bytes, { flag: "wx" });
      renameSync(tmp, target);
    } catch (e) {
      rmSync(tmp, { force: true });
      throw e;
    }
  }

  async get(key: string): Promise<Buffer | null> {
    try {
      return readFileSync(this.file(key));
    } catch (e) {
      if ((e as NodeJS.ErrnoException).code === "ENOENT") return null;
      throw e;
    }
  }

  async delete(key: string): Promise<void> {
    rmSync(this.file(key), { force: true });
  }
}

/** The store for this process: files beside the database (follows DATABASE_PATH, so tests get their own). */
export function fileStore(): FileStore {
  return new DiskFileStore(filesFolder(env().databasePath));
}
