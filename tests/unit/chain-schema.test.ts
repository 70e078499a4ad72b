/**
 * The complete level of the chain document, checked against chain-format.md (fields, defaults, limits,
 * graph rules) and the messages promised in the schema task.
 */
import { describe, expect, it } from "vitest";
import { chainSchema, formatPath, issueText, partSchema, validateChain } from "@/lib/chain/schema";
import { exampleChain } from "@/lib/chain/example";
import type { ChainIssue } from "@/lib/chain/types";

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- documents under test are built and broken freely
type Doc = Record<string, any>;

/** A small valid chain: source → inverting → adc, no defaults written. */
function minimal(): Doc {
  return {
    format: "chainwright.chain/1",
    name: "Minimal",
    nodes: [
      { id: "src", kind: "source", params: { dc: 0.1, amplitude: 0.2, fLow: 1, fHigh: 100 } },
      { id: "u1", kind: "inverting", params: { r1: 1e3, r2: 1e4 }, rails: { low: -5, high: 5 } },
      { id: "adc", kind: "adc", params: { bits: 12, sampleRate: 1000, vinLow: 0, vinHigh: 3.3 } },
    ],
    edges: [
      { from: "src", to: "u1" },
      { from: "u1", to: "adc" },
    ],
  };
}

/** A chain with `stage` between the source and the ADC. */
function withStage(stage: Doc): Doc {
  const d = minimal();
  d.nodes[1] = { id: "u1", ...stage };
  return d;
}

const errorsOf = (input: unknown): ChainIssue[] => {
  const r = validateChain(input);
  if (r.ok) throw new Error("expected the document to be refused");
  return r.errors;
};
const paths = (input: unknown) => errorsOf(input).map((e) => e.path);
const find = (input: unknown, path: string) => errorsOf(input).find((e) => e.path === path);

const rails = { low: -12, high: 12 };

/** One valid instance of every kind with all required params (chain-format.md "Stage kinds"). */
const STAGES: Record<string, Doc> = {
  inverting: { kind: "inverting", params: { r1: 1e3, r2: 1e4 }, rails },
  noninverting: { kind: "noninverting", params: { rf: 9e3, rg: 1e3 }, rails },
  lossyIntegrator: { kind: "lossyIntegrator", params: { r1: 1e4, r2: 1e5, c2: 1e-8 }, rails },
  integrator: { kind: "integrator", params: { r1: 1e4, c2: 1e-6 }, rails },
  rcLowpass: { kind: "rcLowpass", params: { r: 1e3, c: 1e-7 } },
  rcHighpass: { kind: "rcHighpass", params: { c: 1e-6, r: 1e5 } },
  sallenKeyLowpass: { kind: "sallenKeyLowpass", params: { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }, rails },
  mfbLowpass: { kind: "mfbLowpass", params: { r1: 1e4, r2: 1e4, r3: 1e4, c1: 1e-7, c2: 1e-8 }, rails },
};

/** Required params per kind, as listed in chain-format.md. */
const REQUIRED: Record<string, string[]> = {
  source: ["dc", "amplitude", "fLow", "fHigh"],
  inverting: ["r1", "r2"],
  noninverting: [],
  lossyIntegrator: ["r1", "r2", "c2"],
  integrator: ["r1", "c2"],
  rcLowpass: ["r", "c"],
  rcHighpass: ["c", "r"],
  sallenKeyLowpass: ["r1", "r2", "c1", "c2"],
  mfbLowpass: ["r1", "r2", "r3", "c1", "c2"],
  adc: ["bits", "sampleRate", "vinLow", "vinHigh"],
};

