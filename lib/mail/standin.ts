import "server-only";
import { env } from "@/lib/env";

/**
 * The mailbox page and its API exist only while MAIL_STANDIN=1 (the dev script and the tests
 * set it). A real deployment leaves it unset, and the pages answer 404.
 */
export function mailStandinEnabled(): boolean {
  return env().mailStandin;
}
