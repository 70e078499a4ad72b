"use client";
/**
 * Standard values: move every resistor and capacitor of the analysed chain (or one of them) to the nearest
 * E24 or E96 value, preview what changes (values, each stage's gain, corner or f0, Q, margin and status,
 * all from the engine's snapPlan), then apply it as one edit, which Undo takes back.
 */
import { useState } from "react";
import type { DraftDoc } from "@/lib/store/draft";
import { snapPlan, type SnapPlan, type SnapSeries } from "@/lib/engine/snap";
import { spreadParts } from "@/lib/engine/spread";
import { useEditor, useEditorActions, useEditorStoreApi } from "@/lib/store/editor-context";
import { fmt, fmtVolts } from "@/components/editor/format";

const gain = (g: number | null) => (g === null ? "—" : fmt(g, "none", 4).replace("-", "−"));

export function SnapPanel() {
  const chain = useEditor((s) => s.live?.chain ?? null);
  const readOnly = useEditor((s) => s.readOnly);
  const store = useEditorStoreApi();
  const actions = useEditorActions();
  const [series, setSeries] = useState<SnapSeries>("E24");
  const [scope, setScope] = useState("");
  const [plan, setPlan] = useState<{ plan: SnapPlan; on: typeof chain } | null>(null);
  const [applied, setApplied] = useState<string | null>(null);
  if (!chain) return null;
  const parts = spreadParts(chain);
  const current = plan && plan.on === chain ? plan.plan : null;

  const preview = () => {
    setApplied(null);
    setPlan({ plan: snapPlan(chain, series, scope || undefined), on: chain });
  };
  const apply = () => {
    if (!current) return;
    const doc = store.getState().doc;
    const byNode = new Map<string, Record<string, number>>();
    for (const c of current.changes) byNode.set(c.nodeId, { ...(byNode.get(c.nodeId) ?? {}), [c.param]: c.to });
    const next: DraftDoc = { ...doc, nodes: doc.nodes.map((n) => (byNode.has(n.id) ? { ...n, params: { ...n.params, ...byNode.get(n.id) } } : n)) };
    actions.commit(next);
    setApplied(`${current.changes.length} values set to ${current.series}. Undo (Ctrl Z) takes them back.`);
    setPlan(null);
  };

  return (
    <details className="rounded-card border border-paper-rule p-2" data-testid="snap-panel">
      <summary className="cursor-pointer font-medium">Standard values (E24 / E96)</summary>
      <div className="mt-1 flex flex-wrap items-end gap-3">
        <label className="flex flex-col gap-0.5">
          <span className="text-[11.5px] text-graphite-700">Series</span>
          <select value={series} onChange={(e) => setSeries(e.target.value as SnapSeries)} className="rounded-card border border-paper-rule px-1" data-testid="snap-series">
            <option value="E24">E24</option>
            <option value="E96">E96</option>
          </select>
        </label>
        <label className="flex flex-col gap-0.5">
          <span className="text-[11.5px] text-graphite-700">Which parts</span>
          <select value={scope} onChange={(e) => setScope(e.target.value)} className="rounded-card border border-paper-rule px-1" data-testid="snap-scope">
            <option value="">every resistor and capacitor</option>
            {parts.map((p) => (
              <option key={p.key} value={p.key}>
                {p.key} ({fmt(p.nominal, p.type === "resistor" ? "ohm" : "farad", 4)})
              </option>
            ))}
          </select>
        </label>
        <button type="button" onClick={preview} className="rounded-card border border-paper-rule px-2.5 py-1 hover:bg-paper-sunk" data-testid="snap-preview">
          Preview
        </button>
        <button type="button" onClick={apply} disabled={!current || current.changes.length === 0 || readOnly} className="rounded-card bg-accent-700 px-2.5 py-1 font-medium text-white hover:bg-accent-800 disabled:bg-graphite-300" data-testid="snap-apply">
          Apply
        </button>
        {applied && <span className="text-status-ok" data-testid="snap-applied">{applied}</span>}
      </div>
      {current && current.changes.length === 0 && <p className="mt-1 text-graphite-700">Every value is already in {current.series}.</p>}
      {current && current.changes.length > 0 && (
        <div className="mt-2 grid grid-cols-2 gap-3">
          <table className="w-full border-collapse text-[12px]" data-testid="snap-changes">
            <caption className="text-left font-medium">Values</caption>
            <thead>
              <tr className="text-left text-graphite-700">
                <th className="px-2 font-medium">Part</th>
                <th className="px-2 font-medium">Now</th>
                <th className="px-2 font-medium">{current.series}</th>
                <th className="px-2 font-medium">Change</th>
              </tr>
            </thead>
            <tbody>
              {current.changes.map((c) => {
                const unit = c.type === "resistor" ? "ohm" : "farad";
                return (
                  <tr key={c.key} className="num border-b border-paper-rule/60">
                    <td className="px-2">{c.key}</td>
                    <td className="px-2">{fmt(c.from, unit, 4)}</td>
                    <td className="px-2">{fmt(c.to, unit, 3)}</td>
                    <td className="px-2">{`${(c.change * 100).toFixed(2)} %`.replace("-", "−")}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          <table className="w-full border-collapse text-[12px]" data-testid="snap-figures">
            <caption className="text-left font-medium">Figures, now → after</caption>
            <thead>
              <tr className="text-left text-graphite-700">
                <th className="px-2 font-medium">Stage</th>
                <th className="px-2 font-medium">Gain</th>
                <th className="px-2 font-medium">f0</th>
                <th className="px-2 font-medium">Q</th>
                <th className="px-2 font-medium">Margin</th>
                <th className="px-2 font-medium">Status</th>
              </tr>
            </thead>
            <tbody>
              {current.stages.map((s) => (
                <tr key={s.id} className="num border-b border-paper-rule/60">
                  <td className="px-2 font-sans">{s.id}</td>
                  <td className="px-2">{gain(s.before.dcGain)} → {gain(s.after.dcGain)}</td>
                  <td className="px-2">{fmt(s.before.f0, "hertz", 4)} → {fmt(s.after.f0, "hertz", 4)}</td>
                  <td className="px-2">{s.before.q === null ? "—" : `${s.before.q.toFixed(4)} → ${s.after.q?.toFixed(4)}`}</td>
                  <td className="px-2">{s.before.margin === null ? "—" : `${fmtVolts(s.before.margin)} → ${fmtVolts(s.after.margin)}`}</td>
                  <td className={`px-2 font-sans ${s.after.status === "clip" ? "text-status-clip" : ""}`}>{s.before.status ?? "—"} → {s.after.status ?? "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </details>
  );
}
