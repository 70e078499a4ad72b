import { ChainList } from "@/components/workspace/chain-list";

export default function Loading() {
  return (
    <div className="flex flex-col gap-5" aria-busy="true">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">Chains</h1>
        <p className="mt-1 text-sm text-graphite-500">Loading…</p>
      </div>
      <ChainList chains={null} />
    </div>
  );
}
