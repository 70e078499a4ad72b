/**
 * Reading what the user types into an inspector field: engineering notation through lib/units, then the
 * shared schema's rule for that param (lib/chain/params.ts via the zod builders of lib/chain/fields.ts).
 * The text itself stays in the form whatever happens; only a value that passes goes into the draft.
 */
import { num, numOrNull, ruleText, type NumberRule } from "@/lib/chain/fields";
import { crossParamIssues } from "@/lib/chain/params";
import type { NodeKind } from "@/lib/chain/types";
import { nearestPreferred, parseQuantity, type QuantityUnit } from "@/lib/units";
import { paramRule } from "@/lib/store/stage-catalog";
import type { ParamValue } from "@/lib/store/draft";
import { formatCompact } from "@/lib/units";

export type FieldRead =
  /** a value to store (null where null has a meaning, e.g. rg empty = follower) */
  | { state: "ok"; value: number | null }
  /** left empty: the param is removed from the draft (its default applies, or the stage waits for it) */
  | { state: "empty"; required: boolean; hint: string }
  | { state: "error"; message: string };

/** Read a number typed against a schema rule. */
export function readNumber(text: string, rule: NumberRule, required: boolean): FieldRead {
  const t = text.trim();
  if (t === "") {
    if (rule.nullMeans) return { state: "ok", value: null };
    return required
      ? { state: "empty", required: true, hint: `needed: ${ruleText(rule)}; the stage waits for it before it is analysed` }
      : { state: "empty", required: false, hint: "empty: the default applies" };
  }
  const unit = isQuantityUnit(rule.unit) ? rule.unit : undefined;
  const parsed = parseQuantity(t, unit ? { unit } : {});
  if (!parsed.ok) return { state: "error", message: parsed.error };
  const schema = rule.nullMeans ? numOrNull({ ...rule, nullMeans: rule.nullMeans }) : num(rule);
  const checked = schema.safeParse(parsed.value);
  if (!checked.success) return { state: "error", message: checked.error.issues[0]?.message ?? `must be ${ruleText(rule)}` };
  return { state: "ok", value: parsed.value };
}

/** Read a stage param field; `others` are the node's stored params, for the rules that tie two together. */
export function readParam(kind: NodeKind, key: string, text: string, others: Record<string, ParamValue | undefined>): FieldRead {
  const spec = paramRule(kind, key);
  if (!spec?.rule) return { state: "error", message: "is not a param of this kind" };
  const r = readNumber(text, spec.rule, spec.required);
  if (r.state !== "ok") return r;
  const cross = crossParamIssues(kind, { ...others, [key]: r.value }, false);
  if (cross.length) {
    const issue = cross[0];
    return { state: "error", message: `${issue.key} ${issue.message}` };
  }
  return r;
}

/** How a stored value is written back into a field: compact engineering notation (`4.7k`, `10n`). */
export function valueToText(v: ParamValue | undefined, unit: QuantityUnit = "none"): string {
  if (v === null || v === undefined) return "";
  if (typeof v !== "number") return String(v);
  if (unit === "none" && Number.isInteger(v) && Math.abs(v) < 1e6) return String(v);
  return formatCompact(v, "none", 6);
}

export interface PreferredHint {
  e24: number;
  e96: number;
}

/** Nearest E24 and E96 values (IEC 60063 series) for a positive component value. */
export function preferredHint(value: number | null): PreferredHint | null {
  if (value === null || !(value > 0) || !Number.isFinite(value)) return null;
  return { e24: nearestPreferred(value, "E24"), e96: nearestPreferred(value, "E96") };
}

function isQuantityUnit(u: NumberRule["unit"]): u is QuantityUnit {
  return u !== "kelvin" && u !== "dB" && u !== "pixels" && u !== "fraction";
}
