import { sql } from "drizzle-orm";
import { db, type Executor } from "~/db/client.server";
import { rateLimit } from "~/db/schema";

/**
 * A fixed-window counter in PostgreSQL (the rate_limit table better-auth also uses; Gatecrash's keys start with
 * "gc:" so they never meet better-auth's). Works across any number of stateless web processes. Inside a transaction,
 * pass its handle as `ex` — but a hit that must count even when the transaction rolls back belongs after it.
 */
export interface RateLimitHit {
  allowed: boolean;
  count: number;
  /** Seconds until the window ends. */
  retryAfterSeconds: number;
}

export async function hitRateLimit(key: string, max: number, windowSeconds: number, now = new Date(), ex: Executor = db()): Promise<RateLimitHit> {
  const nowMs = now.getTime();
  const windowStart = nowMs - windowSeconds * 1000;
  const fullKey = `gc:${key}`;
  // One statement: a new window starts when the stored one began before windowStart.
  const [row] = await ex
    .insert(rateLimit)
    .values({ id: crypto.randomUUID(), key: fullKey, count: 1, lastRequest: nowMs })
    .onConflictDoUpdate({
      target: rateLimit.key,
      set: {
        count: sql`case when ${rateLimit.lastRequest} < ${windowStart} then 1 else ${rateLimit.count} + 1 end`,
        lastRequest: sql`case when ${rateLimit.lastRequest} < ${windowStart} then ${nowMs} else ${rateLimit.lastRequest} end`,
      },
    })
    .returning({ count: rateLimit.count, lastRequest: rateLimit.lastRequest });
  const retryAfterSeconds = Math.max(1, Math.ceil((row.lastRequest + windowSeconds * 1000 - nowMs) / 1000));
  return { allowed: row.count <= max, count: row.count, retryAfterSeconds };
}
