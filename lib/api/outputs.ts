import "server-only";
/**
 * What the hand-off routes and pages share: the chain checked complete and analysed, the current
 * revision, the query words they take, and file downloads. The builders themselves are in lib/handoff.
 */
import { currentRevision } from "@/db/queries/history";
import type { ChainRow } from "@/db/schema";
import { validateChain } from "@/lib/chain/schema";
import type { AnalysisResult, Chain } from "@/lib/chain/types";
import { analyzeChain } from "@/lib/engine";
import { TEST_FREQUENCY_LIMIT, defaultTestFrequencies } from "@/lib/handoff";
import { parseQuantity } from "@/lib/units";
import { ApiError, ValidationError } from "./errors";

export interface ChainOutputs {
  chain: Chain;
  result: AnalysisResult;
  revision: number | null;
}

/**
 * The chain as a complete document with its analysis, or 409 listing what keeps it from being complete
 * (hand-offs are only made from complete chains: a bill of materials of half a design would mislead).
 */
export function outputsOf(row: ChainRow): ChainOutputs {
  const v = validateChain(JSON.parse(row.document) as unknown);
  if (!v.ok) {
    throw new ApiError(409, "The chain is not complete yet, so there is nothing to hand off; finish it in the workspace first.", {
      errors: v.errors.map((e) => ({ path: e.path ? `document.${e.path}` : "document", message: e.message })),
    });
  }
  return { chain: v.chain, result: analyzeChain(v.chain), revision: currentRevision(row.id)?.number ?? null };
}

/** The same for pages: the reasons instead of a thrown answer. */
export function outputsOrReasons(row: ChainRow): { ok: true; outputs: ChainOutputs } | { ok: false; reasons: string[] } {
  try {
    return { ok: true, outputs: outputsOf(row) };
  } catch (e) {
    if (e instanceof ApiError && e.status === 409) {
      const errors = (e.extra.errors as { path: string; message: string }[]) ?? [];
      return { ok: false, reasons: errors.map((x) => `${x.path}: ${x.message}`) };
    }
    throw e;
  }
}

/**
 * Test frequencies from a query value such as `2,63,2k` (engineering notation, hertz), at most
 * TEST_FREQUENCY_LIMIT, each positive; empty or absent gives the chain's defaults. 400 names the item.
 */
export function readTestFrequencies(raw: string | null, chain: Chain, field = "f"): number[] {
  if (raw === null || raw.trim() === "") return defaultTestFrequencies(chain);
  const items = raw.split(/[,;\s]+/).filter(Boolean);
  if (items.length > TEST_FREQUENCY_LIMIT) {
    throw new ValidationError([{ path: field, message: `takes at most ${TEST_FREQUENCY_LIMIT} test frequencies (found ${items.length})` }]);
  }
  return items.map((text, i) => {
    const q = parseQuantity(text, { unit: "hertz" });
    if (!q.ok || !(q.value > 0) || q.value > 1e12) {
      throw new ValidationError([{ path: `${field}[${i}]`, message: `must be a positive frequency in hertz such as 100 or 2k (found ${JSON.stringify(text.slice(0, 24))})` }]);
    }
    return q.value;
  });
}

/** One of a fixed set of words from the query, else 400 naming the field. */
export function readChoice<T extends string>(raw: string | null, field: string, choices: readonly T[], dflt: T): T {
  if (raw === null || raw === "") return dflt;
  if ((choices as readonly string[]).includes(raw)) return raw as T;
  throw new ValidationError([{ path: field, message: `must be one of ${choices.join(", ")} (found ${JSON.stringify(raw.slice(0, 24))})` }]);
}

/** A file name from a chain name: letters and digits, dashes between. */
export function fileStem(name: string): string {
  return name.replace(/[^A-Za-z0-9]+/g, "-").replace(/^-|-$/g, "").toLowerCase().slice(0, 60) || "chain";
}

export function download(body: string, type: string, filename: string): Response {
  return new Response(body, {
    headers: { "content-type": `${type}; charset=utf-8`, "content-disposition": `attachment; filename="${filename}"`, "cache-control": "no-store" },
  });
}
