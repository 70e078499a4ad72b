/**
 * `npm run crashtest`: kill the production server with SIGKILL in the middle of a save storm, then
 * check what SQLite kept. Per round: 16 writers save 4 chains as fast as the server answers (each save
 * with its own summary, so none folds into another and each keeps its own revision, and a marker in
 * its notes); once 40+ saves are acknowledged and after a random further moment, the server's whole
 * process group gets SIGKILL. Then, on the database file as the crash left it:
 *
 *   - `PRAGMA integrity_check` is "ok" and `PRAGMA foreign_key_check` finds nothing;
 *   - every acknowledged save is there: the revision with its chain and version holds its marker;
 *   - each chain's version is at least its newest acknowledged one, its document is its newest
 *     revision's, and its revisions run 1…version without a gap (nothing half written);
 *
 * and the server starts again on the same file, answers the chains and takes a new save.
 * Options: --rounds N (default 3), --reuse (keep an existing build in E2E_DIST_DIR). Exit 1 on any
 * broken check.
 */
import Database from "better-sqlite3";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { hullVibration } from "../../db/seed-data/chains";
import { DEMO_PASSWORD, DEMO_PEOPLE } from "../../db/seed-data/people";
import { prepare, ROOT, signIn, startServer, type RunningServer } from "./server";

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? Number(process.argv[i + 1]) : fallback;
};
const ROUNDS = arg("rounds", 3);
const REUSE = process.argv.includes("--reuse");
const CHAINS = 4;
const WRITERS = 16;
const KILL_AFTER_ACKS = 40;

interface Ack {
  chainId: string;
  version: number;
  marker: string;
}

async function storm(server: RunningServer, cookie: string, chainIds: string[], round: number): Promise<{ acks: Ack[]; conflicts: number; inFlightAtKill: number; failedAfterKill: number }> {
  const headers = { cookie, "content-type": "application/json" };
  const newest = new Map<string, number>();
  for (const id of chainIds) {
    const res = await fetch(`${server.baseUrl}/api/chains/${id}`, { headers });
    newest.set(id, ((await res.json()) as { chain: { version: number } }).chain.version);
  }
  const acks: Ack[] = [];
  let conflicts = 0;
  let inFlight = 0;
  let inFlightAtKill = -1;
  let failedAfterKill = 0;
  let killed = false;
  const writer = async (w: number) => {
    const chainId = chainIds[w % chainIds.length];
    for (let n = 0; !killed; n++) {
      const marker = `round ${round} writer ${w} save ${n}`;
      const body = JSON.stringify({ baseVersion: newest.get(chainId), summary: marker, document: { ...hullVibration, name: `Crash target ${w % chainIds.length}`, notes: marker } });
      inFlight++;
      try {
        const res = await fetch(`${server.baseUrl}/api/chains/${chainId}`, { method: "PUT", headers, body });
        const json = (await res.json()) as { chain?: { version: number }; currentVersion?: number };
        if (res.status === 200) {
          acks.push({ chainId, version: json.chain!.version, marker });
          newest.set(chainId, Math.max(newest.get(chainId)!, json.chain!.version));
        } else if (res.status === 409) {
          conflicts++;
          newest.set(chainId, Math.max(newest.get(chainId)!, json.currentVersion!));
        } else throw new Error(`a save answered ${res.status}: ${JSON.stringify(json).slice(0, 200)}`);
      } catch (err) {
        if (!killed) throw err;
        failedAfterKill++;
        return;
      } finally {
        inFlight--;
      }
    }
  };
  const writers = Array.from({ length: WRITERS }, (_, w) => writer(w));
  const killer = (async () => {
    while (acks.length < KILL_AFTER_ACKS) await new Promise((r) => setTimeout(r, 20));
    await new Promise((r) => setTimeout(r, Math.random() * 400));
    inFlightAtKill = inFlight;
    killed = true;
    await server.kill();
  })();
  await Promise.all([...writers, killer]);
  return { acks, conflicts, inFlightAtKill, failedAfterKill };
}