describe("validateChain: accepted documents", () => {
  it("accepts the example of chain-format.md and returns it unchanged", () => {
    const r = validateChain(exampleChain());
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.chain).toEqual(exampleChain());
  });

  it("fills every default of chain-format.md", () => {
    const r = validateChain(minimal());
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const c = r.chain;
    expect(c.notes).toBe("");
    expect(c.analysis).toEqual({
      fMin: 0.1,
      fMax: 1e6,
      points: 600,
      temperatureK: 298.15,
      noiseLow: 0.1,
      noiseHigh: null,
      aliasTargetDb: null,
    });
    expect(c.tolerances).toEqual({ resistor: 0.01, capacitor: 0.05 });
    expect(c.parts).toEqual({});
    expect(c.nodes[0].params).toEqual({
      dc: 0.1,
      amplitude: 0.2,
      fLow: 1,
      fHigh: 100,
      dcSpread: 0,
      resistance: 0,
      noiseDensity: 0,
      safety: "low-voltage",
    });
    expect(c.nodes[1].params).toEqual({ r1: 1e3, r2: 1e4, vref: 0 });
    expect(c.nodes[2].params).toMatchObject({ inputResistance: null });
    expect("part" in c.nodes[1]).toBe(false); // absent stays absent: an ideal op-amp
  });

  it("fills the defaults of every kind: vref, vbias, rf and rg", () => {
    const defaults: Record<string, Doc> = {
      lossyIntegrator: { vref: 0 },
      integrator: { vref: 0 },
      rcHighpass: { vbias: 0 },
      sallenKeyLowpass: { vref: 0 },
      mfbLowpass: { vref: 0 },
    };
    for (const [kind, want] of Object.entries(defaults)) {
      const r = validateChain(withStage(STAGES[kind]));
      if (!r.ok) throw new Error(`${kind}: ${JSON.stringify(r.errors)}`);
      expect(r.chain.nodes[1].params).toMatchObject(want);
    }
    const follower = validateChain(withStage({ kind: "noninverting", params: {}, rails }));
    expect(follower.ok && follower.chain.nodes[1].params).toEqual({ rf: null, rg: null, vref: 0 });
  });

  it("keeps the analysis and tolerance fields given and fills the rest", () => {
    const d = minimal();
    d.analysis = { fMax: 1e4, aliasTargetDb: 60 };
    d.tolerances = { capacitor: 0.1 };
    const r = validateChain(d);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.chain.analysis).toMatchObject({ fMin: 0.1, fMax: 1e4, points: 600, aliasTargetDb: 60 });
    expect(r.chain.tolerances).toEqual({ resistor: 0.01, capacitor: 0.1 });
  });

  it("accepts every stage kind with its required params only", () => {
    for (const [kind, stage] of Object.entries(STAGES)) {
      const r = validateChain(withStage(stage));
      expect(r.ok, `${kind}: ${r.ok ? "" : JSON.stringify(r.errors)}`).toBe(true);
    }
  });

  it("accepts the limits' boundary values", () => {
    const d = minimal();
    d.nodes[0].params = { dc: -1, amplitude: 0, fLow: 0, fHigh: 1e-3, resistance: 0, dcSpread: 0, noiseDensity: 0 };
    d.nodes[2].params.bits = 32;
    d.analysis = { points: 20_000 };
    d.tolerances = { resistor: 0, capacitor: 0.5 };
    expect(validateChain(d).ok).toBe(true);
    d.nodes[2].params.bits = 1;
    d.analysis = { points: 2 };
    expect(validateChain(d).ok).toBe(true);
  });

  it("accepts a fan-out (one source, two channels) and a path that ends without an ADC", () => {
    const d = minimal();
    d.nodes.push({ id: "rc", kind: "rcLowpass", params: { r: 1e3, c: 1e-9 } });
    d.edges.push({ from: "src", to: "rc" });
    expect(validateChain(d).ok).toBe(true);
  });

  it("accepts part null (ideal) and a part named in parts; every part field is optional", () => {
    const d = withStage({ ...STAGES.inverting, part: null });
    expect(validateChain(d).ok).toBe(true);
    d.parts = { opa: {} };
    d.nodes[1].part = "opa";
    expect(validateChain(d).ok).toBe(true);
  });

  it("accepts negative inputLow/inputHigh (input range beyond the rail, chain-format.md)", () => {
    expect(partSchema.safeParse({ inputLow: -0.1, inputHigh: -0.1 }).success).toBe(true);
  });
});

