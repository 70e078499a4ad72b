/**
 * The executable form of chain-format.md: zod schemas for the two levels of a `chainwright.chain/1`
 * document and the validation entry points every edge of the product uses (CLI, API, import, editor).
 *
 * - complete (`chainSchema`, `validateChain`): every rule of chain-format.md, defaults filled in; the
 *   output is exactly the `Chain` of types.ts.
 * - draft (`draftChainSchema`, `validateDraft`): what is present is valid in type and limit; params and
 *   rails may be missing and the graph unfinished, but ids stay unique and edges never dangle, loop, lead
 *   into a source, leave an ADC or give a node a second input.
 *
 * Unknown fields are refused at both levels (with a "did you mean" where a known field is close): a typo
 * such as `fmax` would otherwise vanish and its default would stand in silently.
 */
import { z } from "zod";
import {
  CHAIN_FORMAT,
  NODE_KINDS,
  type AnalysisSettings,
  type Chain,
  type ChainIssue,
  type DraftChain,
  type DraftChainNode,
  type NodeKind,
  type Part,
  type Tolerances,
} from "./types";
import { checked, describeFound, idField, idProblem, num, numOrNull, oneOf, text, VOLTS, type NumberRule } from "./fields";
import { crossParamIssues, KIND_WORDS, PARAM_SPECS, type ParamSpec } from "./params";
import { graphIssues, isOpAmpKind, isPlainObject, type Level } from "./graph";
import { migrateChain, readFormat } from "./migrate";
import { errorText, toPlainJson } from "./plain-json";
import { planSubchain } from "./subchain";

// ---------------------------------------------------------------------------------------------------------
// Limits the format leaves open (documented in lib/chain/README.md).

export const LIMITS = {
  nameLength: 200,
  labelLength: 200,
  notesLength: 100_000,
  nodes: 1000,
  edges: 2000,
  parts: 1000,
  /** validateChain/validateDraft report at most this many issues */
  issues: 100,
} as const;

export const DEFAULT_ANALYSIS: Readonly<AnalysisSettings> = {
  fMin: 0.1,
  fMax: 1e6,
  points: 600,
  temperatureK: 298.15,
  noiseLow: 0.1,
  noiseHigh: null,
  aliasTargetDb: null,
};

export const DEFAULT_TOLERANCES: Readonly<Tolerances> = { resistor: 0.01, capacitor: 0.05 };

// ---------------------------------------------------------------------------------------------------------
// Objects

const TOP_KEYS = ["format", "name", "notes", "analysis", "tolerances", "parts", "nodes", "edges"] as const;

/** A strict object whose type error says what was expected, in words. */
function strictObject<S extends z.core.$ZodLooseShape>(shape: S, what: string, required = `is required: ${what}`) {
  return z.strictObject(shape, {
    error: (iss) => {
      if (iss.code === "unrecognized_keys") return `has fields ${what} does not take: ${iss.keys.join(", ")}`;
      return iss.input === undefined ? required : `must be ${what} (found ${describeFound(iss.input)})`;
    },
  });
}

const hertz = (bound: "positive" | "nonNegative"): NumberRule => ({ unit: "hertz", bound });

const analysisSchema = strictObject(
  {
    fMin: num(hertz("positive")).default(DEFAULT_ANALYSIS.fMin),
    fMax: num(hertz("positive")).default(DEFAULT_ANALYSIS.fMax),
    points: num({ unit: "none", bound: "positive", integer: { min: 2, max: 20_000 } }).default(DEFAULT_ANALYSIS.points),
    temperatureK: num({ unit: "kelvin", bound: "positive" }).default(DEFAULT_ANALYSIS.temperatureK),
    noiseLow: num(hertz("positive")).default(DEFAULT_ANALYSIS.noiseLow),
    noiseHigh: numOrNull({ unit: "hertz", bound: "positive", nullMeans: "fMax" }).default(null),
    aliasTargetDb: numOrNull({ unit: "dB", bound: "any", nullMeans: "the ADC's ideal SNR" }).default(null),
  },
  "an object of analysis settings",
).superRefine((a, ctx) => {
  const ok = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);
  if (ok(a.fMin) && ok(a.fMax) && !(a.fMin < a.fMax)) {
    ctx.addIssue({ code: "custom", path: ["fMax"], message: `must be above fMin (fMax is ${a.fMax} Hz, fMin is ${a.fMin} Hz)` });
  }
  if (ok(a.noiseLow) && ok(a.noiseHigh) && !(a.noiseLow < a.noiseHigh)) {
    ctx.addIssue({
      code: "custom",
      path: ["noiseHigh"],
      message: `must be above noiseLow (noiseHigh is ${a.noiseHigh} Hz, noiseLow is ${a.noiseLow} Hz)`,
    });
  }
  // The total noise is integrated from noiseLow to fMax, so the band must start below fMax.
  if (ok(a.noiseLow) && ok(a.fMax) && !(a.noiseLow < a.fMax)) {
    ctx.addIssue({
      code: "custom",
      path: ["noiseLow"],
      message: `must be below fMax (noiseLow is ${a.noiseLow} Hz, fMax is ${a.fMax} Hz): noise is integrated from noiseLow up to fMax`,
    });
  }
});

