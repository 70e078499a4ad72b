/**
 * The chain drawn as cards for print: one card per node in signal order, each with its kind, name and
 * the values its card shows in the workspace, joined by arrows; a node fed from elsewhere than the card
 * before it says where from. Plain markup, no script.
 */
import type { Chain } from "@/lib/chain/types";
import { signalOrder } from "@/lib/handoff/order";
import { STAGE_CATALOG, paramUnit } from "@/lib/store/stage-catalog";
import { formatCompact } from "@/lib/units";

function value(kind: keyof typeof STAGE_CATALOG, v: unknown, key: string): string {
  if (v === null) return "none";
  if (typeof v !== "number") return typeof v === "string" ? v : "—";
  const unit = paramUnit(kind, key);
  return formatCompact(v, unit === "none" ? "none" : unit);
}

export function ChainCards({ chain }: { chain: Chain }) {
  const order = signalOrder(chain);
  const feeds = new Map(chain.edges.map((e) => [e.to, e.from]));
  return (
    <ol className="flex flex-wrap items-stretch gap-y-3" data-testid="report-cards">
      {order.map((n, k) => {
        const spec = STAGE_CATALOG[n.kind];
        const from = feeds.get(n.id);
        const prev = order[k - 1];
        return (
          <li key={n.id} className="report-keep flex items-stretch">
            {k > 0 && (
              <span aria-hidden="true" className="self-center px-1.5 text-graphite-400">
                →
              </span>
            )}
            <div className="w-[9.5rem] rounded-card border border-paper-rule bg-white px-2 py-1.5 text-[11.5px]">
              <p className="font-semibold text-graphite-950">{spec?.title ?? n.kind}</p>
              <p className="num text-graphite-500">{n.label ? `${n.label} · ${n.id}` : n.id}</p>
              {from && prev && from !== prev.id && <p className="text-graphite-500">fed from {from}</p>}
              <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-2">
                {(spec?.cardFields ?? []).map(([key, short]) => (
                  <div key={key} className="contents">
                    <dt className="text-graphite-500">{short}</dt>
                    <dd className="num text-graphite-900">{value(n.kind, (n.params as unknown as Record<string, unknown>)[key], key)}</dd>
                  </div>
                ))}
              </dl>
            </div>
          </li>
        );
      })}
    </ol>
  );
}
