/**
 * Generators of hostile input for the fuzz tests: chain documents mutated from the demo chains (a
 * value replaced by one of the wrong kind or an extreme number, a key removed or added, an array
 * emptied, duplicated or wrapped, a node copied), documents generated from nothing, and request bodies
 * around them, plus raw JSON text with bytes cut, doubled or swapped. The demo chains are complete and
 * valid, so a small mutation lands near the edge of what the schema accepts, where slips hide.
 */
import fc from "fast-check";
import { ballastPressure, hullVibration, turbidityPhotodiode } from "@/db/seed-data/chains";
import { exampleChain } from "@/lib/chain/example";

export const SEEDS: readonly unknown[] = [hullVibration, ballastPressure, turbidityPhotodiode, exampleChain()];

/** How many runs each property gets: 1,000 in the unit suite, FUZZ_RUNS (npm run fuzz: 10,000) when set. */
export function fuzzRuns(ciDefault = 1000): number {
  const n = Number(process.env.FUZZ_RUNS);
  return Number.isInteger(n) && n > 0 ? n : ciDefault;
}

/** A fixed seed unless FUZZ_SEED is set, so a CI failure replays; npm run fuzz prints the seed it used. */
export function fuzzSeed(): number {
  const n = Number(process.env.FUZZ_SEED);
  return Number.isInteger(n) ? n : 20261203;
}

/** Numbers and strings that break arithmetic or parsing when a check is missing. */
const nastyScalar = fc.constantFrom<unknown>(
  0, -0, -1, 1, 0.5, -1e-300, 1e-300, 1e308, -1e308, Number.MAX_SAFE_INTEGER, Number.MIN_VALUE, 2 ** 53 + 1, 1e21, 20_001, 1_000_000,
  "", " ", "0", "1k", "10e3", "NaN", "Infinity", "-Infinity", "1e999", "\u0000", "\ud800", "__proto__", "constructor", "x".repeat(5000),
  null, true, false, [], {}, [null], [[]], { __proto__: null },
);

/** Any value, nasty ones weighted up. */
export const anyValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 3, arbitrary: nastyScalar },
  { weight: 2, arbitrary: fc.jsonValue({ maxDepth: 3 }) },
  { weight: 1, arbitrary: fc.double() },
  { weight: 1, arbitrary: fc.integer() },
  { weight: 1, arbitrary: fc.string({ maxLength: 40 }) },
);

const keyName = fc.oneof(
  fc.constantFrom("__proto__", "constructor", "prototype", "id", "kind", "params", "from", "to", "nodes", "edges", "part", "rails", "", "toString"),
  fc.string({ maxLength: 12 }),
);

type Json = unknown;
type Step = (string | number)[];

/** Every path to a value inside a JSON tree (the root is []). */
function allPaths(value: Json, prefix: Step = [], out: Step[] = []): Step[] {
  out.push(prefix);
  if (Array.isArray(value)) value.forEach((v, i) => allPaths(v, [...prefix, i], out));
  else if (value && typeof value === "object") for (const k of Object.keys(value)) allPaths((value as Record<string, Json>)[k], [...prefix, k], out);
  return out;
}

function getAt(root: Json, path: Step): Json {
  let v: Json = root;
  for (const p of path) v = (v as Record<string | number, Json>)[p];
  return v;
}

function setAt(root: Json, path: Step, value: Json): Json {
  if (path.length === 0) return value;
  const parent = getAt(root, path.slice(0, -1)) as Record<string | number, Json>;
  // defineProperty so that a "__proto__" key is an own field, as JSON.parse makes it
  Object.defineProperty(parent, path[path.length - 1], { value, enumerable: true, writable: true, configurable: true });
  return root;
}

function removeAt(root: Json, path: Step): Json {
  if (path.length === 0) return undefined;
  const parent = getAt(root, path.slice(0, -1));
  const last = path[path.length - 1];
  if (Array.isArray(parent)) parent.splice(last as number, 1);
  else delete (parent as Record<string, Json>)[last as string];
  return root;
}