describe("validateChain: params, required and limited", () => {
  it("requires each kind's required params, naming the field and its unit", () => {
    const nodes: Record<string, Doc> = { ...STAGES, source: minimal().nodes[0], adc: minimal().nodes[2] };
    for (const [kind, required] of Object.entries(REQUIRED)) {
      for (const key of required) {
        const d = kind === "source" || kind === "adc" ? minimal() : withStage(nodes[kind]);
        const i = kind === "source" ? 0 : kind === "adc" ? 2 : 1;
        delete d.nodes[i].params[key];
        const e = find(d, `nodes[${i}].params.${key}`);
        expect(e?.message, `${kind}.${key}`).toMatch(/^is required: /);
      }
    }
  });

  it("states the rule with the unit in plain words", () => {
    const d = withStage({ ...STAGES.lossyIntegrator, params: { r1: 1e4, r2: 1e5, c2: -1e-9 } });
    const e = find(d, "nodes[1].params.c2")!;
    expect(issueText(e)).toBe("nodes[1].params.c2: must be a positive number of farads (found -1e-9)");
    const r = withStage({ ...STAGES.inverting, params: { r1: 0, r2: 1e3 } });
    expect(find(r, "nodes[1].params.r1")?.message).toMatch(/^must be a positive number of ohms/);
    const b = minimal();
    b.nodes[2].params.bits = 33;
    expect(find(b, "nodes[2].params.bits")?.message).toMatch(/^must be an integer from 1 to 32/);
  });

  const bad: [string, (d: Doc) => void, string, RegExp][] = [
    ["NaN resistor", (d) => (d.nodes[1].params.r1 = Number.NaN), "nodes[1].params.r1", /positive number of ohms.*NaN/],
    ["infinite resistor", (d) => (d.nodes[1].params.r2 = Number.POSITIVE_INFINITY), "nodes[1].params.r2", /positive number of ohms/],
    ["text for a number", (d) => (d.nodes[1].params.r1 = "4k7"), "nodes[1].params.r1", /not text.*write 4700 for "4k7"/],
    ["true for a number", (d) => (d.nodes[1].params.r1 = true), "nodes[1].params.r1", /found true/],
    ["negative amplitude", (d) => (d.nodes[0].params.amplitude = -0.1), "nodes[0].params.amplitude", /volts, 0 or more/],
    ["negative dcSpread", (d) => (d.nodes[0].params.dcSpread = -1), "nodes[0].params.dcSpread", /volts, 0 or more/],
    ["negative resistance", (d) => (d.nodes[0].params.resistance = -1), "nodes[0].params.resistance", /ohms, 0 or more/],
    ["negative noise", (d) => (d.nodes[0].params.noiseDensity = -1e-9), "nodes[0].params.noiseDensity", /V\/√Hz, 0 or more/],
    ["negative fLow", (d) => (d.nodes[0].params.fLow = -1), "nodes[0].params.fLow", /hertz, 0 or more/],
    ["fLow = fHigh", (d) => (d.nodes[0].params.fLow = 100), "nodes[0].params.fHigh", /above fLow/],
    ["unknown safety", (d) => (d.nodes[0].params.safety = "mains"), "nodes[0].params.safety", /one of "low-voltage", "mains-connected", "body-connected"/],
    ["fractional bits", (d) => (d.nodes[2].params.bits = 12.5), "nodes[2].params.bits", /integer from 1 to 32/],
    ["zero bits", (d) => (d.nodes[2].params.bits = 0), "nodes[2].params.bits", /integer from 1 to 32/],
    ["zero sample rate", (d) => (d.nodes[2].params.sampleRate = 0), "nodes[2].params.sampleRate", /positive number of hertz/],
    ["vinLow = vinHigh", (d) => (d.nodes[2].params.vinLow = 3.3), "nodes[2].params.vinHigh", /above vinLow/],
    ["zero input resistance", (d) => (d.nodes[2].params.inputResistance = 0), "nodes[2].params.inputResistance", /positive number of ohms, or null/],
    ["rails reversed", (d) => (d.nodes[1].rails = { low: 5, high: -5 }), "nodes[1].rails.high", /above low/],
    ["rails equal", (d) => (d.nodes[1].rails = { low: 0, high: 0 }), "nodes[1].rails.high", /above low/],
    ["rail as text", (d) => (d.nodes[1].rails = { low: "-5", high: 5 }), "nodes[1].rails.low", /number of volts/],
    ["points too few", (d) => (d.analysis = { points: 1 }), "analysis.points", /integer from 2 to 20000/],
    ["points too many", (d) => (d.analysis = { points: 20_001 }), "analysis.points", /integer from 2 to 20000/],
    ["fractional points", (d) => (d.analysis = { points: 100.5 }), "analysis.points", /integer/],
    ["fMin zero", (d) => (d.analysis = { fMin: 0 }), "analysis.fMin", /positive number of hertz/],
    ["fMin above fMax", (d) => (d.analysis = { fMin: 10, fMax: 5 }), "analysis.fMax", /above fMin/],
    ["fMax below default fMin", (d) => (d.analysis = { fMax: 0.05 }), "analysis.fMax", /above fMin/],
    ["zero temperature", (d) => (d.analysis = { temperatureK: 0 }), "analysis.temperatureK", /positive number of kelvin/],
    ["zero noiseLow", (d) => (d.analysis = { noiseLow: 0 }), "analysis.noiseLow", /positive number of hertz/],
    ["noiseHigh below noiseLow", (d) => (d.analysis = { noiseLow: 10, noiseHigh: 5 }), "analysis.noiseHigh", /above noiseLow/],
    ["noiseLow at fMax", (d) => (d.analysis = { fMax: 100, noiseLow: 100 }), "analysis.noiseLow", /below fMax/],
    ["aliasTargetDb as text", (d) => (d.analysis = { aliasTargetDb: "60 dB" }), "analysis.aliasTargetDb", /decibels, or null/],
    ["tolerance over 50 %", (d) => (d.tolerances = { resistor: 0.6 }), "tolerances.resistor", /fraction from 0 to 0.5/],
    ["negative tolerance", (d) => (d.tolerances = { capacitor: -0.01 }), "tolerances.capacitor", /fraction from 0 to 0.5/],
    ["empty name", (d) => (d.name = ""), "name", /1 to 200 characters/],
    ["blank name", (d) => (d.name = "   "), "name", /not only spaces/],
    ["long name", (d) => (d.name = "x".repeat(201)), "name", /1 to 200 characters \(found 201\)/],
    ["missing name", (d) => delete d.name, "name", /^is required/],
    ["notes not text", (d) => (d.notes = 5), "notes", /text of up to/],
    ["analysis not an object", (d) => (d.analysis = []), "analysis", /analysis settings.*found a list/],
    ["nodes not a list", (d) => (d.nodes = {}), "nodes", /list of nodes/],
    ["missing edges", (d) => delete d.edges, "edges", /^is required/],
    ["edge end not text", (d) => (d.edges[0].to = 3), "edges[0].to", /id of a node/],
    ["negative part figure", (d) => (d.parts = { p: { vos: -1e-3 } }), "parts.p.vos", /volts, 0 or more/],
    ["gbw zero", (d) => (d.parts = { p: { gbw: 0 } }), "parts.p.gbw", /positive number of hertz/],
    ["aol in dB as text", (d) => (d.parts = { p: { aol: "100 dB" } }), "parts.p.aol", /V\/V, not dB/],
    ["part name with a space", (d) => (d.parts = { "my part": {} }), 'parts["my part"]', /part name must be 1 to 32/],
    ["position not numbers", (d) => (d.nodes[0].position = { x: "0", y: 0 }), "nodes[0].position.x", /a number/],
    ["label too long", (d) => (d.nodes[1].label = "x".repeat(201)), "nodes[1].label", /up to 200/],
  ];
  for (const [what, mutate, path, message] of bad) {
    it(`refuses ${what} at ${path}`, () => {
      const d = minimal();
      mutate(d);
      const e = find(d, path);
      expect(e, JSON.stringify(errorsOf(d))).toBeDefined();
      expect(e!.message).toMatch(message);
    });
  }

  it("requires rails on every op-amp stage and says why there is no default", () => {
    for (const kind of ["inverting", "noninverting", "lossyIntegrator", "integrator", "sallenKeyLowpass", "mfbLowpass"]) {
      const stage = { ...STAGES[kind] };
      delete stage.rails;
      expect(find(withStage(stage), "nodes[1].rails")?.message, kind).toMatch(/^is required on every op-amp stage/);
    }
  });

  it("refuses rails and part on stages without an op-amp", () => {
    const d = withStage({ ...STAGES.rcLowpass, rails, part: null });
    expect(find(d, "nodes[1].rails")?.message).toMatch(/only op-amp stages take rails/);
    expect(find(d, "nodes[1].part")?.message).toMatch(/only op-amp stages take a part/);
  });

  it("requires rf once rg is given; a follower needs neither", () => {
    expect(find(withStage({ kind: "noninverting", params: { rg: 1e3 }, rails }), "nodes[1].params.rf")?.message).toMatch(
      /required when rg is given/,
    );
    expect(validateChain(withStage({ kind: "noninverting", params: { rf: 1e3 }, rails })).ok).toBe(true);
    expect(validateChain(withStage({ kind: "noninverting", params: { rf: null, rg: null }, rails })).ok).toBe(true);
  });

  it("requires part to name a key of parts", () => {
    const d = withStage({ ...STAGES.inverting, part: "p9" });
    d.parts = { p1: {} };
    expect(find(d, "nodes[1].part")?.message).toBe('names no part of this chain ("p9"); parts has "p1"');
    const inherited = withStage({ ...STAGES.inverting, part: "toString" });
    expect(find(inherited, "nodes[1].part")?.message).toMatch(/names no part/);
  });
});

