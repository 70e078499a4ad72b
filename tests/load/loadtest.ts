/**
 * `npm run loadtest`: the production build on 127.0.0.1 with a fresh seeded database, driven by
 * autocannon at 50 connections in three phases of a bounded time each:
 *
 *   reads    GET /api/chains/:id of a demo chain
 *   saves    PUT /api/chains/:id on one new chain, every request naming the newest version this
 *            client has seen, so most of the 50 race for the same version and all but one must lose
 *   analyze  POST /api/analyze with the hull vibration chain at its 500 points
 *
 * Prints per phase: requests, throughput (requests/s), latency p50/p95/p99/max in ms, and counts of
 * each status, errors and timeouts. Invariants, each failing the run (exit 1): no error, timeout or
 * unexpected status in any phase; in the saves, every refusal is a 409, and the chain's final version
 * equals 1 + the accepted saves (no update lost, none counted twice), with a revision for each.
 *
 * Options: --duration S per phase (default 10), --connections N (default 50), --reuse (keep an
 * existing build in E2E_DIST_DIR, default .next-e2e).
 */
import autocannon from "autocannon";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { hullVibration } from "../../db/seed-data/chains";
import { DEMO_PASSWORD, DEMO_PEOPLE } from "../../db/seed-data/people";
import { percentiles, prepare, ROOT, signIn, startServer } from "./server";

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? Number(process.argv[i + 1]) : fallback;
};
const DURATION = arg("duration", 10);
const CONNECTIONS = arg("connections", 50);
const REUSE = process.argv.includes("--reuse");

interface PhaseResult {
  name: string;
  requests: number;
  perSecond: number;
  latency: ReturnType<typeof percentiles>;
  statuses: Record<string, number>;
  errors: number;
  timeouts: number;
}

function runPhase(name: string, opts: autocannon.Options): Promise<PhaseResult> {
  return new Promise((resolve, reject) => {
    const times: number[] = [];
    const statuses: Record<string, number> = {};
    const instance = autocannon({ connections: CONNECTIONS, duration: DURATION, timeout: 30, ...opts }, (err, result) => {
      if (err) return reject(err);
      resolve({ name, requests: times.length, perSecond: times.length / (result.duration || DURATION), latency: percentiles(times), statuses, errors: result.errors, timeouts: result.timeouts });
    });
    instance.on("response", (_client: unknown, status: number, _bytes: number, responseTime: number) => {
      times.push(responseTime);
      statuses[status] = (statuses[status] ?? 0) + 1;
    });
  });
}

function line(r: PhaseResult): string {
  const l = r.latency;
  const st = Object.entries(r.statuses).map(([k, v]) => `${k}×${v}`).join(" ");
  return `${r.name.padEnd(8)} ${String(r.requests).padStart(7)} req  ${r.perSecond.toFixed(1).padStart(7)} req/s   p50 ${l.p50.toFixed(0).padStart(5)}  p95 ${l.p95.toFixed(0).padStart(5)}  p99 ${l.p99.toFixed(0).padStart(5)}  max ${l.max.toFixed(0).padStart(5)} ms   ${st}  errors ${r.errors} timeouts ${r.timeouts}`;
}

