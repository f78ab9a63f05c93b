// Counting attempts in MariaDB (the auth library's rate_limits table, under keys of our own): a fixed
// window per key for routes the auth library does not cover (accepting an invitation), and the
// failed sign-ins of one account with a growing wait, whatever address they come from.
import { randomUUID } from "node:crypto";
import { eq, sql } from "drizzle-orm";
import { db } from "@/server/db.server";
import { rateLimits } from "@/db/schema";

/** One more attempt under `key`; whether it is within `max` per `window_s`, and when the window ends. */
export async function countAttempt(
  key: string,
  max: number,
  window_s: number,
): Promise<{ allowed: boolean; retryAfter_s: number }> {
  const now = Date.now();
  const start = now - window_s * 1000;
  // A window that has ended starts again at this attempt; both columns read the row's old values.
  await db
    .insert(rateLimits)
    .values({ id: randomUUID(), key, count: 1, lastRequest: now })
    .onDuplicateKeyUpdate({
      set: {
        count: sql`IF(${rateLimits.lastRequest} < ${start}, 1, ${rateLimits.count} + 1)`,
        lastRequest: sql`IF(${rateLimits.lastRequest} < ${start}, ${now}, ${rateLimits.lastRequest})`,
      },
    });
  const [row] = await db
    .select({ count: rateLimits.count, since: rateLimits.lastRequest })
    .from(rateLimits)
    .where(eq(rateLimits.key, key));
  const retryAfter_s = Math.max(1, Math.ceil((row.since + window_s * 1000 - now) / 1000));
  return { allowed: row.count <= max, retryAfter_s };
}

/** Failed sign-ins an account may have before each further attempt waits. */
export const FREE_FAILURES = 5;
const FIRST_WAIT_S = 30;
const LONGEST_WAIT_S = 15 * 60;

/** The wait after `failures` consecutive failed sign-ins: none up to FREE_FAILURES, then 30 s doubling per failure up to 15 min. */
export function backoff_s(failures: number): number {
  if (failures < FREE_FAILURES) return 0;
  return Math.min(LONGEST_WAIT_S, FIRST_WAIT_S * 2 ** (failures - FREE_FAILURES));
}

const failureKey = (accountKey: string) => `tapwright:sign-in-failures:${accountKey}`;

/** Seconds this account must still wait before another sign-in attempt (0 when it may try now). */
export async function accountWait_s(accountKey: string): Promise<number> {
  const [row] = await db
    .select({ failures: rateLimits.count, last: rateLimits.lastRequest })
    .from(rateLimits)
    .where(eq(rateLimits.key, failureKey(accountKey)));
  if (!row) return 0;
  const until = row.last + backoff_s(row.failures) * 1000;
  return Math.max(0, Math.ceil((until - Date.now()) / 1000));
}

/** Records a sign-in's outcome: a failure adds one to the account's count, a success clears it. */
export async function recordSignIn(accountKey: string, ok: boolean): Promise<void> {
  const key = failureKey(accountKey);
  if (ok) {
    await db.delete(rateLimits).where(eq(rateLimits.key, key));
    return;
  }
  const now = Date.now();
  await db
    .insert(rateLimits)
    .values({ id: randomUUID(), key, count: 1, lastRequest: now })
    .onDuplicateKeyUpdate({ set: { count: sql`${rateLimits.count} + 1`, lastRequest: now } });
}
