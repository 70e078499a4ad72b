"use server";

import { redirect, unstable_rethrow } from "next/navigation";
import { z } from "zod";
import { createInvitedUser } from "@/db/queries/invitations";
import { ensurePersonalTeam } from "@/db/queries/users";
import { signIn } from "@/lib/auth";
import { accountNameSchema, hashPassword, newPasswordSchema } from "@/lib/auth/password";
import { getCurrentUser } from "@/lib/auth/session";
import { formFields, invitationTokenSchema, NOT_A_FORM } from "@/lib/api/action-input";
import { validate } from "@/lib/api/validate";
import { acceptFor } from "@/lib/review/accept";

export interface InvitationFormState {
  error?: string;
  fieldErrors?: Record<string, string>;
  name?: string;
}

/** Accept as the signed-in user (the address must be the invited one). */
// The form state and data that useActionState passes in are not needed: the token says it all.
export async function acceptInvitationAction(token: string): Promise<InvitationFormState> {
  const bad = tokenRefusal(token);
  if (bad) return bad;
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(`/invitation/${token}`)}`);
  const result = acceptFor(token, user);
  if (!result.ok) return { error: result.message };
  redirect(result.to);
}

const signUpSchema = z.object({ name: accountNameSchema, password: newPasswordSchema });

/** The token is bound in the browser, so a forged call can put anything there. */
function tokenRefusal(token: unknown): InvitationFormState | null {
  const parsed = validate(invitationTokenSchema, token);
  return parsed.ok ? null : { error: "This invitation link is not valid.", fieldErrors: { token: parsed.errors[0].message } };
}

/**
 * Sign up through an invitation: the account for the invited address is created (the mailed link
 * proves the address, so no second confirmation mail), the invitation is taken, and the new user is
 * signed in and lands on what they were invited to.
 */
export async function signUpThroughInvitation(token: string, _prev: InvitationFormState, form: FormData): Promise<InvitationFormState> {
  const bad = tokenRefusal(token);
  if (bad) return bad;
  const input = formFields(form, ["name", "password"]);
  if (!input) return { error: NOT_A_FORM };
  const parsed = validate(signUpSchema, input);
  if (!parsed.ok) {
    const fieldErrors: Record<string, string> = {};
    for (const e of parsed.errors) fieldErrors[e.path] ??= e.message;
    return { fieldErrors, name: input.name };
  }
  const created = createInvitedUser(token, parsed.data.name, await hashPassword(parsed.data.password));
  if (!created.ok) {
    return {
      error: created.reason === "exists" ? "This address already has an account: sign in to accept the invitation." : "This invitation can no longer be used.",
      name: input.name,
    };
  }
  ensurePersonalTeam(created.userId);
  const accepted = acceptFor(token, { id: created.userId, email: created.email });
  const to = accepted.ok ? accepted.to : "/chains";
  try {
    await signIn("credentials", { email: created.email, password: parsed.data.password, redirectTo: to });
  } catch (error) {
    unstable_rethrow(error); // a successful sign-in ends in a redirect, thrown
    return { error: "Your account was made, but signing in failed; sign in with your new password." };
  }
  redirect(to);
}
