/**
 * `npm run analyze -- FILE --trials N --seed S`: the spread in the JSON result, the flags' checks, and
 * the same numbers as the worker's code path (driveSpread in small slices) for one seed.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { parseAnalyzeArgs } from "@/lib/chain/analyze-cli";
import { exampleChain } from "@/lib/chain/example";
import { validateChain } from "@/lib/chain/schema";
import { driveSpread } from "@/lib/store/spread-runner";

const root = fileURLToPath(new URL("../../", import.meta.url));
const tsx = join(root, "node_modules", ".bin", "tsx");
const SLOW = 150_000;
let dir = "";

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "cw-cli-spread-"));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("--trials and --seed", () => {
  const errs = (argv: string[]) => {
    const r = parseAnalyzeArgs(argv);
    return r.ok ? [] : r.errors;
  };
  it("reads them, with a default seed of 1", () => {
    expect(parseAnalyzeArgs(["c.json", "--trials", "1k", "--seed", "42"])).toEqual({ ok: true, args: { file: "c.json", trials: 1000, seed: 42 } });
    expect(parseAnalyzeArgs(["c.json", "--trials=10"])).toEqual({ ok: true, args: { file: "c.json", trials: 10, seed: 1 } });
  });
  it("refuses bad values, naming the flag", () => {
    for (const t of ["0", "100001", "2.5", "x"]) expect(errs(["c.json", "--trials", t])[0]?.path, t).toBe("--trials");
    for (const s of ["-1", "4294967296", "1.5"]) expect(errs(["c.json", "--trials", "5", "--seed", s])[0]?.path, s).toBe("--seed");
    expect(errs(["c.json", "--seed", "3"])[0]).toMatchObject({ path: "--seed", message: expect.stringMatching(/--trials/) });
    expect(errs(["c.json", "--trials"])[0]).toMatchObject({ path: "--trials", message: expect.stringMatching(/needs a number/) });
  });
});

describe("the command line and the worker's code path", () => {
  it(
    "give identical spreads for one seed",
    async () => {
      const doc = exampleChain();
      const file = join(dir, "chain.json");
      writeFileSync(file, JSON.stringify(doc));
      const r = spawnSync(tsx, [join(root, "scripts/analyze.ts"), file, "--trials", "60", "--seed", "9", "--points", "80"], { cwd: dir, encoding: "utf8", timeout: 100_000 });
      expect(r.stderr).toBe("");
      expect(r.status).toBe(0);
      const out = JSON.parse(r.stdout);
      expect(out.format).toBe("chainwright.analysis/1");
      expect(out.spread).toMatchObject({ format: "chainwright.spread/1", seed: 9, trials: 60, done: 60, complete: true });
      expect(out.spread.response.f).toHaveLength(80);

      const v = validateChain(doc);
      if (!v.ok) throw new Error("example chain invalid");
      let slices = 0;
      const worker = await driveSpread(v.chain, { trials: 60, seed: 9, points: 80 }, {
        sliceMs: 0.2, // many small slices: slicing must not change a number
        cancelled: () => false,
        pause: async () => void slices++,
        progress: () => {},
      });
      expect(worker.finished).toBe(true);
      expect(slices).toBeGreaterThan(2);
      if (worker.finished) expect(JSON.parse(JSON.stringify(worker.result))).toEqual(out.spread);
    },
    SLOW,
  );

  it("cancel stops the run at the next slice", async () => {
    const v = validateChain(exampleChain());
    if (!v.ok) throw new Error("example chain invalid");
    let slices = 0;
    const out = await driveSpread(v.chain, { trials: 5000, seed: 1 }, {
      sliceMs: 1,
      cancelled: () => slices >= 3,
      pause: async () => void slices++,
      progress: () => {},
    });
    expect(out.finished).toBe(false);
    if (!out.finished) expect(out.done).toBeLessThan(out.total);
  });

  it("a cancel sent during a slice is taken before a partial result is worked out", async () => {
    const v = validateChain(exampleChain());
    if (!v.ok) throw new Error("example chain invalid");
    let pauses = 0;
    let partials = 0;
    const out = await driveSpread(v.chain, { trials: 5000, seed: 1 }, {
      sliceMs: 1,
      partialEveryMs: 0, // a partial is due after every slice
      cancelled: () => pauses >= 1, // the cancel arrives during the first slice
      pause: async () => void pauses++,
      progress: (_done, _total, partial) => void (partial && partials++),
    });
    expect(out.finished).toBe(false);
    expect(partials).toBe(0);
  });
});
