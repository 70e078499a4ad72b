import "server-only";
import nodemailer, { type Transporter } from "nodemailer";
import { env } from "@/lib/env";

let transport: { key: string; t: Transporter } | undefined;

/**
 * Nodemailer transport built from SMTP_* settings. With the stand-in it is plain SMTP on a
 * local port; in production, whatever the environment names (port 465 or SMTP_SECURE=1 for TLS).
 */
export function getTransport(): Transporter {
  const { smtp, mailStandin } = env();
  const key = JSON.stringify(smtp);
  if (transport?.key === key) return transport.t;
  const t = nodemailer.createTransport({
    host: smtp.host,
    port: smtp.port,
    secure: smtp.secure || smtp.port === 465,
    // the local stand-in speaks plain SMTP; never try STARTTLS against it
    ignoreTLS: mailStandin,
    auth: smtp.user ? { user: smtp.user, pass: smtp.password ?? "" } : undefined,
  });
  transport = { key, t };
  return t;
}

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
}

export async function sendMail(mail: OutgoingMail): Promise<void> {
  const info = await getTransport().sendMail({ from: env().mailFrom, ...mail });
  const failed = [...(info.rejected ?? []), ...(info.pending ?? [])].filter(Boolean);
  if (failed.length) throw new Error(`mail to ${failed.join(", ")} was not accepted`);
}
