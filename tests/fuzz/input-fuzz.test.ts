/**
 * Fuzzing the three doors a chain document comes in by: POST /api/analyze, PUT /api/chains/:id (the
 * save) and the command line's steps (argument parsing, JSON reading, runAnalysis). Inputs are demo
 * chains mutated a few places at a time, documents generated from nothing, hostile options and
 * mangled JSON text (tests/fuzz/support/inputs.ts). For every input: no 500, nothing thrown, and a
 * refusal is a 400 whose errors each name the field (a path) with a message. Saves also keep their
 * version arithmetic: the chain's version rises by one per accepted save and by nothing otherwise.
 *
 * 1,000 inputs per door in the unit suite; `npm run fuzz` runs 10,000 (FUZZ_RUNS) and prints the tally.
 */
import fc from "fast-check";
import { writeFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { idContext, jsonRequest, sessionModule, signInAs } from "../api/session-mock";

vi.mock("@/lib/auth/session", () => sessionModule);

import { POST as analyzePost } from "@/app/api/analyze/route";
import { PUT as savePut } from "@/app/api/chains/[id]/route";
import { getDb } from "@/db/connection";
import { chains, type User } from "@/db/schema";
import { eq } from "drizzle-orm";
import { parseAnalyzeArgs } from "@/lib/chain/analyze-cli";
import { runAnalysis } from "@/lib/chain/analyze-request";
import { makeChain, makeTeam, makeUser } from "../support/fixtures";
import { useTempDatabase } from "../support/temp-db";
import { analyzeBody, anyValue, chainDocument, fuzzRuns, fuzzSeed, mangledText, refusalProblem, sometimes, Tally, withoutAbsent } from "./support/inputs";

/** The document is there nine times in ten. */
const sometimesMissing = <T,>(arb: fc.Arbitrary<T>) => fc.oneof({ weight: 9, arbitrary: arb }, { weight: 1, arbitrary: fc.constant(undefined) });

const RUNS = fuzzRuns();
const SEED = fuzzSeed();
/** 10,000 analyses and saves on a loaded two-core machine take minutes, not seconds. */
const TIME = Math.max(120_000, RUNS * 120);

let db: ReturnType<typeof useTempDatabase>;
let user: User;
const tallies: Array<[string, Tally]> = [];

beforeAll(() => {
  db = useTempDatabase();
  user = makeUser("fuzzer");
  signInAs(user);
});
afterAll(() => {
  console.log(`[fuzz] seed ${SEED}, ${RUNS} runs per property`);
  for (const [label, t] of tallies) console.log(t.line(label));
  db.cleanup();
});

/** FUZZ_TRACE=FILE writes each input there before it runs, so the last line names an input that killed the process. */
function trace(label: string, input: unknown): void {
  const file = process.env.FUZZ_TRACE;
  if (file) writeFileSync(file, `${label} ${typeof input === "string" ? input : JSON.stringify(input)}\n`);
}

function tally(label: string): Tally {
  const t = new Tally();
  tallies.push([label, t]);
  return t;
}

function isPlainObject(v: unknown): boolean {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

function parsedOrUndefined(text: string): { ok: boolean; value?: unknown } {
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch {
    return { ok: false };
  }
}

/** A route answer that is not a 200 must be a 400 naming the field (413 only past the size limit). */
async function checkAnswer(res: Response, text: string, t: Tally, allowed: number[] = []): Promise<void> {
  t.add(res.status);
  if (res.status === 200) return;
  if (res.status === 413 && text.length > 1024 * 1024) return;
  if (allowed.includes(res.status)) return;
  const body = await res.json().catch(() => "(not JSON)");
  if (res.status !== 400) throw new Error(`answered ${res.status}: ${JSON.stringify(body).slice(0, 400)}\nfor ${text.slice(0, 400)}`);
  const parsed = parsedOrUndefined(text);
  const problem = refusalProblem(body, !parsed.ok || !isPlainObject(parsed.value));
  if (problem) throw new Error(`${problem}\nfor ${text.slice(0, 400)}`);
}

describe("POST /api/analyze under fuzzed bodies", () => {
  it(`answers ${RUNS} generated and mutated bodies with 200 or a 400 naming the field`, async () => {
    const t = tally("POST /api/analyze (bodies)");
    await fc.assert(
      fc.asyncProperty(analyzeBody, async (body) => {
        const text = JSON.stringify(body) ?? "null";
        trace("analyze", text);
        await checkAnswer(await analyzePost(jsonRequest("POST", "/api/analyze", undefined, text), undefined), text, t);
      }),
      { numRuns: RUNS, seed: SEED },
    );
    expect(t.total).toBe(RUNS);
    // the generators must reach both sides of the schema, or the fuzzing says nothing
    expect(t.get(200)).toBeGreaterThan(0);
    expect(t.get(400)).toBeGreaterThan(0);
  }, TIME);

  it(`answers ${RUNS} mangled JSON texts the same way`, async () => {
    const t = tally("POST /api/analyze (mangled text)");
    await fc.assert(
      fc.asyncProperty(mangledText(analyzeBody), async (text) => {
        trace("analyze-text", text);
        await checkAnswer(await analyzePost(jsonRequest("POST", "/api/analyze", undefined, text), undefined), text, t);
      }),
      { numRuns: RUNS, seed: SEED + 1 },
    );
    expect(t.get(400)).toBeGreaterThan(0);
  }, TIME);
});

describe("PUT /api/chains/:id under fuzzed saves", () => {
  let chainId = "";
  const version = () => getDb().select({ v: chains.version }).from(chains).where(eq(chains.id, chainId)).get()!.v;

  beforeAll(() => {
    const teamId = makeTeam("Fuzz team", [[user, "admin"]]);
    chainId = makeChain(teamId, user, "Fuzzed chain");
  });

  it(`answers ${RUNS} saves with 200, 409 for a stale version, or a 400 naming the field; versions never skip or stall`, async () => {
    const t = tally("PUT /api/chains/:id");
    const baseVersion = fc.oneof(
      { weight: 6, arbitrary: fc.constant("current") },
      { weight: 1, arbitrary: fc.constant("stale") },
      { weight: 2, arbitrary: anyValue },
    );
    const saveBody = fc
      .record({
        baseVersion,
        document: sometimesMissing(chainDocument),
        name: sometimes(fc.oneof(fc.string({ maxLength: 220 }), anyValue)),
        summary: sometimes(fc.oneof(fc.string({ maxLength: 600 }), anyValue)),
        extra: sometimes(anyValue),
      })
      .map(withoutAbsent);
    const body = fc.oneof({ weight: 9, arbitrary: saveBody }, { weight: 1, arbitrary: anyValue });
    await fc.assert(
      fc.asyncProperty(body, fc.nat({ max: 4 }).map((n) => n === 0), async (raw, mangle) => {
        const before = version();
        let payload = raw;
        if (isPlainObject(raw)) {
          const b = raw as Record<string, unknown>;
          const bv = b.baseVersion === "current" ? before : b.baseVersion === "stale" ? Math.max(1, before - 1 - (before % 3)) : b.baseVersion;
          payload = { ...b, baseVersion: bv };
        }
        let text = JSON.stringify(payload) ?? "null";
        if (mangle && text.length > 2) text = text.slice(0, Math.floor(text.length / 2));
        trace("save", text);
        const res = await savePut(jsonRequest("PUT", `/api/chains/${chainId}`, undefined, text), idContext(chainId));
        const staleVersion = isPlainObject(payload) && Number.isInteger((payload as { baseVersion?: unknown }).baseVersion) && (payload as { baseVersion: number }).baseVersion !== before;
        await checkAnswer(res, text, t, staleVersion ? [409] : []);
        const after = version();
        if (res.status === 200 && after !== before + 1) throw new Error(`an accepted save moved the version from ${before} to ${after}`);
        if (res.status !== 200 && after !== before) throw new Error(`a refused save (${res.status}) moved the version from ${before} to ${after}`);
      }),
      { numRuns: RUNS, seed: SEED + 2 },
    );
    expect(t.get(200)).toBeGreaterThan(0);
    expect(t.get(400)).toBeGreaterThan(0);
    expect(version()).toBe(1 + t.get(200));
  }, TIME);
});

describe("the command line's steps under fuzzed input", () => {
  it(`parses ${RUNS} generated argument lists without throwing; every refusal names the option`, () => {
    const t = tally("CLI arguments");
    const token = fc.oneof(
      fc.constantFrom("--freq", "--points", "--freq=", "--points=", "-", "--", "-h", "--help", "--trials", "-1", "1k,10k", "1k,,2", "1e999", "0", "2k", "x.json", "NaN", "--freq=1,2,3", "--points=20001"),
      fc.string({ maxLength: 20 }),
    );
    fc.assert(
      fc.property(fc.array(token, { maxLength: 8 }), (argv) => {
        const r = parseAnalyzeArgs(argv);
        if (r.ok) return void t.add("ok");
        t.add("refused");
        const problem = refusalProblem({ errors: r.errors }, false);
        if (problem) throw new Error(`${problem} for argv ${JSON.stringify(argv)}`);
      }),
      { numRuns: RUNS, seed: SEED + 3 },
    );
    expect(t.get("refused")).toBeGreaterThan(0);
  });

  it(`analyses ${RUNS} mangled and mutated files as the command line reads them, without throwing`, () => {
    const t = tally("CLI documents");
    const fileText = fc.oneof(mangledText(chainDocument), chainDocument.map((d) => JSON.stringify(d) ?? "null"));
    fc.assert(
      fc.property(fileText, fc.option(fc.integer({ min: 2, max: 600 }), { nil: undefined }), (text, points) => {
        // what scripts/analyze.ts does with a file: JSON.parse (its failure is the "" path: the whole file), then runAnalysis
        trace("cli", { text, points });
        const parsed = parsedOrUndefined(text);
        if (!parsed.ok) return void t.add("not JSON");
        const outcome = runAnalysis({ chain: parsed.value, ...(points !== undefined ? { points } : {}) });
        if (outcome.ok) return void t.add("analysed");
        t.add("refused");
        const problem = refusalProblem({ errors: outcome.errors }, !isPlainObject(parsed.value));
        if (problem) throw new Error(`${problem}\nfor ${text.slice(0, 400)}`);
      }),
      { numRuns: RUNS, seed: SEED + 4 },
    );
    expect(t.get("analysed")).toBeGreaterThan(0);
    expect(t.get("refused")).toBeGreaterThan(0);
  }, TIME);
});
