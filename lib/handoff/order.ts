/**
 * Node order for every hand-off: the signal's way through the chain (breadth first from the source along
 * the edges, siblings in document order), then anything not reached, in document order. Reference
 * designators and test points are numbered in this order, so R1 sits nearest the sensor.
 */
import type { Chain, ChainNode } from "../chain/types";

export function signalOrder(chain: Chain): ChainNode[] {
  const byId = new Map(chain.nodes.map((n) => [n.id, n]));
  const hasInput = new Set(chain.edges.map((e) => e.to));
  const queue = chain.nodes.filter((n) => !hasInput.has(n.id));
  const seen = new Set<string>();
  const out: ChainNode[] = [];
  while (queue.length) {
    const n = queue.shift()!;
    if (seen.has(n.id)) continue;
    seen.add(n.id);
    out.push(n);
    for (const e of chain.edges) if (e.from === n.id && !seen.has(e.to)) queue.push(byId.get(e.to)!);
  }
  for (const n of chain.nodes) if (!seen.has(n.id)) out.push(n);
  return out;
}

/** Nodes with no input feed the chain (the source kinds); their params describe the sensor, not parts. */
export function isFeed(chain: Chain, node: ChainNode): boolean {
  return !chain.edges.some((e) => e.to === node.id);
}

export const nodeTitle = (node: ChainNode): string => (node.label ? `${node.label} (${node.id})` : node.id);

/** |z| and its angle in degrees wrapped to (−180, 180]; both null where z is not finite or zero. */
export function gainPhase(re: number, im: number): { gain: number | null; phaseDeg: number | null } {
  const gain = Math.hypot(re, im);
  if (!Number.isFinite(gain)) return { gain: null, phaseDeg: null };
  if (gain === 0) return { gain: 0, phaseDeg: null };
  const d = (Math.atan2(im, re) * 180) / Math.PI;
  return { gain, phaseDeg: d <= -180 ? d + 360 : d };
}
