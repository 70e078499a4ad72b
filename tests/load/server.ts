/**
 * A production server for the load and crash scripts, on 127.0.0.1 with a database they own: build
 * into E2E_DIST_DIR (default .next-e2e, shared with the browser tests; `--reuse` keeps an existing
 * build), seed a fresh SQLite file, then `next start` in its own process group so it can be killed
 * outright (SIGKILL) and started again on the same file. Mail goes to a port nothing listens on:
 * these scripts send none.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { createWriteStream, existsSync, mkdirSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { freePort } from "../e2e/support/server";

export const ROOT = fileURLToPath(new URL("../..", import.meta.url));
export const DIST_DIR = process.env.E2E_DIST_DIR || ".next-e2e";
const NEXT = path.join(ROOT, "node_modules", "next", "dist", "bin", "next");
const TSX = path.join(ROOT, "node_modules", "tsx", "dist", "cli.mjs");

function run(args: string[], env: NodeJS.ProcessEnv, what: string): void {
  const r = spawnSync(process.execPath, args, { cwd: ROOT, env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1", ...env }, encoding: "utf8", maxBuffer: 64 << 20 });
  if (r.status !== 0) throw new Error(`${what} failed (${r.status}):\n${(r.stdout + r.stderr).split("\n").slice(-40).join("\n")}`);
}

/** Build unless `reuse` and a build exists; seed the demo into a fresh database at `databasePath`. */
export function prepare(databasePath: string, reuse: boolean): void {
  if (!(reuse && existsSync(path.join(ROOT, DIST_DIR, "BUILD_ID")))) {
    console.log(`[server] building into ${DIST_DIR} …`);
    run([NEXT, "build"], { NODE_ENV: "production", NEXT_DIST_DIR: DIST_DIR }, "next build");
  }
  mkdirSync(path.dirname(databasePath), { recursive: true });
  run([TSX, "--conditions=react-server", "db/seed.ts"], { NODE_ENV: "test", DATABASE_PATH: databasePath }, "seeding");
}

export interface RunningServer {
  baseUrl: string;
  child: ChildProcess;
  /** SIGKILL the whole process group, no chance to flush or close anything */
  kill(): Promise<void>;
  /** SIGTERM and wait */
  stop(): Promise<void>;
}

export const AUTH_SECRET = randomBytes(33).toString("base64url");

export async function startServer(databasePath: string, logFile: string, port?: number): Promise<RunningServer> {
  const httpPort = port ?? (await freePort());
  const smtpPort = await freePort();
  mkdirSync(path.dirname(logFile), { recursive: true });
  const log = createWriteStream(logFile, { flags: "a" });
  const child = spawn(process.execPath, [NEXT, "start", "-H", "127.0.0.1", "-p", String(httpPort)], {
    cwd: ROOT,
    detached: true,
    stdio: ["ignore", "pipe", "pipe"],
    env: {
      ...process.env,
      NEXT_TELEMETRY_DISABLED: "1",
      NODE_ENV: "production",
      NEXT_DIST_DIR: DIST_DIR,
      DATABASE_PATH: databasePath,
      AUTH_SECRET,
      SMTP_HOST: "127.0.0.1",
      SMTP_PORT: String(smtpPort),
    },
  });
  child.stdout!.pipe(log);
  child.stderr!.pipe(log);
  const baseUrl = `http://127.0.0.1:${httpPort}`;
  const exited = new Promise<void>((r) => child.once("exit", () => r()));
  const signal = async (sig: NodeJS.Signals) => {
    if (child.exitCode !== null || child.signalCode !== null) return;
    try {
      process.kill(-child.pid!, sig);
    } catch {
      // already gone
    }
    await Promise.race([exited, new Promise((r) => setTimeout(r, 10_000))]);
  };
  const deadline = Date.now() + 90_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`next start exited with ${child.exitCode}; see ${logFile}`);
    try {
      const res = await fetch(`${baseUrl}/sign-in`, { redirect: "manual" });
      if (res.status < 500) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error(`the server did not answer within 90 s; see ${logFile}`);
    await new Promise((r) => setTimeout(r, 250));
  }
  return { baseUrl, child, kill: () => signal("SIGKILL"), stop: () => signal("SIGTERM") };
}

/**
 * Sign in by password through Auth.js's own endpoints (CSRF token, then the credentials callback) and
 * return the Cookie header to send with API requests.
 */
export async function signIn(baseUrl: string, email: string, password: string): Promise<string> {
  const csrf = await fetch(`${baseUrl}/api/auth/csrf`);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(";");
      const eq = pair.indexOf("=");
      jar.set(pair.slice(0, eq), pair.slice(eq + 1));
    }
  };
  keep(csrf);
  const res = await fetch(`${baseUrl}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: [...jar].map(([k, v]) => `${k}=${v}`).join("; ") },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: `${baseUrl}/chains` }),
  });
  keep(res);
  const session = [...jar.keys()].find((k) => k.includes("session-token"));
  if (!session) throw new Error(`signing in as ${email} gave no session cookie (status ${res.status})`);
  const cookie = [...jar].map(([k, v]) => `${k}=${v}`).join("; ");
  const me = await fetch(`${baseUrl}/api/chains`, { headers: { cookie } });
  if (me.status !== 200) throw new Error(`signed in as ${email}, but GET /api/chains answered ${me.status}`);
  return cookie;
}

/** Latency percentiles (nearest rank) of a list of milliseconds. */
export function percentiles(ms: number[]): { p50: number; p95: number; p99: number; max: number } {
  const s = [...ms].sort((a, b) => a - b);
  const at = (q: number) => (s.length ? s[Math.min(s.length - 1, Math.ceil(q * s.length) - 1)] : NaN);
  return { p50: at(0.5), p95: at(0.95), p99: at(0.99), max: s.length ? s[s.length - 1] : NaN };
}
