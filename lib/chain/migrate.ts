/**
 * Versions of the chain document. `chainwright.chain/1` is the only version so far; a later version adds a
 * step to MIGRATIONS (from N to N + 1) and raises CURRENT_VERSION, and every older document is brought
 * forward step by step before validation. Documents from a newer Chainwright are refused, never guessed at.
 */
import { CHAIN_FORMAT, type ChainIssue } from "./types";
import { isPlainObject } from "./graph";

export const FORMAT_PREFIX = "chainwright.chain/";
export const CURRENT_VERSION = 1;

type Doc = Record<string, unknown>;

/**
 * One step per version: MIGRATIONS[n] turns a version-n document into a version n + 1 document (and sets
 * its `format`). Empty while version 1 is the only one.
 */
const MIGRATIONS: Readonly<Record<number, (doc: Doc) => Doc>> = {};

export type FormatReading = { ok: true; version: number } | { ok: false; message: string };

/** Recognise the `format` string and its version. */
export function readFormat(format: unknown): FormatReading {
  if (format === undefined) return { ok: false, message: `is required: ${JSON.stringify(CHAIN_FORMAT)}` };
  if (typeof format !== "string") {
    return { ok: false, message: `must be the text ${JSON.stringify(CHAIN_FORMAT)}` };
  }
  const m = /^chainwright\.chain\/(\d{1,6})$/.exec(format);
  if (!m) {
    const shown = JSON.stringify(format.length > 40 ? `${format.slice(0, 40)}…` : format);
    return { ok: false, message: `must be ${JSON.stringify(CHAIN_FORMAT)}; ${shown} is not a Chainwright chain document` };
  }
  const version = Number(m[1]);
  if (version > CURRENT_VERSION) {
    return {
      ok: false,
      message: `is version ${version} of the chain document, newer than this Chainwright reads (up to version ${CURRENT_VERSION}); update Chainwright to open it`,
    };
  }
  if (version < 1) return { ok: false, message: `names version ${version}, which never existed; the first version is 1` };
  return { ok: true, version };
}

export type MigrateResult = { ok: true; doc: unknown; from: number } | { ok: false; errors: ChainIssue[] };

/**
 * Bring a chain document to the current version. Input that is not an object, or whose `format` is
 * missing, is passed through unchanged (from = CURRENT_VERSION) so the schema reports it along with every
 * other problem; a wrong or newer `format` stops here with that one error. Never throws.
 */
export function migrateChain(input: unknown): MigrateResult {
  if (!isPlainObject(input) || input.format === undefined) return { ok: true, doc: input, from: CURRENT_VERSION };
  const reading = readFormat(input.format);
  if (!reading.ok) return { ok: false, errors: [{ path: "format", message: reading.message }] };
  let doc: Doc = input;
  for (let v = reading.version; v < CURRENT_VERSION; v++) {
    const step = MIGRATIONS[v];
    if (!step) return { ok: false, errors: [{ path: "format", message: `cannot be brought forward from version ${v}` }] };
    doc = step(doc);
  }
  return { ok: true, doc, from: reading.version };
}
