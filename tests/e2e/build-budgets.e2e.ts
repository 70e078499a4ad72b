/**
 * Budgets on the production build the browser tests run against (.next-e2e), and accessibility of
 * every page. The JavaScript each page loads before it runs is measured from the build's manifests
 * (tests/budgets/build-report.ts) against a budget per page; the plotting library may be reachable only from
 * the chain pages that draw plots (workspace, its read-only view, report, outputs), and never up front. No client file and no served page carries a server secret.
 * axe-core runs in every page (landing, sign-in, sign-up, chain list, new chain, workspace, history,
 * parts, settings, teams, a team) and no serious or critical violation is allowed.
 */
import { existsSync, readFileSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import type { Page } from "playwright-core";
import { beforeAll, describe, expect, it } from "vitest";
import { budgetFor, formatReport, leakedIn, readBuild, type BuildReport } from "../budgets/build-report";
import { DEMO_PEOPLE } from "./support/auth";
import { useBrowser } from "./support/suite";
import { e2eContext } from "./support/context";
import { E2E_DIST_DIR } from "./support/server";
import { openWorkspace, waitForPlot } from "./workspace-support";

const ctx = e2eContext();
const ROOT = path.resolve(__dirname, "../..");
const require = createRequire(import.meta.url);
const AXE_SOURCE = readFileSync(require.resolve("axe-core/axe.min.js"), "utf8");

/** Names of server-only settings: client code that mentions one has pulled the server's environment in. */
const SERVER_ENV_NAMES = ["AUTH_SECRET", "SMTP_PASSWORD", "SMTP_USER", "DATABASE_PATH", "MAILBOX_PATH", "better-sqlite3"];

function secretNeedles(): Array<{ label: string; value: string }> {
  const needles = SERVER_ENV_NAMES.map((name) => ({ label: `the name ${name}`, value: name }));
  ctx.serverSecrets.forEach((value, i) => needles.push({ label: i === 0 ? "the server's AUTH_SECRET" : "the server's database path", value }));
  // the development secret kept beside the default database (lib/env.ts), if this checkout has one
  const devSecret = path.join(ROOT, "data", ".dev-secret");
  if (existsSync(devSecret)) needles.push({ label: "data/.dev-secret", value: readFileSync(devSecret, "utf8").trim() });
  for (const name of ["AUTH_SECRET", "SMTP_PASSWORD"]) if (process.env[name]) needles.push({ label: `this shell's ${name}`, value: process.env[name]! });
  return needles;
}

describe.skipIf(ctx.skip !== null)("page budgets and secrets, read from the production build", () => {
  let report: BuildReport;
  beforeAll(() => {
    report = readBuild(path.join(ROOT, E2E_DIST_DIR));
    console.log(formatReport(report));
  });

  it("finds every page of the app with its entry chunks", () => {
    const routes = report.pages.map((p) => p.route);
    for (const r of ["/(marketing)", "/(auth)/sign-in", "/(workspace)/chains", "/(workspace)/chains/[id]", "/(workspace)/settings"]) expect(routes).toContain(r);
    for (const p of report.pages) expect(p.initial.length, p.route).toBeGreaterThan(1);
  });

  it("keeps each page's up-front JavaScript within its budget", () => {
    const over = report.pages
      .filter((p) => p.initialGzip / 1024 > budgetFor(p.route).kb)
      .map((p) => `${p.route}: ${(p.initialGzip / 1024).toFixed(0)} kB gzip, budget ${budgetFor(p.route).kb} kB`);
    expect(over).toEqual([]);
  });

  it("lets only the chain pages that draw plots reach the plotting library, and only lazily", () => {
    expect(report.pages.filter((p) => p.plotlyInitial).map((p) => p.route)).toEqual([]);
    const reaching = report.pages.filter((p) => p.plotlyReachable).map((p) => p.route);
    expect(reaching).toEqual(report.pages.filter((p) => budgetFor(p.route).plotly).map((p) => p.route));
    // the workspace itself must be among them, so the check is looking at a real import
    expect(reaching).toContain("/(workspace)/chains/[id]");
  });

  it("has no server secret or server-only setting in any client file", () => {
    expect(report.clientFiles.length).toBeGreaterThan(10);
    expect(leakedIn(report.clientFiles, secretNeedles())).toEqual([]);
  });
});

type AxeViolation = { id: string; impact: string | null; help: string; nodes: { target: unknown[] }[] };

/** Run axe-core in the page as it stands. It is evaluated through the browser's debugging protocol, which the page's policy does not govern, so nothing is loosened for it. */
async function axeProblems(page: Page): Promise<string[]> {
  await page.evaluate(AXE_SOURCE);
  const violations = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: AxeViolation[] }> } }).axe;
    const result = await axe.run(document, { resultTypes: ["violations"] });
    return result.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.map((n) => ({ target: n.target })) }));
  });
  return violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => `${v.impact} ${v.id} (${v.help}) at ${v.nodes.map((n) => JSON.stringify(n.target)).slice(0, 5).join(", ")}`);
}

describe.skipIf(ctx.skip !== null)("accessibility of every page (axe-core, production build)", () => {
  const sessions = useBrowser();

  it("has no serious or critical violation on the public pages", async () => {
    const { context, page } = await sessions.open();
    const found: Record<string, string[]> = {};
    for (const pathname of ["/", "/sign-in", "/sign-up", "/check-your-mail", "/auth-error"]) {
      await page.goto(pathname);
      await page.waitForLoadState("networkidle");
      found[pathname] = await axeProblems(page);
      const html = await page.content();
      for (const secret of ctx.serverSecrets) expect(html.includes(secret), `a server secret in ${pathname}`).toBe(false);
    }
    expect(Object.entries(found).filter(([, v]) => v.length)).toEqual([]);
    await context.close();
  });

  it("has no serious or critical violation on the signed-in pages, the workspace included", async () => {
    const { context, page } = await sessions.signedIn(DEMO_PEOPLE.engineerA.email);
    const found: Record<string, string[]> = {};
    const check = async (label: string) => {
      await page.waitForLoadState("networkidle");
      found[label] = await axeProblems(page);
      const html = await page.content();
      for (const secret of ctx.serverSecrets) expect(html.includes(secret), `a server secret in ${label}`).toBe(false);
    };
    await page.getByTestId("chain-list").waitFor();
    await check("/chains");
    for (const pathname of ["/chains/new", "/parts", "/settings", "/teams"]) {
      await page.goto(pathname);
      await check(pathname);
    }
    const team = page.locator('a[href^="/teams/"]').first();
    if (await team.count()) {
      await team.click();
      await page.waitForURL(/\/teams\/[^/]+$/);
      await check("/teams/[id]");
    }
    const chainId = await openWorkspace(page, "Hull vibration channel, aft bay");
    await waitForPlot(page);
    await check("/chains/[id]");
    await page.goto(`/chains/${chainId}/history`);
    await check("/chains/[id]/history");
    expect(Object.keys(found).length).toBeGreaterThanOrEqual(7);
    expect(Object.entries(found).filter(([, v]) => v.length)).toEqual([]);
    await context.close();
  });
});
