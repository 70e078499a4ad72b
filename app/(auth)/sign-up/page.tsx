import type { Metadata } from "next";
import Link from "next/link";
import { SignUpForm } from "@/components/auth/sign-up-form";
import { Card } from "@/components/ui/card";

export const metadata: Metadata = { title: "Create an account" };

export default function SignUpPage() {
  return (
    <div className="flex flex-col gap-5">
      <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">Create an account</h1>
      <p className="text-sm text-graphite-700">
        You get a workspace of your own for your chains; a team admin can add you to their team later.
      </p>
      <Card className="p-6">
        <SignUpForm />
      </Card>
      <p className="text-sm text-graphite-700">
        Already have an account? <Link href="/sign-in">Sign in</Link>.
      </p>
    </div>
  );
}
