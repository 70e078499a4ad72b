"use client";
/**
 * The inspector: the selected node's values as a form (react-hook-form with the zod resolver over the
 * shared chain rules), its op-amp model and rails, and below the form the stage's own numbers from the
 * live analysis. With nothing selected it shows the chain's own settings.
 *
 * What is typed stays in the form even when it does not read; only values that pass go into the draft,
 * one undo step per field. When the draft changes from elsewhere (undo, a picked E-series value), the
 * field is rewritten from the draft.
 */
import { useEffect, useMemo, useRef, useState } from "react";
import { useForm, useWatch, type Path } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { Safety } from "@/lib/chain/types";
import { isSourceKind } from "@/lib/chain/types";
import { crossParamIssues, SAFETY_VALUES, SOURCE_UNIT_LENGTH } from "@/lib/chain/params";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import { STAGE_CATALOG, paramRule, paramUnit } from "@/lib/store/stage-catalog";
import type { DraftNode, ParamValue } from "@/lib/store/draft";
import { QuantityInput } from "./quantity-input";
import { Pictogram } from "./pictograms";
import { StageNumbers } from "./stage-numbers";
import { SolvePanel } from "./solve-panel";
import { FilterWizard } from "./filter-wizard";
import { PartsPanel } from "./parts-panel";
import { ChainSheet } from "./chain-sheet";
import { readFormParam, readRails, nodeFormSchema, nodeToForm, ORDER_DEPS, type NodeFormValues } from "./node-form-schema";
import { readParam, valueToText } from "./field-read";

export function Inspector() {
  const node = useEditor((s) => (s.selected.length === 1 ? (s.doc.nodes.find((n) => n.id === s.selected[0]) ?? null) : null));
  const count = useEditor((s) => s.selected.length);
  const readOnly = useEditor((s) => s.readOnly);
  if (!node) {
    return (
      <div className="flex flex-col gap-4 p-3" data-testid="inspector">
        {count > 1 && <p className="text-sm text-graphite-500">{count} nodes selected. Select one to edit its values.</p>}
        <ChainSheet readOnly={readOnly} />
      </div>
    );
  }
  return <NodeSheet key={node.id} node={node} readOnly={readOnly} />;
}

const SAFETY_WORDS: Record<Safety, string> = {
  "low-voltage": "Low voltage",
  "mains-connected": "Mains-connected",
  "body-connected": "Connected to a person",
};

/** Two stored numbers the same for the form's purposes (text round trips may differ in the last bit). */
function same(a: ParamValue | undefined, b: ParamValue | undefined): boolean {
  if (typeof a === "number" && typeof b === "number") return a === b || Math.abs(a - b) <= 1e-12 * Math.max(Math.abs(a), Math.abs(b));
  return a === b;
}