type Mutation =
  | { op: "replace"; at: number; value: unknown }
  | { op: "remove"; at: number }
  | { op: "addKey"; at: number; key: string; value: unknown }
  | { op: "wrap"; at: number }
  | { op: "duplicate"; at: number }
  | { op: "empty"; at: number }
  | { op: "swap"; at: number; other: number };

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  { weight: 5, arbitrary: fc.record({ op: fc.constant("replace" as const), at: fc.nat(), value: anyValue }) },
  { weight: 2, arbitrary: fc.record({ op: fc.constant("remove" as const), at: fc.nat() }) },
  { weight: 2, arbitrary: fc.record({ op: fc.constant("addKey" as const), at: fc.nat(), key: keyName, value: anyValue }) },
  { weight: 1, arbitrary: fc.record({ op: fc.constant("wrap" as const), at: fc.nat() }) },
  { weight: 1, arbitrary: fc.record({ op: fc.constant("duplicate" as const), at: fc.nat() }) },
  { weight: 1, arbitrary: fc.record({ op: fc.constant("empty" as const), at: fc.nat() }) },
  { weight: 1, arbitrary: fc.record({ op: fc.constant("swap" as const), at: fc.nat(), other: fc.nat() }) },
);

function apply(doc: Json, m: Mutation): Json {
  const paths = allPaths(doc);
  const path = paths[m.at % paths.length];
  const here = getAt(doc, path);
  switch (m.op) {
    case "replace":
      return setAt(doc, path, structuredClone(m.value));
    case "remove":
      return removeAt(doc, path);
    case "addKey":
      if (here && typeof here === "object" && !Array.isArray(here)) setAt(doc, [...path, m.key], structuredClone(m.value));
      return doc;
    case "wrap":
      return setAt(doc, path, [here]);
    case "duplicate":
      if (Array.isArray(here) && here.length) here.push(structuredClone(here[m.at % here.length]));
      return doc;
    case "empty":
      return setAt(doc, path, Array.isArray(here) ? [] : here && typeof here === "object" ? {} : "");
    case "swap": {
      const other = paths[m.other % paths.length];
      // swapping a value with its own ancestor would make a cycle; swap leaves only
      if (path.length === 0 || other.length === 0 || isPrefix(path, other) || isPrefix(other, path)) return doc;
      const a = structuredClone(here);
      const b = structuredClone(getAt(doc, other));
      setAt(doc, path, b);
      return setAt(doc, other, a);
    }
  }
}

function isPrefix(a: Step, b: Step): boolean {
  return a.length <= b.length && a.every((p, i) => b[i] === p);
}

/** A demo chain with one to five mutations. */
export const mutatedChain: fc.Arbitrary<unknown> = fc
  .tuple(fc.nat({ max: SEEDS.length - 1 }), fc.array(mutation, { minLength: 1, maxLength: 4 }))
  .map(([seed, steps]) => steps.reduce<Json>((doc, m) => (doc === undefined ? doc : apply(doc, m)), structuredClone(SEEDS[seed])));

const kinds = fc.constantFrom("source", "rcLowpass", "rcHighpass", "inverting", "noninverting", "follower", "sallenKeyLowpass", "adc", "nope", "", 3);

/** A chain document built from nothing: plausible shape, arbitrary contents. */
export const generatedChain: fc.Arbitrary<unknown> = fc.record(
  {
    format: fc.oneof(fc.constant("chainwright.chain/1"), anyValue),
    name: fc.oneof(fc.string({ maxLength: 250 }), anyValue),
    analysis: fc.oneof(
      fc.record({ fMin: anyValue, fMax: anyValue, points: fc.oneof(fc.integer({ min: -5, max: 3000 }), anyValue) }, { requiredKeys: [] }),
      anyValue,
    ),
    nodes: fc.array(
      fc.record(
        {
          id: fc.oneof(fc.constantFrom("a", "b", "c", "d"), anyValue),
          kind: kinds,
          params: fc.oneof(fc.dictionary(fc.constantFrom("r", "c", "r1", "r2", "rf", "rg", "bits", "sampleRate", "vinLow", "vinHigh", "dc", "amplitude", "fLow", "fHigh"), anyValue), anyValue),
          rails: fc.oneof(fc.record({ low: anyValue, high: anyValue }), anyValue),
          part: anyValue,
        },
        { requiredKeys: ["id", "kind"] },
      ),
      { maxLength: 6 },
    ),
    edges: fc.array(fc.record({ from: fc.oneof(fc.constantFrom("a", "b", "c", "d"), anyValue), to: fc.oneof(fc.constantFrom("a", "b", "c", "d"), anyValue) }), { maxLength: 6 }),
  },
  { requiredKeys: [] },
);

