/** Demo chains of db/seed-data as validated chains with their engine results, for the hand-off tests. */
import { ballastPressure, hullVibration, turbidityPhotodiode } from "@/db/seed-data/chains";
import { validateChain } from "@/lib/chain/schema";
import type { Chain } from "@/lib/chain/types";
import { analyzeChain } from "@/lib/engine";

export function complete(doc: unknown): Chain {
  const v = validateChain(doc);
  if (!v.ok) throw new Error(`demo chain refused: ${JSON.stringify(v.errors)}`);
  return v.chain;
}

export const demo = () => ({ hull: complete(hullVibration), ballast: complete(ballastPressure), turbidity: complete(turbidityPhotodiode) });

export const analysed = (chain: Chain) => ({ chain, result: analyzeChain(chain) });

/** A copy of a chain with one node's params changed. */
export function withParams(chain: Chain, nodeId: string, params: Record<string, unknown>): Chain {
  const copy = structuredClone(chain);
  const node = copy.nodes.find((n) => n.id === nodeId)!;
  node.params = { ...node.params, ...params } as never;
  return complete(copy);
}
