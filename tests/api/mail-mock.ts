import { vi } from "vitest";

/**
 * Route tests send no real mail: lib/mail/transport is replaced by this recorder.
 * Use with: vi.mock("@/lib/mail/transport", () => mailModule);
 */
export const sentMail: Array<{ to: string; subject: string; text: string; html: string }> = [];

export const mailModule = {
  sendMail: vi.fn(async (mail: { to: string; subject: string; text: string; html: string }) => {
    sentMail.push(mail);
  }),
  getTransport: vi.fn(),
};

export function clearMail(): void {
  sentMail.length = 0;
}

/** The first link in the newest mail to `to`. */
export function lastLinkTo(to: string): string | null {
  const mail = [...sentMail].reverse().find((m) => m.to === to);
  return mail ? (/https?:\/\/\S+/.exec(mail.text)?.[0] ?? null) : null;
}
