/**
 * `npm run budgets [DIST_DIR]`: the JavaScript per page of a production build (default .next-e2e, the
 * browser tests' build; `npm run build` makes .next) against its budget. Exits 1 when a page is over
 * its budget or a page other than the workspace can reach the plotting library. The browser tests
 * (tests/e2e/build-budgets.e2e.ts) check the same on every run.
 */
import path from "node:path";
import { budgetFor, formatReport, readBuild } from "./build-report";

const dist = path.resolve(process.argv[2] ?? process.env.E2E_DIST_DIR ?? ".next-e2e");
const report = readBuild(dist);
console.log(formatReport(report));
const problems = report.pages.flatMap((p) => {
  const b = budgetFor(p.route);
  const out: string[] = [];
  if (p.initialGzip / 1024 > b.kb) out.push(`${p.route}: ${(p.initialGzip / 1024).toFixed(0)} kB gzip before it runs, budget ${b.kb} kB`);
  if (p.plotlyInitial) out.push(`${p.route}: the plotting library is loaded up front`);
  if (p.plotlyReachable && !b.plotly) out.push(`${p.route}: reaches the plotting library`);
  return out;
});
if (problems.length) {
  console.error(`over budget:\n  ${problems.join("\n  ")}`);
  process.exitCode = 1;
} else console.log(`all ${report.pages.length} pages within budget`);