const fraction: NumberRule = { unit: "fraction", bound: "nonNegative", range: { min: 0, max: 0.5 } };
/** "nodeId.param" of a per-part tolerance (the param is checked against the node in overrideIssues) */
const OVERRIDE_KEY = /^[A-Za-z0-9_-]{1,32}\.[A-Za-z0-9]{1,32}$/;
const overridesSchema = checked<Record<string, unknown>>((v) =>
  isPlainObject(v) ? null : `must be an object of per-part tolerances keyed "nodeId.param" (found ${describeFound(v)})`,
)
  .superRefine((o, ctx) => {
    for (const key of Object.keys(o)) {
      if (!OVERRIDE_KEY.test(key)) ctx.addIssue({ code: "custom", path: [key], message: 'is not a part key: write "nodeId.param", e.g. "u1.r1"' });
    }
  })
  .pipe(z.record(z.string(), num(fraction)));
const tolerancesSchema = strictObject(
  {
    resistor: num(fraction).default(DEFAULT_TOLERANCES.resistor),
    capacitor: num(fraction).default(DEFAULT_TOLERANCES.capacitor),
    overrides: overridesSchema.optional(),
  },
  "an object of tolerances",
);

/** Each per-part tolerance must name a resistor or capacitor param of a node of the chain. */
function overrideIssues(doc: { tolerances?: { overrides?: Record<string, unknown> }; nodes?: unknown }): ChainIssue[] {
  const o = doc.tolerances?.overrides;
  if (!o || !Array.isArray(doc.nodes)) return [];
  const out: ChainIssue[] = [];
  for (const key of Object.keys(o)) {
    const [id, param] = key.split(".");
    const node = (doc.nodes as { id?: unknown; kind?: unknown }[]).find((n) => n && n.id === id);
    const kind = node && (NODE_KINDS as readonly unknown[]).includes(node.kind) ? (node.kind as NodeKind) : null;
    const unit = kind ? PARAM_SPECS[kind][param]?.rule?.unit : undefined;
    if (!node) out.push({ path: `tolerances.overrides.${key}`, message: `names node "${id}", which the chain does not have` });
    else if (unit !== "ohm" && unit !== "farad")
      out.push({ path: `tolerances.overrides.${key}`, message: `names "${param}", which is not a resistor or capacitor of ${id}` });
  }
  return out;
}

const nonNeg = (unit: NumberRule["unit"], note?: string): NumberRule => ({ unit, bound: "nonNegative", note });

/**
 * An op-amp model, as kept in a chain's `parts` and in a team's library (and read from CSV). Every field
 * is optional: a missing figure means ideal in that respect. All figures are finite and ≥ 0, except:
 * gbw and aol are > 0 (zero would be an op-amp with no gain, and the single-pole model divides by gbw);
 * inputLow and inputHigh may be negative, which chain-format.md defines as an input range reaching beyond
 * the rail.
 */