describe("validateChain: ids and graph rules", () => {
  it("checks ids: 1 to 32 characters of [A-Za-z0-9_-], unique, not a built-in object name", () => {
    for (const id of ["", "a b", "ü", "x".repeat(33), "a.b"]) {
      const d = minimal();
      d.nodes[1].id = id;
      d.edges = [];
      expect(find(d, "nodes[1].id")?.message, id).toMatch(/1 to 32 characters of letters, digits, _ and -/);
    }
    for (const id of ["__proto__", "constructor", "hasOwnProperty"]) {
      const d = minimal();
      d.nodes[2].id = id;
      d.edges[1].to = id;
      expect(find(d, "nodes[2].id")?.message, id).toMatch(/name every JavaScript object already has/);
    }
    const ok = minimal();
    ok.nodes[1].id = "A_b-9".padEnd(32, "x");
    ok.edges[0].to = ok.edges[1].from = ok.nodes[1].id;
    expect(validateChain(ok).ok).toBe(true);
  });

  it("refuses duplicate ids", () => {
    const d = minimal();
    d.nodes[2].id = "u1";
    expect(find(d, "nodes[2].id")?.message).toMatch(/repeats the id "u1" of nodes\[1\]/);
  });

  it("refuses edges to unknown ids, into the source, out of an ADC, and a second input", () => {
    const d = minimal();
    d.nodes.push({ id: "adc2", kind: "adc", params: { bits: 8, sampleRate: 1e3, vinLow: 0, vinHigh: 1 } });
    d.edges.push({ from: "u1", to: "ghost" }, { from: "u1", to: "src" }, { from: "adc", to: "adc2" }, { from: "src", to: "adc" });
    const errors = errorsOf(d);
    expect(errors).toContainEqual({ path: "edges[2].to", message: 'names no node of this chain ("ghost")' });
    expect(errors.find((e) => e.path === "edges[3].to")?.message).toMatch(/leads into the source "src"/);
    expect(errors.find((e) => e.path === "edges[4].from")?.message).toMatch(/leaves the ADC "adc"/);
    expect(errors.find((e) => e.path === "edges[5].to")?.message).toMatch(/gives "adc" a second input \(edges\[1\] already feeds it\)/);
  });

  it("refuses loops, including a node feeding itself", () => {
    const d = minimal();
    d.nodes.push({ id: "a", kind: "rcLowpass", params: { r: 1, c: 1 } }, { id: "b", kind: "rcLowpass", params: { r: 1, c: 1 } });
    d.edges.push({ from: "a", to: "b" }, { from: "b", to: "a" });
    expect(find(d, "edges")?.message).toMatch(/form a loop \("[ab]" → "[ab]" → "[ab]"\)/);
    const self = minimal();
    self.edges.push({ from: "adc", to: "adc" });
    expect(find(self, "edges[2]")?.message).toMatch(/joins "adc" to itself/);
  });

  it("needs exactly one source and every node reachable from it", () => {
    const none = minimal();
    none.nodes[0] = { ...STAGES.inverting, id: "src" };
    expect(find(none, "nodes")?.message).toMatch(/has no source/);
    const two = minimal();
    two.nodes.push({ ...minimal().nodes[0], id: "src2" });
    expect(find(two, "nodes")?.message).toMatch(/has 2 sources \("src" and "src2"\)/);
    const loose = minimal();
    loose.edges.pop();
    expect(find(loose, "nodes[2]")?.message).toMatch(/"adc" is not connected to the source "src"/);
    const empty = minimal();
    empty.nodes = [];
    empty.edges = [];
    expect(find(empty, "nodes")?.message).toMatch(/empty/);
  });

  it("reports graph errors together with field errors", () => {
    const d = minimal();
    d.nodes[1].params.r1 = -1;
    d.edges.push({ from: "u1", to: "nowhere" });
    expect(paths(d)).toEqual(expect.arrayContaining(["nodes[1].params.r1", "edges[2].to"]));
  });
});

