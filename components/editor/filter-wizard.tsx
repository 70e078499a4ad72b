"use client";
/**
 * "Insert a low-pass after this stage": a filter of order 2–8 (Butterworth, Bessel, Chebyshev with a stated
 * ripple) split into sections by the engine, each solved to standard values, inserted as ordinary stages
 * between the selected node and what it fed — one undo step. When a section cannot be solved the engine's
 * sentence says which one and which constraint stops it, and nothing is inserted.
 */
import { useState } from "react";
import { formatQuantity, parseQuantity, type ESeries } from "@/lib/units";
import { designLowpass, FILTER_RESPONSES, SECTION_ORDER_RULE, type FilterResponse, type LowpassDesign, type SecondOrderKind } from "@/lib/engine/filter-design";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import { insertAfter } from "@/lib/store/solve-apply";
import type { DraftNode } from "@/lib/store/draft";
import { Notice } from "@/components/ui/notice";
import { ToolForm, ToolPanel } from "./tool-panel";

const RESPONSE_WORDS: Record<FilterResponse, string> = { butterworth: "Butterworth (flat)", bessel: "Bessel (flat delay)", chebyshev: "Chebyshev (ripple)" };
const KIND_WORDS: Record<string, string> = { sallenKeyLowpass: "Sallen-Key", mfbLowpass: "MFB", lossyIntegrator: "first-order (inverting)" };
const input = "num w-full min-w-0 rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-[13px]";