export const partSchema = strictObject(
  {
    label: text("text", 0, LIMITS.labelLength).optional(),
    gbw: num({ unit: "hertz", bound: "positive", note: "(leave it out for an ideal op-amp)" }).optional(),
    aol: num({ unit: "none", bound: "positive", note: "(a ratio in V/V, not dB; leave it out for an ideal op-amp)" }).optional(),
    slewRate: num(nonNeg("V/s")).optional(),
    vos: num(nonNeg("volt")).optional(),
    ib: num(nonNeg("ampere")).optional(),
    en: num(nonNeg("V/√Hz")).optional(),
    in: num(nonNeg("A/√Hz")).optional(),
    enCorner: num(nonNeg("hertz")).optional(),
    inCorner: num(nonNeg("hertz")).optional(),
    swingLow: num(nonNeg("volt")).optional(),
    swingHigh: num(nonNeg("volt")).optional(),
    inputLow: num({ ...VOLTS, note: "(negative: the input range reaches beyond the low rail)" }).optional(),
    inputHigh: num({ ...VOLTS, note: "(negative: the input range reaches beyond the high rail)" }).optional(),
  },
  "an op-amp part (an object)",
) as unknown as z.ZodType<Part, unknown>;

/** Part keys follow the id rule; zod's record silently skips a `__proto__` key, so the keys are checked first. */
const partsSchema = checked<Record<string, unknown>>((v) =>
  isPlainObject(v) ? null : `must be an object of op-amp parts keyed by name (found ${describeFound(v)})`,
)
  .superRefine((parts, ctx) => {
    const keys = Object.keys(parts);
    if (keys.length > LIMITS.parts) {
      ctx.addIssue({ code: "custom", message: `has ${keys.length} parts; a chain takes at most ${LIMITS.parts}` });
    }
    for (const key of keys) {
      const problem = idProblem(key);
      if (problem) ctx.addIssue({ code: "custom", path: [key], message: `is not a usable part name: a part name ${problem}` });
    }
  })
  .pipe(z.record(z.string(), partSchema));

const positionSchema = strictObject(
  {
    x: num({ unit: "pixels", bound: "any" }),
    y: num({ unit: "pixels", bound: "any" }),
  },
  "a position {x, y}",
);

const railsSchema = strictObject(
  { low: num(VOLTS), high: num(VOLTS) },
  "the op-amp's supply rails {low, high} in volts",
  "is required on every op-amp stage: the supply rails {low, high} in volts (there is no default, since a wrong supply would hide a clipping stage)",
).superRefine((r, ctx) => {
  if (typeof r.low === "number" && typeof r.high === "number" && !(r.low < r.high)) {
    ctx.addIssue({ code: "custom", path: ["high"], message: `must be above low (high is ${r.high} V, low is ${r.low} V)` });
  }
});

// ---------------------------------------------------------------------------------------------------------
// Nodes

function paramField(spec: ParamSpec, level: Level) {
  const base = spec.words
    ? oneOf(spec.words)
    : spec.maxLength !== undefined
      ? text("text", 0, spec.maxLength)
      : spec.rule!.nullMeans
      ? numOrNull({ ...spec.rule!, nullMeans: spec.rule!.nullMeans })
      : num(spec.rule!);
  if (level === "draft") return base.optional();
  if (spec.required) return base;
  // No default: the param stays absent when left out (the source's sensitivity and unit).
  return spec.default === undefined ? base.optional() : (base as z.ZodType<unknown>).default(spec.default as never);
}

function paramsSchema(kind: NodeKind, level: Level) {
  const shape: Record<string, z.ZodType> = {};
  for (const [key, spec] of Object.entries(PARAM_SPECS[kind])) shape[key] = paramField(spec, level);
  return strictObject(shape, `an object of ${KIND_WORDS[kind].replace(/^an? /, "")} params`).superRefine((p, ctx) => {
    for (const issue of crossParamIssues(kind, p, level === "complete")) {
      ctx.addIssue({ code: "custom", path: [issue.key], message: issue.message });
    }
  });
}

function nodeSchema(kind: NodeKind, level: Level) {
  const params = paramsSchema(kind, level);
  const shape: Record<string, z.ZodType> = {
    id: idField,
    kind: z.literal(kind),
    label: text("text", 0, LIMITS.labelLength).optional(),
    position: positionSchema.optional(),
    params: level === "draft" ? params.default({}) : params,
  };
  if (isOpAmpKind(kind)) {
    shape.part = checked<string | null>((v) =>
      v === null || typeof v === "string" ? null : `must be the name of a part in parts, or null for an ideal op-amp (found ${describeFound(v)})`,
    ).optional();
    shape.rails = level === "draft" ? railsSchema.optional() : railsSchema;
  }
  return strictObject(shape, `${KIND_WORDS[kind]} node (an object)`);
}

