import { spawn } from "node:child_process";
import path from "node:path";
import { closeDb } from "../db/connection";
import { seedDemo } from "../db/seed";
import { env } from "../lib/env";
import { defaultMailboxPath, startMailStandin } from "./mail-standin";

/**
 * `npm run dev`: one command for a working local setup. Applies migrations and seeds an empty
 * database, starts the mail stand-in, then runs `next dev` on port 3000, forwarding Ctrl-C
 * and termination signals so that nothing is left running.
 */
process.env.MAIL_STANDIN ??= "1";
process.env.SMTP_HOST ??= "127.0.0.1";
process.env.SMTP_PORT ??= "2525";
process.env.NEXT_TELEMETRY_DISABLED ??= "1"; // no network calls from a local trial

async function main(): Promise<void> {
  const settings = env();
  const outcome = await seedDemo(); // getDb() inside applies the migrations first
  console.log(
    outcome === "seeded"
      ? `[dev] new database at ${settings.databasePath}, seeded with the Keelwater Instruments demo`
      : `[dev] using the existing database at ${settings.databasePath}`,
  );
  closeDb(); // next dev opens its own connection

  const mailboxPath = defaultMailboxPath();
  const standin = await startMailStandin({ port: settings.smtp.port, mailboxPath }).catch((err: Error) => {
    console.error(`[dev] the mail stand-in could not listen on port ${settings.smtp.port} (${err.message}). Is another dev server running? Set SMTP_PORT to use another port.`);
    process.exit(1);
  });
  console.log(`[dev] mail stand-in on 127.0.0.1:${standin.port}; messages at http://localhost:${process.env.PORT ?? 3000}/mailbox`);

  const nextBin = path.resolve("node_modules", "next", "dist", "bin", "next");
  const child = spawn(process.execPath, [nextBin, "dev", "--port", process.env.PORT ?? "3000"], {
    stdio: "inherit",
    env: process.env,
  });
  const forward = (signal: NodeJS.Signals) => () => {
    if (!child.killed) child.kill(signal);
  };
  process.on("SIGINT", forward("SIGINT"));
  process.on("SIGTERM", forward("SIGTERM"));
  child.on("exit", (code, signal) => {
    void standin.close().then(() => process.exit(code ?? (signal ? 0 : 1)));
  });
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
