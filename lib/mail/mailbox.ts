import { appendFileSync, existsSync, mkdirSync, readFileSync } from "node:fs";
import path from "node:path";

/**
 * The mail stand-in's store: one JSON object per line in a file beside the database.
 * Plain files keep the stand-in independent of the app's database and migrations, and a
 * line-at-a-time append cannot leave a half-written message that breaks the rest.
 */

export interface StoredMessage {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
}

export function appendMessage(file: string, message: StoredMessage): void {
  mkdirSync(path.dirname(file), { recursive: true });
  appendFileSync(file, JSON.stringify(message) + "\n", "utf8");
}

/** Every stored message, newest first; lines that do not parse are skipped. */
export function readMessages(file: string): StoredMessage[] {
  if (!existsSync(file)) return [];
  const out: StoredMessage[] = [];
  for (const line of readFileSync(file, "utf8").split("\n")) {
    if (!line.trim()) continue;
    try {
      out.push(JSON.parse(line) as StoredMessage);
    } catch {
      // a torn line from a crash: ignore it rather than hide every other message
    }
  }
  return out.reverse();
}

/** Messages addressed to `email` (case-insensitive), newest first. */
export function messagesFor(file: string, email: string): StoredMessage[] {
  const wanted = email.trim().toLowerCase();
  return readMessages(file).filter((m) => m.to.some((t) => t.toLowerCase().includes(wanted)));
}

/** The first http(s) link in a message's text part (sign-in and invitation mails carry one). */
export function firstLink(message: Pick<StoredMessage, "text" | "html">): string | null {
  const match = /https?:\/\/[^\s"'<>]+/.exec(message.text) ?? (message.html ? /href="(https?:\/\/[^"]+)"/.exec(message.html) : null);
  if (!match) return null;
  return (match[1] ?? match[0]).replace(/&amp;/g, "&");
}