function NodeSheet({ node, readOnly }: { node: DraftNode; readOnly: boolean }) {
  const spec = STAGE_CATALOG[node.kind];
  const actions = useEditorActions();
  const schema = useMemo(() => nodeFormSchema(node.kind), [node.kind]);
  const form = useForm<NodeFormValues>({ mode: "onChange", resolver: zodResolver(schema), defaultValues: nodeToForm(node) });
  const { register, control, setValue, formState } = form;
  const values = useWatch({ control }) as NodeFormValues;
  const nodeRef = useRef(node);
  nodeRef.current = node;
  /** what the form and the draft last agreed on, per field */
  const agreed = useRef({ params: { ...node.params }, rails: node.rails, label: node.label ?? "" });
  const [partsOpen, setPartsOpen] = useState(false);

  // Draft → form, for changes that did not come from this form.
  useEffect(() => {
    for (const f of spec.fields) {
      const stored = node.params[f.key];
      if (!same(stored, agreed.current.params[f.key])) {
        agreed.current.params[f.key] = stored;
        setValue(`params.${f.key}` as Path<NodeFormValues>, valueToText(stored, paramUnit(node.kind, f.key)), { shouldValidate: true });
      }
    }
    const r = node.rails;
    const a = agreed.current.rails;
    if (r?.low !== a?.low || r?.high !== a?.high) {
      agreed.current.rails = r;
      setValue("rails.low", valueToText(r?.low, "volt"));
      setValue("rails.high", valueToText(r?.high, "volt"), { shouldValidate: true });
    }
    if ((node.label ?? "") !== agreed.current.label) {
      agreed.current.label = node.label ?? "";
      setValue("label", node.label ?? "");
    }
  }, [node, spec.fields, setValue]);

  // Form → draft, on every change that reads.
  useEffect(() => {
    const sub = form.watch((v, { name }) => {
      if (!name || readOnly) return;
      const n = nodeRef.current;
      const vals = v as NodeFormValues;
      if (name.startsWith("params.")) {
        const key = name.slice("params.".length);
        const r = readParam(n.kind, key, vals.params?.[key] ?? "", n.params);
        const next = r.state === "ok" ? r.value : r.state === "empty" ? undefined : null;
        if (r.state === "error" || same(next as ParamValue | undefined, n.params[key])) return;
        agreed.current.params[key] = next as ParamValue | undefined;
        actions.setParam(n.id, key, next as ParamValue | undefined);
      } else if (name.startsWith("rails.")) {
        const r = readRails(vals.rails?.low ?? "", vals.rails?.high ?? "");
        if (r.state === "ok" && (r.rails.low !== n.rails?.low || r.rails.high !== n.rails?.high)) {
          agreed.current.rails = r.rails;
          actions.setRails(n.id, r.rails);
        }
      } else if (name === "label") {
        const label = vals.label ?? "";
        if (label.length <= 200 && label !== (n.label ?? "")) {
          agreed.current.label = label;
          actions.setLabel(n.id, label);
        }
      }
    });
    return () => sub.unsubscribe();
  }, [form, actions, readOnly]);

  const deps = ORDER_DEPS[node.kind] ?? [];
  const depFor = (key: string) =>
    deps.flatMap(([a, b]) => (a === key ? [`params.${b}`] : b === key ? [`params.${a}`] : [])) as Path<NodeFormValues>[];
  const pickPreferred = (key: string) => (v: number) =>
    setValue(`params.${key}` as Path<NodeFormValues>, valueToText(v, paramUnit(node.kind, key)), { shouldValidate: true, shouldDirty: true });

  const paramErrors = (formState.errors.params ?? {}) as Record<string, { message?: string } | undefined>;
  const railErrors = formState.errors.rails;
  const railsRead = readRails(values.rails?.low ?? "", values.rails?.high ?? "");
  const reads = Object.fromEntries(spec.fields.map((f) => [f.key, readFormParam(node.kind, f.key, values.params?.[f.key] ?? "")]));
  // Rules tying two params together (fLow below fHigh) are shown on both fields of the pair.
  const crossMessage: Record<string, string> = {};
  const parsed = Object.fromEntries(Object.entries(reads).flatMap(([k, r]) => (r.state === "ok" ? [[k, r.value]] : [])));
  for (const issue of crossParamIssues(node.kind, parsed, false)) {
    for (const [a, b] of deps) if (a === issue.key || b === issue.key) crossMessage[a] = crossMessage[b] = `${issue.key} ${issue.message}`;
  }

  return (
    <div className="flex flex-col gap-3 p-3" data-testid="inspector" data-node-id={node.id}>
      <header className="flex items-center gap-2">
        <Pictogram kind={node.kind} className="text-graphite-700" />
        <div className="min-w-0">
          <h2 className="text-[15px] font-semibold text-graphite-950">{spec.title}</h2>
          <p className="num text-[11.5px] text-graphite-500">{node.id}</p>
        </div>
      </header>
      <p className="text-[12px] leading-snug text-graphite-500">{spec.blurb}</p>

      <form className="flex flex-col gap-1.5" onSubmit={(e) => e.preventDefault()} aria-label={`Values of ${node.id}`}>
        <fieldset disabled={readOnly} className="contents">
          <div className="grid grid-cols-[5.5rem_1fr] items-center gap-x-2">
            <label htmlFor="f-label" className="text-[12.5px] text-graphite-700">
              Label
            </label>
            <input
              id="f-label"
              {...register("label")}
              placeholder={node.id}
              className="w-full min-w-0 rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-[13px] focus:border-accent-600 focus:outline-none"
            />
          </div>
          <div className="h-1" />
          {spec.fields.map((f) => {
            const rule = paramRule(node.kind, f.key);
            return (
              <QuantityInput
                key={f.key}
                id={`f-${f.key}`}
                label={f.label}
                unit={paramUnit(node.kind, f.key)}
                read={reads[f.key]}
                preferred={f.preferred}
                nullMeans={rule?.rule?.nullMeans}
                error={crossMessage[f.key] ?? paramErrors[f.key]?.message}
                onPickPreferred={readOnly ? undefined : pickPreferred(f.key)}
                {...register(`params.${f.key}` as Path<NodeFormValues>, { deps: depFor(f.key) })}
              />
            );
          })}

          {isSourceKind(node.kind) && <SourceUnitField node={node} />}

          {isSourceKind(node.kind) && (
            <div className="grid grid-cols-[5.5rem_1fr] items-center gap-x-2">
              <label htmlFor="f-safety" className="text-[12.5px] text-graphite-700">
                Connection
              </label>
              <select
                id="f-safety"
                value={(node.params.safety as Safety | undefined) ?? "low-voltage"}
                onChange={(e) => actions.setSafety(node.id, e.target.value as Safety)}
                className="rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-[13px]"
              >
                {SAFETY_VALUES.map((s) => (
                  <option key={s} value={s}>
                    {SAFETY_WORDS[s]}
                  </option>
                ))}
              </select>
            </div>
          )}

          {spec.opAmp && (
            <div className="mt-2 flex flex-col gap-1.5 border-t border-paper-rule pt-2">
              <h3 className="text-[12px] font-semibold uppercase tracking-wide text-graphite-500">Op-amp</h3>
              <div className="grid grid-cols-[5.5rem_1fr_auto] items-center gap-x-2">
                <label htmlFor="f-part" className="text-[12.5px] text-graphite-700">
                  Model
                </label>
                <PartSelect node={node} />
                <button
                  type="button"
                  onClick={() => setPartsOpen((o) => !o)}
                  aria-expanded={partsOpen}
                  className="rounded-card px-1.5 py-1 text-[12px] text-accent-700 hover:bg-accent-50"
                >
                  {partsOpen ? "Hide models" : "Models…"}
                </button>
              </div>
              <QuantityInput
                id="f-rails-low"
                label="Low rail"
                unit="volt"
                read={railsRead.state === "ok" ? { state: "ok", value: railsRead.rails.low } : null}
                error={railErrors?.low?.message}
                {...register("rails.low", { deps: ["rails.high"] })}
              />
              <QuantityInput
                id="f-rails-high"
                label="High rail"
                unit="volt"
                read={railsRead.state === "ok" ? { state: "ok", value: railsRead.rails.high } : null}
                error={railErrors?.high?.message}
                {...register("rails.high", { deps: ["rails.low"] })}
              />
            </div>
          )}
        </fieldset>
      </form>
      {spec.opAmp && partsOpen && <PartsPanel readOnly={readOnly} focusKey={node.part ?? null} />}
      {!readOnly && <SolvePanel node={node} />}
      {!readOnly && <FilterWizard node={node} />}
      <StageNumbers node={node} />
    </div>
  );
}

