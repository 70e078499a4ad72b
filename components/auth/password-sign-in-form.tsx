"use client";

import { useActionState } from "react";
import { signInWithPassword, type FormState } from "@/app/(auth)/actions";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { EmailField } from "./email-field";

export function PasswordSignInForm({ callbackUrl }: { callbackUrl: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(signInWithPassword, {});
  return (
    <form action={action} className="flex flex-col gap-4" aria-labelledby="password-heading" noValidate>
      <h2 id="password-heading" className="text-base font-semibold text-graphite-950">
        With your password
      </h2>
      {state.error ? <Notice tone="problem" title="Not signed in">{state.error}</Notice> : null}
      <input type="hidden" name="callbackUrl" value={callbackUrl} />
      <EmailField state={state} id="password-email" />
      <Field
        label="Password"
        name="password"
        type="password"
        autoComplete="current-password"
        required
        error={state.fieldErrors?.password}
      />
      <Button type="submit" disabled={pending}>
        {pending ? "Signing in…" : "Sign in"}
      </Button>
    </form>
  );
}
