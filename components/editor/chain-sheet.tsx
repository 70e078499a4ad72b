"use client";
/** The inspector with nothing selected: the chain's name, the plotted frequency range, and its op-amp models. */
import { useState } from "react";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import { readNumber, valueToText, type FieldRead } from "./field-read";
import { QuantityInput } from "./quantity-input";
import { PartsPanel } from "./parts-panel";
import type { NumberRule } from "@/lib/chain/fields";

const SWEEP: { key: "fMin" | "fMax" | "points"; label: string; rule: NumberRule; fallback: number }[] = [
  { key: "fMin", label: "From", rule: { unit: "hertz", bound: "positive" }, fallback: 0.1 },
  { key: "fMax", label: "To", rule: { unit: "hertz", bound: "positive" }, fallback: 1e6 },
  { key: "points", label: "Points", rule: { unit: "none", bound: "positive", integer: { min: 2, max: 20000 } }, fallback: 600 },
];

/** Read a sweep field, and hold fMin below fMax (the schema refuses the draft otherwise). */
function orderedRead(key: string, texts: Record<string, string>): FieldRead {
  const f = SWEEP.find((x) => x.key === key)!;
  const r = readNumber(texts[key] ?? "", f.rule, false);
  if (r.state !== "ok" || key === "points") return r;
  const other = SWEEP.find((x) => x.key === (key === "fMin" ? "fMax" : "fMin"))!;
  const o = readNumber(texts[other.key] ?? "", other.rule, false);
  const lo = key === "fMin" ? r.value : o.state === "ok" ? o.value : other.fallback;
  const hi = key === "fMax" ? r.value : o.state === "ok" ? o.value : other.fallback;
  if (lo !== null && hi !== null && !(lo < hi)) return { state: "error", message: "the range must start below where it ends" };
  return r;
}

export function ChainSheet({ readOnly }: { readOnly: boolean }) {
  const name = useEditor((s) => s.doc.name);
  const analysis = useEditor((s) => s.doc.analysis);
  const actions = useEditorActions();
  const [nameText, setNameText] = useState(name);
  const [texts, setTexts] = useState(() =>
    Object.fromEntries(SWEEP.map((f) => [f.key, valueToText(analysis?.[f.key] ?? f.fallback, f.key === "points" ? "none" : "hertz")])),
  );
  const nameProblem = nameText.trim() === "" ? "a chain needs a name" : nameText.length > 200 ? "at most 200 characters" : null;
  return (
    <div className="flex flex-col gap-3" data-testid="chain-sheet">
      <fieldset disabled={readOnly} className="flex flex-col gap-1.5">
        <h2 className="text-[15px] font-semibold text-graphite-950">Chain</h2>
        <div className="grid grid-cols-[5.5rem_1fr] items-center gap-x-2">
          <label htmlFor="chain-name" className="text-[12.5px] text-graphite-700">
            Name
          </label>
          <input
            id="chain-name"
            value={nameText}
            aria-invalid={nameProblem ? true : undefined}
            onChange={(e) => {
              setNameText(e.target.value);
              actions.rename(e.target.value);
            }}
            className="rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-[13px]"
          />
        </div>
        {nameProblem && <p className="pl-[6rem] text-[11.5px] text-status-clip">■ {nameProblem}</p>}
        <h3 className="mt-2 text-[12px] font-semibold uppercase tracking-wide text-graphite-500">Response plot range</h3>
        {SWEEP.map((f) => {
          const read = orderedRead(f.key, texts);
          return (
          <QuantityInput
            key={f.key}
            id={`sweep-${f.key}`}
            label={f.label}
            unit={f.key === "points" ? "none" : "hertz"}
            read={read}
            value={texts[f.key] ?? ""}
            onChange={(e) => {
              const text = e.target.value;
              setTexts((t) => ({ ...t, [f.key]: text }));
              const r = orderedRead(f.key, { ...texts, [f.key]: text });
              if (r.state === "ok" && r.value !== null) actions.setAnalysis(f.key, r.value);
              else if (r.state === "empty") actions.setAnalysis(f.key, undefined);
            }}
          />
          );
        })}
      </fieldset>
      <PartsPanel readOnly={readOnly} />
      <p className="text-[12px] text-graphite-500">Select a node on the canvas to edit its values.</p>
    </div>
  );
}