export const chainDocument: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 6, arbitrary: mutatedChain },
  { weight: 2, arbitrary: generatedChain },
  { weight: 1, arbitrary: anyValue },
  { weight: 1, arbitrary: fc.constantFrom(...SEEDS).map((s) => structuredClone(s)) },
);

const ABSENT = Symbol("absent");
/** A field that is left out four times in five. */
export function sometimes<T>(arb: fc.Arbitrary<T>): fc.Arbitrary<T | typeof ABSENT> {
  return fc.oneof({ weight: 4, arbitrary: fc.constant(ABSENT) }, { weight: 1, arbitrary: arb });
}
export function withoutAbsent(record: Record<string, unknown>): Record<string, unknown> {
  return Object.fromEntries(Object.entries(record).filter(([, v]) => v !== ABSENT));
}

/** `{ chain, freqs?, points? }` with the options themselves sometimes hostile, sometimes extra keys. */
export const analyzeBody: fc.Arbitrary<unknown> = fc.oneof(
  {
    weight: 8,
    arbitrary: fc.record({
      chain: chainDocument,
      freqs: sometimes(fc.oneof(fc.array(fc.oneof({ weight: 9, arbitrary: fc.double({ min: 1e-3, max: 1e9, noNaN: true }) }, { weight: 1, arbitrary: anyValue }), { maxLength: 8 }), anyValue)),
      points: sometimes(fc.oneof({ weight: 4, arbitrary: fc.integer({ min: -10, max: 800 }) }, { weight: 1, arbitrary: anyValue })),
      extra: sometimes(anyValue),
    }).map(withoutAbsent),
  },
  { weight: 1, arbitrary: anyValue },
);

/** JSON text of a body with a few characters cut, doubled or swapped for a random one. */
export function mangledText(body: fc.Arbitrary<unknown>): fc.Arbitrary<string> {
  return fc
    .tuple(body, fc.array(fc.tuple(fc.nat(), fc.constantFrom("cut", "double", "swap"), fc.constantFrom("{", "}", "[", "]", '"', ",", ":", "\\", "0", "-", "e", "\u0000", "\ud83d", " ")), { minLength: 1, maxLength: 4 }))
    .map(([value, edits]) => {
      let text = JSON.stringify(value) ?? "";
      for (const [at, op, ch] of edits) {
        const i = text.length ? at % text.length : 0;
        if (op === "cut") text = text.slice(0, i) + text.slice(i + 1);
        else if (op === "double") text = text.slice(0, i) + text[i] + text.slice(i);
        else text = text.slice(0, i) + ch + text.slice(i + 1);
      }
      return text;
    });
}

/** Tally of outcomes a fuzz test prints at the end, so a run shows what it exercised. */
export class Tally {
  private readonly counts = new Map<string, number>();
  add(key: string | number): void {
    const k = String(key);
    this.counts.set(k, (this.counts.get(k) ?? 0) + 1);
  }
  get total(): number {
    return [...this.counts.values()].reduce((a, b) => a + b, 0);
  }
  get(key: string | number): number {
    return this.counts.get(String(key)) ?? 0;
  }
  line(label: string): string {
    const parts = [...this.counts.entries()].sort(([a], [b]) => a.localeCompare(b)).map(([k, n]) => `${k}: ${n}`);
    return `[fuzz] ${label}: ${this.total} inputs (${parts.join(", ")})`;
  }
}

/**
 * A 400 body names the field of each problem: `{ errors: [{ path, message }] }` with a non-empty
 * message, and a non-empty path unless the whole body is the problem (not JSON, not an object).
 */
export function refusalProblem(body: unknown, wholeBodyAllowed: boolean): string | null {
  if (!body || typeof body !== "object" || !Array.isArray((body as { errors?: unknown }).errors)) return `400 without an errors list: ${JSON.stringify(body)}`;
  const errors = (body as { errors: unknown[] }).errors;
  if (errors.length === 0) return "400 with an empty errors list";
  for (const e of errors) {
    if (!e || typeof e !== "object") return `error entry is not an object: ${JSON.stringify(e)}`;
    const { path, message } = e as { path?: unknown; message?: unknown };
    if (typeof path !== "string") return `error without a path: ${JSON.stringify(e)}`;
    if (typeof message !== "string" || !message.trim()) return `error without a message: ${JSON.stringify(e)}`;
    if (!path && !wholeBodyAllowed) return `error that names no field: ${JSON.stringify(e)}`;
  }
  return null;
}
