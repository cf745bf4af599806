// Password and link sign-in with rate limits and lockout. Failed attempts are counted per account;
// the account locks after AUTH_SETTINGS.lockAfterFailures in a row and stays locked until an
// administrator unlocks it. Unknown addresses get the same answer as wrong passwords.
import { sql, type Kysely } from 'kysely';
import type { Database, SignInMethod } from '@/db/schema';
import { recordAudit } from '@/lib/audit/record';
import { AuthError } from './auth-error';
import { consumeEmailToken } from './email-tokens';
import { verifyPassword } from './password';
import { AUTH_SETTINGS } from './settings';

export interface SignedInUser {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
}

const INVALID = 'The e-mail address or the password is not right.';
const LOCKED = `This account is locked after ${AUTH_SETTINGS.lockAfterFailures} failed sign-in attempts. An administrator must unlock it.`;
const DISABLED = 'This account is disabled. Ask an administrator.';

async function checkRate(db: Kysely<Database>, email: string, ip: string): Promise<void> {
  const since = sql<Date>`now() - make_interval(mins => ${AUTH_SETTINGS.rateWindowMinutes})`;
  const row = await db
    .selectFrom('sign_in_attempts')
    .select([
      (eb) => eb.fn.countAll<string>().filterWhere('email', '=', email).as('by_email'),
      (eb) => eb.fn.countAll<string>().filterWhere('ip', '=', ip).as('by_ip'),
    ])
    .where('at', '>', since)
    .where((eb) => eb.or([eb('email', '=', email), eb('ip', '=', ip)]))
    .executeTakeFirstOrThrow();
  if (Number(row.by_email) >= AUTH_SETTINGS.maxAttemptsPerEmail || Number(row.by_ip) >= AUTH_SETTINGS.maxAttemptsPerIp) {
    throw new AuthError('rate_limited', `Too many sign-in attempts. Wait ${AUTH_SETTINGS.rateWindowMinutes} minutes and try again.`);
  }
}

async function noteAttempt(db: Kysely<Database>, email: string, ip: string, method: SignInMethod, ok: boolean): Promise<void> {
  await db.insertInto('sign_in_attempts').values({ email, ip, method, ok }).execute();
}

export async function authenticatePassword(db: Kysely<Database>, input: { email: string; password: string; ip: string }): Promise<SignedInUser> {
  const email = input.email.trim().toLowerCase();
  await checkRate(db, email, input.ip);
  const user = await db
    .selectFrom('users')
    .select(['id', 'email', 'display_name', 'password_hash', 'is_admin', 'disabled_at', 'locked_at', 'failed_sign_ins'])
    .where('email', '=', email)
    .executeTakeFirst();
  if (!user) {
    await verifyPassword(null, input.password);
    await noteAttempt(db, email, input.ip, 'password', false);
    throw new AuthError('invalid', INVALID);
  }
  if (user.disabled_at) {
    await noteAttempt(db, email, input.ip, 'password', false);
    throw new AuthError('disabled', DISABLED);
  }
  if (user.locked_at) {
    await noteAttempt(db, email, input.ip, 'password', false);
    throw new AuthError('locked', LOCKED);
  }
  const ok = await verifyPassword(user.password_hash, input.password);
  await noteAttempt(db, email, input.ip, 'password', ok);
  if (!ok) {
    const locked = await db.transaction().execute(async (trx) => {
      const row = await trx
        .updateTable('users')
        .set((eb) => ({ failed_sign_ins: eb('failed_sign_ins', '+', 1) }))
        .where('id', '=', user.id)
        .returning('failed_sign_ins')
        .executeTakeFirstOrThrow();
      if (row.failed_sign_ins < AUTH_SETTINGS.lockAfterFailures) return false;
      await trx.updateTable('users').set({ locked_at: sql`now()` }).where('id', '=', user.id).where('locked_at', 'is', null).execute();
      await recordAudit(trx, null, {
        action: 'user.lock',
        objectType: 'user',
        objectId: user.id,
        newValue: { locked: true, failedAttempts: row.failed_sign_ins },
        reason: `${row.failed_sign_ins} failed sign-in attempts in a row`,
      });
      return true;
    });
    throw new AuthError(locked ? 'locked' : 'invalid', locked ? LOCKED : INVALID);
  }
  if (user.failed_sign_ins > 0) await db.updateTable('users').set({ failed_sign_ins: 0 }).where('id', '=', user.id).execute();
  return { id: user.id, email: user.email, name: user.display_name, isAdmin: user.is_admin };
}

/** Signs in with a single-use e-mailed link. A locked or disabled account cannot use one. */
export async function authenticateLink(db: Kysely<Database>, input: { token: string; ip: string }): Promise<SignedInUser> {
  const userId = await consumeEmailToken(db, { token: input.token, purpose: 'sign-in' });
  if (!userId) throw new AuthError('expired_link', 'This sign-in link has expired or was already used. Ask for a new one.');
  const user = await db
    .selectFrom('users')
    .select(['id', 'email', 'display_name', 'is_admin', 'disabled_at', 'locked_at'])
    .where('id', '=', userId)
    .executeTakeFirstOrThrow();
  await noteAttempt(db, user.email, input.ip, 'link', !user.disabled_at && !user.locked_at);
  if (user.disabled_at) throw new AuthError('disabled', DISABLED);
  if (user.locked_at) throw new AuthError('locked', LOCKED);
  return { id: user.id, email: user.email, name: user.display_name, isAdmin: user.is_admin };
}
