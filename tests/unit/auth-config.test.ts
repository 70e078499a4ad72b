import { afterEach, beforeEach, describe, expect, it } from "vitest";
import path from "node:path";
import { findUserByEmail, savePendingSignup } from "@/db/queries/users";
import { listUserTeams } from "@/db/queries/teams";
import { Auth } from "@auth/core";
import { buildAuthConfig, PASSWORD_ATTEMPT_LIMIT, PasswordAttemptsLimited, SignInMailLimited } from "@/lib/auth/config";
import { hashPassword } from "@/lib/auth/password";
import { resetEnvCache } from "@/lib/env";
import { messagesFor } from "@/lib/mail/mailbox";
import { startMailStandin, type MailStandin } from "@/scripts/mail-standin";
import { makeUser } from "../support/fixtures";
import { useTempDatabase } from "../support/temp-db";

/**
 * The Auth.js configuration's own pieces, called the way Auth.js calls them: the mail step of
 * the e-mail link provider, the password check, and the sign-in event.
 */

type ProviderWithOptions = { id: string; options: Record<string, (...args: never[]) => unknown> };

function provider(id: string): ProviderWithOptions {
  const found = buildAuthConfig().providers.find((p) => (p as unknown as ProviderWithOptions).id === id);
  return found as unknown as ProviderWithOptions;
}

let standin: MailStandin;
let tmp: ReturnType<typeof useTempDatabase>;
const saved = { ...process.env };

beforeEach(async () => {
  tmp = useTempDatabase();
  const mailbox = path.join(tmp.dir, "mailbox.jsonl");
  standin = await startMailStandin({ port: 0, mailboxPath: mailbox, quiet: true });
  Object.assign(process.env, {
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(standin.port),
    MAIL_STANDIN: "1",
    MAILBOX_PATH: mailbox,
    SIGNIN_MAIL_LIMIT: "2",
  });
  resetEnvCache();
});
afterEach(async () => {
  await standin.close();
  tmp.cleanup();
  process.env = { ...saved };
  resetEnvCache();
});

describe("e-mail link provider", () => {
  it("sends the link through SMTP and refuses the third request in the window for one address", async () => {
    const send = provider("nodemailer").options.sendVerificationRequest as unknown as (p: { identifier: string; url: string }) => Promise<void>;
    const url = "http://localhost:3000/api/auth/callback/nodemailer?token=abc&email=a%40test.example";
    await send({ identifier: "a@test.example", url });
    await send({ identifier: "a@test.example", url });
    await expect(send({ identifier: "a@test.example", url })).rejects.toBeInstanceOf(SignInMailLimited);
    await send({ identifier: "b@test.example", url }); // another address has its own allowance
    const mailbox = path.join(tmp.dir, "mailbox.jsonl");
    expect(messagesFor(mailbox, "a@test.example")).toHaveLength(2);
    expect(messagesFor(mailbox, "b@test.example")).toHaveLength(1);
  });

  it("normalises addresses to one form and refuses what is not an address", () => {
    const normalize = provider("nodemailer").options.normalizeIdentifier as unknown as (s: string) => string;
    expect(normalize("  Maren@Keelwater.EXAMPLE ")).toBe("maren@keelwater.example");
    expect(() => normalize("not-an-address")).toThrow(/not an e-mail address/);
    expect(() => normalize("a@b@c.example")).toThrow();
  });
});

describe("password provider", () => {
  it("returns the user for the right password and null for every kind of wrong", async () => {
    const authorize = provider("credentials").options.authorize as unknown as (c: unknown) => Promise<{ id: string } | null>;
    const user = makeUser("pw", await hashPassword("right password 1"));
    expect(await authorize({ email: user.email, password: "right password 1" })).toMatchObject({ id: user.id });
    expect(await authorize({ email: user.email!.toUpperCase(), password: "right password 1" })).toMatchObject({ id: user.id });
    expect(await authorize({ email: user.email, password: "wrong password" })).toBeNull();
    expect(await authorize({ email: "nobody@test.example", password: "right password 1" })).toBeNull();
    expect(await authorize({ email: makeUser("link-only").email, password: "anything" })).toBeNull();
    expect(await authorize({ email: "not an address", password: "x" })).toBeNull();
    expect(await authorize({ email: user.email, password: "x".repeat(500) })).toBeNull();
    expect(await authorize(null)).toBeNull();
  });
});

