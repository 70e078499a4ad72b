/**
 * Property tests (fast-check): the validators never throw, every refusal carries a path and a message,
 * and valid documents survive a round trip through JSON and validation unchanged.
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { completeSubchain, validateChain, validateDraft } from "@/lib/chain/schema";
import type { ChainIssue } from "@/lib/chain/types";

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- documents under test are built and broken freely
type Doc = Record<string, any>;

const pos = fc.double({ min: 1e-12, max: 1e9, noNaN: true });
const volts = fc.double({ min: -50, max: 50, noNaN: true });
const rails = fc.tuple(volts, fc.double({ min: 0.1, max: 50, noNaN: true })).map(([low, span]) => ({ low, high: low + span }));

const stageArb: fc.Arbitrary<Doc> = fc.oneof(
  fc.record({ kind: fc.constant("inverting"), params: fc.record({ r1: pos, r2: pos, vref: volts }, { requiredKeys: ["r1", "r2"] }), rails }),
  fc.record({ kind: fc.constant("noninverting"), params: fc.record({ rf: pos, rg: pos }), rails }),
  fc.record({ kind: fc.constant("lossyIntegrator"), params: fc.record({ r1: pos, r2: pos, c2: pos }), rails, part: fc.constantFrom("p1", null) }),
  fc.record({ kind: fc.constant("integrator"), params: fc.record({ r1: pos, c2: pos }), rails }),
  fc.record({ kind: fc.constant("rcLowpass"), params: fc.record({ r: pos, c: pos }), label: fc.string({ maxLength: 20 }) }),
  fc.record({ kind: fc.constant("rcHighpass"), params: fc.record({ c: pos, r: pos, vbias: volts }, { requiredKeys: ["c", "r"] }) }),
  fc.record({ kind: fc.constant("sallenKeyLowpass"), params: fc.record({ r1: pos, r2: pos, c1: pos, c2: pos }), rails }),
  fc.record({ kind: fc.constant("mfbLowpass"), params: fc.record({ r1: pos, r2: pos, r3: pos, c1: pos, c2: pos }), rails }),
  // filters: the Sallen-Key gain network (rf alone or with rg) and the high-pass sections
  fc.record({ kind: fc.constant("sallenKeyLowpass"), params: fc.record({ r1: pos, r2: pos, c1: pos, c2: pos, rf: pos }), rails }),
  fc.record({ kind: fc.constant("sallenKeyHighpass"), params: fc.record({ c1: pos, c2: pos, r1: pos, r2: pos, rf: pos, rg: pos }, { requiredKeys: ["c1", "c2", "r1", "r2"] }).filter((p) => p.rg === undefined || p.rf !== undefined), rails }),
  fc.record({ kind: fc.constant("mfbHighpass"), params: fc.record({ c1: pos, c2: pos, c3: pos, r1: pos, r2: pos, vref: volts }, { requiredKeys: ["c1", "c2", "c3", "r1", "r2"] }), rails }),
);

/** A valid chain: a source, a tree of stages (each fed by an earlier node), and ADCs on some of them. */
const chainArb: fc.Arbitrary<Doc> = fc
  .record({
    stages: fc.array(fc.tuple(stageArb, fc.nat()), { maxLength: 6 }),
    adcs: fc.array(fc.tuple(fc.integer({ min: 1, max: 32 }), fc.nat()), { maxLength: 3 }),
    resistance: fc.double({ min: 0, max: 1e4, noNaN: true }),
    fLow: fc.double({ min: 0, max: 10, noNaN: true }),
    analysis: fc.record({ fMin: fc.double({ min: 0.01, max: 1, noNaN: true }), points: fc.integer({ min: 2, max: 2000 }) }, { requiredKeys: [] }),
  })
  .map(({ stages, adcs, resistance, fLow, analysis }) => {
    const nodes: Doc[] = [{ id: "src", kind: "source", params: { dc: 0.1, amplitude: 0.5, fLow, fHigh: fLow + 100, resistance } }];
    const edges: Doc[] = [];
    stages.forEach(([stage, pick], i) => {
      const from = nodes[pick % nodes.length].id;
      nodes.push({ id: `n${i}`, ...stage });
      edges.push({ from, to: `n${i}` });
    });
    const feeders = nodes.slice(); // an ADC feeds nothing, so ADCs hang only off the source and stages
    adcs.forEach(([bits, pick], i) => {
      const from = feeders[pick % feeders.length].id;
      nodes.push({ id: `adc${i}`, kind: "adc", params: { bits, sampleRate: 1e4, vinLow: -1, vinHigh: 1 } });
      edges.push({ from, to: `adc${i}` });
    });
    return { format: "chainwright.chain/1", name: "Random", analysis, parts: { p1: { gbw: 1e6 } }, nodes, edges };
  });

