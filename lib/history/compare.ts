import "server-only";
import { getRevision } from "@/db/queries/history";
import type { Revision } from "@/db/schema";
import { ApiError } from "@/lib/api/errors";
import { diffChains, hasChanges } from "./diff";
import { diffKeyResults, keyResults } from "./key-results";

/** Two revisions of one chain compared: values of stages and settings, then the key results. */
export function compareRevisions(chainId: string, fromId: string, toId: string) {
  const from = getRevision(chainId, fromId);
  const to = getRevision(chainId, toId);
  if (!from || !to) throw new ApiError(404, "No such revision of this chain.");
  return compareDocuments(from, to);
}

export function compareDocuments(from: Pick<Revision, "id" | "number" | "document">, to: Pick<Revision, "id" | "number" | "document">) {
  const a = JSON.parse(from.document) as unknown;
  const b = JSON.parse(to.document) as unknown;
  const diff = diffChains(a, b);
  const ka = keyResults(a);
  const kb = keyResults(b);
  return {
    from: { id: from.id, number: from.number },
    to: { id: to.id, number: to.number },
    changed: hasChanges(diff),
    diff,
    keyResults: { from: ka, to: kb, changes: diffKeyResults(ka, kb) },
  };
}
