"use client";
/**
 * "Solve" under a stage's form: the user states targets (gain, f0 or corner, Q, an input-impedance floor,
 * a capacitor ceiling, the resistor series), the engine's solver returns ranked standard-value sets with
 * their achieved figures, errors and sensitivities, and "Apply" writes one set into the stage as one undo
 * step. When nothing fits, the solver's sentence naming the constraint is shown instead.
 */
import { useMemo, useState } from "react";
import { parseQuantity, formatQuantity, type ESeries, type QuantityUnit } from "@/lib/units";
import { SOLVE_TARGETS, SOLVED_PARAMS, figuresOf, isSolvableKind, solveStage, type SolveResult, type SolvableKind, type SolvedParams, type SolvedSet } from "@/lib/engine/solve";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import { applyParams } from "@/lib/store/solve-apply";
import type { DraftNode } from "@/lib/store/draft";
import { Notice } from "@/components/ui/notice";
import { ToolForm, ToolPanel } from "./tool-panel";

type FieldKey = "gain" | "f0" | "q" | "minInputImpedance" | "maxCapacitance";
const FIELDS: { key: FieldKey; label: string; unit: QuantityUnit; always?: boolean }[] = [
  { key: "gain", label: "Gain |K|", unit: "none" },
  { key: "f0", label: "f0 / corner", unit: "hertz" },
  { key: "q", label: "Q", unit: "none" },
  { key: "minInputImpedance", label: "Zin at least", unit: "ohm", always: true },
  { key: "maxCapacitance", label: "C at most", unit: "farad", always: true },
];
const SERIES: ESeries[] = ["E12", "E24", "E96"];

const pct = (e: number | undefined) => (e === undefined ? "—" : `${e >= 0 ? "+" : ""}${(e * 100).toFixed(2)} %`);
const valueText = (k: string, v: number | null) => (v === null ? "none" : formatQuantity(v, k.startsWith("c") ? "farad" : "ohm", 3));

function currentParams(node: DraftNode, kind: SolvableKind): SolvedParams | null {
  const out: SolvedParams = {};
  for (const k of SOLVED_PARAMS[kind]) {
    const v = node.params[k];
    if (typeof v === "number") out[k] = v;
    else if (v === null || (v === undefined && (k === "rf" || k === "rg"))) out[k] = null;
    else return null;
  }
  return out;
}

export function SolvePanel({ node }: { node: DraftNode }) {
  if (!isSolvableKind(node.kind)) return null;
  return <SolveForm key={node.id} node={node} kind={node.kind} />;
}