/** A value anywhere in a document: numbers of every sort, text, lists, objects, nothing. */
const junk = fc.oneof(
  fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, -1, 0, -0, 1e308, -1e308, 5e-324, "", "4k7", "__proto__", null, true, [], {}),
  fc.double(),
  fc.string(),
  fc.jsonValue({ maxDepth: 3 }),
);

/** Every path to a value inside a document. */
function allPaths(v: unknown, prefix: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  out.push(prefix);
  if (Array.isArray(v)) v.forEach((x, i) => allPaths(x, [...prefix, i], out));
  else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) allPaths(x, [...prefix, k], out);
  return out;
}

type Mutation = { kind: "set" | "delete" | "add"; pick: number; value: unknown; key: string };
const mutationArb: fc.Arbitrary<Mutation> = fc.record({
  kind: fc.constantFrom("set", "delete", "add"),
  pick: fc.nat(),
  value: junk,
  key: fc.oneof(fc.constantFrom("__proto__", "constructor", "rails", "part", "r1", "kind", "id"), fc.string({ maxLength: 8 })),
});

function mutate(doc: Doc, muts: Mutation[]): unknown {
  let root: unknown = structuredClone(doc);
  for (const m of muts) {
    const paths = allPaths(root);
    const path = paths[m.pick % paths.length];
    if (path.length === 0) {
      if (m.kind === "set") root = m.value;
      continue;
    }
    let parent = root as Doc;
    for (const seg of path.slice(0, -1)) parent = parent[seg];
    const last = path[path.length - 1];
    if (m.kind === "set") parent[last] = m.value;
    else if (m.kind === "delete") {
      if (Array.isArray(parent)) parent.splice(last as number, 1);
      else delete parent[last];
    } else if (parent[last] && typeof parent[last] === "object" && !Array.isArray(parent[last])) {
      Object.defineProperty(parent[last], m.key, { value: m.value, enumerable: true, writable: true, configurable: true });
    }
  }
  return root;
}

function wellFormed(errors: ChainIssue[]): void {
  expect(errors.length).toBeGreaterThan(0);
  for (const e of errors) {
    expect(typeof e.path).toBe("string");
    expect(typeof e.message).toBe("string");
    expect(e.message.length).toBeGreaterThan(0);
  }
}

describe("validateChain and validateDraft (properties)", () => {
  it("accept every generated valid chain, and the result is a fixed point that survives JSON", () => {
    fc.assert(
      fc.property(chainArb, (doc) => {
        const r = validateChain(doc);
        if (!r.ok) throw new Error(JSON.stringify(r.errors));
        const again = validateChain(JSON.parse(JSON.stringify(r.chain)));
        expect(again.ok && again.chain).toEqual(r.chain);
        const d = validateDraft(doc);
        expect(d.ok).toBe(true);
        const sub = completeSubchain(doc);
        expect(sub.issues).toEqual([]);
        expect(sub.chain).toEqual(r.chain);
      }),
      { numRuns: 300 },
    );
  });

  it("never throw on random JSON-like values, and every refusal has a path and a message", () => {
    fc.assert(
      fc.property(fc.oneof(fc.anything(), fc.jsonValue(), fc.object()), (input) => {
        for (const r of [validateChain(input), validateDraft(input)]) if (!r.ok) wellFormed(r.errors);
        const sub = completeSubchain(input);
        expect(Array.isArray(sub.issues)).toBe(true);
      }),
      { numRuns: 1500 },
    );
  });

  it("never throw on mutations of valid chains; what they accept re-validates to itself", () => {
    fc.assert(
      fc.property(chainArb, fc.array(mutationArb, { minLength: 1, maxLength: 4 }), (doc, muts) => {
        const input = mutate(doc, muts);
        const r = validateChain(input);
        if (r.ok) {
          const again = validateChain(JSON.parse(JSON.stringify(r.chain)));
          expect(again.ok && again.chain).toEqual(r.chain);
        } else wellFormed(r.errors);
        const d = validateDraft(input);
        if (!d.ok) wellFormed(d.errors);
        const sub = completeSubchain(input);
        if (sub.chain) expect(validateChain(sub.chain).ok).toBe(true);
        for (const i of sub.issues) expect(i.message.length).toBeGreaterThan(0);
        expect(({} as Doc).polluted).toBeUndefined();
      }),
      { numRuns: 1500 },
    );
  });

  it("a chain valid at the complete level is always a valid draft", () => {
    fc.assert(
      fc.property(chainArb, fc.array(mutationArb, { maxLength: 2 }), (doc, muts) => {
        const input = mutate(doc, muts);
        if (validateChain(input).ok) expect(validateDraft(input).ok).toBe(true);
      }),
      { numRuns: 500 },
    );
  });
});
