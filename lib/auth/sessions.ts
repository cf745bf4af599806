// Server-side sessions: the browser's signed cookie only carries the session id. A session ends
// after AUTH_SETTINGS.sessionIdleMinutes without a request, after sessionMaxHours in any case, on
// sign-out, and when its user is disabled.
import { sql, type Kysely } from 'kysely';
import type { Database, SignInMethod } from '@/db/schema';
import type { Actor } from './actor';
import { AUTH_SETTINGS } from './settings';

export async function startSession(
  db: Kysely<Database>,
  input: { userId: string; method: SignInMethod; ip: string | null; userAgent: string | null },
): Promise<string> {
  const row = await db
    .insertInto('sessions')
    .values({ user_id: input.userId, method: input.method, ip: input.ip, user_agent: input.userAgent?.slice(0, 300) ?? null })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** The actor of a live session, refreshing its last activity; null when it has ended or expired. */
export async function resumeSession(db: Kysely<Database>, sessionId: string): Promise<Actor | null> {
  if (!/^[0-9a-f-]{36}$/.test(sessionId)) return null;
  const row = await db
    .selectFrom('sessions as s')
    .innerJoin('users as u', 'u.id', 's.user_id')
    .select([
      's.id',
      's.user_id',
      'u.email',
      'u.display_name',
      'u.is_admin',
      'u.disabled_at',
      's.ended_at',
      sql<boolean>`s.last_seen_at < now() - make_interval(mins => ${AUTH_SETTINGS.sessionIdleMinutes})`.as('idle'),
      sql<boolean>`s.created_at < now() - make_interval(hours => ${AUTH_SETTINGS.sessionMaxHours})`.as('too_old'),
      sql<boolean>`s.last_seen_at < now() - interval '1 minute'`.as('stale'),
    ])
    .where('s.id', '=', sessionId)
    .executeTakeFirst();
  if (!row || row.ended_at) return null;
  if (row.idle || row.too_old || row.disabled_at) {
    await endSession(db, sessionId, row.disabled_at ? 'user disabled' : row.idle ? 'inactivity' : 'maximum duration');
    return null;
  }
  if (row.stale) await db.updateTable('sessions').set({ last_seen_at: sql`now()` }).where('id', '=', sessionId).execute();
  return { userId: row.user_id, email: row.email, name: row.display_name, isAdmin: row.is_admin, via: 'session', sessionId, tokenId: null };
}

export async function endSession(db: Kysely<Database>, sessionId: string, reason: string): Promise<void> {
  await db.updateTable('sessions').set({ ended_at: sql`now()`, ended_reason: reason }).where('id', '=', sessionId).where('ended_at', 'is', null).execute();
}

export async function endUserSessions(db: Kysely<Database>, userId: string, reason: string): Promise<void> {
  await db.updateTable('sessions').set({ ended_at: sql`now()`, ended_reason: reason }).where('user_id', '=', userId).where('ended_at', 'is', null).execute();
}
