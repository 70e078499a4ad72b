"use client";
/**
 * The "Gain plan" dock tab: the gain-staging advisor for the path into a converter. It shows the present
 * split beside the advised one (gain and reference per stage, headroom, converter range use, noise), says
 * plainly what stops the target when it cannot be met, and applies the advice as one undo step.
 */
import { useMemo, useState } from "react";
import type { Chain } from "@/lib/chain/types";
import { adviseGainStaging, type GainAdvice, type SplitFigures } from "@/lib/engine/gain-staging";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import { applyEdits } from "@/lib/store/solve-apply";
import { Notice } from "@/components/ui/notice";
import { fmt, fmtVolts } from "./format";

const share = (x: number | null) => (x === null ? "—" : `${(x * 100).toFixed(1)} %`);
const gainText = (g: number | null) => (g === null ? "—" : Number(g.toPrecision(4)).toString());
const noiseText = (v: number | null) => (v === null ? "—" : fmt(v, "volt"));

function adcIds(chain: Chain | null): { id: string; label: string }[] {
  if (!chain) return [];
  return chain.nodes.filter((n) => n.kind === "adc").map((n) => ({ id: n.id, label: n.label ?? n.id }));
}

export function GainPlanPanel() {
  const chain = useEditor((s) => s.live?.chain ?? null);
  const doc = useEditor((s) => s.doc);
  const readOnly = useEditor((s) => s.readOnly);
  const pastLength = useEditor((s) => s.past.length);
  const actions = useEditorActions();
  const adcs = useMemo(() => adcIds(chain), [chain]);
  const [adcId, setAdcId] = useState<string>("");
  const [margin, setMargin] = useState("10");
  const [target, setTarget] = useState("70");
  const [advice, setAdvice] = useState<GainAdvice | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [appliedAt, setAppliedAt] = useState<number | null>(null);

  if (!chain || adcs.length === 0) {
    return <p className="p-3 text-[12.5px] text-graphite-500" data-testid="gain-plan">The gain plan needs a complete path from the source to a converter.</p>;
  }
  const plan = () => {
    const m = Number(margin) / 100;
    const t = Number(target) / 100;
    if (!(m >= 0 && m < 0.5)) return setError("Margin: a percentage from 0 to under 50.");
    if (!(t > 0 && t <= 1)) return setError("Target range use: a percentage above 0 and at most 100.");
    try {
      setAdvice(adviseGainStaging(chain, { adcId: adcId || adcs[0].id, margin: m, targetRangeUse: t }));
      setError(null);
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    }
  };
  const apply = () => {
    if (!advice) return;
    actions.commit(applyEdits(doc, advice.edits));
    setAppliedAt(pastLength + 1);
  };

  return (
    <div className="flex h-full flex-col gap-2 overflow-auto p-3 text-[12.5px]" data-testid="gain-plan">
      <form
        className="flex flex-wrap items-end gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          plan();
        }}
      >
        {adcs.length > 1 && (
          <label className="flex flex-col gap-0.5">
            <span className="text-graphite-600">Converter</span>
            <select value={adcId || adcs[0].id} onChange={(e) => setAdcId(e.target.value)} className="rounded-card border border-paper-rule bg-paper-raised px-2 py-1">
              {adcs.map((a) => (
                <option key={a.id} value={a.id}>
                  {a.label}
                </option>
              ))}
            </select>
          </label>
        )}
        <label className="flex flex-col gap-0.5">
          <span className="text-graphite-600">Margin to each rail, % of span</span>
          <input name="plan-margin" value={margin} onChange={(e) => setMargin(e.target.value)} className="num w-24 rounded-card border border-paper-rule bg-paper-raised px-2 py-1" />
        </label>
        <label className="flex flex-col gap-0.5">
          <span className="text-graphite-600">Target range use, %</span>
          <input name="plan-target" value={target} onChange={(e) => setTarget(e.target.value)} className="num w-24 rounded-card border border-paper-rule bg-paper-raised px-2 py-1" />
        </label>
        <button type="submit" className="rounded-card bg-accent-700 px-3 py-1 font-medium text-white hover:bg-accent-800" data-testid="plan-run">
          Plan the gain
        </button>
        {advice && advice.edits.length > 0 && !readOnly && (
          <button type="button" onClick={apply} className="rounded-card border border-paper-rule px-3 py-1 text-accent-700 hover:bg-accent-50" data-testid="plan-apply">
            Apply the advice
          </button>
        )}
        {appliedAt !== null && appliedAt === pastLength && (
          <button
            type="button"
            onClick={() => {
              actions.undo();
              setAppliedAt(null);
            }}
            className="rounded-card px-3 py-1 text-accent-700 hover:bg-accent-50"
            data-testid="plan-undo"
          >
            Undo the advice
          </button>
        )}
      </form>
      <p className="text-[11.5px] text-graphite-500">
        Rule (common practice): gain as early as the rails allow, every stage and the converter kept the margin away from its limits, references moved to centre each output; the converter is filled up to its margin.
      </p>
      {error && <Notice tone="problem">{error}</Notice>}
      {advice && <AdviceView advice={advice} />}
    </div>
  );
}

