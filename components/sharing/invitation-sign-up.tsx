"use client";

import { useActionState } from "react";
import { acceptInvitationAction, signUpThroughInvitation, type InvitationFormState } from "@/app/(auth)/invitation/[token]/actions";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { NewPasswordField } from "@/components/auth/new-password-field";

/** Create the invited account: the address is the invited one and cannot be changed here. */
export function InvitationSignUp({ token, email }: { token: string; email: string }) {
  const [state, action, pending] = useActionState<InvitationFormState, FormData>(signUpThroughInvitation.bind(null, token), {});
  return (
    <form action={action} className="flex flex-col gap-4" noValidate>
      {state.error ? <Notice tone="problem">{state.error}</Notice> : null}
      <Field label="E-mail" name="email-shown" value={email} readOnly hint="The invitation is for this address." />
      <Field label="Name" name="name" autoComplete="name" required defaultValue={state.name} error={state.fieldErrors?.name} />
      <NewPasswordField error={state.fieldErrors?.password} />
      <Button type="submit" disabled={pending}>
        {pending ? "Creating…" : "Create account and accept"}
      </Button>
    </form>
  );
}

export function AcceptInvitation({ token }: { token: string }) {
  const [state, action, pending] = useActionState<InvitationFormState, FormData>(() => acceptInvitationAction(token), {});
  return (
    <form action={action} className="flex flex-col gap-3">
      {state.error ? <Notice tone="problem">{state.error}</Notice> : null}
      <Button type="submit" disabled={pending}>
        {pending ? "Accepting…" : "Accept the invitation"}
      </Button>
    </form>
  );
}
