"use client";

import { useActionState } from "react";
import { signUp, type FormState } from "@/app/(auth)/actions";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { EmailField } from "./email-field";
import { NewPasswordField } from "./new-password-field";

export function SignUpForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(signUp, {});
  return (
    <form action={action} className="flex flex-col gap-4" noValidate>
      {state.error ? <Notice tone="problem" title="Not sent">{state.error}</Notice> : null}
      <Field label="Name" name="name" autoComplete="name" required defaultValue={state.values?.name} error={state.fieldErrors?.name} />
      <EmailField state={state} />
      <NewPasswordField error={state.fieldErrors?.password} />
      <Button type="submit" disabled={pending}>
        {pending ? "Sending…" : "Create account"}
      </Button>
      <p className="text-xs text-graphite-500">
        We send a link to confirm the address. Your password works from the moment you open it.
      </p>
    </form>
  );
}
