import { simpleParser, type AddressObject } from "mailparser";
import { randomUUID } from "node:crypto";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { SMTPServer } from "smtp-server";
import { appendMessage } from "../lib/mail/mailbox";

/**
 * The local mail stand-in: an SMTP server (smtp-server package) on a local port that accepts
 * every message, parses it with mailparser and appends it to the mailbox file the /mailbox
 * page reads. For development and tests only; it never relays anything.
 */

export interface MailStandin {
  port: number;
  close(): Promise<void>;
}

function addresses(a: AddressObject | AddressObject[] | undefined): string[] {
  if (!a) return [];
  return (Array.isArray(a) ? a : [a]).flatMap((o) => o.value.map((v) => v.address ?? "").filter(Boolean));
}

export function startMailStandin(opts: { port: number; host?: string; mailboxPath: string; quiet?: boolean }): Promise<MailStandin> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    banner: "Chainwright mail stand-in",
    size: 10 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((mail) => {
          const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
          const message = {
            id: randomUUID(),
            receivedAt: new Date().toISOString(),
            from: mail.from?.text ?? (session.envelope.mailFrom ? session.envelope.mailFrom.address : ""),
            to: envelopeTo.length ? envelopeTo : addresses(mail.to),
            subject: mail.subject ?? "",
            text: mail.text ?? "",
            html: typeof mail.html === "string" ? mail.html : null,
          };
          appendMessage(opts.mailboxPath, message);
          if (!opts.quiet) console.log(`[mail] ${message.to.join(", ")}: ${message.subject}`);
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  return new Promise((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port, opts.host ?? "127.0.0.1", () => {
      server.off("error", reject);
      const address = server.server.address();
      const port = typeof address === "object" && address ? address.port : opts.port;
      resolve({ port, close: () => new Promise<void>((done) => server.close(() => done())) });
    });
  });
}

/** Mailbox file used when none is named: beside the database, as lib/env.ts decides too. */
export function defaultMailboxPath(): string {
  if (process.env.MAILBOX_PATH) return path.resolve(process.env.MAILBOX_PATH);
  const db = path.resolve(process.env.DATABASE_PATH ?? "./data/chainwright.db");
  return path.join(path.dirname(db), "mailbox.jsonl");
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const port = Number(process.env.SMTP_PORT ?? 2525);
  const mailboxPath = defaultMailboxPath();
  startMailStandin({ port, mailboxPath })
    .then((s) => {
      console.log(`[mail] stand-in listening on 127.0.0.1:${s.port}, storing into ${mailboxPath}`);
      const stop = () => void s.close().then(() => process.exit(0));
      process.on("SIGINT", stop);
      process.on("SIGTERM", stop);
    })
    .catch((err: Error) => {
      console.error(`[mail] could not start on port ${port}: ${err.message}`);
      process.exit(1);
    });
}
