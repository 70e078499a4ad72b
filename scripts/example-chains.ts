/**
 * Writes the three demo chains of db/seed-data as chain documents under public/examples/ (the hull
 * vibration, ballast pressure and turbidity channels of the invented Keelwater Instruments), so the
 * command line and the import page have real files to start from:
 *   npm run -s analyze -- public/examples/keelwater-hull-vibration.chain.json --trials 200 --seed 1
 * tests/unit/example-chains.test.ts fails when a file no longer equals its seed chain.
 * Run: npx tsx scripts/example-chains.ts
 */
import { writeFileSync } from "node:fs";
import { EXAMPLE_CHAIN_FILES, exampleChainText } from "../db/seed-data/example-files";

for (const [file, doc] of Object.entries(EXAMPLE_CHAIN_FILES)) {
  writeFileSync(new URL(`../public/examples/${file}`, import.meta.url), exampleChainText(doc));
  console.log(`wrote public/examples/${file}`);
}
