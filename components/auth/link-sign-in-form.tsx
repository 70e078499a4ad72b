"use client";

import { useActionState } from "react";
import { signInWithLink, type FormState } from "@/app/(auth)/actions";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { EmailField } from "./email-field";

export function LinkSignInForm({ callbackUrl }: { callbackUrl: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(signInWithLink, {});
  return (
    <form action={action} className="flex flex-col gap-4" aria-labelledby="link-heading" noValidate>
      <h2 id="link-heading" className="text-base font-semibold text-graphite-950">
        With an e-mail link
      </h2>
      <p className="text-sm text-graphite-500">We send a link that signs you in once. New here? The link creates your account.</p>
      {state.error ? <Notice tone="problem" title="No link sent">{state.error}</Notice> : null}
      <input type="hidden" name="callbackUrl" value={callbackUrl} />
      <EmailField state={state} id="link-email" />
      <Button type="submit" variant="secondary" disabled={pending}>
        {pending ? "Sending…" : "Send me a sign-in link"}
      </Button>
    </form>
  );
}