describe("validateChain: unknown fields, kinds and formats", () => {
  it("refuses unknown fields at every level, suggesting a close known one", () => {
    const d = minimal();
    d.analysis = { fmax: 1e3 };
    d.nodes[1].params.R1 = 5;
    d.nodes[1].colour = "red";
    d.extra = true;
    d.edges[0].weight = 1;
    const errors = errorsOf(d);
    expect(errors.find((e) => e.path === "analysis.fmax")?.message).toMatch(/did you mean fMax\?/);
    expect(errors.find((e) => e.path === "nodes[1].params.R1")?.message).toMatch(/of an inverting stage's params \(did you mean r1\?\); the fields are r1, r2, vref/);
    expect(errors.find((e) => e.path === "nodes[1].colour")?.message).toMatch(/is not a field of an inverting stage/);
    expect(errors.find((e) => e.path === "extra")?.message).toMatch(/is not a field of a chain document/);
    expect(errors.find((e) => e.path === "edges[0].weight")?.message).toMatch(/is not a field of an edge/);
  });

  it("refuses an unknown kind with the list of kinds, and a missing kind", () => {
    const d = withStage({ kind: "bandpass", params: {} });
    expect(find(d, "nodes[1].kind")?.message).toMatch(/is not a stage kind Chainwright knows \("bandpass"\); the kinds are source, inverting/);
    const m = minimal();
    delete m.nodes[1].kind;
    expect(find(m, "nodes[1].kind")?.message).toMatch(/^is required: the stage kind/);
  });

  it("refuses a wrong or future format with one clear message", () => {
    expect(errorsOf({ ...minimal(), format: "chainwright.chain/2" })).toEqual([
      { path: "format", message: expect.stringMatching(/version 2 .* newer than this Chainwright reads/) },
    ]);
    expect(errorsOf({ ...minimal(), format: "something/1" })[0].message).toMatch(/not a Chainwright chain document/);
    expect(errorsOf({ ...minimal(), format: "chainwright.analysis/1" })[0].message).toMatch(/must be "chainwright.chain\/1"/);
    expect(find({ ...minimal(), format: undefined }, "format")?.message).toMatch(/^is required/);
  });
});

describe("validateChain: hostile input", () => {
  it("never throws, and answers with a path and a message", () => {
    const cyclic: Doc = minimal();
    cyclic.nodes[0].params.self = cyclic;
    const getter = minimal();
    Object.defineProperty(getter, "name", { enumerable: true, get: () => { throw new Error("boom"); } });
    const proxy = new Proxy({}, { ownKeys: () => { throw new Error("no keys"); } });
    let deep: unknown = 1;
    for (let i = 0; i < 10_000; i++) deep = [deep];
    const inputs: unknown[] = [
      undefined, null, 0, -0, Number.NaN, 1e308, "text", "{}", true, [], [minimal()], 10n, Symbol("s"), () => 1,
      new Date(), new Map(), cyclic, getter, proxy, deep, { ...minimal(), nodes: deep },
      { ...minimal(), nodes: new Array(5000).fill(minimal().nodes[1]) },
    ];
    for (const input of inputs) {
      let r: ReturnType<typeof validateChain> | undefined;
      expect(() => (r = validateChain(input))).not.toThrow();
      expect(r!.ok).toBe(false);
      if (!r!.ok) for (const e of r!.errors) expect(typeof e.path === "string" && e.message.length > 0).toBe(true);
    }
  });

  it("names the cycle's place and refuses non-JSON values by name", () => {
    const cyclic: Doc = minimal();
    cyclic.nodes[0].params.self = cyclic;
    expect(errorsOf(cyclic)).toEqual([{ path: "nodes[0].params.self", message: expect.stringMatching(/cycle/) }]);
    expect(errorsOf({ ...minimal(), when: new Date() })[0]).toEqual({ path: "when", message: "is not JSON data (a Date)" });
  });

  it("caps the number of issues it reports", () => {
    const d = minimal();
    d.nodes = Array.from({ length: 400 }, (_, i) => ({ id: `n${i}`, kind: "rcLowpass", params: { r: -1, c: -1 } }));
    const errors = errorsOf(d);
    expect(errors.length).toBe(101);
    expect(errors[100].message).toMatch(/^and \d+ more problems$/);
  });

  it("does not let __proto__ keys reach any prototype", () => {
    const text = '{"format":"chainwright.chain/1","name":"x","nodes":[],"edges":[],"__proto__":{"polluted":1},' +
      '"parts":{"__proto__":{"gbw":1}},"analysis":{"__proto__":{"fMax":5}}}';
    const errors = errorsOf(JSON.parse(text));
    expect(errors.map((e) => e.path)).toEqual(expect.arrayContaining(["__proto__", "parts.__proto__", "analysis.__proto__"]));
    expect(({} as Doc).polluted).toBeUndefined();
    expect(({} as Doc).fMax).toBeUndefined();
  });
});

describe("chainSchema", () => {
  it("is a zod schema the app can use directly (safeParse with paths)", () => {
    const d = minimal();
    d.nodes[1].params.r2 = -5;
    const r = chainSchema.safeParse(d);
    expect(r.success).toBe(false);
    if (!r.success) expect(formatPath(r.error.issues[0].path)).toBe("nodes[1].params.r2");
  });
});

describe("formatPath", () => {
  it("writes indexes in brackets and odd keys quoted", () => {
    expect(formatPath(["nodes", 1, "params", "r1"])).toBe("nodes[1].params.r1");
    expect(formatPath(["parts", "my part", "gbw"])).toBe('parts["my part"].gbw');
    expect(formatPath(["parts", "p-1"])).toBe('parts["p-1"]');
    expect(formatPath([])).toBe("");
  });
});
