/** What a dock tab shows while its code loads (the tabs other than the response load on first opening). */
export function DockLoading() {
  return <p className="p-3 text-[12.5px] text-graphite-500">Loading…</p>;
}
