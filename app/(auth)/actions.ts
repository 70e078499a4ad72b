"use server";

import { AuthError } from "next-auth";
import { redirect, unstable_rethrow } from "next/navigation";
import { z } from "zod";
import { findUserByEmail, normalizeEmail, savePendingSignup } from "@/db/queries/users";
import { signIn } from "@/lib/auth";
import { accountNameSchema, hashPassword, newPasswordSchema, PASSWORD_MAX_LENGTH, verifyPassword } from "@/lib/auth/password";
import { safeCallbackPath } from "@/lib/auth/redirects";
import { formFields, NOT_A_FORM } from "@/lib/api/action-input";
import { validate } from "@/lib/api/validate";

export interface FormState {
  error?: string;
  fieldErrors?: Record<string, string>;
  /** echo of what was typed (never the password) so a refused form keeps it */
  values?: Record<string, string>;
}

/** One wording for every password refusal, so it does not tell which addresses have accounts. */
const BAD_CREDENTIALS = "That e-mail address and password do not match an account. Check both, or sign in with an e-mail link.";
const TOO_MANY_ATTEMPTS =
  "Too many password attempts for this address in the last quarter of an hour. Wait a while, or sign in with an e-mail link below.";
const MAIL_NOT_SENT =
  "We could not send a link to that address just now. If you asked for several links in the last few minutes, wait a quarter of an hour and try again.";

const email = z.email("enter an e-mail address like name@example.com").max(320, "at most 320 characters");

const passwordSignInSchema = z.object({
  email,
  password: z.string().min(1, "enter your password").max(PASSWORD_MAX_LENGTH),
});

const linkSignInSchema = z.object({ email });

const signUpSchema = z.object({ name: accountNameSchema, email, password: newPasswordSchema });

function fieldErrors(errors: { path: string; message: string }[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const e of errors) out[e.path] ??= e.message;
  return out;
}

export async function signInWithPassword(_prev: FormState, form: FormData): Promise<FormState> {
  const input = formFields(form, ["email", "password", "callbackUrl"]);
  if (!input) return { error: NOT_A_FORM };
  const values = { email: input.email };
  const parsed = validate(passwordSignInSchema, input);
  if (!parsed.ok) return { fieldErrors: fieldErrors(parsed.errors), values };
  try {
    await signIn("credentials", {
      email: normalizeEmail(parsed.data.email),
      password: parsed.data.password,
      redirectTo: safeCallbackPath(input.callbackUrl),
    });
  } catch (error) {
    unstable_rethrow(error); // a successful sign-in ends in a redirect, thrown
    if (error instanceof AuthError && error.type === "CredentialsSignin") {
      return { error: (error as AuthError & { code?: string }).code === "too_many_attempts" ? TOO_MANY_ATTEMPTS : BAD_CREDENTIALS, values };
    }
    throw error;
  }
  return { error: BAD_CREDENTIALS, values };
}

async function sendSignInLink(address: string, redirectTo: string, values: Record<string, string>): Promise<FormState> {
  let next: string;
  try {
    // redirect: false hands back Auth.js's next URL instead of bouncing through /api/auth/verify-request
    next = await signIn("nodemailer", { email: address, redirectTo, redirect: false });
  } catch (error) {
    unstable_rethrow(error);
    console.error("[auth] sign-in mail not sent:", error instanceof Error ? error.message : error);
    return { error: MAIL_NOT_SENT, values };
  }
  if (typeof next === "string" && /[?&]error=/.test(next)) return { error: MAIL_NOT_SENT, values };
  redirect("/check-your-mail");
}

export async function signInWithLink(_prev: FormState, form: FormData): Promise<FormState> {
  const input = formFields(form, ["email", "callbackUrl"]);
  if (!input) return { error: NOT_A_FORM };
  const values = { email: input.email };
  const parsed = validate(linkSignInSchema, input);
  if (!parsed.ok) return { fieldErrors: fieldErrors(parsed.errors), values };
  return sendSignInLink(normalizeEmail(parsed.data.email), safeCallbackPath(input.callbackUrl), values);
}

/**
 * Sign-up: the password waits beside the address until the e-mail link is followed. For an
 * address that already has an account, the same page and a plain sign-in link follow, and
 * nothing is stored, so the form neither reveals accounts nor lets anyone replace a password.
 */
export async function signUp(_prev: FormState, form: FormData): Promise<FormState> {
  const input = formFields(form, ["name", "email", "password"]);
  if (!input) return { error: NOT_A_FORM };
  const values = { name: input.name, email: input.email };
  const parsed = validate(signUpSchema, input);
  if (!parsed.ok) return { fieldErrors: fieldErrors(parsed.errors), values };
  const address = normalizeEmail(parsed.data.email);
  const existing = findUserByEmail(address);
  if (existing) {
    await verifyPassword(parsed.data.password, null); // same hashing cost as the other branch
  } else {
    savePendingSignup(address, parsed.data.name, await hashPassword(parsed.data.password));
  }
  return sendSignInLink(address, "/chains", values);
}
