import type { Metadata } from "next";
import Link from "next/link";
import { LinkSignInForm } from "@/components/auth/link-sign-in-form";
import { PasswordSignInForm } from "@/components/auth/password-sign-in-form";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { safeCallbackPath } from "@/lib/auth/redirects";
import { authErrorMessage } from "@/lib/auth/error-messages";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  const callbackUrl = safeCallbackPath(params.callbackUrl);
  const error = typeof params.error === "string" ? authErrorMessage(params.error) : null;
  return (
    <div className="flex flex-col gap-5">
      <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">Sign in</h1>
      {error ? <Notice tone="problem" title={error.title}>{error.body}</Notice> : null}
      <Card className="p-6">
        <PasswordSignInForm callbackUrl={callbackUrl} />
      </Card>
      <Card className="p-6">
        <LinkSignInForm callbackUrl={callbackUrl} />
      </Card>
      <p className="text-sm text-graphite-700">
        No account yet? <Link href="/sign-up">Create one</Link>.
      </p>
    </div>
  );
}
