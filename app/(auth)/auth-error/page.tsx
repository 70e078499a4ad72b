import type { Metadata } from "next";
import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { authErrorMessage } from "@/lib/auth/error-messages";

export const metadata: Metadata = { title: "Sign-in problem" };

export default async function AuthErrorPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  const message = authErrorMessage(typeof params.error === "string" ? params.error : "Default");
  return (
    <Card className="flex flex-col gap-3 p-6">
      <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">{message.title}</h1>
      <p className="text-graphite-700">{message.body}</p>
      <p>
        <Link href="/sign-in" className={buttonClass("primary")}>
          Back to sign-in
        </Link>
      </p>
    </Card>
  );
}
