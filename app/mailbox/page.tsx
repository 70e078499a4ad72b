import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { Fragment } from "react";
import { Wordmark } from "@/components/ui/wordmark";
import { env } from "@/lib/env";
import { readMessages } from "@/lib/mail/mailbox";
import { mailStandinEnabled } from "@/lib/mail/standin";

export const metadata: Metadata = { title: "Mailbox (local stand-in)" };
export const dynamic = "force-dynamic";

/** Show links in a plain-text body as links, everything else as text. */
function Linked({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/[^\s<>"']+)/g);
  return (
    <>
      {parts.map((p, i) =>
        /^https?:\/\//.test(p) ? (
          <a key={i} href={p} className="break-all">
            {p}
          </a>
        ) : (
          <Fragment key={i}>{p}</Fragment>
        ),
      )}
    </>
  );
}

export default function MailboxPage() {
  if (!mailStandinEnabled()) notFound();
  const messages = readMessages(env().mailboxPath);
  return (
    <div className="mx-auto max-w-4xl px-6 py-8">
      <Wordmark />
      <h1 className="mt-6 text-2xl font-semibold tracking-tight text-graphite-950">Mailbox</h1>
      <p className="mt-1 text-sm text-graphite-500">
        Every message this installation sent, caught by the local mail stand-in. Newest first. It exists only while
        MAIL_STANDIN=1.
      </p>
      {messages.length === 0 ? (
        <p className="mt-6 rounded-card border border-dashed border-paper-rule bg-paper-raised p-6 text-graphite-700">
          No mail yet.
        </p>
      ) : (
        <ol className="mt-6 flex flex-col gap-4">
          {messages.map((m) => (
            <li key={m.id} className="rounded-card border border-paper-rule bg-paper-raised p-5 shadow-card" data-testid="mail">
              <p className="text-sm font-semibold text-graphite-950">{m.subject}</p>
              <dl className="mt-1 grid grid-cols-[4rem_1fr] gap-x-2 text-xs text-graphite-500">
                <dt>To</dt>
                <dd data-testid="mail-to">{m.to.join(", ")}</dd>
                <dt>From</dt>
                <dd>{m.from}</dd>
                <dt>Received</dt>
                <dd className="num">{m.receivedAt}</dd>
              </dl>
              <pre className="mt-3 whitespace-pre-wrap font-sans text-sm text-graphite-900">
                <Linked text={m.text} />
              </pre>
            </li>
          ))}
        </ol>
      )}
    </div>
  );
}