function AdviceView({ advice }: { advice: GainAdvice }) {
  const rows = advice.current.stages.map((c, i) => ({ c, a: advice.advised.stages[i] }));
  const edited = new Map(advice.edits.map((e) => [e.id, e.summary]));
  return (
    <div className="flex flex-col gap-2">
      {advice.problem ? (
        <Notice tone="caution" title="Target not met">
          {advice.problem}
        </Notice>
      ) : (
        <Notice tone="info">{advice.edits.length ? `${advice.edits.length} stage${advice.edits.length > 1 ? "s" : ""} to change; every stage clear of its margin.` : "The present split already meets the margin and the target."}</Notice>
      )}
      {advice.notes.map((n) => (
        <Notice key={n} tone="info">
          {n}
        </Notice>
      ))}
      <table className="w-full text-[12px]" data-testid="plan-table">
        <thead className="text-left text-graphite-500">
          <tr>
            <th className="font-medium">Stage</th>
            <th className="font-medium">Gain now → advised</th>
            <th className="font-medium">Reference now → advised</th>
            <th className="font-medium">Spare now → advised</th>
            <th className="font-medium">Status</th>
            <th className="font-medium">Change</th>
          </tr>
        </thead>
        <tbody className="num">
          {rows.map(({ c, a }) => (
            <tr key={c.id} className="border-t border-paper-rule">
              <td className="font-sans">{c.label}</td>
              <td>
                {gainText(c.gain)} → {gainText(a.gain)}
              </td>
              <td>
                {c.vref === null ? "—" : fmtVolts(c.vref)} → {a.vref === null ? "—" : fmtVolts(a.vref)}
              </td>
              <td>
                {c.margins ? fmtVolts(Math.min(c.margins.low, c.margins.high)) : "—"} → {a.margins ? fmtVolts(Math.min(a.margins.low, a.margins.high)) : "—"}
              </td>
              <td>
                {c.status ?? "—"} → {a.status ?? "—"}
              </td>
              <td className="font-sans text-graphite-600">{edited.get(c.id) ?? ""}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <Summary now={advice.current} next={advice.advised} />
    </div>
  );
}

function Summary({ now, next }: { now: SplitFigures; next: SplitFigures }) {
  const item = (name: string, a: string, b: string) => (
    <div className="contents">
      <dt className="text-graphite-500">{name}</dt>
      <dd className="num">
        {a} → {b}
      </dd>
    </div>
  );
  return (
    <dl className="grid grid-cols-[12rem_1fr] gap-y-0.5 text-[12px]" data-testid="plan-summary">
      {item("Converter range used", share(now.rangeUse), share(next.rangeUse))}
      {item("Clipping", now.clips.length ? now.clips.join(", ") : "none", next.clips.length ? next.clips.join(", ") : "none")}
      {item("Least spare (share of span)", share(now.worstHeadroom), share(next.worstHeadroom))}
      {item("Noise at the converter", noiseText(now.noiseRms), noiseText(next.noiseRms))}
      {item("Noise referred to the source", noiseText(now.inputNoiseRms), noiseText(next.inputNoiseRms))}
      {item("SNR", now.snrDb === null ? "—" : `${now.snrDb.toFixed(1)} dB`, next.snrDb === null ? "—" : `${next.snrDb.toFixed(1)} dB`)}
    </dl>
  );
}
