// Server-side sessions: the browser's signed cookie only carries the session id. A session ends
// after AUTH_SETTINGS.sessionIdleMinutes without a request, after sessionMaxHours in any case, on
// sign-out (audited), when its user is disabled or locked, and when the password is changed (the
// other sessions) or reset (all of them). Each ended session keeps the reason in ended_reason.
import { sql, type Kysely } from 'kysely';
import type { Database, SignInMethod } from '@/db/schema';
import { recordAudit } from '@/lib/audit/record';
import type { Actor } from './actor';
import { AUTH_SETTINGS } from './settings';

export async function startSession(
  db: Kysely<Database>,
  input: { userId: string; method: SignInMethod; ip: string | null; userAgent: string | null },
): Promise<string> {
  const row = await db
    .insertInto('sessions')
    .values({
      user_id: input.userId,
      method: input.method,
      ip: input.ip,
      user_agent: input.userAgent?.slice(0, 300) ?? null,
    })
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
      // Locked as lib/auth/lockout.ts defines it: an administrator's lock (no end) or a timed one in force.
      sql<boolean>`u.locked_at is not null and (u.lock_expires_at is null or u.lock_expires_at > now())`.as('locked'),
      's.ended_at',
      sql<boolean>`s.last_seen_at < now() - make_interval(mins => ${AUTH_SETTINGS.sessionIdleMinutes})`.as('idle'),
      sql<boolean>`s.created_at < now() - make_interval(hours => ${AUTH_SETTINGS.sessionMaxHours})`.as('too_old'),
      sql<boolean>`s.last_seen_at < now() - interval '1 minute'`.as('stale'),
    ])
    .where('s.id', '=', sessionId)
    .executeTakeFirst();
  if (!row || row.ended_at) return null;
  if (row.idle || row.too_old || row.disabled_at || row.locked) {
    await endSession(
      db,
      sessionId,
      row.disabled_at ? 'user disabled' : row.locked ? 'user locked' : row.idle ? 'inactivity' : 'maximum duration',
    );
    return null;
  }
  if (row.stale)
    await db
      .updateTable('sessions')
      .set({ last_seen_at: sql`now()` })
      .where('id', '=', sessionId)
      .execute();
  return {
    userId: row.user_id,
    email: row.email,
    name: row.display_name,
    isAdmin: row.is_admin,
    via: 'session',
    sessionId,
    tokenId: null,
  };
}

/** Ends one session; its user's id when it was live, null when it had ended already. */
async function endSession(db: Kysely<Database>, sessionId: string, reason: string): Promise<string | null> {
  if (!/^[0-9a-f-]{36}$/.test(sessionId)) return null;
  const row = await db
    .updateTable('sessions')
    .set({ ended_at: sql`now()`, ended_reason: reason })
    .where('id', '=', sessionId)
    .where('ended_at', 'is', null)
    .returning('user_id')
    .executeTakeFirst();
  return row?.user_id ?? null;
}

/** Sign-out (next-auth's signOut event): ends the session and records auth.sign-out, in one transaction. */
export async function signOutSession(db: Kysely<Database>, sessionId: string): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const userId = await endSession(trx, sessionId, 'signed out');
    if (!userId) return;
    await recordAudit(
      trx,
      { userId, email: '', name: '', isAdmin: false, via: 'session', sessionId, tokenId: null },
      {
        action: 'auth.sign-out',
        objectType: 'session',
        objectId: sessionId,
      },
    );
  });
}

/**
 * Ends the user's live sessions, but the one in `except` (the session that changed the password),
 * each with `reason`; the number ended.
 */
export async function endUserSessions(
  db: Kysely<Database>,
  userId: string,
  reason: string,
  except: string | null = null,
): Promise<number> {
  let query = db
    .updateTable('sessions')
    .set({ ended_at: sql`now()`, ended_reason: reason })
    .where('user_id', '=', userId)
    .where('ended_at', 'is', null);
  if (except) query = query.where('id', '<>', except);
  const ended = await query.returning('id').execute();
  return ended.length;
}
