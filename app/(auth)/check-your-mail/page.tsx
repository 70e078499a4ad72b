import type { Metadata } from "next";
import Link from "next/link";
import { connection } from "next/server";
import { Card } from "@/components/ui/card";
import { mailStandinEnabled } from "@/lib/mail/standin";

export const metadata: Metadata = { title: "Check your mail" };

export default async function CheckYourMailPage() {
  await connection(); // rendered per request: whether the stand-in is on is a run-time setting
  const standin = mailStandinEnabled();
  return (
    <Card className="flex flex-col gap-3 p-6">
      <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">Check your mail</h1>
      <p className="text-graphite-700">
        If the address can receive mail, a sign-in link is on its way. Open it in this browser; it works once, for 24
        hours.
      </p>
      <p className="text-sm text-graphite-500">Nothing after a few minutes? Look in the spam folder, then ask for a new link.</p>
      {standin ? (
        <p className="text-sm">
          This installation uses the local mail stand-in: the message is in the <Link href="/mailbox">mailbox</Link>.
        </p>
      ) : null}
      <p className="text-sm">
        <Link href="/sign-in">Back to sign-in</Link>
      </p>
    </Card>
  );
}
