/**
 * The command line as a user runs it: real processes (node + tsx), real files, exit codes and streams
 * as chain-format.md "Analysis result" fixes them.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { exampleChain } from "@/lib/chain/example";

const root = fileURLToPath(new URL("../../", import.meta.url));
const tsx = join(root, "node_modules", ".bin", "tsx");
let dir = "";
/** Each test starts real processes; on a loaded two-core machine one start can take several seconds. */
const SLOW = 150_000;

function run(args: string[], input?: string, viaNpm = false) {
  const [cmd, argv] = viaNpm ? ["npm", ["run", "-s", "analyze", "--", ...args]] : [tsx, [join(root, "scripts/analyze.ts"), ...args]];
  const r = spawnSync(cmd, argv, { cwd: viaNpm ? root : dir, input, encoding: "utf8", timeout: 100_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function file(name: string, content: unknown): string {
  const path = join(dir, name);
  writeFileSync(path, typeof content === "string" ? content : JSON.stringify(content));
  return path;
}

/** A gain of −100 on a 1 V sensor offset with ±5 V rails: the stage sits on a rail. */
function clippingChain() {
  return {
    format: "chainwright.chain/1",
    name: "Clipping",
    nodes: [
      { id: "src", kind: "source", params: { dc: 1, amplitude: 0.01, fLow: 1, fHigh: 100 } },
      { id: "u1", kind: "inverting", params: { r1: 1e3, r2: 1e5 }, rails: { low: -5, high: 5 } },
      { id: "adc", kind: "adc", params: { bits: 12, sampleRate: 1e4, vinLow: -5, vinHigh: 5 } },
    ],
    edges: [
      { from: "src", to: "u1" },
      { from: "u1", to: "adc" },
    ],
  };
}

/** stderr of a refusal: exactly {"errors":[{path,message},…]}. */
function refusal(stderr: string) {
  const body = JSON.parse(stderr);
  expect(Object.keys(body)).toEqual(["errors"]);
  for (const e of body.errors) expect(Object.keys(e).sort()).toEqual(["message", "path"]);
  return body.errors as { path: string; message: string }[];
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "chainwright-cli-"));
});
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("scripts/analyze.ts", () => {
  it("prints one analysis document and exits 0 for a valid chain", () => {
    const r = run([file("example.json", exampleChain())]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe("");
    const out = JSON.parse(r.stdout);
    expect(out.format).toBe("chainwright.analysis/1");
    expect(out.paths[0].nodes).toEqual(["src", "u1", "adc"]);
    expect(out.paths[0].response.f).toHaveLength(600);
  }, SLOW);

  it("evaluates at exactly the --freq frequencies, engineering notation included, and honours --points", () => {
    const path = file("example.json", exampleChain());
    const f = JSON.parse(run([path, "--freq", "10,1k,2.5e3"]).stdout).paths[0].response;
    expect(f.f).toEqual([10, 1000, 2500]);
    expect(f.magDb).toHaveLength(3);
    const p = JSON.parse(run([path, "--points", "50"]).stdout).paths[0].response;
    expect(p.f).toHaveLength(50);
  }, SLOW);

  it("treats a clipping chain as a result: exit 0 with the stage marked", () => {
    const r = run([file("clip.json", clippingChain())]);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.paths[0].stages[0].status).toBe("clip");
    expect(out.warnings.map((w: { code: string }) => w.code)).toContain("rail-clip");
  }, SLOW);

  it("reads the document from standard input with -", () => {
    const r = run(["-", "--freq", "100"], JSON.stringify(exampleChain()));
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).paths[0].response.f).toEqual([100]);
  }, SLOW);

  it("refuses an invalid chain: exit 2, errors with paths on stderr, nothing on stdout", () => {
    const broken = exampleChain() as unknown as { nodes: { params: Record<string, unknown> }[] };
    broken.nodes[1].params.c2 = -1e-9;
    const r = run([file("broken.json", broken)]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(refusal(r.stderr)).toContainEqual({ path: "nodes[1].params.c2", message: "must be a positive number of farads (found -1e-9)" });
  }, SLOW);

  it("refuses a file that is not JSON, a missing file and bad flags the same way", () => {
    const notJson = run([file("not.json", "{ nodes: [ }")]);
    expect(notJson.code).toBe(2);
    expect(notJson.stdout).toBe("");
    expect(refusal(notJson.stderr)[0].message).toMatch(/is not JSON/);

    const missing = run([join(dir, "nowhere.json")]);
    expect(missing.code).toBe(2);
    expect(missing.stdout).toBe("");
    expect(refusal(missing.stderr)[0]).toMatchObject({ path: "file", message: expect.stringMatching(/no such file/) });

    const flags = run([file("ok.json", exampleChain()), "--points", "0", "--freq", "abc"]);
    expect(flags.code).toBe(2);
    expect(flags.stdout).toBe("");
    expect(refusal(flags.stderr).map((e) => e.path)).toEqual(["--points", "--freq"]);
  }, SLOW);

  it("works through npm run -s analyze with nothing but the JSON on stdout", () => {
    const r = run([file("example.json", exampleChain()), "--freq", "10"], undefined, true);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).paths[0].response.f).toEqual([10]);
    const bad = run([join(dir, "nowhere.json")], undefined, true);
    expect(bad.code).toBe(2);
    expect(bad.stdout).toBe("");
  }, SLOW);
});
