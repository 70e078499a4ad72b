import "server-only";
import { DrizzleAdapter } from "@auth/drizzle-adapter";
import { CredentialsSignin } from "@auth/core/errors";
import type { NextAuthConfig } from "next-auth";
import Credentials from "next-auth/providers/credentials";
import Nodemailer from "next-auth/providers/nodemailer";
import { z } from "zod";
import { getDb } from "@/db/connection";
import { clearRateTokens, takeRateToken } from "@/db/queries/rate-limit";
import { applyPendingSignup, ensurePersonalTeam, findUserByEmail, normalizeEmail } from "@/db/queries/users";
import { accounts, sessions, users, verificationTokens } from "@/db/schema";
import { env } from "@/lib/env";
import { sendMail } from "@/lib/mail/transport";
import { signInLinkMail } from "@/lib/mail/templates";
import { PASSWORD_MAX_LENGTH, verifyPassword } from "./password";

/** Sign-in links live 24 hours and work once (Auth.js deletes the token when it is used). */
export const SIGN_IN_LINK_MAX_AGE_S = 24 * 60 * 60;

const credentialsSchema = z.object({
  email: z.email().max(320),
  password: z.string().min(1).max(PASSWORD_MAX_LENGTH),
});

/**
 * Password attempts per address (the address as typed, account or not, so the limit tells nothing
 * about which addresses have accounts): PASSWORD_ATTEMPT_LIMIT attempts in the window without a
 * success, then refused until the oldest leaves the window. A success clears the count.
 */
export const PASSWORD_ATTEMPT_LIMIT = 10;
export const PASSWORD_ATTEMPT_WINDOW_MS = 15 * 60_000;

/** Auth.js hands `code` back to the sign-in action, which shows its own wording for it. */
export class PasswordAttemptsLimited extends CredentialsSignin {
  code = "too_many_attempts";
}

/** Raised from the mail step when an address asked for too many links; shows as a sign-in mail error. */
export class SignInMailLimited extends Error {
  constructor(public readonly retryAfterMs: number) {
    super("Too many sign-in links requested for this address");
    this.name = "SignInMailLimited";
  }
}

/**
 * The Auth.js configuration, built on each request (never at import), so that `next build`
 * neither needs AUTH_SECRET nor opens the database.
 */
export function buildAuthConfig(): NextAuthConfig {
  const e = env();
  const db = getDb();
  return {
    secret: e.authSecret,
    trustHost: true,
    // Auth.js cookies are httpOnly; whether they are Secure it would otherwise read from the request's
    // protocol, which behind a proxy is only what X-Forwarded-Proto claims. In production they are
    // always Secure (browsers keep such cookies over HTTPS, and on http://localhost for a local trial).
    useSecureCookies: e.nodeEnv === "production" ? true : undefined,
    adapter: DrizzleAdapter(db, {
      usersTable: users,
      accountsTable: accounts,
      sessionsTable: sessions,
      verificationTokensTable: verificationTokens,
    }),
    // The password provider only works with JWT sessions; roles are never read from the token.
    session: { strategy: "jwt", maxAge: 30 * 24 * 60 * 60 },
    pages: { signIn: "/sign-in", error: "/auth-error", verifyRequest: "/check-your-mail" },
    providers: [
      Nodemailer({
        server: { host: e.smtp.host, port: e.smtp.port },
        from: e.mailFrom,
        maxAge: SIGN_IN_LINK_MAX_AGE_S,
        normalizeIdentifier(identifier) {
          // Auth.js's own normaliser also refuses malformed addresses; keep that, in one canonical form
          const email = normalizeEmail(identifier ?? "");
          if (!credentialsSchema.shape.email.safeParse(email).success) throw new Error("not an e-mail address");
          return email;
        },
        async sendVerificationRequest({ identifier, url }) {
          const decision = takeRateToken(`sign-in-mail:${identifier}`, e.signinMailLimit, e.signinMailWindowMs);
          if (!decision.allowed) throw new SignInMailLimited(decision.retryAfterMs);
          const mail = signInLinkMail(url, new URL(url).host);
          await sendMail({ to: identifier, ...mail });
        },
      }),
      Credentials({
        credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
        async authorize(raw) {
          const parsed = credentialsSchema.safeParse(raw);
          if (!parsed.success) return null;
          const attemptKey = `sign-in-password:${normalizeEmail(parsed.data.email)}`;
          if (!takeRateToken(attemptKey, PASSWORD_ATTEMPT_LIMIT, PASSWORD_ATTEMPT_WINDOW_MS).allowed) throw new PasswordAttemptsLimited();
          const user = findUserByEmail(parsed.data.email);
          // verifyPassword hashes against a dummy when there is no user, to keep timing alike
          const ok = await verifyPassword(parsed.data.password, user?.passwordHash);
          if (!user || !ok) return null;
          clearRateTokens(attemptKey);
          return { id: user.id, name: user.name, email: user.email };
        },
      }),
    ],
    callbacks: {
      jwt({ token, user }) {
        if (user?.id) token.sub = user.id;
        return token;
      },
      session({ session, token }) {
        if (token.sub && session.user) session.user.id = token.sub;
        return session;
      },
    },
    events: {
      async signIn({ user, account }) {
        if (!user.id) return;
        // A followed e-mail link proves the address: a password sign-up waiting for it now applies.
        if (account?.provider === "nodemailer" && user.email) applyPendingSignup(user.id, user.email);
        ensurePersonalTeam(user.id);
      },
    },
    logger: {
      // Expected refusals (wrong password, used link) are not server errors: keep the log quiet.
      error(error) {
        const type = (error as { type?: string }).type;
        if (type === "CredentialsSignin" || type === "Verification") return;
        console.error("[auth]", error);
      },
    },
  };
}