export function FilterWizard({ node }: { node: DraftNode }) {
  const actions = useEditorActions();
  const doc = useEditor((s) => s.doc);
  const readOnly = useEditor((s) => s.readOnly);
  const pastLength = useEditor((s) => s.past.length);
  const [open, setOpen] = useState(false);
  const [response, setResponse] = useState<FilterResponse>("butterworth");
  const [order, setOrder] = useState("4");
  const [corner, setCorner] = useState("1k");
  const [ripple, setRipple] = useState("1");
  const [gain, setGain] = useState("1");
  const [kind, setKind] = useState<SecondOrderKind>("sallenKeyLowpass");
  const [series, setSeries] = useState<ESeries>("E96");
  const [design, setDesign] = useState<LowpassDesign | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [insertedAt, setInsertedAt] = useState<number | null>(null);

  if (node.kind === "adc" || readOnly) return null;
  if (!open) {
    return (
      <button type="button" onClick={() => setOpen(true)} className="self-start rounded-card px-1.5 py-1 text-[12.5px] text-accent-700 hover:bg-accent-50" data-testid="filter-open">
        Insert a low-pass filter after this…
      </button>
    );
  }
  const run = () => {
    const f = parseQuantity(corner, { unit: "hertz" });
    if (!f.ok || !(f.value > 0)) return setError(`Corner: ${f.ok ? "a positive frequency" : f.error}`);
    const g = Number(gain);
    try {
      setDesign(
        designLowpass({
          response,
          order: Number(order),
          cornerHz: f.value,
          rippleDb: response === "chebyshev" ? Number(ripple) : null,
          gain: g,
          secondOrder: kind,
          parts: { series, tolerance: 0.01 },
        }),
      );
      setError(null);
    } catch (e) {
      setDesign(null);
      setError(e instanceof Error ? e.message : String(e));
    }
  };
  const insert = () => {
    if (!design || design.problem) return;
    const n = design.sections.length;
    const { doc: next, ids } = insertAfter(
      doc,
      node.id,
      design.sections.map((s) => ({
        kind: s.kind,
        label: `Low-pass ${s.position}/${n}`,
        params: { ...(s.params ?? {}), vref: 0 },
      })),
    );
    actions.commit(next);
    void ids;
    setInsertedAt(pastLength + 1);
  };

  return (
    <ToolPanel testId="filter-wizard" label="Insert a low-pass filter" title="Low-pass of order N" onClose={() => setOpen(false)}>
      <ToolForm onSubmit={run}>
        <label className="contents">
          <span className="text-[12.5px] text-graphite-700">Response</span>
          <select name="fw-response" value={response} onChange={(e) => setResponse(e.target.value as FilterResponse)} className={input}>
            {FILTER_RESPONSES.map((r) => (
              <option key={r} value={r}>
                {RESPONSE_WORDS[r]}
              </option>
            ))}
          </select>
        </label>
        <label className="contents">
          <span className="text-[12.5px] text-graphite-700">Order</span>
          <select name="fw-order" value={order} onChange={(e) => setOrder(e.target.value)} className={input}>
            {[2, 3, 4, 5, 6, 7, 8].map((o) => (
              <option key={o}>{o}</option>
            ))}
          </select>
        </label>
        <label className="contents">
          <span className="text-[12.5px] text-graphite-700">{response === "chebyshev" ? "Ripple edge" : "−3 dB corner"}</span>
          <input name="fw-corner" value={corner} onChange={(e) => setCorner(e.target.value)} className={input} />
        </label>
        {response === "chebyshev" && (
          <label className="contents">
            <span className="text-[12.5px] text-graphite-700">Ripple, dB</span>
            <input name="fw-ripple" value={ripple} onChange={(e) => setRipple(e.target.value)} className={input} />
          </label>
        )}
        <label className="contents">
          <span className="text-[12.5px] text-graphite-700">Gain |K|</span>
          <input name="fw-gain" value={gain} onChange={(e) => setGain(e.target.value)} className={input} />
        </label>
        <label className="contents">
          <span className="text-[12.5px] text-graphite-700">Sections</span>
          <select name="fw-kind" value={kind} onChange={(e) => setKind(e.target.value as SecondOrderKind)} className={input}>
            <option value="sallenKeyLowpass">Sallen-Key (unity gain)</option>
            <option value="mfbLowpass">MFB (inverting, with gain)</option>
          </select>
        </label>
        <label className="contents">
          <span className="text-[12.5px] text-graphite-700">Resistors</span>
          <select name="fw-series" value={series} onChange={(e) => setSeries(e.target.value as ESeries)} className={input}>
            {(["E12", "E24", "E96"] as ESeries[]).map((s) => (
              <option key={s}>{s}</option>
            ))}
          </select>
        </label>
        <span />
        <button type="submit" className="justify-self-start rounded-card bg-accent-700 px-3 py-1 text-[12.5px] font-medium text-white hover:bg-accent-800" data-testid="filter-design">
          Design
        </button>
      </ToolForm>
      <p className="text-[11.5px] text-graphite-500">{SECTION_ORDER_RULE} Each section within 1 % of its f0, Q and gain.</p>
      {error && <Notice tone="problem">{error}</Notice>}
      {design?.problem && (
        <Notice tone="caution" title="Cannot build this filter">
          {design.problem}
        </Notice>
      )}
      {design && (
        <ol className="flex flex-col gap-1 text-[12px]" data-testid="filter-sections">
          {design.sections.map((s) => (
            <li key={s.position} className="rounded-card border border-paper-rule bg-paper-raised p-1.5">
              <div className="text-graphite-900">
                {s.position}. {KIND_WORDS[s.kind] ?? s.kind}: f0 {formatQuantity(s.f0, "hertz", 4)}
                {s.q !== null && `, Q ${s.q.toFixed(3)}`}
                {s.gain !== 1 && `, gain ${Number(s.gain.toPrecision(4))}`}
              </div>
              {s.params && (
                <div className="num text-graphite-600">
                  {Object.entries(s.params)
                    .map(([k, v]) => `${k} ${v === null ? "—" : formatQuantity(v, k.startsWith("c") ? "farad" : "ohm", 3)}`)
                    .join(", ")}{" "}
                  (worst error {((s.solve.sets[0]?.worstError ?? 0) * 100).toFixed(2)} %)
                </div>
              )}
            </li>
          ))}
        </ol>
      )}
      {design && !design.problem && (
        <button type="button" onClick={insert} className="self-start rounded-card border border-paper-rule px-2 py-0.5 text-[12.5px] text-accent-700 hover:bg-accent-50" data-testid="filter-insert">
          Insert {design.sections.length} stages
        </button>
      )}
      {insertedAt !== null && insertedAt === pastLength && (
        <button
          type="button"
          onClick={() => {
            actions.undo();
            setInsertedAt(null);
          }}
          className="self-start rounded-card px-2 py-0.5 text-[12.5px] text-accent-700 hover:bg-accent-50"
          data-testid="filter-undo"
        >
          Undo the insertion
        </button>
      )}
    </ToolPanel>
  );
}
