/**
 * The inspector's form schema for one node kind: text fields read as engineering notation and checked
 * by the shared chain rules (lib/chain/params.ts), plus rails for op-amp stages. Used by react-hook-form
 * through its zod resolver, and by the inspector to decide what may enter the draft.
 */
import { z } from "zod";
import { crossParamIssues } from "@/lib/chain/params";
import { VOLTS } from "@/lib/chain/fields";
import type { NodeKind } from "@/lib/chain/types";
import { STAGE_CATALOG, paramRule } from "@/lib/store/stage-catalog";
import type { DraftNode } from "@/lib/store/draft";
import { readNumber, valueToText, type FieldRead } from "./field-read";
import { paramUnit } from "@/lib/store/stage-catalog";

export interface NodeFormValues {
  label: string;
  params: Record<string, string>;
  rails: { low: string; high: string };
}

export function nodeToForm(node: DraftNode): NodeFormValues {
  const params: Record<string, string> = {};
  for (const f of STAGE_CATALOG[node.kind].fields) params[f.key] = valueToText(node.params[f.key], paramUnit(node.kind, f.key));
  return {
    label: node.label ?? "",
    params,
    rails: { low: valueToText(node.rails?.low, "volt"), high: valueToText(node.rails?.high, "volt") },
  };
}

export function readFormParam(kind: NodeKind, key: string, text: string): FieldRead {
  const spec = paramRule(kind, key);
  if (!spec?.rule) return { state: "error", message: "is not a param of this kind" };
  return readNumber(text, spec.rule, spec.required);
}

export type RailsRead =
  | { state: "ok"; rails: { low: number; high: number } }
  | { state: "empty" }
  | { state: "error"; low?: string; high?: string };

/** Rails are required on op-amp stages: both ends, in volts, low below high. */
export function readRails(low: string, high: string): RailsRead {
  if (low.trim() === "" && high.trim() === "") return { state: "empty" };
  const need = "needed: the supply rail in volts (no default: a wrong supply would hide a clipping stage)";
  const a = low.trim() === "" ? ({ state: "error", message: need } as const) : readNumber(low, VOLTS, true);
  const b = high.trim() === "" ? ({ state: "error", message: need } as const) : readNumber(high, VOLTS, true);
  const out: { state: "error"; low?: string; high?: string } = { state: "error" };
  if (a.state === "error") out.low = a.message;
  if (b.state === "error") out.high = b.message;
  if (out.low || out.high) return out;
  const lo = (a as { value: number }).value;
  const hi = (b as { value: number }).value;
  if (!(lo < hi)) return { state: "error", high: `must be above the low rail (${hi} V is not above ${lo} V)` };
  return { state: "ok", rails: { low: lo, high: hi } };
}

export function nodeFormSchema(kind: NodeKind) {
  const spec = STAGE_CATALOG[kind];
  const paramShape: Record<string, z.ZodString> = {};
  for (const f of spec.fields) paramShape[f.key] = z.string();
  return z.object({
    label: z.string().max(200, { error: "must be up to 200 characters" }),
    params: z.object(paramShape).superRefine((p, ctx) => {
      const values: Record<string, number | null> = {};
      for (const f of spec.fields) {
        const r = readFormParam(kind, f.key, p[f.key] ?? "");
        if (r.state === "error") ctx.addIssue({ code: "custom", path: [f.key], message: r.message });
        else if (r.state === "ok") values[f.key] = r.value;
      }
      for (const issue of crossParamIssues(kind, values, false)) {
        ctx.addIssue({ code: "custom", path: [issue.key], message: issue.message });
      }
    }),
    rails: z.object({ low: z.string(), high: z.string() }).superRefine((r, ctx) => {
      if (!spec.opAmp) return;
      const read = readRails(r.low, r.high);
      if (read.state === "empty") {
        ctx.addIssue({ code: "custom", path: ["low"], message: "needed: the supply rails of this stage" });
      } else if (read.state === "error") {
        if (read.low) ctx.addIssue({ code: "custom", path: ["low"], message: read.low });
        if (read.high) ctx.addIssue({ code: "custom", path: ["high"], message: read.high });
      }
    }),
  });
}

/** Params of a kind that must stay in order; editing one re-checks the other. */
export const ORDER_DEPS: Partial<Record<NodeKind, [string, string][]>> = {
  source: [["fLow", "fHigh"]],
  adc: [["vinLow", "vinHigh"]],
};
