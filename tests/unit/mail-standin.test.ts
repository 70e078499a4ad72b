import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as mailboxGet } from "@/app/api/mailbox/route";
import { resetEnvCache } from "@/lib/env";
import { firstLink, messagesFor, readMessages } from "@/lib/mail/mailbox";
import { signInLinkMail } from "@/lib/mail/templates";
import { sendMail } from "@/lib/mail/transport";
import { startMailStandin, type MailStandin } from "@/scripts/mail-standin";

describe("mail stand-in with the app's transport", () => {
  let dir: string;
  let mailbox: string;
  let standin: MailStandin;
  const saved = { ...process.env };

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), "chainwright-mail-"));
    mailbox = path.join(dir, "mailbox.jsonl");
    standin = await startMailStandin({ port: 0, mailboxPath: mailbox, quiet: true });
    Object.assign(process.env, {
      DATABASE_PATH: path.join(dir, "x.db"),
      SMTP_HOST: "127.0.0.1",
      SMTP_PORT: String(standin.port),
      MAIL_STANDIN: "1",
      MAILBOX_PATH: mailbox,
    });
    resetEnvCache();
  });

  afterAll(async () => {
    await standin.close();
    process.env = saved;
    resetEnvCache();
    rmSync(dir, { recursive: true, force: true });
  });

  it("stores a sent sign-in mail with its link intact after quoted-printable transfer", async () => {
    // a long link with '=' and '&' is exactly what quoted-printable folds and escapes
    const url = `http://localhost:3999/api/auth/callback/nodemailer?callbackUrl=${encodeURIComponent("http://localhost:3999/chains")}&token=${"ab12".repeat(16)}&email=someone%40test.example`;
    await sendMail({ to: "someone@test.example", ...signInLinkMail(url, "localhost:3999") });
    const [message] = messagesFor(mailbox, "SOMEONE@test.example");
    expect(message.subject).toBe("Your Chainwright sign-in link");
    expect(message.to).toEqual(["someone@test.example"]);
    expect(firstLink(message)).toBe(url);
  });

  it("lists newest first and skips a torn line", async () => {
    await sendMail({ to: "second@test.example", subject: "Second", text: "no link here", html: "<p>no link</p>" });
    writeFileSync(mailbox, '{"broken": \n', { flag: "a" });
    const all = readMessages(mailbox);
    expect(all[0].subject).toBe("Second");
    expect(all).toHaveLength(2);
    expect(firstLink(all[0])).toBeNull();
  });

  it("serves the mailbox as JSON only while MAIL_STANDIN=1", async () => {
    const on = await mailboxGet(new Request("http://localhost/api/mailbox?to=second@test.example"), undefined);
    expect(on.status).toBe(200);
    const body = (await on.json()) as { messages: { subject: string }[] };
    expect(body.messages.map((m) => m.subject)).toEqual(["Second"]);

    delete process.env.MAIL_STANDIN;
    resetEnvCache();
    const off = await mailboxGet(new Request("http://localhost/api/mailbox"), undefined);
    expect(off.status).toBe(404);
    process.env.MAIL_STANDIN = "1";
    resetEnvCache();
  });
});
