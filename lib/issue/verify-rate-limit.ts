// Verification is open to anyone, and reading an uploaded PDF costs the server work, so each client
// address (lib/http/client-address.ts: the connection's peer, or the right-most hop not a trusted
// proxy) may verify a limited number of files or codes per fixed window. The count lives in
// PostgreSQL, so every app instance behind a load balancer counts against the same window, and
// it is taken in one statement (an upsert), so concurrent requests cannot all pass a limit of one.
import { sql, type Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import { config } from '@/lib/config';
import { AppError } from '@/lib/errors/app-error';

export interface VerifyRateLimit {
  /** Requests an address may make per window. */
  requests: number;
  windowSeconds: number;
}

function verifyRateLimitFromEnv(): VerifyRateLimit {
  return {
    requests: config().WORLDSHEET_VERIFY_RATE_PER_MINUTE,
    windowSeconds: 60,
  };
}

/**
 * Counts one verification for `address`; 429 with Retry-After (the seconds left in the window)
 * once the address has used up the window's requests. A refused request counts too, so a client
 * that keeps hammering stays refused until the window ends.
 */
export async function countVerification(
  db: Kysely<Database>,
  address: string,
  limit: VerifyRateLimit = verifyRateLimitFromEnv(),
): Promise<void> {
  const key = address.slice(0, 100) || 'unknown';
  const window = sql`make_interval(secs => ${limit.windowSeconds})`;
  const row = await db
    .insertInto('verify_rate_limits')
    .values({ address: key, requests: 1 })
    .onConflict((oc) =>
      oc.column('address').doUpdateSet({
        // A window that has ended starts again from this request.
        window_started_at: sql`case when verify_rate_limits.window_started_at <= now() - ${window} then now() else verify_rate_limits.window_started_at end`,
        requests: sql`case when verify_rate_limits.window_started_at <= now() - ${window} then 1 else verify_rate_limits.requests + 1 end`,
      }),
    )
    .returning([
      'requests',
      sql<number>`extract(epoch from (window_started_at + ${window} - now()))`.as('seconds_left'),
    ])
    .executeTakeFirstOrThrow();
  if (row.requests === 1) {
    // A new window: forget addresses whose windows ended long ago, so the table stays small.
    await db
      .deleteFrom('verify_rate_limits')
      .where('window_started_at', '<', sql<Date>`now() - make_interval(secs => ${limit.windowSeconds * 10})`)
      .execute();
  }
  if (row.requests > limit.requests) {
    const retryAfter = Math.max(1, Math.ceil(Number(row.seconds_left)));
    throw new AppError(
      'too_many_requests',
      `Too many verifications from your address: at most ${limit.requests} per ${limit.windowSeconds} s. Try again in ${retryAfter} s.`,
      null,
      retryAfter,
    );
  }
}
