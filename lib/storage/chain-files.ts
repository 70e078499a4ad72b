import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { deleteChainFile, getChainFile, insertChainFile, listChainFiles } from "@/db/queries/chain-files";
import { deleteChainRow } from "@/db/queries/chains";
import type { ChainFile } from "@/db/schema";
import { ApiError, ValidationError, type FieldError } from "@/lib/api/errors";
import type { ChainFileKind } from "@/lib/domain";
import { problemText, readResponseCsv, readWaveformCsv, RESPONSE_LIMITS, WAVEFORM_LIMITS, type CsvProblem } from "@/lib/waveform-csv";
import { fileStore, type FileStore } from "./file-store";

/**
 * Files attached to a chain (recorded waveforms, measured responses): checked with the same CSV
 * readers the browser previews with, bytes into the file store, then one metadata row. A file that
 * fails any check is not stored at all; if the row cannot be written, the stored bytes are removed.
 */

export const FILE_LIMITS: Record<ChainFileKind, number> = { waveform: WAVEFORM_LIMITS.maxBytes, response: RESPONSE_LIMITS.maxBytes };

export interface ChainFileView {
  id: string;
  kind: ChainFileKind;
  name: string;
  size: number;
  rows: number;
  sampleRate: number | null;
  sha256: string;
  createdAt: string;
}

export const fileView = (f: ChainFile): ChainFileView => ({
  id: f.id,
  kind: f.kind,
  name: f.name,
  size: f.size,
  rows: f.rows,
  sampleRate: f.sampleRate,
  sha256: f.sha256,
  createdAt: f.createdAt.toISOString(),
});

export interface NewFile {
  chainId: string;
  userId: string;
  kind: ChainFileKind;
  name: string;
  csv: string;
  sampleRate?: number | null;
  tolerance?: number;
}

/** A CSV problem as a field error of the upload: path `csv` (or `sampleRate`), its line and column kept. */
const asFieldError = (e: CsvProblem): FieldError & { line: number | null; column: string | null } => ({
  path: e.column === "sampleRate" || e.column === "tolerance" ? e.column : "csv",
  message: problemText(e),
  line: e.line,
  column: e.column,
});

// Control characters other than tab, CR and LF do not belong in a CSV of numbers.
const BINARY = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;

export async function addChainFile(input: NewFile, store: FileStore = fileStore()): Promise<ChainFileView> {
  const bytes = Buffer.from(input.csv, "utf8");
  const limit = FILE_LIMITS[input.kind];
  if (bytes.length > limit) throw new ApiError(413, `The file is ${(bytes.length / 1048576).toFixed(1)} MB; at most ${limit / 1048576} MB is accepted.`, { limit });
  const bad = BINARY.exec(input.csv);
  if (bad) {
    const line = input.csv.slice(0, bad.index).split("\n").length;
    throw new ValidationError([{ path: "csv", message: `line ${line}: a control character (code ${bad[0].charCodeAt(0)}); this is not a text CSV`, line, column: null } as FieldError]);
  }
  let rows: number;
  let sampleRate: number | null = null;
  if (input.kind === "waveform") {
    const r = readWaveformCsv(input.csv, { sampleRate: input.sampleRate ?? null, tolerance: input.tolerance });
    if (!r.ok) throw new ValidationError(withCount(r.errors.map(asFieldError), r.errorCount));
    rows = r.data.rows;
    sampleRate = r.data.sampleRate;
  } else {
    const r = readResponseCsv(input.csv);
    if (!r.ok) throw new ValidationError(withCount(r.errors.map(asFieldError), r.errorCount));
    rows = r.data.rows;
  }
  const id = randomUUID();
  const storageKey = `${input.kind}-${id}`;
  await store.put(storageKey, bytes);
  try {
    const row = insertChainFile({
      id,
      chainId: input.chainId,
      kind: input.kind,
      name: input.name,
      storageKey,
      size: bytes.length,
      sha256: createHash("sha256").update(bytes).digest("hex"),
      rows,
      sampleRate,
      createdBy: input.userId,
    });
    return fileView(row);
  } catch (e) {
    await store.delete(storageKey);
    throw e;
  }
}

function withCount(errors: FieldError[], count: number): FieldError[] {
  return count > errors.length ? [...errors, { path: "csv", message: `and ${count - errors.length} more problems` }] : errors;
}

export const chainFilesOf = (chainId: string): ChainFileView[] => listChainFiles(chainId).map(fileView);

/** The file's metadata and text; ApiError 404 when it is not this chain's or its bytes are gone. */
export async function readChainFile(chainId: string, id: string, store: FileStore = fileStore()): Promise<{ file: ChainFileView; text: string }> {
  const row = getChainFile(chainId, id);
  if (!row) throw new ApiError(404, "No such file on this chain.");
  const bytes = await store.get(row.storageKey);
  if (!bytes) throw new ApiError(404, "The file's contents are missing from the file store.");
  return { file: fileView(row), text: bytes.toString("utf8") };
}

/** Removes the row first (so no one is offered a file that is going), then the bytes. */
export async function removeChainFile(chainId: string, id: string, store: FileStore = fileStore()): Promise<void> {
  const row = deleteChainFile(chainId, id);
  if (!row) throw new ApiError(404, "No such file on this chain.");
  await store.delete(row.storageKey);
}

/**
 * Deletes a chain with everything it owns: the rows (one transaction, files' rows by cascade), then the
 * bytes of each of its files. The rows go first, as in `removeChainFile`; should the process stop between
 * the two, what remains is unreachable bytes, never a listed file without its contents. False when there
 * was no such chain.
 */
export async function deleteChainWithFiles(chainId: string, store: FileStore = fileStore()): Promise<boolean> {
  const gone = deleteChainRow(chainId);
  if (!gone) return false;
  for (const key of gone.storageKeys) await store.delete(key);
  return true;
}
