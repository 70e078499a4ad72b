"use client";
/**
 * The chain's own op-amp models. A chain carries the models its stages use, so it stays self-contained
 * when shared, exported or pasted elsewhere. Each figure is typed in engineering notation and checked
 * by the shared part schema; a figure left empty means ideal in that respect.
 */
import { useState } from "react";
import type { Part } from "@/lib/chain/types";
import { partSchema } from "@/lib/chain/schema";
import { parseQuantity, type QuantityUnit } from "@/lib/units";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import { QuantityInput } from "./quantity-input";
import { valueToText, type FieldRead } from "./field-read";
import { LibraryModels } from "@/components/library/library-models";

type NumericPartKey = Exclude<keyof Part, "label">;

const PART_FIELDS: { key: NumericPartKey; label: string; unit: QuantityUnit }[] = [
  { key: "gbw", label: "Gain-bandwidth", unit: "hertz" },
  { key: "aol", label: "Open-loop gain", unit: "none" },
  { key: "slewRate", label: "Slew rate", unit: "V/s" },
  { key: "vos", label: "Offset", unit: "volt" },
  { key: "ib", label: "Bias current", unit: "ampere" },
  { key: "en", label: "en", unit: "V/√Hz" },
  { key: "in", label: "in", unit: "A/√Hz" },
  { key: "enCorner", label: "en 1/f corner", unit: "hertz" },
  { key: "inCorner", label: "in 1/f corner", unit: "hertz" },
  { key: "swingLow", label: "Swing to low", unit: "volt" },
  { key: "swingHigh", label: "Swing to high", unit: "volt" },
  { key: "inputLow", label: "Input to low", unit: "volt" },
  { key: "inputHigh", label: "Input to high", unit: "volt" },
];

/** Read one part figure: engineering notation, then the shared part schema for that field alone. */
export function readPartField(key: NumericPartKey, unit: QuantityUnit, text: string): FieldRead {
  if (text.trim() === "") return { state: "empty", required: false, hint: "empty: ideal in this respect" };
  const parsed = parseQuantity(text, { unit });
  if (!parsed.ok) return { state: "error", message: parsed.error };
  const checked = partSchema.safeParse({ [key]: parsed.value });
  if (!checked.success) return { state: "error", message: checked.error.issues[0]?.message ?? "not a valid figure" };
  return { state: "ok", value: parsed.value };
}

export function PartsPanel({ readOnly, focusKey }: { readOnly: boolean; focusKey?: string | null }) {
  const parts = useEditor((s) => s.doc.parts);
  const actions = useEditorActions();
  const keys = Object.keys(parts);
  const [open, setOpen] = useState<string | null>(focusKey ?? keys[0] ?? null);
  const current = open && parts[open] ? open : null;
  return (
    <section className="rounded-card border border-paper-rule bg-paper-raised p-2" aria-label="Op-amp models of this chain" data-testid="parts-panel">
      <div className="flex items-center justify-between">
        <h3 className="text-[12px] font-semibold uppercase tracking-wide text-graphite-500">Op-amp models</h3>
        {!readOnly && (
          <div className="flex gap-1">
            <button type="button" className="rounded px-1.5 py-0.5 text-[12px] text-accent-700 hover:bg-accent-50" onClick={() => setOpen(actions.addPart())}>
              Add
            </button>
            {current && (
              <button type="button" className="rounded px-1.5 py-0.5 text-[12px] text-accent-700 hover:bg-accent-50" onClick={() => setOpen(actions.copyPart(current))}>
                Copy
              </button>
            )}
            {current && (
              <button type="button" className="rounded px-1.5 py-0.5 text-[12px] text-graphite-500 hover:bg-paper-sunk" onClick={() => { actions.removePart(current); setOpen(null); }}>
                Remove
              </button>
            )}
          </div>
        )}
      </div>
      {keys.length === 0 ? (
        <p className="mt-1 text-[12px] text-graphite-500">No models yet: stages use an ideal op-amp. Add one to give stages finite gain-bandwidth, offset, swing and noise.</p>
      ) : (
        <ul className="mt-1 flex flex-wrap gap-1" role="list">
          {keys.map((k) => (
            <li key={k}>
              <button
                type="button"
                aria-pressed={k === current}
                onClick={() => setOpen(k)}
                className={`rounded-card border px-1.5 py-0.5 text-[12px] ${k === current ? "border-accent-600 bg-accent-50 text-accent-800" : "border-paper-rule text-graphite-700 hover:bg-paper-sunk"}`}
              >
                {parts[k].label || k}
              </button>
            </li>
          ))}
        </ul>
      )}
      {current && <PartEditor key={current} partKey={current} part={parts[current]} readOnly={readOnly} />}
      <LibraryModels readOnly={readOnly} />
    </section>
  );
}

function PartEditor({ partKey, part, readOnly }: { partKey: string; part: Part; readOnly: boolean }) {
  const actions = useEditorActions();
  const initial = () => Object.fromEntries(PART_FIELDS.map((f) => [f.key, valueToText(part[f.key], f.unit)])) as Record<string, string>;
  const [texts, setTexts] = useState<Record<string, string>>(initial);
  const [label, setLabel] = useState(part.label ?? "");
  // Undo and redo change the part under us: take the draft's figures where they differ from what reads
  // (adjusting state while rendering, so no effect runs a second render).
  const [shownPart, setShownPart] = useState(part);
  if (shownPart !== part) {
    setShownPart(part);
    setTexts((prev) => {
      const next = { ...prev };
      for (const f of PART_FIELDS) {
        const r = readPartField(f.key, f.unit, prev[f.key] ?? "");
        const shown = r.state === "ok" ? r.value : r.state === "empty" ? undefined : "error";
        if (shown !== "error" && shown !== part[f.key]) next[f.key] = valueToText(part[f.key], f.unit);
      }
      return next;
    });
    if (label !== (part.label ?? "")) setLabel(part.label ?? "");
  }

  const change = (key: NumericPartKey, unit: QuantityUnit, text: string) => {
    setTexts((t) => ({ ...t, [key]: text }));
    const r = readPartField(key, unit, text);
    if (r.state === "error") return;
    const next: Part = { ...part };
    if (r.state === "ok" && r.value !== null) next[key] = r.value;
    else delete next[key];
    actions.upsertPart(partKey, next);
  };

  return (
    <fieldset disabled={readOnly} className="mt-2 flex flex-col gap-1" aria-label={`Model ${partKey}`}>
      <div className="grid grid-cols-[5.5rem_1fr] items-center gap-x-2">
        <label htmlFor={`part-${partKey}-label`} className="text-[12.5px] text-graphite-700">
          Name
        </label>
        <input
          id={`part-${partKey}-label`}
          value={label}
          maxLength={200}
          onChange={(e) => {
            setLabel(e.target.value);
            const next: Part = { ...part };
            if (e.target.value) next.label = e.target.value;
            else delete next.label;
            actions.upsertPart(partKey, next);
          }}
          className="rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-[13px]"
        />
      </div>
      {PART_FIELDS.map((f) => (
        <QuantityInput
          key={f.key}
          id={`part-${partKey}-${f.key}`}
          label={f.label}
          unit={f.unit}
          read={readPartField(f.key, f.unit, texts[f.key] ?? "")}
          value={texts[f.key] ?? ""}
          onChange={(e) => change(f.key, f.unit, e.target.value)}
        />
      ))}
    </fieldset>
  );
}
