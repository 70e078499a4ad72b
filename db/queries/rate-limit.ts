import "server-only";
import { and, asc, count, eq, gt, lt } from "drizzle-orm";
import { getDb } from "../connection";
import { rateLimitEvents } from "../schema";

export interface RateDecision {
  allowed: boolean;
  /** when refused: milliseconds until the oldest counted event leaves the window */
  retryAfterMs: number;
}

/**
 * Sliding-window limit: allow and record an event for `key` unless `limit` events already
 * fall inside the last `windowMs`. Check and record happen in one transaction so two
 * requests at once cannot both slip under the limit.
 */
export function takeRateToken(key: string, limit: number, windowMs: number, now = Date.now()): RateDecision {
  const db = getDb();
  const since = new Date(now - windowMs);
  return db.transaction((tx) => {
    tx.delete(rateLimitEvents).where(and(eq(rateLimitEvents.key, key), lt(rateLimitEvents.at, since))).run();
    const [{ n }] = tx
      .select({ n: count() })
      .from(rateLimitEvents)
      .where(and(eq(rateLimitEvents.key, key), gt(rateLimitEvents.at, since)))
      .all();
    if (n >= limit) {
      const oldest = tx
        .select({ at: rateLimitEvents.at })
        .from(rateLimitEvents)
        .where(and(eq(rateLimitEvents.key, key), gt(rateLimitEvents.at, since)))
        .orderBy(asc(rateLimitEvents.at))
        .get();
      const retryAfterMs = oldest ? Math.max(0, oldest.at.getTime() + windowMs - now) : windowMs;
      return { allowed: false, retryAfterMs };
    }
    tx.insert(rateLimitEvents).values({ key, at: new Date(now) }).run();
    return { allowed: true, retryAfterMs: 0 };
  });
}

/** Forget every counted event for `key` (a successful password sign-in clears its failures). */
export function clearRateTokens(key: string): void {
  getDb().delete(rateLimitEvents).where(eq(rateLimitEvents.key, key)).run();
}