const KIND_LIST = NODE_KINDS.join(", ");

function nodesSchema(level: Level) {
  const options = NODE_KINDS.map((k) => nodeSchema(k, level));
  const union = z.discriminatedUnion("kind", options as unknown as [z.ZodObject, ...z.ZodObject[]], {
    error: (iss) => {
      if ((iss.code as string) === "invalid_type") return `must be a node (an object with id, kind and params; found ${describeFound(iss.input)})`;
      const kind = isPlainObject(iss.input) ? iss.input.kind : undefined;
      if (kind === undefined) return `is required: the stage kind, one of ${KIND_LIST}`;
      if (typeof kind !== "string") return `must be a stage kind, one of ${KIND_LIST} (found ${describeFound(kind)})`;
      return `is not a stage kind Chainwright knows (${JSON.stringify(kind.slice(0, 40))}); the kinds are ${KIND_LIST}`;
    },
  });
  return z.array(union, {
    error: (iss) =>
      iss.input === undefined ? "is required: the list of nodes" : `must be a list of nodes (found ${describeFound(iss.input)})`,
  }).max(LIMITS.nodes, { error: (iss) => `has too many nodes; a chain takes at most ${LIMITS.nodes} (found ${(iss.input as unknown[]).length})` });
}

const nodeRef = checked<string>((v) => (typeof v === "string" ? null : `must be the id of a node (found ${describeFound(v)})`));
const edgeSchema = strictObject(
  { from: nodeRef, to: nodeRef },
  "an edge {from, to}",
);

const edgesSchema = z
  .array(edgeSchema, {
    error: (iss) =>
      iss.input === undefined ? "is required: the list of edges (may be empty)" : `must be a list of edges (found ${describeFound(iss.input)})`,
  })
  .max(LIMITS.edges, { error: `has too many edges; a chain takes at most ${LIMITS.edges}` });

// ---------------------------------------------------------------------------------------------------------
// Documents

const formatField = checked<typeof CHAIN_FORMAT>((v) => {
  if (v === CHAIN_FORMAT) return null;
  const reading = readFormat(v);
  return reading.ok ? `must be ${JSON.stringify(CHAIN_FORMAT)}` : reading.message;
});

function documentSchema(level: Level) {
  return strictObject(
    {
      format: formatField,
      name: text("text", 1, LIMITS.nameLength, true),
      notes: text("text", 0, LIMITS.notesLength).default(""),
      analysis: analysisSchema.default(() => ({ ...DEFAULT_ANALYSIS })),
      tolerances: tolerancesSchema.default(() => ({ ...DEFAULT_TOLERANCES })),
      parts: partsSchema.default(() => ({})),
      nodes: nodesSchema(level),
      edges: edgesSchema,
    },
    "a chain document (a JSON object)",
  ).superRefine(
    (doc, ctx) => {
      for (const issue of graphIssues(doc, level)) ctx.addIssue({ code: "custom", path: issue.path, message: issue.message });
      for (const issue of overrideIssues(doc)) ctx.addIssue({ code: "custom", path: ["tolerances", "overrides", issue.path.slice(21)], message: issue.message });
    },
    // Graph rules are reported alongside field errors, not only once every field is right.
    { when: () => true },
  );
}

/** A complete chain (every rule of chain-format.md); parses to `Chain` with every default filled in. */
export const chainSchema = documentSchema("complete") as unknown as z.ZodType<Chain, unknown>;

/** A draft (see the module comment); parses to `DraftChain` with the document-level defaults filled in. */
export const draftChainSchema = documentSchema("draft") as unknown as z.ZodType<DraftChain, unknown>;

// ---------------------------------------------------------------------------------------------------------
// Entry points

export type ValidateResult = { ok: true; chain: Chain } | { ok: false; errors: ChainIssue[] };
export type ValidateDraftResult = { ok: true; draft: DraftChain } | { ok: false; errors: ChainIssue[] };

/** Validate a complete chain document. Never throws; errors carry a path such as `nodes[1].params.r1`. */
export function validateChain(input: unknown): ValidateResult {
  const r = run(chainSchema, input);
  return r.ok ? { ok: true, chain: r.value as Chain } : r;
}

