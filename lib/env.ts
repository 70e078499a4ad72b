import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { z } from "zod";

/**
 * The server's environment, validated with zod when first asked for (at run time), never
 * while `next build` imports modules: the build must not need a secret or a database.
 */

const flag = z
  .enum(["1", "0", "true", "false", ""])
  .optional()
  .transform((v) => v === "1" || v === "true");

const rawSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_PATH: z.string().min(1).default("./data/chainwright.db"),
  AUTH_SECRET: z.string().min(32, "must be at least 32 characters (e.g. `openssl rand -base64 33`)").optional(),
  AUTH_URL: z.url().optional(),
  SMTP_HOST: z.string().min(1).optional(),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).optional(),
  SMTP_SECURE: flag,
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().min(3).default("Chainwright <no-reply@chainwright.invalid>"),
  MAIL_STANDIN: flag,
  MAILBOX_PATH: z.string().min(1).optional(),
  SIGNIN_MAIL_LIMIT: z.coerce.number().int().min(1).max(1000).default(5),
  SIGNIN_MAIL_WINDOW_MINUTES: z.coerce.number().int().min(1).max(24 * 60).default(15),
});

export interface AppEnv {
  nodeEnv: "development" | "production" | "test";
  databasePath: string;
  authSecret: string;
  authUrl?: string;
  smtp: { host: string; port: number; secure: boolean; user?: string; password?: string };
  mailFrom: string;
  /** the local mail stand-in and its /mailbox page are switched on */
  mailStandin: boolean;
  mailboxPath: string;
  signinMailLimit: number;
  signinMailWindowMs: number;
}

export class EnvError extends Error {
  constructor(public readonly problems: string[]) {
    super(`Invalid environment:\n  ${problems.join("\n  ")}`);
    this.name = "EnvError";
  }
}

/**
 * The development/test secret: generated once and kept beside the database, so sessions
 * survive restarts without anyone having to invent a secret to try the app.
 */
function devSecret(dataDir: string): string {
  const file = path.join(/*turbopackIgnore: true*/ dataDir, ".dev-secret");
  if (existsSync(file)) {
    const kept = readFileSync(file, "utf8").trim();
    if (kept.length >= 32) return kept;
  }
  mkdirSync(dataDir, { recursive: true });
  const secret = randomBytes(33).toString("base64url");
  writeFileSync(file, secret + "\n", { mode: 0o600 });
  return secret;
}

/** Parse and check an environment record; throws EnvError naming every bad variable. */
export function parseEnv(source: Record<string, string | undefined>): AppEnv {
  const parsed = rawSchema.safeParse(source);
  if (!parsed.success) {
    throw new EnvError(parsed.error.issues.map((i) => `${i.path.join(".") || "env"}: ${i.message}`));
  }
  const e = parsed.data;
  const production = e.NODE_ENV === "production";
  const problems: string[] = [];
  if (production && !e.AUTH_SECRET) {
    problems.push("AUTH_SECRET: required in production (at least 32 random characters)");
  }
  if (production && !e.SMTP_HOST && !e.MAIL_STANDIN) {
    problems.push("SMTP_HOST: required in production (or MAIL_STANDIN=1 for a local trial)");
  }
  if (problems.length) throw new EnvError(problems);

  // paths chosen at run time: tell the bundler not to trace them as build inputs
  const databasePath = path.resolve(/*turbopackIgnore: true*/ e.DATABASE_PATH);
  const dataDir = path.dirname(databasePath);
  return {
    nodeEnv: e.NODE_ENV,
    databasePath,
    authSecret: e.AUTH_SECRET ?? devSecret(dataDir),
    authUrl: e.AUTH_URL,
    smtp: {
      host: e.SMTP_HOST ?? "127.0.0.1",
      port: e.SMTP_PORT ?? (e.MAIL_STANDIN || !production ? 2525 : 587),
      secure: e.SMTP_SECURE,
      user: e.SMTP_USER || undefined,
      password: e.SMTP_PASSWORD || undefined,
    },
    mailFrom: e.MAIL_FROM,
    mailStandin: e.MAIL_STANDIN,
    mailboxPath: path.resolve(/*turbopackIgnore: true*/ e.MAILBOX_PATH ?? path.join(dataDir, "mailbox.jsonl")),
    signinMailLimit: e.SIGNIN_MAIL_LIMIT,
    signinMailWindowMs: e.SIGNIN_MAIL_WINDOW_MINUTES * 60_000,
  };
}

let cached: AppEnv | undefined;

/** The validated environment of this process (parsed on first use). */
export function env(): AppEnv {
  cached ??= parseEnv(process.env);
  return cached;
}

/**
 * The check at server start (instrumentation.ts). In production a bad environment ends the process
 * with code 1 after naming every problem: left running, the server would answer each request with a
 * 500 and look alive to whatever supervises it. Elsewhere the error is thrown as usual.
 */
export function envAtStart(
  source: Record<string, string | undefined> = process.env,
  exit: (code: number) => never = (code) => process.exit(code),
  log: (message: string) => void = (message) => console.error(message),
): AppEnv {
  try {
    return parseEnv(source);
  } catch (err) {
    if (err instanceof EnvError && source.NODE_ENV === "production") {
      log(`[chainwright] ${err.message}\n[chainwright] Not starting: set these variables and start the server again.`);
      return exit(1);
    }
    throw err;
  }
}

/** Tests change process.env between cases; this forgets the parsed copy. */
export function resetEnvCache(): void {
  cached = undefined;
}