/** The measurand's unit name ("kg", "°C"): free text, stored as typed (an empty field removes it). */
function SourceUnitField({ node }: { node: DraftNode }) {
  const actions = useEditorActions();
  const stored = typeof node.params.unit === "string" ? node.params.unit : "";
  return (
    <div className="grid grid-cols-[5.5rem_1fr] items-center gap-x-2">
      <label htmlFor="f-unit" className="text-[12.5px] text-graphite-700">
        Unit
      </label>
      <input
        id="f-unit"
        value={stored}
        maxLength={SOURCE_UNIT_LENGTH}
        placeholder="of the measurand, e.g. kg"
        onChange={(e) => actions.setParam(node.id, "unit", e.target.value === "" ? undefined : e.target.value)}
        className="w-full min-w-0 rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-[13px] focus:border-accent-600 focus:outline-none"
      />
    </div>
  );
}

function PartSelect({ node }: { node: DraftNode }) {
  const parts = useEditor((s) => s.doc.parts);
  const readOnly = useEditor((s) => s.readOnly);
  const actions = useEditorActions();
  return (
    <select
      id="f-part"
      disabled={readOnly}
      value={node.part ?? ""}
      onChange={(e) => actions.setPart(node.id, e.target.value === "" ? null : e.target.value)}
      className="min-w-0 rounded-card border border-paper-rule bg-paper-raised px-2 py-1 text-[13px]"
    >
      <option value="">Ideal op-amp</option>
      {Object.entries(parts).map(([key, p]) => (
        <option key={key} value={key}>
          {p.label ? `${p.label} (${key})` : key}
        </option>
      ))}
    </select>
  );
}