/** Validate a draft. Never throws. */
export function validateDraft(input: unknown): ValidateDraftResult {
  const r = run(draftChainSchema, input);
  return r.ok ? { ok: true, draft: r.value as DraftChain } : r;
}

const completeNodeSchemas = new Map<NodeKind, z.ZodType>(NODE_KINDS.map((k) => [k, nodeSchema(k, "complete")]));

/** The first reason a draft node is not yet complete, in words, or null when it is complete. */
export function nodeProblem(node: DraftChainNode): string | null {
  const schema = completeNodeSchemas.get(node.kind);
  if (!schema) return "its kind is unknown";
  const parsed = schema.safeParse(node);
  if (parsed.success) return null;
  const [first] = toChainIssues(parsed.error.issues, node);
  return first.path ? `${first.path} ${first.message}` : first.message;
}

/**
 * The largest part of a draft that can be analysed exactly now (see subchain.ts for the rule), as a
 * complete chain, and an issue for every node left out saying why. `chain` is null when nothing can be
 * analysed yet. Accepts anything; a draft that is not valid gives its validation errors. Never throws.
 */
export function completeSubchain(draft: unknown): { chain: Chain | null; issues: ChainIssue[] } {
  const v = validateDraft(draft);
  if (!v.ok) return { chain: null, issues: v.errors };
  try {
    const plan = planSubchain(v.draft, nodeProblem);
    if (plan.keep.size === 0) return { chain: null, issues: plan.issues };
    const d = v.draft;
    const doc = {
      ...d,
      nodes: d.nodes.filter((n) => plan.keep.has(n.id)),
      edges: d.edges.filter((e) => plan.keep.has(e.from) && plan.keep.has(e.to)),
    };
    const c = validateChain(doc);
    // A kept set that is not a valid chain would be a defect here; say so rather than analyse it.
    if (!c.ok) return { chain: null, issues: [...plan.issues, ...c.errors.map((e) => ({ ...e, message: `(live analysis) ${e.message}` }))] };
    return { chain: c.chain, issues: plan.issues };
  } catch (e) {
    return { chain: null, issues: [{ path: "", message: `could not prepare the live analysis (${errorText(e)})` }] };
  }
}

function run(schema: z.ZodType, input: unknown): { ok: true; value: unknown } | { ok: false; errors: ChainIssue[] } {
  try {
    const copied = toPlainJson(input);
    if (!copied.ok) return { ok: false, errors: [{ path: formatPath(copied.path), message: copied.message }] };
    const migrated = migrateChain(copied.value);
    if (!migrated.ok) return migrated;
    const parsed = schema.safeParse(migrated.doc);
    if (parsed.success) return { ok: true, value: parsed.data };
    return { ok: false, errors: toChainIssues(parsed.error.issues, migrated.doc) };
  } catch (e) {
    // Not expected: the input was copied into plain data first. Reported rather than thrown all the same.
    return { ok: false, errors: [{ path: "", message: `could not be validated (${errorText(e)})` }] };
  }
}

// ---------------------------------------------------------------------------------------------------------
// Issues in words

/** `["nodes", 1, "params", "r1"]` → `nodes[1].params.r1`; keys that are not plain names in brackets. */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = "";
  for (const seg of path) {
    if (typeof seg === "number") out += `[${seg}]`;
    else if (typeof seg === "string" && /^[A-Za-z_$][A-Za-z0-9_$]*$/.test(seg)) out += out ? `.${seg}` : seg;
    else out += `[${JSON.stringify(String(seg))}]`;
  }
  return out;
}

/** Render an issue as one line, `nodes[2].params.c2: must be a positive number of farads`. */
export function issueText(issue: ChainIssue): string {
  return issue.path ? `${issue.path}: ${issue.message}` : issue.message;
}

function toChainIssues(issues: readonly z.core.$ZodIssue[], input: unknown): ChainIssue[] {
  const out: ChainIssue[] = [];
  const seen = new Set<string>();
  const push = (path: readonly PropertyKey[], message: string) => {
    const issue = { path: formatPath(path), message };
    const key = `${issue.path}\u0000${message}`;
    if (!seen.has(key)) {
      seen.add(key);
      out.push(issue);
    }
  };
  for (const iss of issues) {
    if (iss.code === "unrecognized_keys") {
      for (const key of iss.keys) push([...iss.path, key], unknownFieldMessage(iss.path, key, input));
    } else {
      push(iss.path, iss.message);
    }
  }
  if (out.length > LIMITS.issues) {
    const more = out.length - LIMITS.issues;
    return [...out.slice(0, LIMITS.issues), { path: "", message: `and ${more} more problem${more === 1 ? "" : "s"}` }];
  }
  return out;
}

