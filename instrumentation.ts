/**
 * Runs once when the server starts (not during `next build`): check the environment, so a
 * production start without AUTH_SECRET stops at once with the reason, then open the database
 * and apply any migrations it has not seen.
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { env, envAtStart } = await import("./lib/env");
  envAtStart();
  const settings = env();
  const { getDb } = await import("./db/connection");
  getDb();
  if (settings.mailStandin && settings.nodeEnv === "production") {
    console.warn("[chainwright] MAIL_STANDIN=1: the /mailbox page is on. Never use this setting in a real deployment.");
  }
}