describe("password attempts", () => {
  it(`refuses an address after ${PASSWORD_ATTEMPT_LIMIT} failed attempts, even the right password, and a success clears the count`, async () => {
    const authorize = provider("credentials").options.authorize as unknown as (c: unknown) => Promise<{ id: string } | null>;
    const user = makeUser("guessed", await hashPassword("right password 1"));
    const other = makeUser("bystander", await hashPassword("right password 2"));
    for (let i = 0; i < PASSWORD_ATTEMPT_LIMIT - 1; i++) expect(await authorize({ email: user.email, password: `guess ${i}` })).toBeNull();
    // a success before the limit resets the count …
    expect(await authorize({ email: user.email, password: "right password 1" })).toMatchObject({ id: user.id });
    for (let i = 0; i < PASSWORD_ATTEMPT_LIMIT; i++) expect(await authorize({ email: user.email, password: `guess ${i}` })).toBeNull();
    // … but after the limit even the right password is refused, with the code the sign-in action words
    await expect(authorize({ email: user.email!.toUpperCase(), password: "right password 1" })).rejects.toBeInstanceOf(PasswordAttemptsLimited);
    // an unknown address is counted the same way (the limit does not reveal accounts), other addresses are untouched
    for (let i = 0; i < PASSWORD_ATTEMPT_LIMIT; i++) expect(await authorize({ email: "nobody@test.example", password: "x" })).toBeNull();
    await expect(authorize({ email: "nobody@test.example", password: "x" })).rejects.toBeInstanceOf(PasswordAttemptsLimited);
    expect(await authorize({ email: other.email, password: "right password 2" })).toMatchObject({ id: other.id });
  });
});

describe("sign-in event", () => {
  it("applies a waiting password sign-up on a followed link and gives the newcomer a personal team", async () => {
    const events = buildAuthConfig().events!;
    const user = makeUser("newcomer");
    savePendingSignup(user.email!, "Nadia Newcomer", await hashPassword("chosen password"));
    await events.signIn!({ user: { id: user.id, email: user.email }, account: { provider: "nodemailer", type: "email", providerAccountId: user.email! } } as never);
    expect(findUserByEmail(user.email!)?.name).toBe("Nadia Newcomer");
    expect(listUserTeams(user.id)).toEqual([expect.objectContaining({ personal: true, role: "admin" })]);
  });

  it("does not apply a waiting sign-up when the password provider signed the user in", async () => {
    const events = buildAuthConfig().events!;
    const user = makeUser("pw-user", await hashPassword("old password"));
    savePendingSignup(user.email!, "Someone Else", await hashPassword("planted password"));
    await events.signIn!({ user: { id: user.id, email: user.email }, account: { provider: "credentials", type: "credentials", providerAccountId: user.id } } as never);
    expect(findUserByEmail(user.email!)?.name).toBe(user.name);
  });
});

describe("session cookies", () => {
  /** Sign in with a password through Auth.js itself and return the Set-Cookie lines of each step. */
  async function passwordSignIn(baseUrl: string) {
    const config = { ...buildAuthConfig(), basePath: "/api/auth" };
    const user = makeUser("cookie", await hashPassword("a long enough password"));
    const csrf = await Auth(new Request(`${baseUrl}/api/auth/csrf`), config);
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    const jar = csrf.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
    const signIn = await Auth(
      new Request(`${baseUrl}/api/auth/callback/credentials`, {
        method: "POST",
        headers: { "content-type": "application/x-www-form-urlencoded", cookie: jar },
        body: new URLSearchParams({ csrfToken, email: user.email!, password: "a long enough password" }),
      }),
      config,
    );
    return [...csrf.headers.getSetCookie(), ...signIn.headers.getSetCookie()];
  }
  const session = (cookies: string[]) => cookies.find((c) => /^(__Secure-)?authjs\.session-token=/.test(c));

  it("are httpOnly and Secure in production even when the request arrives over plain HTTP", async () => {
    Object.assign(process.env, { NODE_ENV: "production", AUTH_SECRET: "x".repeat(40) });
    resetEnvCache();
    const cookies = await passwordSignIn("http://localhost:3000");
    const token = session(cookies);
    expect(token).toMatch(/^__Secure-authjs\.session-token=/);
    for (const c of cookies) {
      expect(c).toMatch(/;\s*HttpOnly/i);
      expect(c).toMatch(/;\s*Secure/i);
    }
  });

  it("are httpOnly but not Secure on a development server over HTTP", async () => {
    Object.assign(process.env, { NODE_ENV: "development" });
    resetEnvCache();
    const cookies = await passwordSignIn("http://localhost:3000");
    const token = session(cookies);
    expect(token).toMatch(/^authjs\.session-token=/);
    expect(token).toMatch(/;\s*HttpOnly/i);
    expect(token).not.toMatch(/;\s*Secure/i);
  });
});