function at(input: unknown, path: readonly PropertyKey[]): unknown {
  let cur = input;
  for (const seg of path) {
    if (cur === null || typeof cur !== "object") return undefined;
    cur = Object.prototype.hasOwnProperty.call(cur, seg) ? (cur as Record<PropertyKey, unknown>)[seg] : undefined;
  }
  return cur;
}

const ANALYSIS_KEYS = Object.keys(DEFAULT_ANALYSIS);
const PART_KEYS = [
  "label", "gbw", "aol", "slewRate", "vos", "ib", "en", "in", "enCorner", "inCorner", "swingLow", "swingHigh", "inputLow", "inputHigh",
];

/** What the object at `parent` is called and which fields it takes. */
function container(parent: readonly PropertyKey[], input: unknown): { what: string; keys: string[] } | null {
  const p = parent.map(String);
  const nodeKind = (): NodeKind | null => {
    const k = at(input, [parent[0], parent[1], "kind"]);
    return (NODE_KINDS as readonly unknown[]).includes(k) ? (k as NodeKind) : null;
  };
  if (p.length === 0) return { what: "a chain document", keys: [...TOP_KEYS] };
  if (p.length === 1 && p[0] === "analysis") return { what: "the analysis settings", keys: ANALYSIS_KEYS };
  if (p.length === 1 && p[0] === "tolerances") return { what: "the tolerances", keys: ["resistor", "capacitor", "overrides"] };
  if (p.length === 2 && p[0] === "parts") return { what: "an op-amp part", keys: PART_KEYS };
  if (p.length === 2 && p[0] === "edges") return { what: "an edge", keys: ["from", "to"] };
  if (p[0] !== "nodes") return null;
  const kind = nodeKind();
  if (!kind) return null;
  if (p.length === 2) {
    const keys = ["id", "kind", "label", "position", "params"];
    if (isOpAmpKind(kind)) keys.push("part", "rails");
    return { what: KIND_WORDS[kind], keys };
  }
  if (p.length === 3 && p[2] === "params") return { what: `${KIND_WORDS[kind]}'s params`, keys: Object.keys(PARAM_SPECS[kind]) };
  if (p.length === 3 && p[2] === "position") return { what: "a position", keys: ["x", "y"] };
  if (p.length === 3 && p[2] === "rails") return { what: "the rails", keys: ["low", "high"] };
  return null;
}

function unknownFieldMessage(parent: readonly PropertyKey[], key: string, input: unknown): string {
  const c = container(parent, input);
  if (!c) return "is not a field Chainwright knows here";
  if ((key === "rails" || key === "part") && c.keys.includes("params") && !c.keys.includes(key)) {
    return `only op-amp stages take ${key === "rails" ? "rails" : "a part"}; ${c.what} has none`;
  }
  const guess = closest(key, c.keys);
  const hint = guess ? ` (did you mean ${guess}?)` : "";
  return `is not a field of ${c.what}${hint}; the fields are ${c.keys.join(", ")}`;
}

/** A known key that differs from `key` only in case or by at most two edits (for keys of 3+ letters). */
function closest(key: string, keys: string[]): string | null {
  const lower = key.toLowerCase();
  const byCase = keys.find((k) => k.toLowerCase() === lower);
  if (byCase) return byCase;
  if (key.length < 3 || key.length > 40) return null;
  let best: string | null = null;
  let bestD = 3;
  for (const k of keys) {
    const d = editDistance(lower, k.toLowerCase());
    if (d < bestD) {
      best = k;
      bestD = d;
    }
  }
  return best;
}

function editDistance(a: string, b: string): number {
  const row = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let prev = row[0];
    row[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const tmp = row[j];
      row[j] = Math.min(row[j] + 1, row[j - 1] + 1, prev + (a[i - 1] === b[j - 1] ? 0 : 1));
      prev = tmp;
    }
  }
  return row[b.length];
}
