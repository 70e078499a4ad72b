import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { createWriteStream, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { startMailStandin, type MailStandin } from "../../../scripts/mail-standin";

/**
 * A production-like Chainwright for browser tests: `next build` into .next-e2e, a fresh seeded
 * SQLite file in a temp folder, the mail stand-in on a free port and `next start` on
 * 127.0.0.1 on another free port. Browse it at http://localhost:PORT (Auth.js builds its
 * links from the host it is reached by).
 */

// E2E_DIST_DIR lets a helper build into its own folder while another build runs (default .next-e2e).
export const E2E_DIST_DIR = process.env.E2E_DIST_DIR || ".next-e2e";
// import.meta.url rather than __dirname, so the harness also runs outside vitest (npm run bench:ui under tsx)
const ROOT = fileURLToPath(new URL("../../..", import.meta.url));

export interface E2EServer {
  baseUrl: string;
  mailboxPath: string;
  /** values only the server may know (its AUTH_SECRET, its database path), to check no page or script carries them */
  serverSecrets: string[];
  stop(): Promise<void>;
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const address = srv.address();
      const port = typeof address === "object" && address ? address.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

function tail(file: string, lines = 40): string {
  if (!existsSync(file)) return "";
  return readFileSync(file, "utf8").split("\n").slice(-lines).join("\n");
}

/** Run a node script from the project root to completion, logging into `logFile`. */
function runNode(args: string[], env: NodeJS.ProcessEnv, logFile: string): Promise<void> {
  return new Promise((resolve, reject) => {
    const log = createWriteStream(logFile);
    const child = spawn(process.execPath, args, { cwd: ROOT, env, stdio: ["ignore", "pipe", "pipe"] });
    child.stdout.pipe(log);
    child.stderr.pipe(log);
    child.on("error", reject);
    child.on("exit", (code) => {
      log.end(() => {
        if (code === 0) resolve();
        else reject(new Error(`${args.join(" ")} exited with ${code}; last lines of ${logFile}:\n${tail(logFile)}`));
      });
    });
  });
}

async function waitForHttp(url: string, child: ChildProcess, logFile: string, timeoutMs = 90_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`next start exited with ${child.exitCode}:\n${tail(logFile)}`);
    try {
      const res = await fetch(url, { redirect: "manual" });
      if (res.status < 500) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error(`server did not answer at ${url} within ${timeoutMs} ms:\n${tail(logFile)}`);
}

/** Build (unless E2E_REUSE_BUILD=1 and a build exists) and start the app with a fresh database. */
export async function startE2EServer(artifactsDir: string): Promise<E2EServer> {
  mkdirSync(artifactsDir, { recursive: true });
  const dataDir = mkdtempSync(path.join(tmpdir(), "chainwright-e2e-"));
  const databasePath = path.join(dataDir, "e2e.db");
  const mailboxPath = path.join(dataDir, "mailbox.jsonl");
  const [smtpPort, httpPort] = [await freePort(), await freePort()];
  const tsx = path.join(ROOT, "node_modules", "tsx", "dist", "cli.mjs");
  const next = path.join(ROOT, "node_modules", "next", "dist", "bin", "next");
  const baseEnv = { ...process.env, NEXT_TELEMETRY_DISABLED: "1" };

  const reuse = process.env.E2E_REUSE_BUILD === "1" && existsSync(path.join(ROOT, E2E_DIST_DIR, "BUILD_ID"));
  const building = reuse
    ? Promise.resolve()
    : // the build gets no database, secret or mail settings: it must not need them
      runNode([next, "build"], { ...baseEnv, NODE_ENV: "production", NEXT_DIST_DIR: E2E_DIST_DIR }, path.join(artifactsDir, "e2e-build.log"));
  const seeding = runNode(
    [tsx, "--conditions=react-server", "db/seed.ts"],
    { ...baseEnv, NODE_ENV: "test", DATABASE_PATH: databasePath },
    path.join(artifactsDir, "e2e-seed.log"),
  );
  await Promise.all([building, seeding]);

  const authSecret = randomBytes(33).toString("base64url");
  let standin: MailStandin | undefined;
  let server: ChildProcess | undefined;
  const stop = async () => {
    if (server && server.exitCode === null && server.pid) {
      const exited = new Promise((r) => server!.once("exit", r));
      try {
        process.kill(-server.pid, "SIGTERM");
      } catch {
        // already gone
      }
      await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
    }
    await standin?.close();
    rmSync(dataDir, { recursive: true, force: true });
  };

  try {
    standin = await startMailStandin({ port: smtpPort, mailboxPath, quiet: true });
    const serverLog = path.join(artifactsDir, "e2e-server.log");
    const log = createWriteStream(serverLog);
    server = spawn(process.execPath, [next, "start", "-H", "127.0.0.1", "-p", String(httpPort)], {
      cwd: ROOT,
      detached: true, // own process group, so stop() ends next and its workers together
      stdio: ["ignore", "pipe", "pipe"],
      env: {
        ...baseEnv,
        NODE_ENV: "production",
        NEXT_DIST_DIR: E2E_DIST_DIR,
        DATABASE_PATH: databasePath,
        AUTH_SECRET: authSecret,
        MAIL_STANDIN: "1",
        MAILBOX_PATH: mailboxPath,
        SMTP_HOST: "127.0.0.1",
        SMTP_PORT: String(smtpPort),
      },
    });
    server.stdout!.pipe(log);
    server.stderr!.pipe(log);
    await waitForHttp(`http://127.0.0.1:${httpPort}/`, server, serverLog);
  } catch (err) {
    await stop();
    throw err;
  }
  return { baseUrl: `http://localhost:${httpPort}`, mailboxPath, serverSecrets: [authSecret, databasePath], stop };
}
