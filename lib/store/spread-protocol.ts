/** Messages between the workspace's Spread panel and its worker (spread.worker.ts). */
import type { Chain } from "@/lib/chain/types";
import type { SpreadOptions, SpreadResult } from "@/lib/engine/spread";

export type SpreadRequest = { type: "start"; id: number; chain: Chain; opts: SpreadOptions } | { type: "cancel"; id: number };

export type SpreadMessage =
  /** `result` is the partial result when one is due (every `partialEveryMs`), else absent */
  | { type: "progress"; id: number; done: number; total: number; result?: SpreadResult }
  | { type: "done"; id: number; result: SpreadResult; ms: number }
  | { type: "cancelled"; id: number; done: number; total: number }
  | { type: "error"; id: number; message: string };
