import { and, eq, gte } from "drizzle-orm";
import { db } from "~/db/client.server";
import { rateLimit } from "~/db/schema";
import { env } from "~/env.server";
import { hitRateLimit } from "~/voting/rate-limit.server";

/**
 * Failed sign-ins, counted in two buckets (PostgreSQL, shared by every web process):
 * - per account and client address: AUTH_RATE_LIMIT failures per window stop that address guessing that account,
 *   while the owner signing in from anywhere else is not affected;
 * - per client address over all accounts: AUTH_ADDRESS_FAILURE_LIMIT, a larger budget, stops one address trying
 *   many accounts.
 * Only failures count (a hall full of people behind one party NAT signs in fine), and a success clears its pair.
 * The client address comes from the production server (TRUSTED_PROXIES decides whether X-Forwarded-For counts).
 */
export const SIGN_IN_WINDOW_S = 10 * 60;

const pairKey = (email: string, address: string) => `sign-in:pair:${email.trim().toLowerCase()}:${address}`;
const addressKey = (address: string) => `sign-in:address:${address}`;

async function failuresIn(key: string, now: Date): Promise<{ count: number; retryAfterSeconds: number }> {
  const since = now.getTime() - SIGN_IN_WINDOW_S * 1000;
  const [row] = await db()
    .select({ count: rateLimit.count, lastRequest: rateLimit.lastRequest })
    .from(rateLimit)
    .where(and(eq(rateLimit.key, `gc:${key}`), gte(rateLimit.lastRequest, since)));
  if (!row) return { count: 0, retryAfterSeconds: 0 };
  return { count: row.count, retryAfterSeconds: Math.max(1, Math.ceil((row.lastRequest + SIGN_IN_WINDOW_S * 1000 - now.getTime()) / 1000)) };
}

/** Seconds to wait when this account may not be tried from this address right now, else null. */
export async function signInBlocked(email: string, address: string, now = new Date()): Promise<number | null> {
  const pair = await failuresIn(pairKey(email, address), now);
  if (pair.count >= env().AUTH_RATE_LIMIT) return pair.retryAfterSeconds;
  const spray = await failuresIn(addressKey(address), now);
  if (spray.count >= env().AUTH_ADDRESS_FAILURE_LIMIT) return spray.retryAfterSeconds;
  return null;
}

export async function recordSignInFailure(email: string, address: string, now = new Date()): Promise<void> {
  await hitRateLimit(pairKey(email, address), env().AUTH_RATE_LIMIT, SIGN_IN_WINDOW_S, now);
  await hitRateLimit(addressKey(address), env().AUTH_ADDRESS_FAILURE_LIMIT, SIGN_IN_WINDOW_S, now);
}

export async function clearSignInFailures(email: string, address: string): Promise<void> {
  await db().delete(rateLimit).where(eq(rateLimit.key, `gc:${pairKey(email, address)}`));
}