async function main(): Promise<number> {
  const dir = mkdtempSync(path.join(tmpdir(), "chainwright-load-"));
  const db = path.join(dir, "load.db");
  prepare(db, REUSE);
  const server = await startServer(db, path.join(ROOT, "artifacts", "loadtest-server.log"));
  const problems: string[] = [];
  try {
    const cookie = await signIn(server.baseUrl, DEMO_PEOPLE.engineerA.email, DEMO_PASSWORD);
    const headers = { cookie, "content-type": "application/json" };
    const list = (await (await fetch(`${server.baseUrl}/api/chains`, { headers })).json()) as { chains: { id: string; name: string }[] };
    const demo = list.chains.find((c) => c.name === hullVibration.name);
    if (!demo) throw new Error("the seeded hull vibration chain is not in engineer A's library");
    const created = await fetch(`${server.baseUrl}/api/chains`, { method: "POST", headers, body: JSON.stringify({ name: "Load test target", document: { ...hullVibration, name: "Load test target" } }) });
    if (created.status !== 201) throw new Error(`creating the save target answered ${created.status}`);
    const target = ((await created.json()) as { chain: { id: string; version: number } }).chain;

    console.log(`[load] ${server.baseUrl}, ${CONNECTIONS} connections, ${DURATION} s per phase`);
    const results: PhaseResult[] = [];

    results.push(await runPhase("reads", { url: `${server.baseUrl}/api/chains/${demo.id}`, headers: { cookie } }));

    let newest = target.version;
    let accepted = 0;
    let conflicts = 0;
    let saveSeq = 0;
    const others: string[] = [];
    const saves = await runPhase("saves", {
      url: server.baseUrl,
      requests: [
        {
          method: "PUT",
          path: `/api/chains/${target.id}`,
          headers,
          setupRequest: (req) => ({ ...req, body: JSON.stringify({ baseVersion: newest, document: { ...hullVibration, name: "Load test target", notes: `save ${++saveSeq}` } }) }),
          onResponse: (status, body) => {
            if (status === 200) {
              accepted++;
              newest = Math.max(newest, (JSON.parse(body) as { chain: { version: number } }).chain.version);
            } else if (status === 409) {
              conflicts++;
              newest = Math.max(newest, (JSON.parse(body) as { currentVersion: number }).currentVersion);
            } else others.push(`${status} ${body.slice(0, 200)}`);
          },
        },
      ],
    });
    results.push(saves);

    results.push(await runPhase("analyze", { url: `${server.baseUrl}/api/analyze`, method: "POST", headers, body: JSON.stringify({ chain: hullVibration }) }));

    for (const r of results) console.log(line(r));

    const after = (await (await fetch(`${server.baseUrl}/api/chains/${target.id}`, { headers: { cookie } })).json()) as { chain: { version: number } };
    const revisions = (await (await fetch(`${server.baseUrl}/api/chains/${target.id}/revisions`, { headers: { cookie } })).json()) as { revisions?: { number: number }[] };
    const topRevision = Math.max(0, ...(revisions.revisions ?? []).map((r) => r.number));
    console.log(
      `[load] saves: ${accepted} accepted, ${conflicts} refused with 409, ${others.length} other; final version ${after.chain.version} (started at ${target.version}); newest revision ${topRevision}`,
    );

    for (const r of results) {
      if (r.errors || r.timeouts) problems.push(`${r.name}: ${r.errors} errors, ${r.timeouts} timeouts`);
      const expected = r.name === "saves" ? ["200", "409"] : ["200"];
      const bad = Object.keys(r.statuses).filter((s) => !expected.includes(s));
      if (bad.length) problems.push(`${r.name}: unexpected statuses ${bad.map((s) => `${s}×${r.statuses[s]}`).join(", ")}`);
      if (r.requests === 0) problems.push(`${r.name}: no request completed`);
    }
    if (others.length) problems.push(`saves refused other than by 409: ${others.slice(0, 3).join(" | ")}`);
    if (accepted === 0) problems.push("no save was accepted");
    if (after.chain.version !== target.version + accepted) problems.push(`lost or doubled update: final version ${after.chain.version}, expected ${target.version} + ${accepted} accepted saves`);
    if (topRevision !== after.chain.version) problems.push(`the newest revision is ${topRevision}, the chain's version ${after.chain.version}`);
  } finally {
    await server.stop();
    rmSync(dir, { recursive: true, force: true });
  }
  if (problems.length) {
    console.error(`[load] FAILED:\n  ${problems.join("\n  ")}`);
    return 1;
  }
  console.log("[load] all invariants held");
  return 0;
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