function SolveForm({ node, kind }: { node: DraftNode; kind: SolvableKind }) {
  const actions = useEditorActions();
  const readOnly = useEditor((s) => s.readOnly);
  const doc = useEditor((s) => s.doc);
  const pastLength = useEditor((s) => s.past.length);
  const [open, setOpen] = useState(false);
  const needs = SOLVE_TARGETS[kind];
  const start = useMemo(() => {
    const p = currentParams(node, kind);
    const fig = p ? figuresOf(kind, p) : null;
    const t: Record<FieldKey, string> = { gain: "", f0: "", q: "", minInputImpedance: "", maxCapacitance: "1µ" };
    if (fig?.gain != null) t.gain = String(Number(fig.gain.toPrecision(4)));
    if (fig?.f0 != null) t.f0 = formatQuantity(fig.f0, "hertz", 4);
    if (fig?.q != null) t.q = String(Number(fig.q.toPrecision(4)));
    return t;
    // the starting targets are read once per opened form
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [node.id, open]);
  const [text, setText] = useState<Record<FieldKey, string> | null>(null);
  const [series, setSeries] = useState<ESeries>("E24");
  const [capSeries, setCapSeries] = useState<ESeries>("E12");
  const [tolerance, setTolerance] = useState("2");
  const [result, setResult] = useState<SolveResult | null>(null);
  const [fieldError, setFieldError] = useState<string | null>(null);
  const [applied, setApplied] = useState<{ at: number; summary: string } | null>(null);
  const values = text ?? start;

  const solve = () => {
    const t: Record<string, number | null> = {};
    for (const f of FIELDS) {
      if (!f.always && !needs.includes(f.key as "gain")) continue;
      const raw = values[f.key].trim();
      if (raw === "") {
        t[f.key] = null;
        continue;
      }
      const r = parseQuantity(raw, { unit: f.unit });
      if (!r.ok || !(r.value > 0)) {
        setFieldError(`${f.label}: ${r.ok ? "a positive number" : r.error}`);
        setResult(null);
        return;
      }
      t[f.key] = r.value;
    }
    const tol = Number(tolerance);
    if (!(tol > 0 && tol <= 50)) {
      setFieldError("Allowed error: a percentage above 0 and at most 50");
      setResult(null);
      return;
    }
    setFieldError(null);
    setResult(solveStage(kind, { ...t, series, capacitorSeries: capSeries, tolerance: tol / 100, limit: 6 }));
  };

  const apply = (set: SolvedSet) => {
    actions.commit(applyParams(doc, node.id, set.params));
    setApplied({ at: pastLength + 1, summary: Object.entries(set.params).map(([k, v]) => `${k} ${valueText(k, v)}`).join(", ") });
  };

  if (!open) {
    return (
      <button type="button" onClick={() => setOpen(true)} disabled={readOnly} className="self-start rounded-card px-1.5 py-1 text-[12.5px] text-accent-700 hover:bg-accent-50 disabled:text-graphite-400" data-testid="solve-open">
        Solve from targets…
      </button>
    );
  }
  return (
    <ToolPanel testId="solve-panel" label="Solve from targets" title="Solve from targets" onClose={() => setOpen(false)}>
      <ToolForm onSubmit={solve}>
        {FIELDS.filter((f) => f.always || needs.includes(f.key as "gain")).map((f) => (
          <label key={f.key} className="contents">
            <span className="text-[12.5px] text-graphite-700">{f.label}</span>
            <input
              name={`solve-${f.key}`}
              value={values[f.key]}
              onChange={(e) => setText({ ...values, [f.key]: e.target.value })}
              placeholder={f.always ? "no limit" : "required"}
              className="num w-full min-w-0 rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-[13px]"
            />
          </label>
        ))}
        <label className="contents">
          <span className="text-[12.5px] text-graphite-700">Resistors</span>
          <select name="solve-series" value={series} onChange={(e) => setSeries(e.target.value as ESeries)} className="rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-[13px]">
            {SERIES.map((s) => (
              <option key={s}>{s}</option>
            ))}
          </select>
        </label>
        <label className="contents">
          <span className="text-[12.5px] text-graphite-700">Capacitors</span>
          <select name="solve-cap-series" value={capSeries} onChange={(e) => setCapSeries(e.target.value as ESeries)} className="rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-[13px]">
            {(["E6", "E12", "E24"] as ESeries[]).map((s) => (
              <option key={s}>{s}</option>
            ))}
          </select>
        </label>
        <label className="contents">
          <span className="text-[12.5px] text-graphite-700">Allowed error %</span>
          <input name="solve-tolerance" value={tolerance} onChange={(e) => setTolerance(e.target.value)} className="num w-full rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-[13px]" />
        </label>
        <span />
        <button type="submit" className="justify-self-start rounded-card bg-accent-700 px-3 py-1 text-[12.5px] font-medium text-white hover:bg-accent-800" data-testid="solve-run">
          Solve
        </button>
      </ToolForm>
      <p className="text-[11.5px] text-graphite-500">Capacitors from 100 pF, resistors 1 kΩ to 1 MΩ; ranked by error, then by sensitivity (Σ|S|, lower is more robust to part tolerances).</p>
      {fieldError && <Notice tone="problem">{fieldError}</Notice>}
      {applied && (
        <div className="flex items-center gap-2 text-[12px] text-graphite-700" data-testid="solve-applied">
          <span>Applied: {applied.summary}.</span>
          {pastLength === applied.at && (
            <button
              type="button"
              onClick={() => {
                actions.undo();
                setApplied(null);
              }}
              className="rounded-card px-1.5 py-0.5 text-accent-700 hover:bg-accent-50"
              data-testid="solve-undo"
            >
              Undo
            </button>
          )}
        </div>
      )}
      {result && (result.problem ? <Notice tone="caution" title="Targets not met">{result.problem}</Notice> : null)}
      {result && (result.sets.length > 0 || result.nearest.length > 0) && (
        <ol className="flex flex-col gap-1.5" data-testid="solve-results">
          {(result.sets.length ? result.sets : result.nearest).map((s, i) => (
            <li key={i} className="rounded-card border border-paper-rule bg-paper-raised p-2 text-[12px]" data-testid="solve-set">
              <div className="num flex flex-wrap gap-x-2 text-graphite-950">
                {Object.entries(s.params).map(([k, v]) => (
                  <span key={k}>
                    {k} {valueText(k, v)}
                  </span>
                ))}
              </div>
              <div className="num mt-0.5 flex flex-wrap gap-x-3 text-graphite-600">
                {needs.map((y) => (
                  <span key={y}>
                    {y === "q" ? "Q" : y} {y === "f0" ? formatQuantity(s.achieved.f0 ?? NaN, "hertz", 4) : Number((s.achieved[y] ?? NaN).toPrecision(4))} ({pct(s.errors[y])})
                  </span>
                ))}
                {s.achieved.inputImpedance != null && <span>Zin ≥ {formatQuantity(s.achieved.inputImpedance, "ohm", 3)}</span>}
                {s.meets && <span title="sum of |∂ln y/∂ln x| over the targets and parts">Σ|S| {s.sensitivityTotal.toFixed(2)}</span>}
              </div>
              {s.meets && (
                <button type="button" onClick={() => apply(s)} disabled={readOnly} className="mt-1 rounded-card border border-paper-rule px-2 py-0.5 text-[12px] text-accent-700 hover:bg-accent-50" data-testid="solve-apply">
                  Apply{i === 0 ? " best" : ""}
                </button>
              )}
            </li>
          ))}
        </ol>
      )}
    </ToolPanel>
  );
}
