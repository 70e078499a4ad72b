/**
 * The chain files in public/examples/ are the seeded demo chains as they are now (a stale file would
 * show the command line a different channel from the app), they pass the schema, and the command line
 * analyses each one with a seeded spread, the same twice.
 */
import { spawnSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { EXAMPLE_CHAIN_FILES, exampleChainText } from "@/db/seed-data/example-files";
import { validateChain } from "@/lib/chain/schema";

const root = fileURLToPath(new URL("../../", import.meta.url));
const tsx = join(root, "node_modules", ".bin", "tsx");

describe("example chain files", () => {
  for (const [file, doc] of Object.entries(EXAMPLE_CHAIN_FILES)) {
    it(`${file} equals its seed chain and is a complete chain (if not: npx tsx scripts/example-chains.ts)`, () => {
      const text = readFileSync(join(root, "public", "examples", file), "utf8");
      expect(text).toBe(exampleChainText(doc));
      expect(validateChain(JSON.parse(text)).ok).toBe(true);
    });
  }

  it(
    "the command line analyses one with --trials and --seed, identically on a second run",
    () => {
      const file = join(root, "public", "examples", "keelwater-turbidity-photodiode.chain.json");
      const run = () => spawnSync(tsx, ["scripts/analyze.ts", file, "--trials", "40", "--seed", "5"], { cwd: root, encoding: "utf8" });
      const a = run();
      expect(a.status, a.stderr).toBe(0);
      const r = JSON.parse(a.stdout) as { paths: { adc: { rangeUse: number } | null }[]; spread: { trials: number; seed: number } };
      expect(r.spread).toMatchObject({ trials: 40, seed: 5 });
      expect(r.paths[0].adc?.rangeUse).toBeGreaterThan(0);
      expect(run().stdout).toBe(a.stdout);
    },
    60_000,
  );
});
