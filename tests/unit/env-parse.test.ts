import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { EnvError, envAtStart, parseEnv } from "@/lib/env";

describe("parseEnv", () => {
  let dir: string;
  beforeEach(() => {
    dir = mkdtempSync(path.join(tmpdir(), "chainwright-env-"));
  });
  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  const dbIn = (d: string) => path.join(d, "app.db");

  it("refuses to run in production without AUTH_SECRET, naming it", () => {
    expect(() => parseEnv({ NODE_ENV: "production", DATABASE_PATH: dbIn(dir), SMTP_HOST: "mail.example" })).toThrowError(
      /AUTH_SECRET: required in production/,
    );
  });

  it("refuses a production start with no SMTP server unless the stand-in is switched on", () => {
    const secret = "x".repeat(40);
    expect(() => parseEnv({ NODE_ENV: "production", AUTH_SECRET: secret, DATABASE_PATH: dbIn(dir) })).toThrowError(/SMTP_HOST/);
    const withStandin = parseEnv({ NODE_ENV: "production", AUTH_SECRET: secret, DATABASE_PATH: dbIn(dir), MAIL_STANDIN: "1" });
    expect(withStandin.mailStandin).toBe(true);
  });

  it("generates a development secret once, keeps it beside the database and reuses it", () => {
    const first = parseEnv({ NODE_ENV: "development", DATABASE_PATH: dbIn(dir) });
    expect(first.authSecret.length).toBeGreaterThanOrEqual(32);
    expect(readFileSync(path.join(dir, ".dev-secret"), "utf8").trim()).toBe(first.authSecret);
    const second = parseEnv({ NODE_ENV: "test", DATABASE_PATH: dbIn(dir) });
    expect(second.authSecret).toBe(first.authSecret);
  });

  it("uses a given secret as it is and never writes a file for it", () => {
    const secret = "s".repeat(48);
    const e = parseEnv({ NODE_ENV: "development", DATABASE_PATH: dbIn(dir), AUTH_SECRET: secret });
    expect(e.authSecret).toBe(secret);
    expect(() => readFileSync(path.join(dir, ".dev-secret"))).toThrow();
  });

  it("names each bad variable", () => {
    try {
      parseEnv({ NODE_ENV: "staging", SMTP_PORT: "seventy", AUTH_SECRET: "short" });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(EnvError);
      const text = (e as EnvError).problems.join("\n");
      expect(text).toMatch(/NODE_ENV/);
      expect(text).toMatch(/SMTP_PORT/);
      expect(text).toMatch(/AUTH_SECRET/);
    }
  });

  it("fills development defaults: database under ./data, stand-in SMTP on 2525, mailbox beside the database", () => {
    const e = parseEnv({ NODE_ENV: "development", DATABASE_PATH: dbIn(dir) });
    expect(e.smtp).toMatchObject({ host: "127.0.0.1", port: 2525, secure: false });
    expect(e.mailboxPath).toBe(path.join(dir, "mailbox.jsonl"));
    expect(e.mailStandin).toBe(false);
    expect(e.signinMailLimit).toBe(5);
    expect(e.signinMailWindowMs).toBe(15 * 60_000);
    const noPath = parseEnv({ NODE_ENV: "test", AUTH_SECRET: "k".repeat(32) });
    expect(noPath.databasePath).toBe(path.resolve("data/chainwright.db"));
  });
});

describe("envAtStart", () => {
  class Exited extends Error {
    constructor(readonly code: number) {
      super(`exit ${code}`);
    }
  }
  const exit = (code: number): never => {
    throw new Exited(code);
  };

  it("in production ends the process with code 1, naming the missing secret", () => {
    const lines: string[] = [];
    const run = () => envAtStart({ NODE_ENV: "production", MAIL_STANDIN: "1" }, exit, (m) => lines.push(m));
    expect(run).toThrow(Exited);
    try {
      run();
    } catch (e) {
      expect((e as Exited).code).toBe(1);
    }
    expect(lines[0]).toContain("AUTH_SECRET");
  });

  it("in development throws the EnvError instead of ending the process", () => {
    const lines: string[] = [];
    expect(() => envAtStart({ NODE_ENV: "development", SMTP_PORT: "not a port" }, exit, (m) => lines.push(m))).toThrow(EnvError);
    expect(lines).toEqual([]);
  });

  it("returns the settings when the environment is good", () => {
    const dir = mkdtempSync(path.join(tmpdir(), "chainwright-env-"));
    try {
      const e = envAtStart({ NODE_ENV: "production", AUTH_SECRET: "s".repeat(40), MAIL_STANDIN: "1", DATABASE_PATH: path.join(dir, "app.db") }, exit);
      expect(e.authSecret).toBe("s".repeat(40));
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