/** The checks on the file as the crash left it; returns the problems found. */
function checkFile(file: string, chainIds: string[], acks: Ack[]): { problems: string[]; integrity: string; versions: Record<string, number> } {
  const db = new Database(file);
  const problems: string[] = [];
  try {
    const integrity = (db.pragma("integrity_check") as { integrity_check: string }[]).map((r) => r.integrity_check).join("; ");
    if (integrity !== "ok") problems.push(`integrity_check: ${integrity}`);
    const fk = db.pragma("foreign_key_check") as unknown[];
    if (fk.length) problems.push(`foreign_key_check: ${JSON.stringify(fk).slice(0, 300)}`);
    const revision = db.prepare("SELECT document FROM revisions WHERE chain_id = ? AND number = ?");
    for (const a of acks) {
      const row = revision.get(a.chainId, a.version) as { document: string } | undefined;
      if (!row) problems.push(`acknowledged save missing: ${a.marker} (chain ${a.chainId} version ${a.version})`);
      else if (!row.document.includes(a.marker)) problems.push(`revision ${a.version} of ${a.chainId} does not hold ${a.marker}`);
    }
    const versions: Record<string, number> = {};
    for (const id of chainIds) {
      const chain = db.prepare("SELECT version, document FROM chains WHERE id = ?").get(id) as { version: number; document: string };
      versions[id] = chain.version;
      const newestAck = Math.max(0, ...acks.filter((a) => a.chainId === id).map((a) => a.version));
      if (chain.version < newestAck) problems.push(`chain ${id} is at version ${chain.version}, but version ${newestAck} was acknowledged`);
      const numbers = (db.prepare("SELECT number FROM revisions WHERE chain_id = ? ORDER BY number").all(id) as { number: number }[]).map((r) => r.number);
      if (numbers.length !== chain.version || numbers.some((n, i) => n !== i + 1)) problems.push(`chain ${id} at version ${chain.version} has revisions ${numbers.slice(0, 5).join(",")}…${numbers.slice(-3).join(",")} (${numbers.length})`);
      const top = revision.get(id, chain.version) as { document: string } | undefined;
      if (!top || top.document !== chain.document) problems.push(`chain ${id}: its document is not its newest revision's`);
    }
    return { problems, integrity, versions };
  } finally {
    db.close();
  }
}

async function main(): Promise<number> {
  const dir = mkdtempSync(path.join(tmpdir(), "chainwright-crash-"));
  const file = path.join(dir, "crash.db");
  const log = path.join(ROOT, "artifacts", "crashtest-server.log");
  prepare(file, REUSE);
  let server = await startServer(file, log);
  const problems: string[] = [];
  try {
    let cookie = await signIn(server.baseUrl, DEMO_PEOPLE.engineerA.email, DEMO_PASSWORD);
    const chainIds: string[] = [];
    for (let i = 0; i < CHAINS; i++) {
      const res = await fetch(`${server.baseUrl}/api/chains`, { method: "POST", headers: { cookie, "content-type": "application/json" }, body: JSON.stringify({ name: `Crash target ${i}`, document: { ...hullVibration, name: `Crash target ${i}` } }) });
      if (res.status !== 201) throw new Error(`creating a chain answered ${res.status}`);
      chainIds.push(((await res.json()) as { chain: { id: string } }).chain.id);
    }
    let totalAcks = 0;
    for (let round = 1; round <= ROUNDS; round++) {
      const s = await storm(server, cookie, chainIds, round);
      totalAcks += s.acks.length;
      const c = checkFile(file, chainIds, s.acks);
      console.log(
        `[crash] round ${round}: SIGKILL with ${s.inFlightAtKill} saves in flight after ${s.acks.length} acknowledged (${s.conflicts} refused with 409); integrity_check ${c.integrity}; ` +
          `${s.acks.length - c.problems.filter((p) => p.startsWith("acknowledged")).length}/${s.acks.length} acknowledged saves present; versions ${Object.values(c.versions).join(", ")}`,
      );
      problems.push(...c.problems.map((p) => `round ${round}: ${p}`));
      server = await startServer(file, log, Number(new URL(server.baseUrl).port));
      cookie = await signIn(server.baseUrl, DEMO_PEOPLE.engineerA.email, DEMO_PASSWORD);
      for (const id of chainIds) {
        const res = await fetch(`${server.baseUrl}/api/chains/${id}`, { headers: { cookie } });
        const got = (await res.json()) as { chain: { version: number } };
        if (res.status !== 200 || got.chain.version !== c.versions[id]) problems.push(`round ${round}: after restart chain ${id} answered ${res.status} version ${got.chain?.version}, the file says ${c.versions[id]}`);
      }
      const again = await fetch(`${server.baseUrl}/api/chains/${chainIds[0]}`, {
        method: "PUT",
        headers: { cookie, "content-type": "application/json" },
        body: JSON.stringify({ baseVersion: c.versions[chainIds[0]], summary: `after crash ${round}`, document: { ...hullVibration, name: "Crash target 0", notes: `after crash ${round}` } }),
      });
      if (again.status !== 200) problems.push(`round ${round}: the first save after restart answered ${again.status}`);
    }
    console.log(`[crash] ${ROUNDS} rounds, ${totalAcks} acknowledged saves in all`);
  } finally {
    await server.stop();
    rmSync(dir, { recursive: true, force: true });
  }
  if (problems.length) {
    console.error(`[crash] FAILED:\n  ${problems.slice(0, 30).join("\n  ")}`);
    return 1;
  }
  console.log("[crash] every acknowledged save survived; the file is intact after every kill");
  return 0;
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
